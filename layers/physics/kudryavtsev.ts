import { SECONDS_PER_YEAR } from './surface-forcing';
import { requirePositive, requireRange, requireNonNegative } from './validate';

/**
 * The Kudryavtsev (1974) method as used by Romanovsky & Osterkamp (1997), Permafrost and Periglacial
 * Processes 8:1–22, and Anisimov, Shiklomanov & Nelson (1997), Global and Planetary Change 15:61–77.
 * (Equations recalled from memory: TTOP form medium, ALT form low-medium confidence; the ALT form is
 * pinned by its exact pure-conduction limit, and the ALT agreed within 4 % with a 1-D enthalpy
 * finite-difference model over four cases, see tests/reference/kudryavtsev.test.ts. Check against the
 * papers before relying on the exact form.)
 *
 * Mean temperature at the top of permafrost, from the surface mean T̄s and amplitude Ās:
 *   TTOP = [½·T̄s·(k_f + k_t) + (Ās/π)·(k_t − k_f)·((T̄s/Ās)·asin(T̄s/Ās) + √(1 − T̄s²/Ās²))] / k*,
 *   k* = k_f if the bracket < 0 (permafrost), else k_t.   (|T̄s| ≥ Ās: TTOP = T̄s·k_f/k* or T̄s.)
 *
 * Active layer thickness, with T = |TTOP|, Q_L volumetric latent heat, k and C of the thawing layer,
 * P = 1 year in s:
 *   A_z = (Ās − T)/ln[(Ās + Q_L/2C)/(T + Q_L/2C)] − Q_L/2C
 *   Z_c = 2(Ās − T)·√(kPC/π)/(2A_zC + Q_L)
 *   Z = {2(Ās − T)√(kPC/π) + (2A_zC·Z_c + Q_L·Z_c)·Q_L·√(kP/(πC)) / [2A_zC·Z_c + Q_L·Z_c + (2A_zC + Q_L)·√(kP/(πC))]} / (2A_zC + Q_L)
 * Limit Q_L → 0: Z = d·ln(Ās/T), d = √(kP/(πC)) (the depth where the conduction wave's minimum
 * reaches 0 °C). Ās ≤ T: no seasonal thaw, Z = 0. For seasonal frost over unfrozen ground (TTOP > 0)
 * the same formula applies with frozen-state k and C.
 */
export interface KudryavtsevTtopInput {
  meanSurfaceTemp_C: number;
  surfaceAmplitude_C: number;
  kThawed_W_mK: number;
  kFrozen_W_mK: number;
}

export function kudryavtsevTtop_C(input: KudryavtsevTtopInput): number {
  const ts = requireRange('meanSurfaceTemp_C', input.meanSurfaceTemp_C, -80, 60, 'C');
  const as = requireRange('surfaceAmplitude_C', input.surfaceAmplitude_C, 0, 100, 'K');
  const kt = requirePositive('kThawed_W_mK', input.kThawed_W_mK, 'W/m/K');
  const kf = requirePositive('kFrozen_W_mK', input.kFrozen_W_mK, 'W/m/K');
  if (as === 0 || Math.abs(ts) >= as) return ts; // the surface never changes phase: no thermal offset
  const r = ts / as;
  const bracket =
    0.5 * ts * (kf + kt) + (as / Math.PI) * (kt - kf) * (r * Math.asin(r) + Math.sqrt(1 - r * r));
  return bracket / (bracket < 0 ? kf : kt);
}

export interface KudryavtsevAltInput {
  surfaceAmplitude_C: number;
  /** Mean temperature at the top of permafrost (its magnitude is used), °C. */
  ttop_C: number;
  conductivity_W_mK: number;
  heatCapacity_J_m3K: number;
  latent_J_m3: number;
  /** Period, s; default one year of 365 days. */
  period_s?: number;
}

export function kudryavtsevActiveLayer_m(input: KudryavtsevAltInput): number {
  const As = requireRange('surfaceAmplitude_C', input.surfaceAmplitude_C, 0, 100, 'K');
  const T = Math.abs(requireRange('ttop_C', input.ttop_C, -80, 60, 'C'));
  const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK, 'W/m/K');
  const C = requirePositive('heatCapacity_J_m3K', input.heatCapacity_J_m3K, 'J/m3/K');
  const QL = requireNonNegative('latent_J_m3', input.latent_J_m3, 'J/m3');
  const P = requirePositive('period_s', input.period_s ?? SECONDS_PER_YEAR, 's');
  if (As <= T) return 0;
  const d = Math.sqrt((k * P) / (Math.PI * C));
  if (QL === 0) return T === 0 ? Infinity : d * Math.log(As / T);
  const h = QL / (2 * C);
  const Az = (As - T) / Math.log((As + h) / (T + h)) - h;
  const sq = Math.sqrt((k * P * C) / Math.PI);
  const den = 2 * Az * C + QL;
  const Zc = (2 * (As - T) * sq) / den;
  const top = (den * Zc * QL * d) / (den * Zc + den * d);
  return (2 * (As - T) * sq + top) / den;
}
