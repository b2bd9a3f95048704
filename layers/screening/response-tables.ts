/**
 * Precomputed ground responses for the per-cell model (built once per scenario, style.md habit 1 kept:
 * the physics is the science core's; only its tabulation lives here).
 *
 * 1. Linear surface warming (Carslaw & Jaeger 1959 §2.5; reference-values §7): a surface temperature
 *    rising at b K/yr raises the ground at depth z after t years by
 *      W(z, t) = 4·b·t·i²erfc(z / (2√(αt))) = (4·b·z²/α)·F(τ),  F(τ) = τ·i²erfc(1/(2√τ)),  τ = αt/z².
 *    F is tabulated against τ (log-log, 40 points per decade, τ ∈ [1e-2, 1e7]; F(1e-2) ≈ 1e-15 so
 *    W = 0 below; above, F ≈ τ/4 − √τ/(2√π) + 1/8 (A&S 7.2.5 expansion at 0)). Its inverse τ(F) is tabulated
 *    too (F ∈ [1e-14, 2e6], by bisection on the forward table), so the time at which W reaches a given rise costs one lookup.
 *    Measured table error: < 2e-4 relative on F and τ (tests/unit/screening-response-tables.test.ts).
 * 2. Finite line source (Eskilson 1987; Zeng, Diao & Fang 2002; layers/physics/finite-line-source.ts):
 *    g = 2πkΔT/q' depends on time only through αt for a fixed geometry, so these are tabulated against
 *    αt ∈ [1e-3, 1e5] m²: the standard pile alone, mean over the pile at its radius (10 points per
 *    decade; kept for the calibration harness, which compares one pile with the simulator's one pile);
 *    the foundation group (foundation-group.ts), mean over all its piles at their radius
 *    (`pileFieldGFunction`, spatial superposition, 10 per decade); the group at the reference point,
 *    at the scenario's reference depth and radius (sum over the piles of the point response of
 *    layers/physics/finite-line-source-point.ts, 20 per decade). Measured error, default scenario, 60
 *    times from 10 days to 300 years: field 6.2e-4, reference point 2.4e-4 of the 30-year value
 *    (tests/reference/screening-response-tables.test.ts holds all tables within 1e-3). Build: about
 *    0.3 s for the default 16 piles beyond the ramp tables, some seconds for hundreds of piles.
 * 3. Infinite cylinder source at the pile wall (Carslaw & Jaeger 1959; Ingersoll et al. 1954;
 *    layers/physics/infinite-cylinder-source.ts, the exact integral, not the Bernier fit), as 2πG against
 *    Fo = αt/r_b² ∈ [1e-4, 1e6], 20 points per decade, for the short (6 h) pulse of the three-pulse
 *    method, as in layers/site/pile-sizing.ts.
 */
import { i2erfc } from '../physics/special-functions';
import { finiteLineSourceG, pileFieldGFunction } from '../physics/finite-line-source';
import { flsPointGUnchecked } from '../physics/finite-line-source-point';
import { cylinderSourceG } from '../physics/infinite-cylinder-source';
import { foundationGroup } from './foundation-group';
import { layoutPositions } from '../site/sizing-layout';
import { buildLogTable, lookup, lookupAt, tablePosition, type LogTable } from './log-table';
import type { Scenario } from './scenario';

const TAU_MIN = 1e-2;
const TAU_MAX = 1e7;
const F_MIN = 1e-14;
const F_MAX = 2e6;

/** F(τ) = τ·i²erfc(1/(2√τ)) (exact; used to build the tables and in tests). */
export function rampShape(tau: number): number {
  return tau * i2erfc(1 / (2 * Math.sqrt(tau)));
}

export interface ResponseTables {
  rampForward: LogTable;
  rampInverse: LogTable;
  /** FLS mean over the standard pile alone at its radius, vs αt (m²). */
  pileMean: LogTable;
  /** FLS field response of the foundation group, mean over its piles at their radius, vs αt (m²). */
  fieldMean: LogTable;
  /**
   * FLS field responses of larger near-square fields at the foundation spacing (the layout the site
   * sizing uses, layers/site/sizing-layout.ts), mean over their piles, vs αt (m²): for the pile count
   * when the building needs more piles than its foundation has. counts[0] is the foundation itself
   * (tables[0] = fieldMean); the others are those of 4, 9, 16, 36, 64, 144 and 256 piles above it
   * (and 2.25 and 4 times the foundation); all on one αt grid. logSteps[i] = ln(counts[i+1]/counts[i]).
   */
  fieldBySize: { counts: number[]; tables: LogTable[]; logSteps: Float64Array };
  /** FLS response of the whole group at the reference point (reference depth and radius), vs αt (m²). */
  referencePoint: LogTable;
  /** 2π × cylinder source G at the pile wall, vs Fo = αt/r_b². */
  cylinderWall: LogTable;
}

const cache = new Map<string, ResponseTables>();

/**
 * Build all tables for a scenario (about 0.2 s; cached per pile geometry and reference radius, so
 * models built for the same geometry share them).
 */
export function buildResponseTables(s: Scenario): ResponseTables {
  const key = [
    s.pile.length_m,
    s.pile.topDepth_m,
    s.pile.radius_m,
    s.referenceRadius_m,
    s.referenceDepth_m,
    s.building.foundationPiles,
    s.building.pileSpacing_m,
    s.building.pileColumns ?? 'auto',
  ].join('|');
  const hit = cache.get(key);
  if (hit) return hit;
  const built = build(s);
  if (cache.size > 16) cache.clear();
  cache.set(key, built);
  return built;
}

/** A log table from a function evaluated at all the table's abscissae at once (same grid as buildLogTable). */
function tabulateAll(
  f: (xs: number[]) => number[],
  range: { xMin: number; xMax: number; perDecade: number },
): LogTable {
  const log10Min = Math.log10(range.xMin);
  const n = Math.ceil((Math.log10(range.xMax) - log10Min) * range.perDecade) + 1;
  const xs = Array.from({ length: n }, (_, i) => Math.pow(10, log10Min + i / range.perDecade));
  const ys = new Map(f(xs).map((y, i) => [xs[i], y]));
  return buildLogTable((x) => ys.get(x) ?? NaN, range);
}

/** The inverse of the ramp shape F, by bisection in log τ on the forward table (F is increasing). */
function rampInverseTable(rampForward: LogTable): LogTable {
  const solveTau = (f: number): number => {
    let lo = Math.log(TAU_MIN);
    let hi = Math.log(TAU_MAX);
    for (let i = 0; i < 60 && hi - lo > 1e-9; i++) {
      const mid = 0.5 * (lo + hi);
      if (lookup(rampForward, Math.exp(mid)) < f) lo = mid;
      else hi = mid;
    }
    return Math.exp(0.5 * (lo + hi));
  };
  return buildLogTable(solveTau, { xMin: F_MIN, xMax: 2e6, perDecade: 40, logY: true });
}

/** Mean field responses of the foundation group and of the larger fields the sizing may need. */
function fieldTables(s: Scenario, group: ReturnType<typeof foundationGroup>) {
  const H = s.pile.length_m;
  const D = s.pile.topDepth_m;
  const field = { xMin: 1e-3, xMax: 1e5, perDecade: 10 };
  const fieldTable = (positions: { x_m: number; y_m: number }[]) =>
    tabulateAll(
      (xs) =>
        pileFieldGFunction({
          positions,
          pileRadius_m: s.pile.radius_m,
          length_m: H,
          buriedDepth_m: D,
          diffusivity_m2_s: 1,
          times_s: xs,
        }),
      field,
    );
  const fieldMean = fieldTable(group.positions);
  const nF = group.positions.length;
  // Field sizes above the foundation's: 4 to 256 piles (as many as the standard building needs in the
  // demo region), and 2.25× and 4× the foundation beyond that for large foundations.
  const larger = [...new Set([4, 9, 16, 36, 64, 144, 256, Math.round(2.25 * nF), 4 * nF])]
    .filter((c) => c > nF)
    .sort((a, b) => a - b);
  const counts = [nF, ...larger];
  const fieldBySize = {
    counts,
    logSteps: Float64Array.from(counts.slice(1), (c, i) => Math.log(c / counts[i])),
    tables: [
      fieldMean,
      ...larger.map((count) =>
        fieldTable(
          layoutPositions({
            count,
            layout: { spacing_m: s.building.pileSpacing_m },
            pileRadius_m: s.pile.radius_m,
          }),
        ),
      ),
    ],
  };
  return { fieldMean, fieldBySize };
}

function build(s: Scenario): ResponseTables {
  const geometry = {
    length_m: s.pile.length_m,
    buriedDepth_m: s.pile.topDepth_m,
    diffusivity_m2_s: 1,
  };
  const fls = { xMin: 1e-3, xMax: 1e5, perDecade: 10 };
  const point = { xMin: 1e-3, xMax: 1e5, perDecade: 20 };
  const group = foundationGroup(s);
  // Reference-point distances grouped to 1 µm (regular layouts repeat them).
  const refCounts = new Map<number, number>();
  for (const d of group.referenceDistances_m) {
    const key = Math.round(d * 1e6) / 1e6;
    refCounts.set(key, (refCounts.get(key) ?? 0) + 1);
  }
  const H = s.pile.length_m;
  const D = s.pile.topDepth_m;
  const zr = s.referenceDepth_m;
  const rampForward = buildLogTable(rampShape, { xMin: TAU_MIN, xMax: TAU_MAX, perDecade: 40, logY: true });
  const { fieldMean, fieldBySize } = fieldTables(s, group);
  return {
    rampForward,
    rampInverse: rampInverseTable(rampForward),
    pileMean: buildLogTable(
      (x) => finiteLineSourceG({ ...geometry, radius_m: s.pile.radius_m, time_s: x, point: 'mean' }),
      fls,
    ),
    fieldMean,
    fieldBySize,
    referencePoint: buildLogTable((x) => {
      let g = 0;
      for (const [d, c] of refCounts) g += c * flsPointGUnchecked(d, zr, H, D, x);
      return g;
    }, point),
    cylinderWall: buildLogTable((fo) => 2 * Math.PI * cylinderSourceG(fo), {
      xMin: 1e-4,
      xMax: 1e6,
      perDecade: 20,
    }),
  };
}

/**
 * Warming W (K) at depth z_m after t_yr years of a linear surface trend b (K/yr), diffusivity in m²/yr
 * (kernel: no checks). b ≤ 0 gives b·F-scaled cooling by linearity.
 */
export function rampWarming_K(
  tables: ResponseTables,
  depth_m: number,
  time_yr: number,
  rate_K_yr: number,
  diffusivity_m2_yr: number,
): number {
  if (!(time_yr > 0)) return 0;
  const z2 = depth_m * depth_m;
  if (z2 === 0) return rate_K_yr * time_yr;
  const tau = (diffusivity_m2_yr * time_yr) / z2;
  if (tau < TAU_MIN) return 0;
  const F =
    tau > TAU_MAX
      ? tau / 4 - Math.sqrt(tau) / (2 * Math.sqrt(Math.PI)) + 0.125
      : lookup(tables.rampForward, tau);
  return ((4 * rate_K_yr * z2) / diffusivity_m2_yr) * F;
}

/**
 * Years until the ramp warms depth z by `rise_K` (> 0) under trend b (> 0), diffusivity in m²/yr.
 * Returns Infinity when b ≤ 0 and 0 when rise ≤ 0 (kernel: no checks).
 */
export function rampTimeToRise_yr(
  tables: ResponseTables,
  depth_m: number,
  rise_K: number,
  rate_K_yr: number,
  diffusivity_m2_yr: number,
): number {
  if (!(rise_K > 0)) return 0;
  if (!(rate_K_yr > 0)) return Infinity;
  const z2 = depth_m * depth_m;
  if (z2 === 0) return rise_K / rate_K_yr;
  const F = (rise_K * diffusivity_m2_yr) / (4 * rate_K_yr * z2);
  let tau: number;
  if (F < F_MIN) tau = TAU_MIN;
  else if (F > F_MAX) {
    // invert F ≈ τ/4 − √τ/(2√π) + 1/8 for large τ: √τ = (1/√π) + √(1/π + 4F − 1/2)
    const s = 1 / Math.sqrt(Math.PI) + Math.sqrt(1 / Math.PI + 4 * F - 0.5);
    tau = s * s;
  } else tau = lookup(tables.rampInverse, F);
  return (tau * z2) / diffusivity_m2_yr;
}

/** FLS response g (dimensionless) from a table at αt = diffusivity·time (m²). */
export function flsResponse(table: LogTable, diffusivity_m2_s: number, time_s: number): number {
  return time_s > 0 ? lookup(table, diffusivity_m2_s * time_s) : 0;
}

/**
 * Field response of `count` piles (near-square field at the foundation spacing), mean over the piles,
 * at αt = x (m²): linear in ln(count) between the tabulated field sizes, extrapolated along the last
 * segment beyond the largest (the field g grows about as ln N there), the foundation's table below it.
 */
export function fieldResponseAtCount(t: ResponseTables, count: number, x: number): number {
  return fieldResponseAtPosition(t, count, tablePosition(t.fieldMean, x));
}

/**
 * fieldResponseAtCount at the grid position u = tablePosition(t.fieldMean, x) (the field tables share
 * one grid), for callers that look up several counts at the same αt.
 */
export function fieldResponseAtPosition(t: ResponseTables, count: number, u: number): number {
  const { counts, tables, logSteps } = t.fieldBySize;
  if (!(count > counts[0])) return lookupAt(tables[0], u);
  let i = 0;
  while (i < counts.length - 2 && count > counts[i + 1]) i++;
  const w = Math.log(count / counts[i]) / logSteps[i];
  const a = lookupAt(tables[i], u);
  return a + w * (lookupAt(tables[i + 1], u) - a);
}
