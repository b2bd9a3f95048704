import { requireFinite, requireNonNegative, requirePositive, requireRange } from './validate';

/**
 * Surface forcing for the per-cell model: a sinusoidal annual air temperature, freezing and thawing
 * n-factors (Lunardini 1978, "Theory of n-factors and correlation of data", Proc. 3rd Int. Conf. on
 * Permafrost, Edmonton, 1:40–46), a warming trend (linear, or piecewise linear from a scenario table)
 * and the freezing and thawing indices (degree-days) of that year.
 *
 * Conventions: a 365-day year (PERIOD_DAYS) and air temperature
 *   T_air(t) = T̄ + ΔT(t) − A·cos(2π(t − t_min)/P),   t in days, t_min the day of the coldest air,
 * so the coldest day is T̄ − A and the warmest T̄ + A half a year later.
 */
export const PERIOD_DAYS = 365;
export const SECONDS_PER_DAY = 86400;
export const SECONDS_PER_YEAR = PERIOD_DAYS * SECONDS_PER_DAY;
/** Day of the coldest air temperature when none is given: mid-January (common practice). */
export const DEFAULT_COLDEST_DAY = 15;

export interface DegreeDays {
  /** Freezing index: ∫ max(0, −T) dt over one year, °C·day. */
  freezingIndex_Cd: number;
  /** Thawing index: ∫ max(0, T) dt over one year, °C·day. */
  thawingIndex_Cd: number;
}

/**
 * Freezing and thawing indices of a sinusoidal year T(t) = T̄ + A·sin(2πt/P), P = 365 days, by the
 * exact integral (no monthly discretisation). With r = T̄/A and s = asin(r) for |r| < 1:
 *   I_thaw = (P/2π)·[T̄(π + 2s) + 2A·√(1 − r²)],   I_freeze = I_thaw − P·T̄   (since I_t − I_f = P·T̄);
 * for T̄ ≥ A the year never freezes (I_thaw = P·T̄), for T̄ ≤ −A it never thaws. Check: T̄ = 0 gives
 * I_thaw = I_freeze = P·A/π.
 */
export function degreeDays(input: { meanAirTemp_C: number; amplitude_C: number }): DegreeDays {
  const mean = requireRange('meanAirTemp_C', input.meanAirTemp_C, -80, 60, 'C');
  const amp = requireRange('amplitude_C', input.amplitude_C, 0, 80, 'K');
  const P = PERIOD_DAYS;
  if (mean >= amp) return { freezingIndex_Cd: 0, thawingIndex_Cd: P * mean };
  if (mean <= -amp) return { freezingIndex_Cd: -P * mean, thawingIndex_Cd: 0 };
  const r = mean / amp;
  const s = Math.asin(r);
  // Clipped at 0: for mean ≈ −amp the two terms cancel and round-off can leave −1e-13 C·day.
  const thaw = Math.max(0, (P / (2 * Math.PI)) * (mean * (Math.PI + 2 * s) + 2 * amp * Math.sqrt(1 - r * r)));
  return { freezingIndex_Cd: Math.max(0, thaw - P * mean), thawingIndex_Cd: thaw };
}

/**
 * Share of the sinusoidal year T(t) = T̄ + A·sin(2πt/P) spent above 0 °C: f_t = (π + 2·asin(T̄/A))/(2π)
 * for |T̄| < A, 1 for T̄ ≥ A, 0 for T̄ ≤ −A (A = 0: 1 when T̄ > 0, else 0). It is also dI_t/dT̄ / P (the
 * derivative of degreeDays' thawing index), since only the thawed part of the year gains from a shift.
 * Hot-path helper: no validation, NaN in gives NaN out.
 */
export function thawSeasonFraction(meanAirTemp_C: number, amplitude_C: number): number {
  if (meanAirTemp_C >= amplitude_C) return meanAirTemp_C > 0 || amplitude_C > 0 ? 1 : 0;
  if (meanAirTemp_C <= -amplitude_C) return 0;
  return 0.5 + Math.asin(meanAirTemp_C / amplitude_C) / Math.PI;
}

/**
 * n-factors: surface index = n × air index (Lunardini 1978). Freezing n_f < 1 under snow; thawing n_t
 * < 1 under moss and forest, > 1 on bare gravel or pavement.
 */
export interface NFactors {
  nFreeze: number;
  nThaw: number;
  source: string;
}

export const N_FACTOR_PRESETS = {
  /** Organic layer / tundra vegetative cover. */
  tundraOrganic: {
    nFreeze: 0.5,
    nThaw: 1.0,
    source:
      'published n-factor table (pair as compiled in the team reference notes, section 11; original work not re-read)',
  },
  /** Gravel fill, maintained (snow-cleared) surface. */
  gravelPad: {
    nFreeze: 0.95,
    nThaw: 1.25,
    source:
      'published n-factor table (pair as compiled in the team reference notes, section 11; original work not re-read)',
  },
  /** Snow-covered natural ground, mid-range of 0.3–0.6. */
  snowCoveredNatural: {
    nFreeze: 0.45,
    nThaw: 1.0,
    source: 'handbook range n_f 0.3–0.6 (recalled from memory)',
  },
  /** Spruce forest with moss, n_t about 0.4–0.6. */
  spruceMossForest: { nFreeze: 0.4, nThaw: 0.5, source: 'handbook ranges (recalled from memory)' },
} as const satisfies Record<string, NFactors>;

/** Checks an n-factor: 0 < n ≤ 3. */
export function requireNFactor(name: string, value: number): number {
  return requireRange(name, value, 1e-6, 3);
}

/** Surface indices from air indices and n-factors: n_f·I_f and n_t·I_t. */
export function surfaceDegreeDays(air: DegreeDays, nFactors: { nFreeze: number; nThaw: number }): DegreeDays {
  const f = requireNonNegative('freezingIndex_Cd', air.freezingIndex_Cd, 'C day');
  const t = requireNonNegative('thawingIndex_Cd', air.thawingIndex_Cd, 'C day');
  return {
    freezingIndex_Cd: requireNFactor('nFreeze', nFactors.nFreeze) * f,
    thawingIndex_Cd: requireNFactor('nThaw', nFactors.nThaw) * t,
  };
}

/** A warming trend: a constant rate, or offsets at given years since the start, linearly interpolated. */
export type WarmingTrend =
  | { kind: 'linear'; rate_C_per_yr: number }
  | { kind: 'piecewise'; points: { year: number; offset_C: number }[] };

/**
 * Temperature offset ΔT (K) of a warming trend after `years` (≥ 0) since the start.
 * Linear: rate × years. Piecewise: linear interpolation between table points (years strictly
 * increasing); before the first point the first offset, after the last point the last offset held.
 */
export function warmingOffset_C(trend: WarmingTrend, years: number): number {
  const y = requireFinite('years', years);
  if (trend.kind === 'linear') return requireRange('rate_C_per_yr', trend.rate_C_per_yr, -1, 1, 'K/yr') * y;
  const pts = trend.points;
  if (!Array.isArray(pts) || pts.length === 0)
    throw new RangeError('points must hold at least one {year, offset_C}');
  for (let i = 0; i < pts.length; i++) {
    requireFinite(`points[${i}].year`, pts[i].year);
    requireRange(`points[${i}].offset_C`, pts[i].offset_C, -30, 30, 'K');
    if (i > 0 && !(pts[i].year > pts[i - 1].year)) {
      throw new RangeError(`points[${i}].year must be > points[${i - 1}].year; received ${pts[i].year}`);
    }
  }
  if (y <= pts[0].year) return pts[0].offset_C;
  for (let i = 1; i < pts.length; i++) {
    if (y <= pts[i].year) {
      const f = (y - pts[i - 1].year) / (pts[i].year - pts[i - 1].year);
      return pts[i - 1].offset_C + f * (pts[i].offset_C - pts[i - 1].offset_C);
    }
  }
  return pts[pts.length - 1].offset_C;
}

/** Mean warming rate over [0, years] of a trend, K/yr (offset(years) − offset(0)) / years. */
export function meanWarmingRate_C_per_yr(trend: WarmingTrend, years: number): number {
  const y = requirePositive('years', years, 'yr');
  return (warmingOffset_C(trend, y) - warmingOffset_C(trend, 0)) / y;
}

export interface SurfaceTemperatureInput {
  meanAirTemp_C: number;
  amplitude_C: number;
  nFreeze: number;
  nThaw: number;
  /** Time since the start of the scenario, s. */
  time_s: number;
  trend?: WarmingTrend;
  /** Day of the year (0–365) of the coldest air temperature; default 15. */
  coldestDay?: number;
}

/**
 * The n-factor transfer, the one rule by which air temperature becomes ground-surface temperature in
 * both the per-cell model and the site simulator: T_s = n_t·T_air when T_air ≥ 0, n_f·T_air below.
 * It acts on the instantaneous air temperature *including* the warming trend, so a warming air mean
 * moves the surface mean by surfaceMeanWarming_K (below), not by the air warming itself.
 */
export function nFactorTransfer_C(airTemp_C: number, nFreeze: number, nThaw: number): number {
  return airTemp_C >= 0 ? nThaw * airTemp_C : nFreeze * airTemp_C;
}

/**
 * Ground-surface temperature at a time: air temperature (sinusoid plus trend) through the n-factor
 * transfer (nFactorTransfer_C; over a year this reproduces the surface indices n_t·I_t and n_f·I_f of
 * Lunardini 1978 exactly). The site simulator's surface boundary (layers/site/site-setup.ts).
 */
export function surfaceTemperature_C(input: SurfaceTemperatureInput): number {
  const mean = requireRange('meanAirTemp_C', input.meanAirTemp_C, -80, 60, 'C');
  const amp = requireRange('amplitude_C', input.amplitude_C, 0, 80, 'K');
  const nf = requireNFactor('nFreeze', input.nFreeze);
  const nt = requireNFactor('nThaw', input.nThaw);
  const t = requireNonNegative('time_s', input.time_s, 's');
  const t0 = requireRange('coldestDay', input.coldestDay ?? DEFAULT_COLDEST_DAY, 0, PERIOD_DAYS, 'day');
  const days = t / SECONDS_PER_DAY;
  const offset = input.trend ? warmingOffset_C(input.trend, t / SECONDS_PER_YEAR) : 0;
  const air = mean + offset - amp * Math.cos((2 * Math.PI * (days - t0)) / PERIOD_DAYS);
  return nFactorTransfer_C(air, nf, nt);
}

/**
 * The equivalent surface sinusoid for the conduction models: mean T̄s = (n_t·I_t − n_f·I_f)/P (the
 * mean of the n-factor-transferred surface temperature) and the amplitude A_s whose sinusoid about T̄s has
 * the surface thawing index n_t·I_t (then its freezing index is n_f·I_f too, as I_t − I_f = P·T̄s).
 * A_s is found by bisection (thaw index grows monotonically with A). If the surface neither thaws nor
 * freezes all year the amplitude is n·A of the single active phase.
 */
export function surfaceSinusoid(input: {
  meanAirTemp_C: number;
  amplitude_C: number;
  nFreeze: number;
  nThaw: number;
}): { meanSurfaceTemp_C: number; surfaceAmplitude_C: number } & DegreeDays {
  const air = degreeDays(input);
  const surf = surfaceDegreeDays(air, input);
  const meanS = (surf.thawingIndex_Cd - surf.freezingIndex_Cd) / PERIOD_DAYS;
  const base = { meanSurfaceTemp_C: meanS, ...surf };
  if (surf.thawingIndex_Cd === 0) return { ...base, surfaceAmplitude_C: input.nFreeze * input.amplitude_C };
  if (surf.freezingIndex_Cd === 0) return { ...base, surfaceAmplitude_C: input.nThaw * input.amplitude_C };
  let lo = Math.abs(meanS);
  let hi = Math.abs(meanS) + 4 * Math.max(input.nFreeze, input.nThaw) * input.amplitude_C + 1;
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (lo + hi);
    const dd = degreeDays({ meanAirTemp_C: meanS, amplitude_C: mid });
    if (dd.thawingIndex_Cd < surf.thawingIndex_Cd) lo = mid;
    else hi = mid;
  }
  return { ...base, surfaceAmplitude_C: 0.5 * (lo + hi) };
}

export interface SurfaceClimate {
  meanAirTemp_C: number;
  amplitude_C: number;
  nFreeze: number;
  nThaw: number;
}

/**
 * Annual mean of the n-factored sinusoidal surface temperature (nFactorTransfer_C of the year
 * T̄ + A·sin): T̄_s = (n_t·I_t − n_f·I_f)/P, the indices by the exact integral of degreeDays.
 */
export function nFactorSurfaceMean_C(c: SurfaceClimate): number {
  const mean = requireRange('meanAirTemp_C', c.meanAirTemp_C, -80, 60, 'C');
  const amp = requireRange('amplitude_C', c.amplitude_C, 0, 80, 'K');
  return nFactorSurfaceMeanKernel_C(
    mean,
    amp,
    requireNFactor('nFreeze', c.nFreeze),
    requireNFactor('nThaw', c.nThaw),
  );
}

/**
 * nFactorSurfaceMean_C for hot loops (no validation): with the thawing index of degreeDays,
 * (n_t·I_t − n_f·(I_t − P·T̄))/P.
 */
export function nFactorSurfaceMeanKernel_C(
  meanAirTemp_C: number,
  amplitude_C: number,
  nFreeze: number,
  nThaw: number,
): number {
  let thaw: number;
  if (meanAirTemp_C >= amplitude_C) thaw = PERIOD_DAYS * meanAirTemp_C;
  else if (meanAirTemp_C <= -amplitude_C) thaw = 0;
  else {
    const r = meanAirTemp_C / amplitude_C;
    thaw =
      (PERIOD_DAYS / (2 * Math.PI)) *
      (meanAirTemp_C * (Math.PI + 2 * Math.asin(r)) + 2 * amplitude_C * Math.sqrt(1 - r * r));
  }
  const freeze = Math.max(0, thaw - PERIOD_DAYS * meanAirTemp_C);
  return (nThaw * thaw - nFreeze * freeze) / PERIOD_DAYS;
}

/**
 * The surface-warming transfer shared by the map and the simulator: the change of the surface mean
 * when the air mean warms by ΔT_air (the amplitude unchanged),
 *   ΔT̄_s = T̄_s(T̄ + ΔT_air) − T̄_s(T̄)   (nFactorSurfaceMean_C),
 * exactly what the simulator's surface (surfaceTemperature_C: the trend added to the air, then the
 * n-factors) averages to over a year whose trend offset is ΔT_air. Its slope is
 *   dT̄_s/dT̄ = n_t·f_t + n_f·(1 − f_t)        (surfaceMeanSensitivity),
 * f_t the thawed share of the year (thawSeasonFraction): from I_t − I_f = P·T̄ and
 * dI_t/dT̄ = P·f_t (degreeDays), d(n_t I_t − n_f I_f)/dT̄ = P·(n_t f_t + n_f(1 − f_t)). Under snow
 * (n_f ≈ 0.5) and a short summer the surface warms by only 0.5–0.7 K per K of air warming; putting
 * the whole air trend on the surface over-states the warming at depth. The trend is not exactly linear
 * at the surface (f_t grows as the air warms); the per-cell model uses the secant over the design life.
 */
export function surfaceMeanWarming_K(c: SurfaceClimate & { airWarming_K: number }): number {
  const d = requireRange('airWarming_K', c.airWarming_K, -40, 40, 'K');
  const shifted = { ...c, meanAirTemp_C: c.meanAirTemp_C + d };
  return nFactorSurfaceMean_C(shifted) - nFactorSurfaceMean_C(c);
}

/** dT̄_s/dT̄ of the n-factored sinusoid: n_t·f_t + n_f·(1 − f_t) (see surfaceMeanWarming_K). */
export function surfaceMeanSensitivity(c: SurfaceClimate): number {
  const nf = requireNFactor('nFreeze', c.nFreeze);
  const nt = requireNFactor('nThaw', c.nThaw);
  const ft = thawSeasonFraction(
    requireRange('meanAirTemp_C', c.meanAirTemp_C, -80, 60, 'C'),
    requireRange('amplitude_C', c.amplitude_C, 0, 80, 'K'),
  );
  return nt * ft + nf * (1 - ft);
}
