/**
 * Forced convection inside round tubes and concentric annuli (fully developed flow).
 *
 * Method (Re = ρ u D_h / μ, Pr = μ c_p / k, h = Nu k / D_h):
 * - Laminar, Re <= 2300: fully developed Nusselt numbers. Round tube: Nu = 4.36 (uniform heat flux)
 *   or 3.66 (uniform wall temperature), Incropera & DeWitt, Fundamentals of Heat and Mass Transfer,
 *   eqs. 8.53 and 8.55. Annulus, one wall heated and the other insulated: Kays & Perkins values as
 *   tabulated in Incropera & DeWitt Table 8.2 (D_i/D_o = 0, 0.05, 0.10, 0.25, 0.50, 1.00), linearly
 *   interpolated in D_i/D_o (table values recalled from memory); below D_i/D_o = 0.05 the inner-wall
 *   value is scaled as (0.05 D_o/D_i)^0.5 (an extrapolation of ours, rarely met in piles).
 * - Turbulent, Re >= 1e4: Gnielinski (1976), Int. Chem. Eng. 16:359–368,
 *   Nu = (f/8)(Re − 1000)Pr / [1 + 12.7 √(f/8)(Pr^(2/3) − 1)], Petukhov f = (0.790 ln Re − 1.64)^−2;
 *   stated validity 3000 <= Re <= 5e6, 0.5 <= Pr <= 2000. Annuli: the tube formula on the hydraulic
 *   diameter D_o − D_i times Gnielinski's (2009) annulus factor, Heat Transfer Eng. 30(6):431–436:
 *   outer wall heated F = 0.9 − 0.15 a^0.6, inner wall heated F = 0.75 a^−0.17, a = D_i/D_o
 *   (factor recalled from memory; the friction-factor refinement of that paper is neglected).
 * - Transitional, 2300 < Re < 1e4: Gnielinski (2013), Int. J. Heat Mass Transfer 63:134–140,
 *   linear blend Nu = (1 − γ) Nu_lam(2300) + γ Nu_turb(1e4), γ = (Re − 2300)/(1e4 − 2300).
 * Entrance effects and property variation with temperature are neglected (conservative for long piles).
 */
import { requireOneOf, requirePositive, requireRange } from './validate';

export type FlowRegime = 'laminar' | 'transitional' | 'turbulent';
export type WallCondition = 'uniformFlux' | 'uniformWallTemperature';

export const RE_LAMINAR_MAX = 2300;
export const RE_TURBULENT_MIN = 1e4;

export interface ConvectionResult {
  reynolds: number;
  prandtl: number;
  nusselt: number;
  regime: FlowRegime;
  /** Heat transfer coefficient, W/(m²·K). */
  h_W_m2K: number;
}

export interface FluidTransport {
  density_kg_m3: number;
  specificHeat_J_kgK: number;
  conductivity_W_mK: number;
  viscosity_Pa_s: number;
}

/** Petukhov friction factor for smooth tubes (used inside Gnielinski's correlation). */
export function petukhovFrictionFactor(reynolds: number): number {
  const re = requireRange('reynolds', reynolds, 1000, 5e6);
  const d = 0.79 * Math.log(re) - 1.64;
  return 1 / (d * d);
}

/** Gnielinski (1976) turbulent Nusselt number for a smooth round tube (see module comment). */
export function gnielinskiNusselt(input: { reynolds: number; prandtl: number }): number {
  const re = requireRange('reynolds', input.reynolds, 2300, 5e6);
  const pr = requireRange('prandtl', input.prandtl, 0.5, 2000);
  const f = petukhovFrictionFactor(re);
  return ((f / 8) * (re - 1000) * pr) / (1 + 12.7 * Math.sqrt(f / 8) * (Math.pow(pr, 2 / 3) - 1));
}

/** Dittus–Boelter (1930) Nu = 0.023 Re^0.8 Pr^n, n = 0.4 heating / 0.3 cooling the fluid (cross-check). */
export function dittusBoelterNusselt(input: { reynolds: number; prandtl: number; heating: boolean }): number {
  const re = requirePositive('reynolds', input.reynolds);
  const pr = requirePositive('prandtl', input.prandtl);
  return 0.023 * Math.pow(re, 0.8) * Math.pow(pr, input.heating ? 0.4 : 0.3);
}

function regimeOf(re: number): FlowRegime {
  if (re <= RE_LAMINAR_MAX) return 'laminar';
  return re >= RE_TURBULENT_MIN ? 'turbulent' : 'transitional';
}

function blendTransition(re: number, pr: number, nuLam: number, factor: number): number {
  if (re <= RE_LAMINAR_MAX) return nuLam;
  const prc = Math.min(Math.max(pr, 0.5), 2000);
  if (re >= RE_TURBULENT_MIN) return factor * gnielinskiNusselt({ reynolds: re, prandtl: prc });
  const g = (re - RE_LAMINAR_MAX) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX);
  return (1 - g) * nuLam + g * factor * gnielinskiNusselt({ reynolds: RE_TURBULENT_MIN, prandtl: prc });
}

function checkFluid(f: FluidTransport): FluidTransport {
  return {
    density_kg_m3: requirePositive('fluid.density_kg_m3', f.density_kg_m3),
    specificHeat_J_kgK: requirePositive('fluid.specificHeat_J_kgK', f.specificHeat_J_kgK),
    conductivity_W_mK: requirePositive('fluid.conductivity_W_mK', f.conductivity_W_mK),
    viscosity_Pa_s: requirePositive('fluid.viscosity_Pa_s', f.viscosity_Pa_s),
  };
}

/** Convection in a round tube of inner radius `innerRadius_m` carrying `flowRate_m3_s`. */
export function tubeConvection(input: {
  fluid: FluidTransport;
  flowRate_m3_s: number;
  innerRadius_m: number;
  wall?: WallCondition;
}): ConvectionResult {
  const fl = checkFluid(input.fluid);
  const q = requirePositive('flowRate_m3_s', input.flowRate_m3_s, 'm3/s');
  const r = requirePositive('innerRadius_m', input.innerRadius_m, 'm');
  const wall = requireOneOf('wall', input.wall ?? 'uniformFlux', ['uniformFlux', 'uniformWallTemperature']);
  const d = 2 * r;
  const u = q / (Math.PI * r * r);
  const re = (fl.density_kg_m3 * u * d) / fl.viscosity_Pa_s;
  const pr = (fl.viscosity_Pa_s * fl.specificHeat_J_kgK) / fl.conductivity_W_mK;
  const nu = blendTransition(re, pr, wall === 'uniformFlux' ? 4.36 : 3.66, 1);
  return {
    reynolds: re,
    prandtl: pr,
    nusselt: nu,
    regime: regimeOf(re),
    h_W_m2K: (nu * fl.conductivity_W_mK) / d,
  };
}

/** Kays & Perkins laminar annulus Nusselt numbers (Incropera & DeWitt Table 8.2), recalled from memory. */
const ANNULUS_RATIO = [0, 0.05, 0.1, 0.25, 0.5, 1.0];
const ANNULUS_NU_INNER = [Infinity, 17.46, 11.56, 7.37, 5.74, 4.86];
const ANNULUS_NU_OUTER = [3.66, 4.06, 4.11, 4.23, 4.43, 4.86];

function laminarAnnulusNu(a: number, wall: 'inner' | 'outer'): number {
  const ys = wall === 'inner' ? ANNULUS_NU_INNER : ANNULUS_NU_OUTER;
  let i = 0;
  while (i < ANNULUS_RATIO.length - 2 && a > ANNULUS_RATIO[i + 1]) i++;
  const w = (a - ANNULUS_RATIO[i]) / (ANNULUS_RATIO[i + 1] - ANNULUS_RATIO[i]);
  if (!Number.isFinite(ys[i])) return ys[i + 1] * Math.pow(ANNULUS_RATIO[i + 1] / a, 0.5);
  return (1 - w) * ys[i] + w * ys[i + 1];
}

/**
 * Convection in a concentric annulus between an inner tube of outer radius `innerRadius_m` and an
 * outer tube of inner radius `outerRadius_m`, at the inner or the outer wall.
 */
export function annulusConvection(input: {
  fluid: FluidTransport;
  flowRate_m3_s: number;
  innerRadius_m: number;
  outerRadius_m: number;
  wall: 'inner' | 'outer';
}): ConvectionResult {
  const fl = checkFluid(input.fluid);
  const q = requirePositive('flowRate_m3_s', input.flowRate_m3_s, 'm3/s');
  const ro = requirePositive('outerRadius_m', input.outerRadius_m, 'm');
  const ri = requireRange('innerRadius_m', input.innerRadius_m, 1e-6, ro * (1 - 1e-6), 'm');
  const wall = requireOneOf('wall', input.wall, ['inner', 'outer'] as const);
  const dh = 2 * (ro - ri);
  const a = ri / ro;
  const u = q / (Math.PI * (ro * ro - ri * ri));
  const re = (fl.density_kg_m3 * u * dh) / fl.viscosity_Pa_s;
  const pr = (fl.viscosity_Pa_s * fl.specificHeat_J_kgK) / fl.conductivity_W_mK;
  const factor = wall === 'outer' ? 0.9 - 0.15 * Math.pow(a, 0.6) : 0.75 * Math.pow(a, -0.17);
  const nu = blendTransition(re, pr, laminarAnnulusNu(a, wall), factor);
  return {
    reynolds: re,
    prandtl: pr,
    nusselt: nu,
    regime: regimeOf(re),
    h_W_m2K: (nu * fl.conductivity_W_mK) / dh,
  };
}
