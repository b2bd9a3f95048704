/**
 * Infinite cylinder source at the cylinder wall (Carslaw & Jaeger 1959, Conduction of Heat in Solids,
 * §13.7; Ingersoll, Zobel & Ingersoll 1954), in the G-function form used by ground-loop sizing:
 *   ΔT(r_b, t) = (q'/k) · G(Fo), Fo = αt/r_b²,
 *   G(Fo, 1) = (2/π³) ∫₀^∞ (1 − e^(−β²Fo)) / (β³ [J1²(β) + Y1²(β)]) dβ
 * (the general-radius bracket J0(pβ)Y1(β) − J1(β)Y0(pβ) reduces at p = 1 to −2/(πβ) by the Wronskian).
 * A constant heat flux leaves the surface of a cylinder whose inside is not modelled.
 *
 * Method: β = e^u, composite Simpson on u ∈ [ln(1e-9/√Fo), ln(2000)] (1601 points), plus the
 * analytic tail ∫ (2/π³)(π/(2β²)) dβ beyond 2000 (J1² + Y1² → 2/(πβ)). J1² + Y1² by the ascending
 * series (A&S 9.1.10–9.1.11) for β <= 12 and the Hankel asymptotic expansion (A&S 9.2.5–9.2.10, via
 * P² + Q²) above. Measured accuracy: 1e-6 relative against mpmath quadrature for 0.1 <= Fo <= 1e5
 * (tests/reference/ground-response.test.ts).
 * Special cases: Fo → 0 gives 0; for Fo > ~1000 G → the line source E1(1/(4Fo))/(4π).
 *
 * Cheap path: `cylinderSourceGBernier`, the fit of Bernier (2001), ASHRAE Trans. 107(1),
 * G ≈ 10^(−0.89129 + 0.36081X − 0.05508X² + 3.59617e-3X³), X = log10 Fo; within ~1 % of the exact
 * integral for 0.5 <= Fo <= 1e4 (reference-values.md §3), 2 % at Fo = 0.1 and 1.4 % at 1e5.
 */
import { EULER_GAMMA } from './special-functions';
import { requireRange } from './validate';

/** J1(x)² + Y1(x)² for x > 0 (private helper, see module comment). */
export function besselJ1Y1SquaredSum(x: number): number {
  if (x <= 12) {
    const h = x / 2;
    const h2 = -h * h;
    // J1 = Σ (−1)^k h^(2k+1)/(k!(k+1)!); Y1 = (2/π)J1 ln(h) − 2/(πx) − (1/π) Σ (ψ(k+1)+ψ(k+2)) term_k
    let term = h; // k = 0
    let psiK1 = -EULER_GAMMA; // ψ(1)
    let psiK2 = 1 - EULER_GAMMA; // ψ(2)
    let j1 = 0;
    let s = 0;
    for (let k = 0; k < 80; k++) {
      j1 += term;
      s += (psiK1 + psiK2) * term;
      const next = (term * h2) / ((k + 1) * (k + 2));
      psiK1 += 1 / (k + 1);
      psiK2 += 1 / (k + 2);
      term = next;
      if (Math.abs(term) < 1e-18 * Math.abs(j1) && k > 5) break;
    }
    const y1 = (2 / Math.PI) * j1 * Math.log(h) - 2 / (Math.PI * x) - s / Math.PI;
    return j1 * j1 + y1 * y1;
  }
  // Hankel: J1² + Y1² = (2/(πx)) (P² + Q²), μ = 4.
  const mu = 4;
  let p = 1;
  let q = 0;
  let t = 1;
  for (let k = 1; k < 30; k++) {
    const next = (t * (mu - (2 * k - 1) * (2 * k - 1))) / (k * 8 * x);
    if (Math.abs(next) > Math.abs(t) && k > 2) break;
    t = next;
    if (k % 2 === 1) q += (k % 4 === 1 ? 1 : -1) * t;
    else p += (k % 4 === 2 ? -1 : 1) * t;
    if (Math.abs(t) < 1e-17) break;
  }
  return (2 / (Math.PI * x)) * (p * p + q * q);
}

const U_HI = Math.log(2000);

/** Exact cylinder-source G(Fo) at the cylinder wall (numerical quadrature, see module comment). */
export function cylinderSourceG(fourier: number): number {
  const fo = requireRange('fourier', fourier, 1e-6, 1e9);
  const uLo = Math.log(1e-9 / Math.sqrt(fo));
  const n = 1600;
  const h = (U_HI - uLo) / n;
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const b = Math.exp(uLo + i * h);
    const f = -Math.expm1(-b * b * fo) / (b * b * besselJ1Y1SquaredSum(b));
    const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
    sum += w * f;
  }
  const integral = (sum * h) / 3 + Math.PI / (2 * Math.exp(U_HI));
  return (2 / Math.PI ** 3) * integral;
}

/** Bernier (2001) fit of G(Fo) at the cylinder wall (cheap path, see module comment). */
export function cylinderSourceGBernier(fourier: number): number {
  const fo = requireRange('fourier', fourier, 1e-3, 1e9);
  const x = Math.log10(fo);
  return Math.pow(10, -0.89129 + 0.36081 * x - 0.05508 * x * x + 3.59617e-3 * x * x * x);
}

/** Temperature change (K) at the wall of a cylinder of radius r_b emitting q' (W/m) for time t. */
export function infiniteCylinderSource(input: {
  heatRate_W_m: number;
  conductivity_W_mK: number;
  diffusivity_m2_s: number;
  radius_m: number;
  time_s: number;
}): number {
  const k = requireRange('conductivity_W_mK', input.conductivity_W_mK, 1e-6, Infinity);
  const a = requireRange('diffusivity_m2_s', input.diffusivity_m2_s, 1e-12, Infinity);
  const r = requireRange('radius_m', input.radius_m, 1e-6, Infinity);
  const t = requireRange('time_s', input.time_s, 1e-9, Infinity);
  const q = requireRange('heatRate_W_m', input.heatRate_W_m, -Infinity, Infinity);
  return (q / k) * cylinderSourceG((a * t) / (r * r));
}
