/**
 * The per-cell regional screening model (implements ScreeningModel, screening-model.ts) and its rich
 * single-cell form `screenCell` for the `cell` command and the map's explanation card.
 *
 * Both run the same kernel (cell-kernel.ts): the number on the map and the number in the card are the
 * same number. Per-scenario constants (soil tables, response tables, economics) are built once in
 * `createScreeningModel`; `evaluate` is allocation-free apart from engine-elided temporaries.
 */
import { z } from 'zod';
import { GROUND_CAUTIONS, SCREENING_CAUTION } from '../cautions';
import type { CellInputs, ScreeningModel } from './screening-model';
import { TEXTURE_CODES } from './screening-model';
import { parseScenario, type Scenario } from './scenario';
import { buildCellConstants, type CellConstants } from './cell-constants';
import {
  createKernelScratch,
  evaluateCellMetrics,
  evaluateCellMetricsSameGround,
  type KernelScratch,
} from './cell-kernel';
import { perturbedScenarios, perturbedWeights, robustnessFlags, robustnessText } from './class-robustness';
import { cellLayers, METRIC, METRIC_COUNT, METRIC_IDS, type MetricId } from './cell-layers';
import {
  criteriaDefinitions,
  EXCLUSION_LABELS,
  linearScore,
  passes,
  PERMAFROST_CLASS_LABELS,
  SUITABILITY_LABELS,
  type CriterionDefinition,
} from './suitability';
import { BINDING_LABELS } from './operating-window';
import { horizonText } from './climate-horizon';
import { formatZodIssues } from '../validation-error';

/** The constants of a scenario and of its robustness perturbations (class-robustness.ts). */
export interface RobustConstants {
  base: CellConstants;
  perturbed: CellConstants[];
  weightSets: Float64Array[];
}

export function buildRobustConstants(s: Scenario): RobustConstants {
  return {
    base: buildCellConstants(s),
    perturbed: perturbedScenarios(s).map(buildCellConstants),
    weightSets: perturbedWeights(s),
  };
}

/**
 * Every metric of one cell into `m`, with its class's robustness (bands classRobust and
 * robustnessFlags): the kernel once per perturbed scenario into `work`, the weights by
 * reclassification.
 */
export function evaluateRobust(
  cell: CellInputs,
  rc: RobustConstants,
  x: KernelScratch,
  m: Float64Array,
  work: Float64Array,
): void {
  evaluateCellMetrics(cell, rc.base, x, m);
  // Excluded by a rule no heat-pump or weight setting touches (outside the data, rock within the pile,
  // no permafrost, thawed today): every perturbation leaves it excluded, so the class is robust as is.
  const ex = m[METRIC.exclusion];
  if (ex >= 1 && ex <= 4) {
    m[METRIC.robustnessFlags] = 0;
    m[METRIC.classRobust] = 1;
    return;
  }
  const perturbedClasses = [0, 0, 0, 0];
  // The perturbations touch only the heat pump (class-robustness.ts): the ground stage is shared.
  for (let i = 0; i < rc.perturbed.length; i++) {
    evaluateCellMetricsSameGround(cell, rc.perturbed[i], x, work, m);
    perturbedClasses[i] = work[METRIC.suitability];
  }
  const flags = robustnessFlags(
    m[METRIC.suitability],
    perturbedClasses,
    m,
    cell.textureClass,
    rc.base.scenario,
    rc.weightSets,
  );
  m[METRIC.robustnessFlags] = flags;
  m[METRIC.classRobust] = flags === 0 ? 1 : 0;
}

/** Build the per-cell model for a scenario (defaults filled in; throws TypeError naming bad fields). */
export function createScreeningModel(scenario: unknown = {}): ScreeningModel & { scenario: Scenario } {
  const s = parseScenario(scenario);
  const rc = buildRobustConstants(s);
  const scratch = createKernelScratch();
  const m = new Float64Array(METRIC_COUNT);
  const work = new Float64Array(METRIC_COUNT);
  const layers = cellLayers(s);
  return {
    scenario: s,
    layers,
    evaluate(cell: CellInputs, out: Float32Array): void {
      evaluateRobust(cell, rc, scratch, m, work);
      for (let i = 0; i < METRIC_COUNT; i++) out[i] = m[i];
    },
  };
}

/** The criteria for the manifest's `criteria` array (raw values in the named bands). */
export function manifestCriteria(scenario: unknown = {}): CriterionDefinition[] {
  return criteriaDefinitions(parseScenario(scenario));
}

const TEXTURE_BY_NAME = Object.fromEntries(Object.entries(TEXTURE_CODES).map(([c, n]) => [n, Number(c)]));
const optionalNumber = z
  .union([z.number(), z.nan()])
  .nullable()
  .optional()
  .transform((v) => (v === null || v === undefined ? NaN : v));

/** One cell's inputs as JSON (the `cell` command); optional grids may be omitted or null. */
export const cellInputSchema = z.strictObject({
  meanAirTemp_C: z.number().min(-60).max(40),
  airAmplitude_C: z.number().min(0).max(60),
  warming_C_per_yr: z.number().min(-1).max(1),
  textureClass: z.union([
    z.number().int().min(1).max(6),
    z.enum(['gravel', 'sand', 'silt', 'clay', 'peat', 'bedrock']).transform((n) => TEXTURE_BY_NAME[n]),
  ]),
  waterContent_m3m3: z.number().min(0).max(1),
  bedrockDepth_m: z.number().min(0).max(10000),
  groundTemp_C: optionalNumber.pipe(z.number().min(-40).max(30).or(z.nan())),
  geothermalFlux_W_m2: optionalNumber.pipe(z.number().min(0).max(1).or(z.nan())),
  nFreeze: optionalNumber.pipe(z.number().min(0.05).max(1.5).or(z.nan())),
  latitude_deg: optionalNumber.pipe(z.number().min(-90).max(90).or(z.nan())),
});
export type CellInputJson = z.input<typeof cellInputSchema>;

/** Validate one cell's JSON into CellInputs; throws TypeError listing `path: message` for every issue. */
export function parseCellInputs(input: unknown): CellInputs {
  const r = cellInputSchema.safeParse(input);
  if (!r.success) {
    const lines = formatZodIssues(r.error);
    throw new TypeError(`invalid cell inputs: ${lines.join('; ')}`);
  }
  return r.data;
}

export interface CriterionResult extends CriterionDefinition {
  /** Raw value read from band `bandId` (null when not applicable). */
  value: number | null;
  verdict: 'pass' | 'fail' | 'not evaluated';
  /** Soft criteria: score 0..1. */
  score?: number;
}

export interface CellScreening {
  caution: string;
  cautions: string[];
  scenario: string;
  suitability: { class: number; label: string; score: number | null };
  exclusion: { code: number; reason: string };
  permafrost: { today: string; endOfLife: string };
  bindingLimit: string;
  /** Whether the class survives the robustness changes, and which changes move it (class-robustness.ts). */
  robustness: { robust: boolean; changedBy: string };
  flags: { fuelIncrease: boolean; fluidLimitReached: boolean; overcoolingBinds: boolean; thawBinds: boolean };
  /**
   * Every layer's value with its unit (null = not applicable). Thaw years and durations past the
   * scenario's climate horizon also carry `qualifier` ("after 2100", "≥ 45 yr"; climate-horizon.ts).
   */
  metrics: Record<MetricId, { value: number | null; unit: string; title: string; qualifier?: string }>;
  criteria: CriterionResult[];
}

const nul = (v: number): number | null => (Number.isFinite(v) ? v : null);

/**
 * Screen one cell and explain it: every metric with its unit, the flags, and each criterion with its
 * raw value, threshold and verdict. `cell` is validated (JSON or CellInputs); `scenario` as in
 * createScreeningModel.
 */
export function screenCell(cell: unknown, scenario: unknown = {}): CellScreening {
  const inputs = parseCellInputs(cell);
  const s = parseScenario(scenario);
  const m = new Float64Array(METRIC_COUNT);
  // The same kernel as `evaluate`, in full (Float64) precision for the card.
  evaluateRobust(inputs, buildRobustConstants(s), createKernelScratch(), m, new Float64Array(METRIC_COUNT));
  const layers = cellLayers(s);
  const flag = m[METRIC.thawBeyondHorizon];
  const metrics = Object.fromEntries(
    METRIC_IDS.map((id, i) => {
      const entry = { value: nul(m[i]), unit: layers[i].unit, title: layers[i].title };
      const q = horizonText(layers[i].horizon, flag, `${+m[i].toPrecision(3)} ${layers[i].unit}`);
      return [id, q === null ? entry : { ...entry, qualifier: q }];
    }),
  ) as CellScreening['metrics'];
  const excl = m[METRIC.exclusion];
  const criteria = criteriaDefinitions(s).map((c): CriterionResult => {
    const v = m[METRIC[c.bandId as MetricId]];
    // Thaw-unstable check: no value means the ground is not ice-rich, which passes.
    if (Number.isNaN(v) && c.id === 'thawUnstable' && Number.isFinite(m[METRIC.excessIce])) {
      return { ...c, value: null, verdict: 'pass' };
    }
    if (Number.isNaN(v)) return { ...c, value: null, verdict: 'not evaluated' };
    const verdict = passes(v, c.comparison, c.threshold) ? 'pass' : 'fail';
    return c.kind === 'soft'
      ? { ...c, value: v, verdict, score: linearScore(v, c.good as number, c.poor as number) }
      : { ...c, value: v, verdict };
  });
  const binding = m[METRIC.bindingLimit];
  return {
    caution: SCREENING_CAUTION,
    cautions: [SCREENING_CAUTION, ...GROUND_CAUTIONS],
    scenario: s.name,
    suitability: {
      class: m[METRIC.suitability],
      label: SUITABILITY_LABELS[m[METRIC.suitability]],
      score: nul(m[METRIC.suitabilityScore]),
    },
    exclusion: { code: excl, reason: EXCLUSION_LABELS[excl] },
    permafrost: {
      today: PERMAFROST_CLASS_LABELS[m[METRIC.permafrostClassToday]] ?? 'not evaluated',
      endOfLife: PERMAFROST_CLASS_LABELS[m[METRIC.permafrostClassEnd]] ?? 'not evaluated',
    },
    bindingLimit: BINDING_LABELS[binding] ?? 'not evaluated',
    robustness: {
      robust: m[METRIC.classRobust] === 1,
      changedBy: robustnessText(m[METRIC.robustnessFlags]),
    },
    flags: {
      fuelIncrease: m[METRIC.fuelIncrease] === 1,
      fluidLimitReached: excl === 5,
      overcoolingBinds: binding === 3,
      thawBinds: binding === 1,
    },
    metrics,
    criteria,
  };
}
