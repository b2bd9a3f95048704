/**
 * A small ensemble of site simulations (the site study's "ranges"): the site's uncertain inputs
 * perturbed over a seeded Latin hypercube (latin-hypercube.ts) with the same declared
 * distributions as the regional ensemble (uncertainty-schema.ts), so the map and the
 * study speak of the same uncertainty; the members are run by the caller (the page's Web Workers) and
 * summarised here as a fan of the probe temperature (P10/P50/P90 per output time, Hyndman & Fan
 * definition 7), the range of the thaw delay with the share of members thawed by each output time
 * (without and with the pile), and a ranking of the inputs that drive the spread by
 * squared standardised regression coefficients (ensemble-statistics.ts; first-order
 * Sobol indices of the best linear fit, with its R²).
 *
 * Perturbed inputs: mean air temperature and amplitude (offsets, the grids' spreads), warming trend
 * (factor, `warmingScale`), thawing and freezing n-factors (offsets), water + ice content of every
 * soil layer (one factor, the grid’s relative spread, capped at 0.95) and geothermal flux (factor).
 */
import type { SiteInput, SiteResult } from '../site/site-input-schema';
import { latinColumn, normalQuantile, sampleDistribution } from './latin-hypercube';
import { percentileOf, standardisedRegressionIndices } from './ensemble-statistics';
import type { Distribution, GridSpread, ScenarioUncertainty } from './uncertainty-schema';

export const SITE_ENSEMBLE_INPUTS = [
  { id: 'meanAirTemp', title: 'Mean air temperature' },
  { id: 'amplitude', title: 'Air temperature amplitude' },
  { id: 'warming', title: 'Warming trend' },
  { id: 'nThaw', title: 'Thawing n-factor' },
  { id: 'nFreeze', title: 'Freezing n-factor' },
  { id: 'waterContent', title: 'Water + ice content' },
  { id: 'geothermalFlux', title: 'Geothermal heat flux' },
] as const;

const clip = (v: number, lo: number, hi: number) => (v < lo ? lo : v > hi ? hi : v);

function spreadSd(g: GridSpread, value: number): number {
  return 'sd' in g ? g.sd : 'relativeSd' in g ? g.relativeSd * Math.abs(value) : 0;
}

function gridValue(g: GridSpread, value: number, u: number): number {
  const sd = spreadSd(g, value);
  return sd > 0 ? value + sd * normalQuantile(u) : value;
}

function factor(g: GridSpread, u: number): number {
  return 'relativeSd' in g && g.relativeSd > 0 ? 1 + g.relativeSd * normalQuantile(u) : 1;
}

export interface SiteEnsemblePlan {
  members: SiteInput[];
  /** members × inputs (SITE_ENSEMBLE_INPUTS order), the value each member took (offsets or factors). */
  design: Float64Array;
}

/** Longest time step of an ensemble member, d (the site's own step if it is longer). */
export const ENSEMBLE_MEMBER_STEP_DAYS = 7;

/**
 * The members' inputs: `count` perturbations of `input` (validated SiteInput) from `seed`. The members
 * run at `fidelity` (coarse by default: the study's ensemble is a ranking, not a design) and with steps
 * of at least ENSEMBLE_MEMBER_STEP_DAYS: the refinement study (docs/site-convergence.md) puts the 7-day
 * step's thaw year 0.6–0.9 yr late against the converged one, a bias every member shares, so the
 * spread the ensemble reports moves far less than the centre; the deterministic run keeps the
 * site's own step.
 */
export function planSiteEnsemble(
  input: SiteInput,
  u: ScenarioUncertainty,
  count: number,
  seed: number,
  fidelity: 'coarse' | 'standard' = 'coarse',
): SiteEnsemblePlan {
  if (!(Number.isInteger(count) && count >= 2 && count <= 256))
    throw new RangeError(`members: expected an integer in [2, 256]; received ${count}`);
  const k = SITE_ENSEMBLE_INPUTS.length;
  const cols = SITE_ENSEMBLE_INPUTS.map((_, d) => {
    const c = new Float64Array(count);
    latinColumn(seed, 200 + d, c, new Int32Array(count));
    return c;
  });
  const design = new Float64Array(count * k);
  const members: SiteInput[] = [];
  const p = u.parameters;
  const g = u.grids;
  const offset = (d: Distribution, x: number) => sampleDistribution(d, x, 0);
  for (let j = 0; j < count; j++) {
    const c = input.climate;
    const v = [
      gridValue(g.meanAirTemp_C, c.meanAirTemp_C, cols[0][j]) - c.meanAirTemp_C,
      gridValue(g.airAmplitude_C, c.amplitude_C, cols[1][j]) - c.amplitude_C,
      sampleDistribution(p.warmingScale, cols[2][j], 1),
      offset(p.nThaw, cols[3][j]),
      offset(p.nFreeze, cols[4][j]),
      factor(g.waterContent_m3m3, cols[5][j]),
      factor(g.geothermalFlux_W_m2, cols[6][j]),
    ];
    for (let d = 0; d < k; d++) design[j * k + d] = v[d];
    members.push({
      ...input,
      climate: {
        ...c,
        meanAirTemp_C: clip(c.meanAirTemp_C + v[0], -40, 20),
        amplitude_C: clip(c.amplitude_C + v[1], 0, 40),
        warming_C_per_yr: clip(c.warming_C_per_yr * v[2], -0.5, 0.5),
        nThaw: clip(c.nThaw + v[3], 0.05, 3),
        nFreeze: clip(c.nFreeze + v[4], 0.05, 3),
      },
      ground: {
        ...input.ground,
        geothermalFlux_W_m2: clip(input.ground.geothermalFlux_W_m2 * Math.max(0, v[6]), 0, 1),
        layers: input.ground.layers.map((l) =>
          'soil' in l && l.soil
            ? {
                ...l,
                soil: {
                  ...l.soil,
                  waterContent_m3m3: Math.min(0.95, l.soil.waterContent_m3m3 * Math.max(0, v[5])),
                },
              }
            : l,
        ),
      },
      timeStep_days: Math.min(
        input.outputStep_days,
        Math.max(input.timeStep_days, ENSEMBLE_MEMBER_STEP_DAYS),
      ),
      numerics: { ...input.numerics, fidelity },
    } as SiteInput);
  }
  return { members, design };
}

export interface SiteEnsembleSummary {
  members: number;
  /** Output times of the first probe, yr. */
  time_yr: number[];
  /** With the pile (or without, when the site has none): P10/P50/P90 of the first probe's temperature. */
  probeP10_C: number[];
  probeP50_C: number[];
  probeP90_C: number[];
  /** Thaw delay at the first probe: percentiles over the members where it is defined, and how many. */
  thawDelay: { p10: number; p50: number; p90: number; defined: number };
  /**
   * Share of the members (0–1) in which the first probe has thawed by each output time (time_yr):
   * thawYear ≤ t, the thaw years the thaw delay is taken from (simulate-site.ts), so a member that
   * never thaws within the run stays unthawed; without the pile and with it (null when the site has
   * none), with how many members thaw within the run in each case.
   */
  thawShare: {
    noPile: number[];
    withPile: number[] | null;
    thawedNoPile: number;
    thawedWithPile: number | null;
  };
  /** First-order indices of the end-of-run probe temperature, per input, with the fit's R². */
  sensitivity: { id: string; title: string; index: number }[];
  rSquared: number;
}

/** Share of `thawYears` (null: never within the run) at or before each of `time_yr`. */
function shareThawedBy(thawYears: (number | null)[], time_yr: number[]): number[] {
  const n = thawYears.length;
  return time_yr.map((t) => thawYears.filter((y) => y !== null && y <= t).length / n);
}

/** The members' thaw timing at the first probe (SiteEnsembleSummary.thawShare) at `time_yr`. */
export function thawShareOf(results: SiteResult[], time_yr: number[]): SiteEnsembleSummary['thawShare'] {
  const a = results.map((r) => r.noPile.probes[0]?.thawYear ?? null);
  const hasPile = results.every((r) => r.withPile !== null);
  const b = hasPile ? results.map((r) => r.withPile?.probes[0]?.thawYear ?? null) : null;
  const thawed = (ys: (number | null)[]) => ys.filter((y) => y !== null).length;
  return {
    noPile: shareThawedBy(a, time_yr),
    withPile: b ? shareThawedBy(b, time_yr) : null,
    thawedNoPile: thawed(a),
    thawedWithPile: b ? thawed(b) : null,
  };
}

/** Summarise the members' results (same order as the plan's members). */
export function summariseSiteEnsemble(plan: SiteEnsemblePlan, results: SiteResult[]): SiteEnsembleSummary {
  const n = results.length;
  if (n !== plan.members.length)
    throw new RangeError(`results: expected ${plan.members.length}; received ${n}`);
  const probe = (r: SiteResult) => (r.withPile ?? r.noPile).probes[0];
  const time = (results[0].withPile ?? results[0].noPile).time_yr;
  const steps = Math.min(...results.map((r) => probe(r).T_C.length));
  const col = new Float64Array(n);
  const scratch = new Float64Array(n);
  const p10: number[] = [];
  const p50: number[] = [];
  const p90: number[] = [];
  for (let t = 0; t < steps; t++) {
    for (let j = 0; j < n; j++) col[j] = probe(results[j]).T_C[t];
    p10.push(percentileOf(col, n, 0.1, scratch));
    p50.push(percentileOf(col, n, 0.5, scratch));
    p90.push(percentileOf(col, n, 0.9, scratch));
  }
  const delays = results.map((r) => r.thawDelay_yr[0] ?? NaN);
  const defined = delays.filter((d) => Number.isFinite(d)).length;
  const y = results.map((r) => {
    const T = probe(r).T_C;
    return T[T.length - 1];
  });
  const k = SITE_ENSEMBLE_INPUTS.length;
  const fit = standardisedRegressionIndices(plan.design, y, n, k);
  const time_yr = time.slice(0, steps);
  return {
    members: n,
    time_yr,
    probeP10_C: p10,
    probeP50_C: p50,
    probeP90_C: p90,
    thawDelay: {
      p10: percentileOf(delays, n, 0.1, scratch),
      p50: percentileOf(delays, n, 0.5, scratch),
      p90: percentileOf(delays, n, 0.9, scratch),
      defined,
    },
    thawShare: thawShareOf(results, time_yr),
    sensitivity: SITE_ENSEMBLE_INPUTS.map((x, i) => ({
      id: x.id,
      title: x.title,
      index: fit.indices[i],
    })).sort((a, b) => b.index - a.index),
    rSquared: fit.rSquared,
  };
}
