/**
 * The surface-warming history of one cell for the per-cell model: a linear trend (one ramp from the
 * start year) or a piecewise-linear pathway (warming-pathway.ts), and the responses the kernel needs
 * from it. Allocation-free; one history per thread, refilled per cell.
 *
 * Method.
 * - Surface levels: the air offset of the pathway at each knot through the n-factor transfer shared
 *   with the site simulator, S_j = T̄s(T̄ + a_j) − T̄s(T̄) (surface-forcing.ts, surfaceMeanWarming_K),
 *   linear between knots (exact at the knots; the transfer is smooth, so the error between knots is
 *   second order in the offset change), held after the last knot.
 * - Warming at depth: superposition of one Carslaw & Jaeger (1959, §2.5) ramp per change of slope,
 *     W(z, t) = Σ_j (s_j − s_{j−1})·R(z, t − t_j),   R(z, t) = 4·t·i²erfc(z/(2√(αt))) per K/yr,
 *   (linearity of the heat equation; Duhamel's theorem, C&J §1.14), R from the tabulated ramp
 *   (response-tables.ts). Checked against a direct numerical Duhamel convolution of the erfc step
 *   response (tests/unit/surface-warming-history.test.ts).
 * - Time to a rise: the first time W reaches the rise, by a scan in steps of ≥ 1 yr up to a limit then
 *   regula falsi to 0.01 yr; Infinity when the rise exceeds the largest surface level (maximum
 *   principle: the ground never warms more than its surface has) or is not reached by the limit.
 * - Latent-heat delay: the quasi-steady Stefan front of layers/physics/years-to-thaw.ts,
 *   X·dX/dt = k_t·E(t)/L with E(t) = S(t) − S(t0) the surface's rise since the conduction wave
 *   brought depth z to 0 °C at t0, reaches z when ∫_{t0}^{t0+τ} E dt = z²·L/(2·k_t); solved exactly
 *   on the piecewise-linear S (a quadratic per segment). For a linear trend b this is τ = z·√(L/(k_t·b)),
 *   the years-to-thaw.ts delay.
 * - Surface gain: the time after `from` at which S has risen by a further `gain` (the c/b lengthening
 *   of the thaw with piles in cell-kernel.ts; c/b for a linear trend).
 * The linear case keeps the closed forms of response-tables.ts, so a scenario without a pathway
 * computes exactly what it computed before pathways existed.
 */
import { nFactorSurfaceMeanKernel_C, SECONDS_PER_YEAR } from '../physics/surface-forcing';
import { rampTimeToRise_yr, rampWarming_K, type ResponseTables } from './response-tables';

/** Most knots a pathway may have (warming-pathway.ts allows 60 points, plus the start). */
export const MAX_PATHWAY_KNOTS = 61;

export interface WarmingHistory {
  linear: boolean;
  /** Linear case: surface trend, K/yr. */
  rate_K_yr: number;
  /** Pathway case: knot count, times since the start (yr), surface levels (K), slope after each knot (K/yr; the last 0). */
  n: number;
  time_yr: Float64Array;
  level_K: Float64Array;
  slope_K_yr: Float64Array;
  /** Largest surface level, K. */
  peak_K: number;
}

export function createWarmingHistory(): WarmingHistory {
  return {
    linear: true,
    rate_K_yr: 0,
    n: 0,
    time_yr: new Float64Array(MAX_PATHWAY_KNOTS),
    level_K: new Float64Array(MAX_PATHWAY_KNOTS),
    slope_K_yr: new Float64Array(MAX_PATHWAY_KNOTS),
    peak_K: 0,
  };
}

export function setLinearHistory(h: WarmingHistory, rate_K_yr: number): WarmingHistory {
  h.linear = true;
  h.rate_K_yr = rate_K_yr;
  h.n = 0;
  h.peak_K = rate_K_yr > 0 ? Infinity : 0;
  return h;
}

/**
 * Fill `h` with the surface levels of a pathway for a cell's climate (knots from pathwayKnots, air
 * offsets scaled by `scale`, the pattern-scaling factor, 1 for a uniform pathway). Air means shifted
 * beyond −80…60 °C or by more than 40 K fall back to the slope of the transfer at today's climate.
 */
export function setPathwayHistory(
  h: WarmingHistory,
  knots: { time_yr: ArrayLike<number>; airOffset_K: ArrayLike<number> },
  scale: number,
  climate: {
    meanAirTemp_C: number;
    airAmplitude_C: number;
    nFreeze: number;
    nThaw: number;
    sensitivity: number;
  },
): WarmingHistory {
  const n = Math.min(knots.time_yr.length, MAX_PATHWAY_KNOTS);
  const { meanAirTemp_C: t, airAmplitude_C: a, nFreeze: nf, nThaw: nt } = climate;
  const base = nFactorSurfaceMeanKernel_C(t, a, nf, nt);
  h.linear = false;
  h.n = n;
  h.peak_K = 0;
  for (let j = 0; j < n; j++) {
    h.time_yr[j] = knots.time_yr[j];
    const d = scale * knots.airOffset_K[j];
    const shifted = t + d;
    const level =
      Math.abs(d) > 40 || shifted < -80 || shifted > 60
        ? climate.sensitivity * d
        : nFactorSurfaceMeanKernel_C(shifted, a, nf, nt) - base;
    h.level_K[j] = level;
    if (level > h.peak_K) h.peak_K = level;
  }
  for (let j = 0; j < n - 1; j++) {
    h.slope_K_yr[j] = (h.level_K[j + 1] - h.level_K[j]) / (h.time_yr[j + 1] - h.time_yr[j]);
  }
  h.slope_K_yr[n - 1] = 0;
  return h;
}

/** Surface warming S(t), K, t yr since the start (≥ 0). */
export function surfaceLevel_K(h: WarmingHistory, t_yr: number): number {
  if (h.linear) return h.rate_K_yr * Math.max(0, t_yr);
  if (!(t_yr > 0)) return 0;
  for (let j = h.n - 1; j >= 0; j--) {
    if (t_yr >= h.time_yr[j]) return h.level_K[j] + h.slope_K_yr[j] * (t_yr - h.time_yr[j]);
  }
  return 0;
}

/** Mean surface warming rate over [0, t], K/yr (the trend itself for a linear history). */
export function meanSurfaceRate_K_yr(h: WarmingHistory, t_yr: number): number {
  if (h.linear) return h.rate_K_yr;
  return t_yr > 0 ? surfaceLevel_K(h, t_yr) / t_yr : 0;
}

/** Warming at depth z after t years, K (superposed ramps; kernel, no checks). */
export function historyWarming_K(
  tables: ResponseTables,
  h: WarmingHistory,
  depth_m: number,
  time_yr: number,
  diffusivity_m2_yr: number,
): number {
  if (h.linear) return rampWarming_K(tables, depth_m, time_yr, h.rate_K_yr, diffusivity_m2_yr);
  let w = 0;
  let prev = 0;
  for (let j = 0; j < h.n; j++) {
    const t = time_yr - h.time_yr[j];
    if (!(t > 0)) break;
    const change = h.slope_K_yr[j] - prev;
    prev = h.slope_K_yr[j];
    if (change !== 0) w += rampWarming_K(tables, depth_m, t, change, diffusivity_m2_yr);
  }
  return w;
}

/** First time the warming at depth z reaches `rise_K`, yr; Infinity if not by `limit_yr` (pathways). */
export function historyTimeToRise_yr(
  tables: ResponseTables,
  h: WarmingHistory,
  depth_m: number,
  rise_K: number,
  diffusivity_m2_yr: number,
  limit_yr: number,
): number {
  if (h.linear) return rampTimeToRise_yr(tables, depth_m, rise_K, h.rate_K_yr, diffusivity_m2_yr);
  if (!(rise_K > 0)) return 0;
  if (!(rise_K <= h.peak_K)) return Infinity;
  const step = Math.max(1, limit_yr / 200);
  let lo = 0;
  let fLo = -rise_K;
  let hi = 0;
  let fHi = fLo;
  while (fHi < 0) {
    if (hi >= limit_yr) return Infinity;
    lo = hi;
    fLo = fHi;
    hi = Math.min(limit_yr, hi + step);
    fHi = historyWarming_K(tables, h, depth_m, hi, diffusivity_m2_yr) - rise_K;
  }
  let side = 0;
  for (let i = 0; i < 40 && hi - lo > 0.01; i++) {
    const t = (lo * fHi - hi * fLo) / (fHi - fLo);
    const ft = historyWarming_K(tables, h, depth_m, t, diffusivity_m2_yr) - rise_K;
    if (ft >= 0) {
      hi = t;
      fHi = ft;
      if (side === 1) fLo /= 2;
      side = 1;
    } else {
      lo = t;
      fLo = ft;
      if (side === -1) fHi /= 2;
      side = -1;
    }
  }
  return hi;
}

/**
 * Latent-heat delay of thaw at depth z after the conduction wave reaches 0 °C there at t0, yr (see the
 * module doc). Infinity when the surface stops rising before the front arrives.
 */
export function historyLatentDelay_yr(
  h: WarmingHistory,
  t0_yr: number,
  depth_m: number,
  latent_J_m3: number,
  kThawed_W_mK: number,
): number {
  if (h.linear) {
    const b = h.rate_K_yr;
    return b > 0
      ? (depth_m * Math.sqrt(latent_J_m3 / (kThawed_W_mK * (b / SECONDS_PER_YEAR)))) / SECONDS_PER_YEAR
      : Infinity;
  }
  if (!Number.isFinite(t0_yr)) return Infinity;
  // ∫ E dt target in K·yr: z²·L/(2·k_t) in K·s.
  let remaining = (depth_m * depth_m * latent_J_m3) / (2 * kThawed_W_mK * SECONDS_PER_YEAR);
  if (!(remaining > 0)) return 0;
  const s0 = surfaceLevel_K(h, t0_yr);
  let u = t0_yr;
  for (let j = 0; j < h.n; j++) {
    const end = j + 1 < h.n ? h.time_yr[j + 1] : Infinity;
    if (end <= u) continue;
    const slope = h.slope_K_yr[j];
    const e = surfaceLevel_K(h, u) - s0;
    const d = end - u;
    const full = Number.isFinite(d) ? e * d + 0.5 * slope * d * d : e > 0 ? Infinity : -Infinity;
    if (full >= remaining) {
      // solve slope/2·x² + e·x − remaining = 0 for the first root in [0, d]
      let x: number;
      if (Math.abs(slope) < 1e-15) x = remaining / e;
      else {
        const disc = e * e + 2 * slope * remaining;
        x = (-e + Math.sqrt(Math.max(0, disc))) / slope;
      }
      return u + x - t0_yr;
    }
    if (!Number.isFinite(d)) return Infinity;
    remaining -= full;
    u = end;
  }
  return Infinity;
}

/** Years after `from_yr` until the surface has risen by `gain_K` more; Infinity if it never does. */
export function historySurfaceGain_yr(h: WarmingHistory, from_yr: number, gain_K: number): number {
  if (!(gain_K > 0)) return 0;
  if (h.linear) return h.rate_K_yr > 0 ? gain_K / h.rate_K_yr : Infinity;
  if (!Number.isFinite(from_yr)) return Infinity;
  const target = surfaceLevel_K(h, from_yr) + gain_K;
  let u = Math.max(0, from_yr);
  for (let j = 0; j < h.n; j++) {
    const end = j + 1 < h.n ? h.time_yr[j + 1] : Infinity;
    if (end <= u) continue;
    const slope = h.slope_K_yr[j];
    const su = surfaceLevel_K(h, u);
    if (slope > 0) {
      const x = (target - su) / slope;
      if (u + x <= end) return u + x - from_yr;
    }
    u = end;
  }
  return Infinity;
}
