import { i2erfc } from './special-functions';
import { SECONDS_PER_YEAR } from './surface-forcing';
import { requireFinite, requireNonNegative, requirePositive, requireRange } from './validate';

/**
 * Years until the mean annual temperature at a depth reaches its freezing point under a linear warming
 * of the mean ground-surface (or top-of-permafrost) temperature — the thaw margin of the per-cell model.
 *
 * Method (an approximation, stated plainly): the delay is the sum of a sensible-heat delay and a
 * latent-heat delay, each from a textbook solution that is exact in its own limit.
 *  1. Sensible (conduction, no latent heat; Carslaw & Jaeger 1959 §2.5): the ground starts in steady
 *     state, T₀(z) = T̄₀ + G·z (G geothermal gradient), and the surface warms as b·t, so
 *     T(z,t) = T₀(z) + 4·b·t·i²erfc(z/2√(α_f t)) with frozen diffusivity α_f. t_s solves T(z, t_s) = T_f.
 *  2. Latent (quasi-steady Stefan front; Stefan equation with a rising surface excess): once the surface
 *     is above T_f, a thaw front driven by the excess b·(t − t₀) through thawed ground of conductivity
 *     k_t obeys X·dX/dt = k_t·b·(t − t₀)/L, so X = (t − t₀)·√(k_t·b/L) and melting the ice down to z takes
 *     t_L = z·√(L/(k_t·b)).
 *  Total: t = t_s + t_L. Limits: L → 0 gives the pure conduction answer; C → 0 (instant conduction)
 *  gives t₀ + z√(L/(k_t b)), the Stefan answer. In between the sum over-estimates the delay, since
 *  sensible heating and melting proceed partly at the same time: against a 1-D enthalpy finite-difference
 *  model (tests/reference/years-to-thaw.test.ts; z 3–15 m, L 5–150 MJ/m³, b 0.03–0.08 K/yr, equal
 *  properties in both phases) it was 0–8 % late. It therefore over-states the thaw margin
 *  slightly (not conservative): callers should say so or discount it. Returns Infinity when the depth does
 *  not reach its freezing point within `horizon_yr` (default 1000) or when the rate is ≤ 0, and 0 when
 *  it is already at or above it.
 */
export interface YearsToThawInput {
  depth_m: number;
  /** Mean annual temperature at the surface (or at the top of permafrost) at t = 0, °C. */
  initialMeanTemp_C: number;
  /** Warming rate of that mean temperature, K/yr. */
  warming_C_per_yr: number;
  /** Geothermal gradient, K/m (default 0). */
  geothermalGradient_K_m?: number;
  freezingPoint_C?: number;
  diffusivityFrozen_m2_s: number;
  conductivityThawed_W_mK: number;
  latent_J_m3: number;
  horizon_yr?: number;
}

export interface YearsToThaw {
  years: number;
  /** Sensible-heat (conduction) part, years. */
  sensibleYears: number;
  /** Latent-heat retardation, years. */
  latentYears: number;
}

export function yearsToThaw(input: YearsToThawInput): YearsToThaw {
  const z = requireRange('depth_m', input.depth_m, 0, 1000, 'm');
  const T0 = requireRange('initialMeanTemp_C', input.initialMeanTemp_C, -60, 30, 'C');
  const b = requireRange('warming_C_per_yr', input.warming_C_per_yr, -1, 1, 'K/yr');
  const G = requireRange('geothermalGradient_K_m', input.geothermalGradient_K_m ?? 0, 0, 1, 'K/m');
  const Tf = requireRange('freezingPoint_C', input.freezingPoint_C ?? 0, -10, 0, 'C');
  const a =
    requirePositive('diffusivityFrozen_m2_s', input.diffusivityFrozen_m2_s, 'm2/s') * SECONDS_PER_YEAR;
  const k = requirePositive('conductivityThawed_W_mK', input.conductivityThawed_W_mK, 'W/m/K');
  const L = requireNonNegative('latent_J_m3', input.latent_J_m3, 'J/m3');
  const horizon = requirePositive('horizon_yr', input.horizon_yr ?? 1000, 'yr');
  const start = T0 + G * z;
  if (start >= Tf) return { years: 0, sensibleYears: 0, latentYears: 0 };
  const never = { years: Infinity, sensibleYears: Infinity, latentYears: Infinity };
  if (b <= 0) return never;
  const rise = (t: number): number => (z === 0 ? b * t : 4 * b * t * i2erfc(z / (2 * Math.sqrt(a * t))));
  const needed = Tf - start;
  if (rise(horizon) < needed) return never;
  let lo = 0;
  let hi = horizon;
  for (let i = 0; i < 100 && hi - lo > 1e-9 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (rise(mid) < needed) lo = mid;
    else hi = mid;
  }
  const sensibleYears = 0.5 * (lo + hi);
  const latentYears = (z * Math.sqrt(L / (k * (b / SECONDS_PER_YEAR)))) / SECONDS_PER_YEAR;
  const years = requireFinite('years', sensibleYears + latentYears);
  return years > horizon ? never : { years, sensibleYears, latentYears };
}
