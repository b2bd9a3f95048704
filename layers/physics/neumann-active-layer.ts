import { neumannTwoPhaseLambdaKernel } from './neumann';
import {
  degreeDays,
  PERIOD_DAYS,
  requireNFactor,
  SECONDS_PER_DAY,
  thawSeasonFraction,
} from './surface-forcing';
import { requireNonNegative, requirePositive, requireRange } from './validate';

/**
 * Active-layer thickness with the sensible heat of both zones: the thaw season of the n-factored
 * sinusoidal year replaced by a surface step of the same degree-days, solved exactly by the two-phase
 * Neumann solution (neumann.ts; Carslaw & Jaeger 1959 §11.2).
 *
 * Method. The surface (n-factor transfer of surface-forcing.ts) is above 0 °C for t_s = f_t·P
 * (f_t = thawSeasonFraction, P one year) with the surface thawing index n_t·I_t; the step is
 * V_s = n_t·I_t/t_s above 0 °C for t_s. The frozen ground below starts at TTOP (Smith & Riseborough
 * 2002, ttop.ts), the mean temperature at the permafrost table. Then, with the thawed (1) and frozen
 * (2) conductivity and heat capacity, ν = √(α₁/α₂), B = (k₂/k₁)·ν·|TTOP|/V_s and Ste = C₁V_s/L,
 *   ALT = 2λ√(α₁·t_s),   e^(−λ²)/erf λ − B/erfcx(λν) = λ√π/Ste.
 * This is the construction of the modified Berggren equation (Aldrich & Paynter 1953, "Analytical
 * studies of freezing and thawing of soils", ACFEL Tech. Rep. 42; restated in Lunardini 1981, Heat
 * Transfer in Cold Climates, and TM 5-852-6, 1988): the Stefan depth times a coefficient λ′ for the
 * sensible heat, from the Neumann solution with the thermal ratio V_0/V_s and the fusion parameter
 * C·V_s/L (recalled from memory, medium confidence). Here λ comes from the exact two-phase root with
 * separate thawed and frozen properties instead of the published chart for averaged properties.
 *
 * Accuracy: within −9 %/+6 % of the site simulator's one-dimensional enthalpy solution (periodic state,
 * fine mesh) for gravel, sand, silt (also ice-rich), clay, peat and rock, wet and dry, over MAAT −14 to
 * −6 °C, amplitude 16–24 K, n_f 0.4–0.9 (tests/unit/active-layer-simulator.test.ts), where the Stefan
 * equation with all pore water reads 6–216 % high (worst in rock and dry gravel) and Kudryavtsev
 * (kudryavtsev.ts) 14 % high to 36 % low (peat). Special cases: no thaw season (I_t = 0) → 0;
 * TTOP ≥ 0 (no permafrost below) → the one-phase problem (B = 0), the depth a summer thaws into ground
 * at its freezing point; L = 0 with B = 0 → Infinity (no front). Small Ste and TTOP → 0: the Stefan depth √(2k₁·n_t·I_t/L). Neglects
 * freezing-point depression and unfrozen water (the front is the 0 °C isotherm) and the shape of the
 * season (a step of equal degree-days, not a half sine).
 */
export interface NeumannActiveLayerInput {
  meanAirTemp_C: number;
  amplitude_C: number;
  nThaw: number;
  /** Mean annual temperature at the top of permafrost (frozen side's initial temperature), °C. */
  ttop_C: number;
  kThawed_W_mK: number;
  kFrozen_W_mK: number;
  cThawed_J_m3K: number;
  cFrozen_J_m3K: number;
  latent_J_m3: number;
}

export function neumannActiveLayer_m(input: NeumannActiveLayerInput): number {
  const mean = requireRange('meanAirTemp_C', input.meanAirTemp_C, -80, 60, 'C');
  const amp = requireRange('amplitude_C', input.amplitude_C, 0, 80, 'K');
  const nt = requireNFactor('nThaw', input.nThaw);
  const ttop = requireRange('ttop_C', input.ttop_C, -80, 60, 'C');
  const kt = requirePositive('kThawed_W_mK', input.kThawed_W_mK, 'W/m/K');
  const kf = requirePositive('kFrozen_W_mK', input.kFrozen_W_mK, 'W/m/K');
  const ct = requirePositive('cThawed_J_m3K', input.cThawed_J_m3K, 'J/m3/K');
  const cf = requirePositive('cFrozen_J_m3K', input.cFrozen_J_m3K, 'J/m3/K');
  const L = requireNonNegative('latent_J_m3', input.latent_J_m3, 'J/m3');
  const thaw = degreeDays({ meanAirTemp_C: mean, amplitude_C: amp }).thawingIndex_Cd;
  return neumannActiveLayerKernel_m(nt * thaw, thawSeasonFraction(mean, amp), ttop, kt, kf, ct, cf, L);
}

/**
 * The same for hot loops, from the surface thawing index n_t·I_t (°C·day) and the thaw-season
 * fraction f_t; no validation (NaN for invalid input).
 */
export function neumannActiveLayerKernel_m(
  surfaceThawIndex_Cd: number,
  thawFraction: number,
  ttop_C: number,
  kThawed_W_mK: number,
  kFrozen_W_mK: number,
  cThawed_J_m3K: number,
  cFrozen_J_m3K: number,
  latent_J_m3: number,
): number {
  if (!(surfaceThawIndex_Cd > 0) || !(thawFraction > 0)) return surfaceThawIndex_Cd === 0 ? 0 : NaN;
  const seasonDays = thawFraction * PERIOD_DAYS;
  const vs = surfaceThawIndex_Cd / seasonDays;
  const ts = seasonDays * SECONDS_PER_DAY;
  const a1 = kThawed_W_mK / cThawed_J_m3K;
  const nu = Math.sqrt(a1 / (kFrozen_W_mK / cFrozen_J_m3K));
  const B = ttop_C < 0 ? ((kFrozen_W_mK / kThawed_W_mK) * nu * -ttop_C) / vs : 0;
  const lambda = neumannTwoPhaseLambdaKernel(B, nu, latent_J_m3 / (cThawed_J_m3K * vs));
  return 2 * lambda * Math.sqrt(a1 * ts);
}
