import { erf, erfc, erfcx } from './special-functions';
import { requireFinite, requireNonNegative, requirePositive } from './validate';

/**
 * Similarity solutions of the Stefan problem on a half-space x ≥ 0 with a sudden surface temperature
 * change, Carslaw & Jaeger (1959), Conduction of Heat in Solids, §11.2 (eqs. 11.2(5)–(11), graph
 * p. 287–288); restated as eq. (3.14) in Crank (1984), Free and Moving Boundary Problems, p. 103.
 * Front X(t) = 2λ√(α₁t); phase 1 (between surface and front) is the phase created by the surface change.
 *
 * One phase (far material at its melting point T_m):
 *   λ·e^(λ²)·erf λ = Ste/√π,  Ste = C₁(T_s − T_m)/L
 *   T(x,t) = T_s − (T_s − T_m)·erf(x/2√(α₁t))/erf λ  for x < X.
 * Two phases (far material initially at T_i on the other side of T_m), ν = √(α₁/α₂):
 *   e^(−λ²)/erf λ − (k₂/k₁)·ν·[(T_m − T_i)/(T_s − T_m)]·e^(−λ²ν²)/erfc(λν) = λ√π/Ste₁
 *   T = T_i + (T_m − T_i)·erfc(x/2√(α₂t))/erfc(λν)  for x > X.
 * Both thawing (T_s > T_m > T_i) and freezing (T_s < T_m < T_i) are covered: only the magnitudes
 * |T_s − T_m| and |T_m − T_i| enter λ. λ is found by bisection (the residual is strictly decreasing
 * in λ) to 1e-14 relative. Small Ste: λ ≈ √(Ste/2), the Stefan limit.
 */
export interface PhaseProperties {
  conductivity_W_mK: number;
  heatCapacity_J_m3K: number;
}

export interface NeumannResult {
  lambda: number;
  /** Stefan number of phase 1, C₁|T_s − T_m|/L. */
  stefanNumber: number;
  /** Front depth at time_s, m. */
  frontPosition_m: number;
  /** Temperature at depth and the given time_s, °C. */
  temperatureAt_C: (depth_m: number) => number;
}

function solveDecreasing(residual: (lambda: number) => number): number {
  let lo = 0;
  let hi = 1;
  while (residual(hi) > 0) {
    lo = hi;
    hi *= 2;
    if (hi > 1e6) throw new RangeError('no Neumann root below lambda = 1e6; check the inputs');
  }
  for (let i = 0; i < 200 && hi - lo > 1e-15 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (residual(mid) > 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** λ of the one-phase problem for a Stefan number Ste > 0. */
export function neumannOnePhaseLambda(stefanNumber: number): number {
  const ste = requirePositive('stefanNumber', stefanNumber);
  const target = ste / Math.sqrt(Math.PI);
  return solveDecreasing((l) => target - l * Math.exp(l * l) * erf(l));
}

export function neumannOnePhase(input: {
  phase: PhaseProperties;
  latent_J_m3: number;
  surfaceTemp_C: number;
  meltTemp_C: number;
  time_s: number;
}): NeumannResult {
  const k = requirePositive('phase.conductivity_W_mK', input.phase.conductivity_W_mK, 'W/m/K');
  const C = requirePositive('phase.heatCapacity_J_m3K', input.phase.heatCapacity_J_m3K, 'J/m3/K');
  const L = requirePositive('latent_J_m3', input.latent_J_m3, 'J/m3');
  const ts = requireFinite('surfaceTemp_C', input.surfaceTemp_C);
  const tm = requireFinite('meltTemp_C', input.meltTemp_C);
  const t = requireNonNegative('time_s', input.time_s, 's');
  if (ts === tm) throw new RangeError(`surfaceTemp_C must differ from meltTemp_C; received ${ts}`);
  const ste = (C * Math.abs(ts - tm)) / L;
  const lambda = neumannOnePhaseLambda(ste);
  const a = k / C;
  const front = 2 * lambda * Math.sqrt(a * t);
  return {
    lambda,
    stefanNumber: ste,
    frontPosition_m: front,
    temperatureAt_C: (x) => {
      requireNonNegative('depth_m', x, 'm');
      if (x >= front) return tm;
      return ts - ((ts - tm) * erf(x / (2 * Math.sqrt(a * t)))) / erf(lambda);
    },
  };
}

export function neumannTwoPhase(input: {
  /** Phase 1: the phase between the surface and the front (thawed when thawing). */
  near: PhaseProperties;
  /** Phase 2: the initial phase beyond the front. */
  far: PhaseProperties;
  latent_J_m3: number;
  surfaceTemp_C: number;
  meltTemp_C: number;
  initialTemp_C: number;
  time_s: number;
}): NeumannResult {
  const k1 = requirePositive('near.conductivity_W_mK', input.near.conductivity_W_mK, 'W/m/K');
  const c1 = requirePositive('near.heatCapacity_J_m3K', input.near.heatCapacity_J_m3K, 'J/m3/K');
  const k2 = requirePositive('far.conductivity_W_mK', input.far.conductivity_W_mK, 'W/m/K');
  const c2 = requirePositive('far.heatCapacity_J_m3K', input.far.heatCapacity_J_m3K, 'J/m3/K');
  const L = requirePositive('latent_J_m3', input.latent_J_m3, 'J/m3');
  const ts = requireFinite('surfaceTemp_C', input.surfaceTemp_C);
  const tm = requireFinite('meltTemp_C', input.meltTemp_C);
  const ti = requireFinite('initialTemp_C', input.initialTemp_C);
  const t = requireNonNegative('time_s', input.time_s, 's');
  if (ts === tm) throw new RangeError(`surfaceTemp_C must differ from meltTemp_C; received ${ts}`);
  if ((ts - tm) * (tm - ti) < 0) {
    throw new RangeError(
      `initialTemp_C must lie on the other side of meltTemp_C (${tm}) from surfaceTemp_C (${ts}); received ${ti}`,
    );
  }
  const a1 = k1 / c1;
  const a2 = k2 / c2;
  const nu = Math.sqrt(a1 / a2);
  const ste = (c1 * Math.abs(ts - tm)) / L;
  const B = (k2 / k1) * nu * (Math.abs(tm - ti) / Math.abs(ts - tm));
  const sqrtPi = Math.sqrt(Math.PI);
  // e^(−λ²ν²)/erfc(λν) = 1/erfcx(λν): finite for any λν.
  const lambda = solveDecreasing((l) => Math.exp(-l * l) / erf(l) - B / erfcx(l * nu) - (l * sqrtPi) / ste);
  const front = 2 * lambda * Math.sqrt(a1 * t);
  return {
    lambda,
    stefanNumber: ste,
    frontPosition_m: front,
    temperatureAt_C: (x) => {
      requireNonNegative('depth_m', x, 'm');
      if (x < front) return ts - ((ts - tm) * erf(x / (2 * Math.sqrt(a1 * t)))) / erf(lambda);
      return ti + ((tm - ti) * erfc(x / (2 * Math.sqrt(a2 * t)))) / erfc(lambda * nu);
    },
  };
}

/**
 * erfc x·e^(x²) for x ≥ 0 by the Chebyshev fit of Press et al. (1992), Numerical Recipes in C, 2nd ed.,
 * §6.2 (erfcc: fractional error of erfc below 1.2e-7 everywhere), without its e^(−x²) factor.
 */
function erfcxFast(x: number): number {
  const t = 1 / (1 + 0.5 * x);
  return (
    t *
    Math.exp(
      -1.26551223 +
        t *
          (1.00002368 +
            t *
              (0.37409196 +
                t *
                  (0.09678418 +
                    t *
                      (-0.18628806 +
                        t *
                          (0.27886807 +
                            t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    )
  );
}

/** erf x for x ≥ 0: Maclaurin series to x¹¹ below 0.5 (A&S 7.1.5; relative error < 3e-8), else 1 − erfc. */
function erfFast(x: number, expMinusX2: number): number {
  if (x < 0.5) {
    const x2 = x * x;
    return (
      1.1283791670955126 *
      x *
      (1 + x2 * (-1 / 3 + x2 * (1 / 10 + x2 * (-1 / 42 + x2 * (1 / 216 + x2 * (-1 / 1320))))))
    );
  }
  return 1 - expMinusX2 * erfcxFast(x);
}

/**
 * λ of the two-phase Neumann problem for hot loops (no validation, no allocation), from
 * B = (k₂/k₁)·ν·|T_m − T_i|/|T_s − T_m| ≥ 0, ν = √(α₁/α₂) > 0 and invSte = L/(C₁|T_s − T_m|) ≥ 0 (0: no
 * latent heat, the front is the T_m isotherm of two-phase conduction). The root of neumannTwoPhase's
 * equation multiplied by erf λ,
 *   G(λ) = e^(−λ²) − B·erf λ/erfcx(λν) − √π·invSte·λ·erf λ,
 * which falls strictly and smoothly from G(0) = 1 (no 1/erf λ pole), by Newton steps kept inside the
 * bracket found so far (bisection when a step leaves it), started at the root of its small-λ
 * expansion (1 + 2·invSte)λ² + (2B/√π)λ − 1 = 0; 3–5 steps to |G| < 1e-9 or a step below 1e-8·λ. erf and erfcx are fast fits
 * (erfFast, erfcxFast: relative error below 1.2e-7), so λ agrees with the bisection of neumannTwoPhase
 * to 1e-6 relative (tests/unit/neumann-kernel.property.test.ts). Returns Infinity when B = 0 and
 * invSte = 0 (nothing stops the front), NaN for invalid input.
 */
export function neumannTwoPhaseLambdaKernel(B: number, nu: number, invSte: number): number {
  if (!(B >= 0) || !(nu > 0) || !(invSte >= 0)) return NaN;
  if (B === 0 && invSte === 0) return Infinity;
  const sqrtPi = 1.7724538509055159;
  const twoOverSqrtPi = 1.1283791670955126;
  const a = 1 + 2 * invSte;
  const bq = twoOverSqrtPi * B;
  let l = 2 / (bq + Math.sqrt(bq * bq + 4 * a)); // = (−bq + √(bq² + 4a))/(2a), cancellation-free
  let lo = 0;
  let hi = Infinity;
  for (let i = 0; i < 100; i++) {
    const e2 = Math.exp(-l * l);
    const el = erfFast(l, e2);
    const x = l * nu;
    const ex = erfcxFast(x);
    const G = e2 - (B * el) / ex - sqrtPi * invSte * l * el;
    // G is only as smooth as the 1.2e-7 fits: stop at that level rather than chase their noise.
    if (Math.abs(G) < 1e-9) return l;
    if (G > 0) lo = l;
    else hi = l;
    // d/dλ: erf′ = (2/√π)e^(−λ²), erfcx′(x) = 2x·erfcx x − 2/√π.
    const dEl = twoOverSqrtPi * e2;
    const dG =
      -2 * l * e2 -
      B * (dEl / ex - (el * nu * (2 * x * ex - twoOverSqrtPi)) / (ex * ex)) -
      sqrtPi * invSte * (el + l * dEl);
    let next = l - G / dG;
    if (!(next > lo && next < hi)) next = hi === Infinity ? 2 * l : 0.5 * (lo + hi);
    if (Math.abs(next - l) <= 1e-8 * l) return next;
    l = next;
  }
  return hi === Infinity ? l : 0.5 * (lo + hi);
}
