import { DEFAULT_COLDEST_DAY, PERIOD_DAYS, SECONDS_PER_DAY, SECONDS_PER_YEAR } from './surface-forcing';
import { requireNonNegative, requirePositive, requireRange, requireFinite } from './validate';

/**
 * The annual temperature wave in a homogeneous half-space, Kusuda & Achenbach (1965), "Earth temperature
 * and thermal diffusivity at selected stations in the United States", ASHRAE Transactions 71(1):61–75
 * (form recalled from memory, high confidence; the damping-depth form is standard, e.g. Hillel 1982):
 *
 *   T(z, t) = T̄ − A_s·exp(−z/d)·cos[ω(t − t_min) − z/d],   ω = 2π/P,  d = √(2α/ω) = √(P·α/π)
 *
 * t_min the day of the coldest surface temperature. The amplitude decays by e per damping depth d and
 * the phase lags by (P/2π)·(z/d) days. Periodic steady state, no phase change, no trend; conduction only.
 */
export function dampingDepth_m(diffusivity_m2_s: number, period_s = SECONDS_PER_YEAR): number {
  const a = requirePositive('diffusivity_m2_s', diffusivity_m2_s, 'm2/s');
  const p = requirePositive('period_s', period_s, 's');
  return Math.sqrt((p * a) / Math.PI);
}

/** Amplitude of the annual wave at depth, A_s·exp(−z/d), K. */
export function annualAmplitudeAtDepth_C(input: {
  depth_m: number;
  surfaceAmplitude_C: number;
  diffusivity_m2_s: number;
}): number {
  const z = requireNonNegative('depth_m', input.depth_m, 'm');
  const a = requireRange('surfaceAmplitude_C', input.surfaceAmplitude_C, 0, 100, 'K');
  return a * Math.exp(-z / dampingDepth_m(input.diffusivity_m2_s));
}

/** Phase lag of the annual wave at depth, days: (P/2π)·z/d. */
export function annualPhaseLag_days(depth_m: number, diffusivity_m2_s: number): number {
  const z = requireNonNegative('depth_m', depth_m, 'm');
  return (PERIOD_DAYS / (2 * Math.PI)) * (z / dampingDepth_m(diffusivity_m2_s));
}

/** Depth at which the annual amplitude falls to `threshold_C` (e.g. 0.1 K: depth of zero annual amplitude), m. */
export function depthOfAmplitude_m(input: {
  surfaceAmplitude_C: number;
  threshold_C: number;
  diffusivity_m2_s: number;
}): number {
  const a = requireRange('surfaceAmplitude_C', input.surfaceAmplitude_C, 0, 100, 'K');
  const th = requirePositive('threshold_C', input.threshold_C, 'K');
  if (a <= th) return 0;
  return dampingDepth_m(input.diffusivity_m2_s) * Math.log(a / th);
}

export interface AnnualWaveInput {
  depth_m: number;
  /** Time, s; day of year = time_s/86400 modulo 365. */
  time_s: number;
  meanSurfaceTemp_C: number;
  surfaceAmplitude_C: number;
  diffusivity_m2_s: number;
  /** Day of the coldest surface temperature, 0–365; default 15. */
  coldestDay?: number;
}

/** Kusuda–Achenbach temperature T(z, t), °C. */
export function kusudaAchenbachTemp_C(input: AnnualWaveInput): number {
  const z = requireNonNegative('depth_m', input.depth_m, 'm');
  const t = requireFinite('time_s', input.time_s);
  const mean = requireRange('meanSurfaceTemp_C', input.meanSurfaceTemp_C, -80, 60, 'C');
  const amp = requireRange('surfaceAmplitude_C', input.surfaceAmplitude_C, 0, 100, 'K');
  const t0 = requireRange('coldestDay', input.coldestDay ?? DEFAULT_COLDEST_DAY, 0, PERIOD_DAYS, 'day');
  const d = dampingDepth_m(input.diffusivity_m2_s);
  const omega = (2 * Math.PI) / PERIOD_DAYS;
  return mean - amp * Math.exp(-z / d) * Math.cos(omega * (t / SECONDS_PER_DAY - t0) - z / d);
}
