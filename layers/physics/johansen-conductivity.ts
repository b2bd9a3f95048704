import { SOIL_CONSTITUENTS as S } from './soil-constituents';
import { requireFinite, requireOneOf, requireRange } from './validate';

/**
 * Thermal conductivity of mineral soil by the Johansen (1975) method, as summarised by Farouki (1981),
 * "Thermal properties of soils", CRREL Monograph 81-1, ch. 7 (equations recalled from memory; see
 * tests/reference/johansen-conductivity.test.ts for the checks).
 *
 *   k = (k_sat − k_dry)·Ke + k_dry
 *   k_dry = (0.135·ρd + 64.7)/(2700 − 0.947·ρd)      natural mineral soils, ρd in kg/m³, ±20 %
 *   k_s   = 7.7^q · k_o^(1−q)                          q quartz fraction of solids, k_o 2.0 (3.0 coarse, q ≤ 0.2)
 *   k_sat = k_s^(1−n) · 0.57^n                        thawed
 *   k_sat = k_s^(1−n) · 2.2^(n−θu) · 0.57^θu          frozen, θu unfrozen volumetric water
 *   Ke    = 0.7·log10 Sr + 1 (coarse, thawed, Sr > 0.05), log10 Sr + 1 (fine, thawed, Sr > 0.1), Sr (frozen)
 *
 * Validity: unsaturated and saturated mineral soils, Sr from 0 to 1. Below the stated Sr limits the
 * log form turns negative; Ke is then clamped at 0 (k = k_dry), as Johansen's curves are.
 */
export type Grading = 'coarse' | 'fine';
export type WaterState = 'frozen' | 'thawed';

/** Johansen's dry conductivity of natural mineral soil from dry density, W/m·K. */
export function johansenDryConductivity_W_mK(dryDensity_kg_m3: number): number {
  const rho = requireRange('dryDensity_kg_m3', dryDensity_kg_m3, 1, 2700, 'kg/m3');
  return (0.135 * rho + 64.7) / (2700 - 0.947 * rho);
}

/** Conductivity of the mineral solids from the quartz fraction q (geometric mean), W/m·K. */
export function johansenSolidsConductivity_W_mK(quartzFraction: number, grading: Grading): number {
  const q = requireRange('quartzFraction', quartzFraction, 0, 1);
  requireOneOf('grading', grading, ['coarse', 'fine'] as const);
  const ko =
    grading === 'coarse' && q <= 0.2
      ? S.otherMineralsCoarseLowQuartzConductivity_W_mK
      : S.otherMineralsConductivity_W_mK;
  return Math.pow(S.quartzConductivity_W_mK, q) * Math.pow(ko, 1 - q);
}

/** Kersten number Ke(Sr) for the given grading and state (Johansen 1975). */
export function johansenKerstenNumber(saturation: number, grading: Grading, state: WaterState): number {
  const sr = requireRange('saturation', saturation, 0, 1);
  requireOneOf('grading', grading, ['coarse', 'fine'] as const);
  requireOneOf('state', state, ['frozen', 'thawed'] as const);
  if (state === 'frozen') return sr;
  if (sr === 0) return 0;
  const ke = grading === 'coarse' ? 0.7 * Math.log10(sr) + 1 : Math.log10(sr) + 1;
  return Math.max(0, ke);
}

export interface JohansenInput {
  porosity: number;
  /** Total volumetric water + ice content, m³/m³ (≤ porosity). */
  waterContent_m3m3: number;
  /** Conductivity of the solids, W/m·K (see johansenSolidsConductivity_W_mK). */
  solidsConductivity_W_mK: number;
  /** Dry conductivity, W/m·K (see johansenDryConductivity_W_mK). */
  dryConductivity_W_mK: number;
  grading: Grading;
  state: WaterState;
  /** Unfrozen volumetric water in the frozen state, m³/m³ (0 ≤ θu ≤ waterContent); default 0. */
  unfrozenWater_m3m3?: number;
}

/** Saturated conductivity k_sat for the given state (geometric mean of constituents), W/m·K. */
export function johansenSaturatedConductivity_W_mK(input: {
  porosity: number;
  solidsConductivity_W_mK: number;
  state: WaterState;
  unfrozenWater_m3m3?: number;
}): number {
  const n = requireRange('porosity', input.porosity, 0, 1);
  const ks = requireRange('solidsConductivity_W_mK', input.solidsConductivity_W_mK, 0.01, 20, 'W/m/K');
  requireOneOf('state', input.state, ['frozen', 'thawed'] as const);
  const thetaU = requireRange('unfrozenWater_m3m3', input.unfrozenWater_m3m3 ?? 0, 0, n, 'm3/m3');
  const solids = Math.pow(ks, 1 - n);
  if (input.state === 'thawed') return solids * Math.pow(S.waterConductivity_W_mK, n);
  return solids * Math.pow(S.iceConductivity_W_mK, n - thetaU) * Math.pow(S.waterConductivity_W_mK, thetaU);
}

/** Johansen (1975) conductivity of a mineral soil, W/m·K. Throws on out-of-domain input. */
export function johansenConductivity_W_mK(input: JohansenInput): number {
  const n = requireRange('porosity', input.porosity, 0.01, 0.99);
  const theta = requireRange('waterContent_m3m3', input.waterContent_m3m3, 0, n, 'm3/m3 (0..porosity)');
  const kdry = requireRange('dryConductivity_W_mK', input.dryConductivity_W_mK, 0.001, 20, 'W/m/K');
  requireFinite('solidsConductivity_W_mK', input.solidsConductivity_W_mK);
  const thetaU = requireRange(
    'unfrozenWater_m3m3',
    input.unfrozenWater_m3m3 ?? 0,
    0,
    theta,
    'm3/m3 (0..waterContent)',
  );
  const ksat = johansenSaturatedConductivity_W_mK({
    porosity: n,
    solidsConductivity_W_mK: input.solidsConductivity_W_mK,
    state: input.state,
    unfrozenWater_m3m3: input.state === 'frozen' ? thetaU : 0,
  });
  const ke = johansenKerstenNumber(theta / n, input.grading, input.state);
  return (ksat - kdry) * ke + kdry;
}
