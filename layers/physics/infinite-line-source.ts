/**
 * Infinite line source (Ingersoll, Zobel & Ingersoll 1954, Heat Conduction with Engineering,
 * Geological and Other Applications; Carslaw & Jaeger 1959, Conduction of Heat in Solids, §10.4).
 *
 * A line of constant heat rate q' (W/m) switched on at t = 0 in an infinite homogeneous medium:
 *   ΔT(r, t) = q'/(4πk) · E1(r²/(4αt)).
 * Here q' > 0 means heat *extracted* from the ground and ΔT is the temperature drop (positive).
 * Validity: r and t > 0; as a pile model, Fo = αt/r_b² > ~5 (the line ignores the pile's own radius and
 * heat capacity; use the cylinder source below that). Special cases: t → 0 gives 0; for
 * r²/(4αt) < 0.05 the logarithmic form q'/(4πk)[ln(4αt/r²) − γ] is within 0.1 %.
 * Accuracy: that of E1 (special-functions.ts, ~1e-12 relative).
 */
import { expint1 } from './special-functions';
import { requirePositive } from './validate';

/** Dimensionless line-source response g = 2πkΔT/q' = ½ E1(r²/(4αt)). */
export function infiniteLineSourceG(input: {
  radius_m: number;
  time_s: number;
  diffusivity_m2_s: number;
}): number {
  const r = requirePositive('radius_m', input.radius_m, 'm');
  const t = requirePositive('time_s', input.time_s, 's');
  const a = requirePositive('diffusivity_m2_s', input.diffusivity_m2_s, 'm2/s');
  return 0.5 * expint1((r * r) / (4 * a * t));
}

/** Temperature change ΔT (K) at radius r and time t for a line heat rate q' (W/m). */
export function infiniteLineSource(input: {
  heatRate_W_m: number;
  conductivity_W_mK: number;
  diffusivity_m2_s: number;
  radius_m: number;
  time_s: number;
}): number {
  const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK);
  const q = input.heatRate_W_m;
  if (!Number.isFinite(q)) throw new TypeError(`heatRate_W_m must be a finite number; received ${q}`);
  return (q / (2 * Math.PI * k)) * infiniteLineSourceG(input);
}

/**
 * Thermal-response-test inversion: k = q'/(4π S), S the slope of the mean fluid temperature against
 * ln t in the late-time (logarithmic) regime of the line source.
 */
export function conductivityFromSlope(input: { heatRate_W_m: number; slope_K: number }): number {
  const q = requirePositive('heatRate_W_m', input.heatRate_W_m, 'W/m');
  const s = requirePositive('slope_K', input.slope_K, 'K per ln(s)');
  return q / (4 * Math.PI * s);
}
