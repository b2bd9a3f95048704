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
 *    g = 2πkΔT/q' depends on time only through αt for a fixed geometry, so the standard pile's
 *    mean-over-the-pile response at its radius and its mid-depth response at the reference radius are
 *    tabulated against αt ∈ [1e-3, 1e5] m² (10 points per decade; measured error < 1e-3 of the
 *    30-year value at any time).
 */
import { i2erfc } from '../physics/special-functions';
import { finiteLineSourceG } from '../physics/finite-line-source';
import { buildLogTable, lookup, type LogTable } from './log-table';
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
  /** FLS mean over the standard pile at its radius, vs αt (m²). */
  pileMean: LogTable;
  /** FLS at the pile's mid-depth and the reference radius, vs αt (m²). */
  referencePoint: LogTable;
}

const cache = new Map<string, ResponseTables>();

/**
 * Build all tables for a scenario (about 0.2 s; cached per pile geometry and reference radius, so
 * models built for the same geometry share them).
 */
export function buildResponseTables(s: Scenario): ResponseTables {
  const key = [s.pile.length_m, s.pile.topDepth_m, s.pile.radius_m, s.referenceRadius_m].join('|');
  const hit = cache.get(key);
  if (hit) return hit;
  const built = build(s);
  if (cache.size > 16) cache.clear();
  cache.set(key, built);
  return built;
}

function build(s: Scenario): ResponseTables {
  const geometry = {
    length_m: s.pile.length_m,
    buriedDepth_m: s.pile.topDepth_m,
    diffusivity_m2_s: 1,
  };
  const fls = { xMin: 1e-3, xMax: 1e5, perDecade: 10 };
  const rampForward = buildLogTable(rampShape, { xMin: TAU_MIN, xMax: TAU_MAX, perDecade: 40, logY: true });
  // Inverse by bisection in log τ on the forward table (F is increasing).
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
  return {
    rampForward,
    rampInverse: buildLogTable(solveTau, { xMin: F_MIN, xMax: 2e6, perDecade: 40, logY: true }),
    pileMean: buildLogTable(
      (x) => finiteLineSourceG({ ...geometry, radius_m: s.pile.radius_m, time_s: x, point: 'mean' }),
      fls,
    ),
    referencePoint: buildLogTable(
      (x) => finiteLineSourceG({ ...geometry, radius_m: s.referenceRadius_m, time_s: x, point: 'midDepth' }),
      fls,
    ),
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
