/**
 * Darcy friction factor and Darcy–Weisbach pressure drop of full pipe flow.
 *
 * Method. Δp = f·(L/D)·ρv²/2 (Darcy–Weisbach). Laminar (Re < 2300): f = 64/Re (Hagen–Poiseuille).
 * Turbulent (Re ≥ 4000): Haaland (1983), J. Fluids Eng. 105:89–90, explicit in f:
 *   1/√f = −1.8·log10[(ε/D/3.7)^1.11 + 6.9/Re],
 * within about 1.5 % of the Colebrook (1939) equation 1/√f = −2·log10(ε/D/3.7 + 2.51/(Re√f)) that
 * underlies the Moody (1944) chart, for 4000 ≤ Re ≤ 1e8 and 0 ≤ ε/D ≤ 0.05 (tests: ≤ 1.4 % measured
 * against Colebrook solved to 1e-12 in Python, tests/reference/fixtures/pipe-friction-colebrook.py).
 * Transition (2300 ≤ Re < 4000): linear in Re between the laminar value at 2300 and Haaland at 4000
 * (a bridge, common practice: the flow is intermittent there and no correlation holds).
 * Special cases: Re ≤ 0 is refused; ε = 0 is a smooth pipe.
 */
import { requireNonNegative, requirePositive } from './validate';

const RE_LAMINAR = 2300;
const RE_TURBULENT = 4000;

function haaland(re: number, relRough: number): number {
  const x = -1.8 * Math.log10((relRough / 3.7) ** 1.11 + 6.9 / re);
  return 1 / (x * x);
}

/** Darcy friction factor (kernel: no checks). */
export function darcyFrictionFactorKernel(reynolds: number, relativeRoughness: number): number {
  if (reynolds < RE_LAMINAR) return 64 / reynolds;
  if (reynolds >= RE_TURBULENT) return haaland(reynolds, relativeRoughness);
  const fl = 64 / RE_LAMINAR;
  const ft = haaland(RE_TURBULENT, relativeRoughness);
  return fl + ((ft - fl) * (reynolds - RE_LAMINAR)) / (RE_TURBULENT - RE_LAMINAR);
}

/** Darcy friction factor of full pipe flow at Reynolds number `reynolds` and roughness ε/D. */
export function darcyFrictionFactor(p: { reynolds: number; relativeRoughness: number }): number {
  return darcyFrictionFactorKernel(
    requirePositive('reynolds', p.reynolds),
    requireNonNegative('relativeRoughness', p.relativeRoughness),
  );
}

/**
 * Darcy–Weisbach pressure drop, Pa, of a volume flow through a round pipe (kernel: no checks; zero
 * flow gives 0).
 */
export function pipePressureDropKernel_Pa(
  flow_m3_s: number,
  diameter_m: number,
  length_m: number,
  roughness_m: number,
  density_kg_m3: number,
  viscosity_Pa_s: number,
): number {
  if (!(flow_m3_s > 0)) return 0;
  const area = (Math.PI * diameter_m * diameter_m) / 4;
  const v = flow_m3_s / area;
  const re = (density_kg_m3 * v * diameter_m) / viscosity_Pa_s;
  const f = darcyFrictionFactorKernel(re, roughness_m / diameter_m);
  return (f * (length_m / diameter_m) * density_kg_m3 * v * v) / 2;
}

/** Darcy–Weisbach pressure drop of a round pipe, Pa (checked form of pipePressureDropKernel_Pa). */
export function pipePressureDrop_Pa(p: {
  flow_m3_s: number;
  diameter_m: number;
  length_m: number;
  roughness_m: number;
  density_kg_m3: number;
  viscosity_Pa_s: number;
}): number {
  return pipePressureDropKernel_Pa(
    requireNonNegative('flow_m3_s', p.flow_m3_s, 'm3/s'),
    requirePositive('diameter_m', p.diameter_m, 'm'),
    requireNonNegative('length_m', p.length_m, 'm'),
    requireNonNegative('roughness_m', p.roughness_m, 'm'),
    requirePositive('density_kg_m3', p.density_kg_m3, 'kg/m3'),
    requirePositive('viscosity_Pa_s', p.viscosity_Pa_s, 'Pa s'),
  );
}
