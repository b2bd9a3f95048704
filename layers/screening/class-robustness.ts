/**
 * Robustness of a cell's suitability class to nearby settings: the class is recomputed with the heat
 * pump's lowest entering fluid temperature one step warmer and one step colder
 * (suitability.robustness.fluidLimitStep_K), with the COP curve scaled down and up by
 * suitability.robustness.copScale (each a full re-run of the cell, cell-kernel.ts), and with each soft
 * weight doubled and halved in turn (reclassification only, cell-class.ts). The class is robust when
 * none of these changes it. Flags: 1 fluid limit warmer, 2 colder, 4 COP lower, 8 COP higher, 16 a
 * weight change; their sum is band robustnessFlags.
 */
import { scenarioSchema, type Scenario } from './scenario';
import { classifyCell } from './cell-class';
import { softWeights } from './suitability';

export { ROBUSTNESS_LABELS, robustnessText } from './robustness-labels';

export const ROBUSTNESS_FLAG = {
  fluidWarmer: 1,
  fluidColder: 2,
  copLower: 4,
  copHigher: 8,
  weights: 16,
} as const;

/**
 * The four perturbed scenarios in flag order (fluid warmer, colder, COP lower, higher). The fluid
 * limit moves both the heat pump's limit and its curve's; COP values stay above 1.
 */
export function perturbedScenarios(s: Scenario): Scenario[] {
  const r = s.suitability.robustness;
  const withFluid = (d: number): Scenario => {
    const t = s.heatPump.minEnteringFluid_C + d;
    return scenarioSchema.parse({
      ...s,
      heatPump: {
        ...s.heatPump,
        minEnteringFluid_C: t,
        curve: { ...s.heatPump.curve, minEnteringFluid_C: t },
      },
    });
  };
  const withCop = (f: number): Scenario =>
    scenarioSchema.parse({
      ...s,
      heatPump: {
        ...s.heatPump,
        curve: { ...s.heatPump.curve, cop: s.heatPump.curve.cop.map((c) => Math.max(1.01, c * f)) },
      },
    });
  return [
    withFluid(r.fluidLimitStep_K),
    withFluid(-r.fluidLimitStep_K),
    withCop(1 - r.copScale),
    withCop(1 + r.copScale),
  ];
}

/** Normalised weight sets with each soft weight doubled, then each halved. */
export function perturbedWeights(s: Scenario): Float64Array[] {
  const base = softWeights(s);
  const out: Float64Array[] = [];
  for (const factor of [2, 0.5]) {
    for (let i = 0; i < base.length; i++) {
      const w = Float64Array.from(base);
      w[i] *= factor;
      const sum = w.reduce((a, b) => a + b, 0);
      for (let j = 0; j < w.length; j++) w[j] /= sum;
      out.push(w);
    }
  }
  return out;
}

/**
 * Flags of one cell: `baseClass` its class, `perturbedClasses` the classes under perturbedScenarios
 * (same order), `m` its outputs for the weight changes.
 */
export function robustnessFlags(
  baseClass: number,
  perturbedClasses: ArrayLike<number>,
  m: ArrayLike<number>,
  textureClass: number,
  s: Scenario,
  weightSets: Float64Array[],
): number {
  let flags = 0;
  const bits = [1, 2, 4, 8];
  for (let i = 0; i < bits.length; i++) if (perturbedClasses[i] !== baseClass) flags |= bits[i];
  for (const w of weightSets) {
    if (classifyCell(m, textureClass, s, w).suitability !== baseClass) {
      flags |= ROBUSTNESS_FLAG.weights;
      break;
    }
  }
  return flags;
}
