/**
 * Solid cylinder source for short, wide piles: Man, Yang, Diao, Fang, Liu & Yu (2010), "A new model
 * and analytical solutions for borehole and pile ground heat exchangers", Int. J. Heat Mass Transfer
 * 53:2593–2601. The heat leaves a cylindrical surface of radius r0 (the pile wall) into a medium that
 * fills the cylinder as well (the pile interior is given the ground's properties), so it can be written
 * as a ring of line sources spread evenly over the circle (form recalled from memory, re-derived here).
 *
 * Infinite length, at radius r (g = 2πkΔT/q'):
 *   g = (1/π) ∫₀^π ½ E1(ρ(φ)²/(4αt)) dφ, ρ² = r² + r0² − 2 r r0 cos φ (Man et al. eq. 6 in that form).
 * Finite length H, buried depth D, mean over the pile wall (r = r0), mirror sink above the surface:
 *   g = (1/π) ∫₀^π g_FLS(ρ(φ), t) dφ, ρ = 2 r0 sin(φ/2), g_FLS the mean finite-line-source response
 *   between two parallel lines (finite-line-source.ts).
 * Method: φ = π w³ removes the logarithmic singularity at φ = 0 (ρ → 0); composite Simpson in w with
 * 96 intervals. Measured 3e-7 relative against mpmath (tests/reference/ground-response.test.ts).
 * Special cases: at late time, r = r0, the average of ln ρ over the circle is ln r0, so the result meets
 * the line source evaluated at r0; at early time (Fo = αt/r0² < ~10) it lies between the line source
 * (which has not yet reached the wall) and the hollow infinite cylinder source (which sends all the heat
 * outwards), e.g. 0.113 vs 0.0001 and 0.208 at Fo = 0.04. Validity: homogeneous ground, uniform flux along
 * the pile; the pile's own heat capacity is that of the ground.
 */
import { finiteLineSourceG } from './finite-line-source';
import { expint1 } from './special-functions';
import { requireNonNegative, requirePositive } from './validate';

const N_W = 96;

function ringAverage(f: (rho: number) => number, r0: number, r: number): number {
  let sum = 0;
  const h = 1 / N_W;
  for (let i = 1; i <= N_W; i++) {
    const w = i * h;
    const phi = Math.PI * w * w * w;
    const rho = Math.sqrt(Math.max(r * r + r0 * r0 - 2 * r * r0 * Math.cos(phi), 0));
    const val = rho > 0 ? 3 * w * w * f(rho) : 0;
    sum += (i === N_W ? 1 : i % 2 === 1 ? 4 : 2) * val;
  }
  return (sum * h) / 3; // (1/π)∫dφ = ∫ 3w² dw
}

/** Infinite solid cylinder source response g at radius r >= 0 (see module comment). */
export function infiniteSolidCylinderSourceG(input: {
  pileRadius_m: number;
  radius_m: number;
  diffusivity_m2_s: number;
  time_s: number;
}): number {
  const r0 = requirePositive('pileRadius_m', input.pileRadius_m, 'm');
  const r = requireNonNegative('radius_m', input.radius_m, 'm');
  const a = requirePositive('diffusivity_m2_s', input.diffusivity_m2_s, 'm2/s');
  const t = requirePositive('time_s', input.time_s, 's');
  if (r === 0) return 0.5 * expint1((r0 * r0) / (4 * a * t));
  return ringAverage((rho) => 0.5 * expint1((rho * rho) / (4 * a * t)), r0, r);
}

/** Finite solid cylinder source response g, mean over the pile wall (see module comment). */
export function finiteSolidCylinderSourceG(input: {
  pileRadius_m: number;
  length_m: number;
  buriedDepth_m: number;
  diffusivity_m2_s: number;
  time_s: number;
}): number {
  const r0 = requirePositive('pileRadius_m', input.pileRadius_m, 'm');
  const geometry = {
    length_m: requirePositive('length_m', input.length_m, 'm'),
    buriedDepth_m: requireNonNegative('buriedDepth_m', input.buriedDepth_m, 'm'),
    diffusivity_m2_s: requirePositive('diffusivity_m2_s', input.diffusivity_m2_s, 'm2/s'),
    time_s: input.time_s === Infinity ? Infinity : requirePositive('time_s', input.time_s, 's'),
  };
  return ringAverage((rho) => finiteLineSourceG({ ...geometry, radius_m: rho }), r0, r0);
}
