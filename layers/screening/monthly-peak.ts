/**
 * Peak extraction of a foundation pile at the fluid limit, month by month against the lagged ground.
 *
 * Method: the three-pulse design equation (Kavanaugh & Rafferty 1997; ASHRAE Handbook—HVAC
 * Applications, geothermal chapter; reference-values §10) in the superposition form of
 * layers/site/pile-sizing.ts (after Bernier et al. 2008), written for one pile of a group whose piles
 * all carry the same load, with the peak Q per pile (W) as the unknown. For each calendar month m,
 *   H·(T_g(m) − T_f) = Q·{[a·g_N(t_L) + (f_m − a)·g_N(t_M + t_p) + (p_m − f_m)·g_c(t_p)]/(2πk) + p_m·R_b},
 * a the annual-average ground load over the design peak, f_m month m's mean ground load over the design
 * peak, p_m month m's peak over the design peak (p = 1 in the design month), g_N the group's
 * finite-line-source field response (mean over its piles), g_c = 2πG the cylinder source at the pile
 * wall, t_L the design life, t_M one month, t_p the 6-hour peak, T_f the mean fluid temperature at the
 * fluid limit (layers/physics/fluid-temperature-convention.ts). Q is the smallest right-hand solution
 * over the months whose braces are positive: the month that limits is the one whose load meets the
 * coldest ground, not necessarily the month of the design peak.
 * Ground: T_g(m) = T̄ − A_s·Re(P·e^(iθ_m)), the Kusuda & Achenbach (1965) annual wave averaged over the
 * pile's active length z1…z2 as a phasor,
 *   P = (d/(z2 − z1))·(e^(−(1+i)z1/d) − e^(−(1+i)z2/d))/(1 + i),  d = √(Pα/π) (damping depth),
 * θ_m = 2πm/12 the month's centre, m = 0 the coldest month of the surface wave. |P| ≤ 1; arg P is the
 * lag of the pile-averaged wave (about two months for the standard pile). A_s is the surface amplitude.
 * Simplifications: as in the method, the months before m enter only through the annual average (the
 * month's own pulse is one month long; the full monthly history, as in pile-sizing.ts's life series,
 * deepens the design month's fluid drop by about 1 % for an isolated pile, measured, and somewhat more in
 * the months after the coldest); conduction only (no latent heat near the pile).
 */
import { dampingDepth_m } from '../physics/ground-temperature-wave';

export const MONTHS = 12;
const COS = Float64Array.from({ length: MONTHS }, (_, m) => Math.cos((2 * Math.PI * m) / MONTHS));
const SIN = Float64Array.from({ length: MONTHS }, (_, m) => Math.sin((2 * Math.PI * m) / MONTHS));

/** cos and sin of the month centres θ_m = 2πm/12 (shared with the kernel's monthly loads). */
export const MONTH_COS: Readonly<Float64Array> = COS;
export const MONTH_SIN: Readonly<Float64Array> = SIN;

/** Phasor P of the pile-averaged annual wave (module comment), written into `out` [re, im]. */
export function pileWavePhasor(
  p: { diffusivity_m2_s: number; top_m: number; bottom_m: number },
  out: Float64Array,
): Float64Array {
  const d = dampingDepth_m(p.diffusivity_m2_s);
  const u1 = p.top_m / d;
  const u2 = p.bottom_m / d;
  const e1 = Math.exp(-u1);
  const e2 = Math.exp(-u2);
  // e^(−(1+i)u1) − e^(−(1+i)u2) = re + i·im;  (re + i·im)/(1 + i) = ((re + im) + i(im − re))/2
  const re = e1 * Math.cos(u1) - e2 * Math.cos(u2);
  const im = -e1 * Math.sin(u1) + e2 * Math.sin(u2);
  const c = d / (2 * (p.bottom_m - p.top_m));
  out[0] = c * (re + im);
  out[1] = c * (im - re);
  return out;
}

/** Cold anomaly of the pile-averaged ground in month m, K (> 0: colder than the mean). */
export function monthAnomaly_K(surfaceAmplitude_C: number, phasor: Float64Array, month: number): number {
  return surfaceAmplitude_C * (phasor[0] * COS[month] - phasor[1] * SIN[month]);
}

export interface MonthlyPeakInput {
  /** Mean ground temperature along the pile, °C. */
  groundMean_C: number;
  /** Surface amplitude of the annual wave, K, and the pile-average phasor (pileWavePhasor). */
  surfaceAmplitude_C: number;
  phasor: Float64Array;
  /** Mean fluid temperature at the fluid limit, °C. */
  meanFluid_C: number;
  length_m: number;
  resistance_mK_W: number;
  conductivity_W_mK: number;
  /** g_N(t_L), g_N(t_M + t_p) of the group and 2πG(t_p) of the cylinder at the pile wall. */
  gLife: number;
  gMonth: number;
  gPeak: number;
  annualFraction: number;
  /** f_m and p_m of the 12 months (module comment). */
  monthlyFraction: Float64Array;
  peakFraction: Float64Array;
}

/**
 * Peak ground extraction per pile at the fluid limit, W (module comment); ≤ 0 when some month's
 * ground is no warmer than the fluid. Writes the limiting month (0-11) into out[0] (kernel: no checks).
 */
export function monthlyPeakPerPile_W(p: MonthlyPeakInput, out: Float64Array): number {
  return monthlyPeakFromAvailable_W(p, monthsAvailable_K(p, AVAILABLE), out);
}

const AVAILABLE = new Float64Array(MONTHS);

/** T_g(m) − T_f of the 12 months, K, into `out` (independent of the field responses). */
export function monthsAvailable_K(p: MonthlyPeakInput, out: Float64Array): Float64Array {
  for (let m = 0; m < MONTHS; m++)
    out[m] = p.groundMean_C - monthAnomaly_K(p.surfaceAmplitude_C, p.phasor, m) - p.meanFluid_C;
  return out;
}

/**
 * monthlyPeakPerPile_W with the months' T_g(m) − T_f from monthsAvailable_K (callers that vary only
 * the field responses reuse them).
 */
export function monthlyPeakFromAvailable_W(
  p: MonthlyPeakInput,
  available_K: Float64Array,
  out: Float64Array,
): number {
  const twoPiK = 2 * Math.PI * p.conductivity_W_mK;
  const base = (p.annualFraction * (p.gLife - p.gMonth)) / twoPiK;
  // The smallest H·avail_m/per_m over the months with per_m > 0, compared as avail_m·per_best <
  // avail_best·per_m (no division per month); H > 0.
  let bestAvail = 0;
  let bestPer = 0;
  let month = -1;
  const gMonthPeak = p.gMonth - p.gPeak;
  const gPeak = p.gPeak;
  const rb = p.resistance_mK_W;
  const monthly = p.monthlyFraction;
  const peak = p.peakFraction;
  for (let m = 0; m < MONTHS; m++) {
    const f = monthly[m];
    const pk = peak[m];
    const per = base + (f * gMonthPeak + pk * gPeak) / twoPiK + pk * rb;
    if (!(per > 0)) continue;
    const avail = available_K[m];
    if (Number.isNaN(avail)) continue;
    if (month < 0 || avail * bestPer < bestAvail * per) {
      bestAvail = avail;
      bestPer = per;
      month = m;
    }
  }
  out[0] = month;
  return month < 0 ? NaN : (p.length_m * bestAvail) / bestPer;
}
