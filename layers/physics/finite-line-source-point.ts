/**
 * Finite line source at any point: the temperature change at radius r from the axis and depth z of a
 * pile of active length H buried D below a surface held at the undisturbed temperature (mirror sink),
 * heat rate q' uniform along the pile. Zeng, Diao & Fang (2002), Heat Transfer—Asian Research
 * 31(7):558–567, eq. 8 (the general point form of which their eq. 10, the mid-depth value in
 * finite-line-source.ts, is the special case z = D + H/2); Eskilson (1987). With g = 2πkΔT/q',
 *   g(r, z, t) = ½ ∫_D^{D+H} [erfc(ρ⁻/√(4αt))/ρ⁻ − erfc(ρ⁺/√(4αt))/ρ⁺] dz',
 *   ρ∓ = √(r² + (z ∓ z')²).
 *
 * Method: both integrals are changed to the hyperbolic variable of their own source, z' − z = r sinh v
 * (real) and z' + z = r sinh v (mirror), so dz'/ρ = dv and the integrands are erfc(r cosh v/√(4αt)),
 * smooth and bounded; composite Simpson with 32 points per unit of v (at least 32). Measured against
 * the mid-depth quadrature of finite-line-source.ts (2000 points) and a brute-force z' quadrature:
 * better than 1e-7 relative (tests/reference/finite-line-source-point.test.ts).
 * Steady state (t → ∞, erfc → 1), in closed form:
 *   g∞ = ½[asinh((D + H − z)/r) − asinh((D − z)/r) − asinh((z + D + H)/r) + asinh((z + D)/r)].
 * Special cases: t → 0 gives 0; r → 0 inside the pile diverges (use the pile radius, r > 0).
 * Validity: homogeneous ground, uniform heat rate along the pile, the surface isothermal at the
 * undisturbed temperature; z ≥ 0 (in the ground). Superpose over piles for a group.
 */
import { erfc } from './special-functions';
import { requireNonNegative, requirePositive } from './validate';

export interface FlsPointGeometry {
  /** Horizontal distance from the pile axis, m (> 0). */
  radius_m: number;
  /** Depth of the point below the surface, m (≥ 0). */
  depth_m: number;
  length_m: number;
  buriedDepth_m: number;
  diffusivity_m2_s: number;
}

const POINTS_PER_UNIT = 32;

function simpsonErfc(r: number, w: number, vLo: number, vHi: number): number {
  if (!(vHi > vLo)) return 0;
  let n = Math.max(32, Math.ceil((vHi - vLo) * POINTS_PER_UNIT));
  if (n % 2 === 1) n++;
  const h = (vHi - vLo) / n;
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const f = erfc(r * Math.cosh(vLo + i * h) * w);
    sum += (i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2) * f;
  }
  return (sum * h) / 3;
}

/**
 * Point response without input checks (table builders; r > 0, z ≥ 0, time in αt units: the product
 * diffusivity·time in m², Infinity for the steady state).
 */
export function flsPointGUnchecked(r: number, z: number, H: number, D: number, alphaTime_m2: number): number {
  const aLo = Math.asinh((D - z) / r);
  const aHi = Math.asinh((D + H - z) / r);
  const bLo = Math.asinh((z + D) / r);
  const bHi = Math.asinh((z + D + H) / r);
  if (alphaTime_m2 === Infinity) return 0.5 * (aHi - aLo - (bHi - bLo));
  if (!(alphaTime_m2 > 0)) return 0;
  const w = 1 / Math.sqrt(4 * alphaTime_m2);
  return 0.5 * (simpsonErfc(r, w, aLo, aHi) - simpsonErfc(r, w, bLo, bHi));
}

/**
 * Dimensionless response g = 2πkΔT/q' at (r, z) after time_s (Infinity: steady state). Throws a
 * RangeError naming the parameter for r ≤ 0, z < 0, H ≤ 0, D < 0, α ≤ 0 or t ≤ 0.
 */
export function finiteLineSourcePointG(input: FlsPointGeometry & { time_s: number }): number {
  const r = requirePositive('radius_m', input.radius_m, 'm');
  const z = requireNonNegative('depth_m', input.depth_m, 'm');
  const H = requirePositive('length_m', input.length_m, 'm');
  const D = requireNonNegative('buriedDepth_m', input.buriedDepth_m, 'm');
  const a = requirePositive('diffusivity_m2_s', input.diffusivity_m2_s, 'm2/s');
  const t =
    input.time_s === Infinity
      ? Infinity
      : requirePositive('time_s', input.time_s, 's (or Infinity for steady state)');
  return flsPointGUnchecked(r, z, H, D, a * t);
}
