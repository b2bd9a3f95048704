/**
 * The per-cell ensemble: the corrected per-cell model (cell-kernel.ts) run N times per cell over a
 * seeded Latin hypercube of the declared uncertainties (uncertainty-schema.ts, latin-hypercube.ts),
 * reported as ranges, a probability of success and a robust class.
 *
 * Design. Scenario parameters (n-factors, COP scale, lowest entering fluid, conductivity factor,
 * warming factor, design-load factor) are regional: member j takes the j-th row of one hypercube over
 * them for every cell, so N sets of per-scenario constants are built once (the response tables depend
 * only on the pile geometry, which is not perturbed, and are shared). Grid spreads are local: each cell
 * draws its own hypercube columns from the hash stream of (seed, cell index). Pairing a fixed column of
 * scenario values with per-cell permuted columns keeps every cell's sample a Latin hypercube. Grid
 * values are normal around the cell's value (sd or relativeSd·|value|), clipped to the kernel's valid
 * input range; a class is replaced, with the declared confusion probability, by another class drawn
 * uniformly.
 *
 * Outputs, after the deterministic model's layers (unchanged, so zero spread reproduces the
 * deterministic build exactly): P10/P50/P90 (ensemble-statistics.ts, Hyndman & Fan definition 7) of
 * piles per ton, thaw delay, end-of-life ground temperature at the reference depth (the adfreeze
 * zone), fuel saved and simple payback, over the members where the value is defined (NaN when fewer than half are);
 * the probability of success, the share of members in which the cell is not excluded, the foundation
 * piles carry at least `successLoadShare` of the standard building's heat and the carried extraction
 * is at least the operating window's lower bound (the reference point stays `frozenMargin_K` below
 * 0 °C through the design life, operating-window.ts); the robust class, the suitability class of the
 * kernel (suitability.ts) that at least `robustShare` of the members agree on, else "uncertain"; and
 * the share of members agreeing on the most common class.
 */
import {
  emptyCellInputs,
  type CellInputs,
  type ScreeningLayer,
  type ScreeningModel,
} from './screening-model';
import { parseScenario, type Scenario } from './scenario';
import { buildCellConstants, type CellConstants, type SoilTable } from './cell-constants';
import { createKernelScratch, evaluateCellMetrics } from './cell-kernel';
import { buildRobustConstants, evaluateRobust } from './cell-screening-model';
import { cellLayers, METRIC, METRIC_COUNT, type MetricId } from './cell-layers';
import { SUITABILITY_LABELS } from './suitability';
import { BINDING } from './operating-window';
import {
  scenarioUncertaintySchema,
  SPREAD_ROLES,
  UNCERTAIN_PARAMETERS,
  type GridSpread,
  type ScenarioUncertainty,
  type SpreadRole,
  type UncertainParameter,
} from './uncertainty-schema';
import { fmix32, hashUniform, latinColumn, normalQuantile, sampleDistribution } from './latin-hypercube';
import { modalClass, percentileIsLowerBound, percentileOf } from './ensemble-statistics';
import { rangeBoundFlags, RANGE_BOUND_LABELS, THAW_HORIZON } from './climate-horizon';
import { BAND, type EnsembleBandId } from './band-ids';
import { BAND_REGISTRY, UNCERTAIN_CLASS_VALUE } from './band-registry';

/** Metrics reported as P10/P50/P90 bands (band id = metric id + P10/P50/P90). */
export const RANGE_METRICS = [
  BAND.pilesPerTon,
  BAND.thawDelay,
  BAND.groundTempEnd,
  BAND.fuelSaved,
  BAND.simplePayback,
] as const;
export const PERCENTILES = [
  ['P10', 0.1],
  ['P50', 0.5],
  ['P90', 0.9],
] as const;
/** Robust-class value for "uncertain" (after the suitability classes 0-3; band-registry.ts). */
export const UNCERTAIN_CLASS = UNCERTAIN_CLASS_VALUE;

/** Valid input range of the kernel per CellInputs field (cell-kernel.ts validInputs). */
const INPUT_RANGE: Record<SpreadRole, [number, number]> = {
  meanAirTemp_C: [-60, 40],
  airAmplitude_C: [0, 60],
  warming_C_per_yr: [-1, 1],
  textureClass: [1, 6],
  waterContent_m3m3: [0, 1],
  bedrockDepth_m: [0, 10000],
  groundTemp_C: [-40, 30],
  geothermalFlux_W_m2: [0, 1],
  nFreeze: [0.05, 1.5],
};
const TEXTURE_CLASSES = 6;
const clip = (v: number, lo: number, hi: number) => (v < lo ? lo : v > hi ? hi : v);

export interface EnsembleOptions {
  /** Scenario JSON; its `uncertainty` (defaults filled when absent) sets the ensemble. */
  scenario?: unknown;
  /** Spreads declared by the inputs config, per grid role; they replace the scenario's defaults. */
  gridSpreads?: Partial<Record<SpreadRole, GridSpread>>;
  /**
   * Roles whose spread comes per cell from a companion grid (`cellSd` of `evaluate`): the standard
   * deviation, or for the texture class the confusion probability; where the cell's value is NaN the
   * role's declared spread applies.
   */
  gridSdRoles?: readonly SpreadRole[];
}

export interface EnsembleModel extends ScreeningModel {
  scenario: Scenario;
  /** The effective uncertainty: the scenario's, with the inputs config's grid spreads applied. */
  uncertainty: ScenarioUncertainty;
  /** Roles with a per-cell standard-deviation grid (recorded in the manifest beside the spreads). */
  gridSdRoles: SpreadRole[];
  /**
   * Evaluate one cell; `cellIndex` (its index on the analysis grid) seeds its own hypercube columns;
   * `cellSd` (indexed as SPREAD_ROLES) holds its spreads from companion grids (standard deviations;
   * for the texture class its confusion probability).
   */
  evaluate(cell: CellInputs, out: Float32Array, cellIndex?: number, cellSd?: Float64Array): void;
}

function scaledSoil(t: SoilTable, f: number): SoilTable {
  return { ...t, kFrozen: t.kFrozen.map((v) => v * f), kThawed: t.kThawed.map((v) => v * f) };
}

/** Member constants for one row of scenario-parameter values (offsets and factors). */
function memberConstants(base: Scenario, v: Record<UncertainParameter, number>): CellConstants {
  const s: Scenario = {
    ...base,
    uncertainty: undefined,
    ground: {
      ...base.ground,
      nThaw: clip(base.ground.nThaw + v.nThaw, 0.1, 2.5),
      nFreeze: clip(base.ground.nFreeze + v.nFreeze, 0.05, 1.5),
    },
    heatPump: {
      ...base.heatPump,
      minEnteringFluid_C: clip(base.heatPump.minEnteringFluid_C + v.minEnteringFluid_C, -20, 5),
    },
    building: {
      ...base.building,
      heatLossCoefficient_W_K: base.building.heatLossCoefficient_W_K * Math.max(0.1, v.designLoadScale),
    },
  };
  const k = buildCellConstants(s);
  const kf = Math.max(0.2, v.conductivityScale);
  const cs = Math.max(0.3, v.copScale);
  return {
    ...k,
    soil: k.soil.map((t) => (t ? scaledSoil(t, kf) : t)),
    // The curve is linear between its knots, so scaling the table scales the curve exactly; COP ≥ 1.01.
    cop: k.cop.map((c) => Math.max(1.01, c * cs)),
  };
}

/** The ensemble's extra layers (after the deterministic model's layers). */
export function ensembleLayers(base: ScreeningLayer[], u: ScenarioUncertainty): ScreeningLayer[] {
  const byId = new Map(base.map((l) => [l.id, l]));
  const out: ScreeningLayer[] = [];
  const n = u.members;
  for (const id of RANGE_METRICS) {
    const b = byId.get(id) as ScreeningLayer;
    for (const [p, q] of PERCENTILES) {
      const bandId = `${id}${p}` as EnsembleBandId;
      out.push({
        id: bandId,
        title: BAND_REGISTRY[bandId].title,
        unit: b.unit,
        kind: 'continuous',
        ramp: b.ramp,
        legendMin: b.legendMin,
        legendMax: b.legendMax,
        description:
          `${p}: ${Math.round(q * 100)} % of the ${n} ensemble members give less than this. ` +
          `Over the members where the value is defined (none when fewer than half are). ${b.description}`,
        source: `ensemble of the per-cell model (Latin hypercube, seed ${u.seed}); ${b.source}`,
        ...(id === BAND.thawDelay ? thawDelayPercentileTexts(b, p) : {}),
      });
    }
  }
  out.push({
    id: BAND.successProbability,
    title: BAND_REGISTRY.successProbability.title,
    unit: '',
    kind: 'continuous',
    ramp: 'viridis',
    legendMin: 0,
    legendMax: 1,
    description:
      `Share of the ${n} members in which the site is not excluded, the foundation piles carry at least ` +
      `${Math.round(u.successLoadShare * 100)} % of the standard building's heat and the foundation ground ` +
      'stays frozen with the margin through the design life (carried extraction ≥ the window’s lower bound).',
    source: 'ensemble of the per-cell model (cell-ensemble-model.ts)',
  });
  out.push({
    id: BAND.robustClass,
    title: BAND_REGISTRY.robustClass.title,
    unit: '',
    kind: 'class',
    classes: [
      ...Object.entries(SUITABILITY_LABELS).map(([value, label]) => ({ value: Number(value), label })),
      {
        value: UNCERTAIN_CLASS,
        label: 'uncertain',
        description: `Fewer than ${Math.round(u.robustShare * 100)} % of the members agree on one class.`,
      },
    ],
    description:
      `The suitability class at least ${Math.round(u.robustShare * 100)} % of the ${n} members agree on; ` +
      '"uncertain" where none does.',
    source: 'ensemble of the per-cell model (cell-ensemble-model.ts)',
  });
  out.push({
    id: BAND.classAgreement,
    title: BAND_REGISTRY.classAgreement.title,
    unit: '',
    kind: 'continuous',
    ramp: 'cividis',
    legendMin: 0,
    legendMax: 1,
    description: 'Share of the members that give the most common suitability class.',
    source: 'ensemble of the per-cell model (cell-ensemble-model.ts)',
  });
  out.push(rangeBoundLayer(byId.get(BAND.thawDelay)?.horizon?.year));
  return out;
}

/**
 * A thaw-delay percentile past the climate horizon is a lower bound: the horizon qualifier that makes
 * every reader show it as "≥ value" (climate-horizon.ts, flag band thawDelayRangeBound).
 */
function thawDelayPercentileTexts(b: ScreeningLayer, p: 'P10' | 'P50' | 'P90'): Partial<ScreeningLayer> {
  const year = b.horizon?.year;
  if (year === undefined) return {};
  return {
    description:
      `${p} of the thaw delay over the members in which the ground at the reference depth thaws before ` +
      `${year} (the scenario's climate horizon). A member whose thaw with piles comes after ${year} counts ` +
      `with its delay up to ${year}, a lower bound; where that reaches the percentile it reads "≥ value" ` +
      '(thawDelayRangeBound).',
    horizon: {
      year,
      flagBand: BAND.thawDelayRangeBound,
      after: [],
      atLeast: rangeBoundFlags(p),
      undetermined: [],
    },
  };
}

/** The class band saying which thaw-delay percentiles are lower bounds (climate-horizon.ts). */
function rangeBoundLayer(year: number | undefined): ScreeningLayer {
  const horizon = year === undefined ? "the scenario's climate horizon" : String(year);
  return {
    id: BAND.thawDelayRangeBound,
    title: BAND_REGISTRY.thawDelayRangeBound.title,
    unit: '',
    kind: 'class',
    classes: Object.entries(RANGE_BOUND_LABELS).map(([value, label]) => ({ value: Number(value), label })),
    description:
      `How many of the thaw delay's P10, P50 and P90 are lower bounds, counted from P90 down: in some ` +
      `members the ground around the piles thaws only after ${horizon}, beyond which the scenario has no ` +
      'climate, so their delay is known only to be at least its value up to then.',
    source: 'ensemble of the per-cell model (cell-ensemble-model.ts; climate-horizon.ts)',
  };
}

/**
 * The members' scenario constants from the scenario-parameter hypercube, shared by all cells (column p
 * from hash stream p of the seed), and each member's warming factor.
 */
function memberSet(
  s: Scenario,
  u: ScenarioUncertainty,
): { members: CellConstants[]; warmingFactor: Float64Array } {
  const n = u.members;
  const col = new Float64Array(n);
  const perm = new Int32Array(n);
  const paramValues = new Float64Array(n * UNCERTAIN_PARAMETERS.length);
  UNCERTAIN_PARAMETERS.forEach((p, pi) => {
    latinColumn(u.seed, pi, col, perm);
    const centre = p.endsWith('Scale') ? 1 : 0;
    for (let j = 0; j < n; j++)
      paramValues[j * UNCERTAIN_PARAMETERS.length + pi] = sampleDistribution(u.parameters[p], col[j], centre);
  });
  const members: CellConstants[] = [];
  const warmingFactor = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const v = Object.fromEntries(
      UNCERTAIN_PARAMETERS.map((p, pi) => [p, paramValues[j * UNCERTAIN_PARAMETERS.length + pi]]),
    ) as Record<UncertainParameter, number>;
    members.push(memberConstants(s, v));
    warmingFactor[j] = v.warmingScale;
  }

  return { members, warmingFactor };
}

/**
 * Member j's draw of the gridded inputs with a spread into `memberRecord` (already a copy of the cell):
 * a normal draw clipped to the input range, or for texture another class with the confusion probability.
 * `sdOfRole[d]` is the cell's own spread from a companion grid (NaN: none): a standard deviation, or
 * for texture the confusion probability.
 */
function drawMemberInputs(
  memberRecord: Record<string, number>,
  cellRecord: Record<string, number>,
  spreadRoles: readonly SpreadRole[],
  u: ScenarioUncertainty,
  cellCols: Float64Array[],
  cellSeed: number,
  j: number,
  sdOfRole: Float64Array,
): void {
  for (let d = 0; d < spreadRoles.length; d++) {
    const r = spreadRoles[d];
    const v = cellRecord[r];
    if (v !== v) continue; // optional grid absent: the scenario default (and its distribution) applies
    const cellSpread = sdOfRole[d];
    const uj = cellCols[d][j];
    if (cellSpread === cellSpread && r !== BAND.textureClass) {
      // The cell's own standard deviation (companion grid).
      const [lo, hi] = INPUT_RANGE[r];
      memberRecord[r] = clip(v + cellSpread * normalQuantile(uj), lo, hi);
      continue;
    }
    const g = u.grids[r];
    if (r === BAND.textureClass) {
      // The confusion: the cell's own (companion grid) where it has one, else the declared one.
      const confusion = cellSpread === cellSpread ? cellSpread : 'confusion' in g ? g.confusion : 0;
      if (uj < confusion) {
        // Another class, each equally likely (a second hash draw).
        const other = 1 + Math.floor(hashUniform(cellSeed, 64 + d, j) * (TEXTURE_CLASSES - 1));
        memberRecord[r] = other >= v ? other + 1 : other;
      }
    } else {
      const sd = 'sd' in g ? g.sd : 'relativeSd' in g ? g.relativeSd * Math.abs(v) : 0;
      const [lo, hi] = INPUT_RANGE[r];
      memberRecord[r] = clip(v + sd * normalQuantile(uj), lo, hi);
    }
  }
}

/**
 * How many of the thaw delay's P10/P50/P90 are lower bounds, counted from P90 down (climate-horizon.ts);
 * NaN where the percentiles are not defined (`p10` NaN).
 */
function boundedPercentiles(
  delays: Float64Array,
  bound: Uint8Array,
  n: number,
  sorted: Float64Array,
  p10: number,
): number {
  if (p10 !== p10) return NaN;
  let count = 0;
  for (const [, p] of PERCENTILES) if (percentileIsLowerBound(delays, bound, n, p, sorted)) count++;
  return count;
}

/** Build the ensemble model (scenario validated; throws TypeError naming bad fields). */
export function createEnsembleModel(options: EnsembleOptions = {}): EnsembleModel {
  const s = parseScenario(options.scenario ?? {});
  const parsed = scenarioUncertaintySchema.parse(s.uncertainty ?? {});
  const u: ScenarioUncertainty = { ...parsed, grids: { ...parsed.grids, ...options.gridSpreads } };
  const n = u.members;
  // The deterministic model's own evaluation (with its class-robustness bands), so that the model bands
  // are the deterministic build's bit for bit.
  const baseRc = buildRobustConstants({ ...s, uncertainty: undefined });
  const baseWork = new Float64Array(METRIC_COUNT);
  const baseLayers = cellLayers(s);
  const layers = [...baseLayers, ...ensembleLayers(baseLayers, u)];
  const nBase = METRIC_COUNT;

  const { members, warmingFactor } = memberSet(s, u);
  const perm = new Int32Array(n);

  // Grid dimensions with a declared spread, then those with a standard-deviation grid (appended, so
  // that a grid of zeros leaves every other dimension's draws as they are without it).
  const sdRoles = SPREAD_ROLES.filter((r) => options.gridSdRoles?.includes(r));
  const spreadRoles = [
    ...SPREAD_ROLES.filter((r) => {
      if (sdRoles.includes(r)) return false;
      const g = u.grids[r];
      return 'sd' in g ? g.sd > 0 : 'relativeSd' in g ? g.relativeSd > 0 : g.confusion > 0;
    }),
    ...sdRoles,
  ];
  const roleIndex = spreadRoles.map((r) => SPREAD_ROLES.indexOf(r));
  const sdOfRole = new Float64Array(spreadRoles.length).fill(NaN);
  const scratch = createKernelScratch();
  const m = new Float64Array(METRIC_COUNT);
  const baseOut = new Float64Array(METRIC_COUNT);
  const ranges = RANGE_METRICS.map(() => new Float64Array(n));
  const rangeIdx = RANGE_METRICS.map((id) => METRIC[id as MetricId]);
  const classes = new Float64Array(n);
  const delayQ = RANGE_METRICS.indexOf(BAND.thawDelay);
  const delayBound = new Uint8Array(n);
  const sorted = new Float64Array(n);
  const counts = new Int32Array(4);
  const cellCols = spreadRoles.map(() => new Float64Array(n));
  const memberCell: CellInputs = emptyCellInputs();
  const memberRecord = memberCell as unknown as Record<string, number>;

  const evaluate = (cell: CellInputs, out: Float32Array, cellIndex = 0, cellSd?: Float64Array): void => {
    for (let d = 0; d < spreadRoles.length; d++) sdOfRole[d] = cellSd ? cellSd[roleIndex[d]] : NaN;
    evaluateRobust(cell, baseRc, scratch, baseOut, baseWork);
    for (let i = 0; i < nBase; i++) out[i] = baseOut[i];
    const cellSeed = fmix32((u.seed + Math.imul(cellIndex + 1, 0x9e3779b1)) >>> 0);
    for (let d = 0; d < spreadRoles.length; d++) latinColumn(cellSeed, d, cellCols[d], perm);
    const cellRecord = cell as unknown as Record<string, number>;
    let successes = 0;
    for (let j = 0; j < n; j++) {
      Object.assign(memberCell, cell);
      // Not clipped: a member outside the kernel's range is reported as outside the data, like the cell itself.
      memberCell.warming_C_per_yr = cell.warming_C_per_yr * warmingFactor[j];
      drawMemberInputs(memberRecord, cellRecord, spreadRoles, u, cellCols, cellSeed, j, sdOfRole);
      evaluateCellMetrics(memberCell, members[j], scratch, m);
      for (let q = 0; q < rangeIdx.length; q++) ranges[q][j] = m[rangeIdx[q]];
      // The delay up to the horizon of a member whose thaw with piles comes later is a lower bound.
      delayBound[j] = m[METRIC.thawBeyondHorizon] === THAW_HORIZON.pilesAfter ? 1 : 0;
      classes[j] = m[METRIC.suitability];
      if (
        m[METRIC.exclusion] === 0 &&
        m[METRIC.loadShare] >= u.successLoadShare &&
        m[METRIC.bindingLimit] !== BINDING.thaw
      )
        successes++;
    }
    let o = nBase;
    const minFinite = Math.ceil(n / 2);
    for (let q = 0; q < rangeIdx.length; q++)
      for (const [, p] of PERCENTILES) out[o++] = percentileOf(ranges[q], n, p, sorted, minFinite);
    out[o++] = successes / n;
    const mode = modalClass(classes, n, counts);
    out[o++] = mode.share >= u.robustShare ? mode.value : UNCERTAIN_CLASS;
    out[o++] = mode.share;
    out[o++] = boundedPercentiles(ranges[delayQ], delayBound, n, sorted, out[nBase + 3 * delayQ]);
  };

  return {
    scenario: s,
    uncertainty: u,
    gridSdRoles: sdRoles,
    layers,
    evaluate,
  };
}
