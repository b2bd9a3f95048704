/**
 * The operating window of a standard pile (domain-notes.md "The ground heat balance decides").
 *
 * Heat extraction, as an annual-average rate per metre of pile q'_a (W/m), is bounded
 *  - below by thaw: the least extraction that holds the ground at the reference radius and depth at
 *    −margin through the design life t_L under the warming trend:
 *      q'_min = max(0, T_ref + W(t_L) + margin) · 2πk / g_ref(t_L),
 *  - above by the fluid: the three-pulse design equation (Kavanaugh & Rafferty 1997; ASHRAE Handbook
 *    HVAC Applications, geothermal chapter; reference-values §10) for one pile at its peak load q_h,
 *      H·(T_g − T_f) = q_h·[a·R_ga + R_b + m·R_gm + R_gd],  q'_fluid = a·q_h/H,
 *    with a = annual-average/peak load, m = peak-month/peak load (PLF_m), T_f = minimum entering fluid
 *    temperature + half the loop ΔT, R_gm and R_gd from the infinite cylinder source (Bernier 2001 fit)
 *    for 1 month and 6 h, and the long pulse R_ga from the finite line source mean over the pile
 *    (Eskilson 1987) over the design life (an infinite cylinder would keep cooling a 10 m pile for
 *    ever; the finite line reaches its steady state within a few years, H²/9α),
 *  - above by over-cooling: the largest extraction that cools the reference point by no more than
 *    ΔT_oc at the end of the design life: q'_oc = ΔT_oc·2πk / g_ref(t_L).
 * g_ref is the finite line source at the pile's mid-depth and the reference radius (Zeng, Diao & Fang
 * 2002). The upper bound is min(q'_fluid, q'_oc); the share of the building's annual ground load the
 * foundation piles carry is min(1, upper / q'_full). Binding limit: 'thaw' when the carried extraction
 * is below q'_min (the window is empty or the load too small to hold the ground frozen), else
 * 'over-cooling' or 'fluid' when the share is capped by that bound, else 'none' (the load fits).
 * This is the equation of sizePileField (layers/site/pile-sizing.ts, after Bernier et al. 2008) for one
 * pile with a continuous pile count, evaluated in closed form per cell (that function sizes an integer
 * pile group with interaction and is meant for one site at a time).
 * Validity: single pile (no group interference, as in the site simulator), frozen ground around the
 * pile (no latent heat), uniform heat rate along the pile, surface held at its mean temperature.
 */
import { cylinderSourceGBernier } from '../physics/infinite-cylinder-source';

export const BINDING = { none: 0, thaw: 1, fluid: 2, overcooling: 3 } as const;
export const BINDING_LABELS: Record<number, string> = {
  0: 'none: the load fits the window',
  1: 'thaw: extraction cannot hold the ground frozen',
  2: 'fluid limit',
  3: 'over-cooling',
};

const MONTH_S = (365 * 86400) / 12;
const SIX_HOURS_S = 6 * 3600;

export interface ThreePulseInput {
  /** Undisturbed ground temperature around the pile, °C. */
  groundTemp_C: number;
  /** Mean fluid temperature at the peak (minimum EFT + half the loop ΔT), °C. */
  meanFluid_C: number;
  length_m: number;
  radius_m: number;
  resistance_mK_W: number;
  conductivity_W_mK: number;
  diffusivity_m2_s: number;
  /** Annual-average load / peak load. */
  annualFraction: number;
  /** Peak-month load / peak load. */
  monthlyFraction: number;
  /** FLS mean response of the standard pile at the design life, g(t_L), and at one month, g(1 month). */
  gLife: number;
  gMonth: number;
}

/**
 * Peak extraction of one pile at the fluid limit, W (three-pulse equation above); ≤ 0 when the ground
 * is no warmer than the fluid (kernel: no checks, NaN propagates).
 */
export function threePulsePeakPerPile_W(p: ThreePulseInput): number {
  const k = p.conductivity_W_mK;
  const rb2 = p.radius_m * p.radius_m;
  const gM = cylinderSourceGBernier((p.diffusivity_m2_s * (MONTH_S + SIX_HOURS_S)) / rb2);
  const gD = cylinderSourceGBernier((p.diffusivity_m2_s * SIX_HOURS_S) / rb2);
  const rGa = Math.max(0, p.gLife - p.gMonth) / (2 * Math.PI * k);
  const rGm = (gM - gD) / k;
  const rGd = gD / k;
  const total = p.annualFraction * rGa + p.resistance_mK_W + p.monthlyFraction * rGm + rGd;
  return (p.length_m * (p.groundTemp_C - p.meanFluid_C)) / total;
}

export interface WindowResult {
  lower_W_m: number;
  upperFluid_W_m: number;
  upperOvercool_W_m: number;
  upper_W_m: number;
  /** Annual-average extraction the foundation piles carry, W/m. */
  carried_W_m: number;
  loadShare: number;
  binding: number;
}

/**
 * Window bounds, carried share and binding limit (module comment). `full_W_m` is the annual-average
 * extraction per metre of foundation pile that would carry the whole heating load.
 */
export function operatingWindow(
  w: {
    referenceTemp_C: number;
    warmingAtLife_K: number;
    frozenMargin_K: number;
    overcooling_K: number;
    conductivity_W_mK: number;
    gReferenceLife: number;
    upperFluid_W_m: number;
    full_W_m: number;
  },
  out: WindowResult,
): WindowResult {
  const per = (2 * Math.PI * w.conductivity_W_mK) / w.gReferenceLife;
  const excess = w.referenceTemp_C + w.warmingAtLife_K + w.frozenMargin_K;
  out.lower_W_m = excess > 0 ? excess * per : 0;
  out.upperFluid_W_m = w.upperFluid_W_m;
  out.upperOvercool_W_m = w.overcooling_K * per;
  out.upper_W_m = Math.max(0, Math.min(out.upperFluid_W_m, out.upperOvercool_W_m));
  out.loadShare = w.full_W_m > 0 ? Math.min(1, out.upper_W_m / w.full_W_m) : 0;
  out.carried_W_m = out.loadShare * w.full_W_m;
  if (out.carried_W_m < out.lower_W_m) out.binding = BINDING.thaw;
  else if (out.loadShare < 1) {
    out.binding = out.upperOvercool_W_m < out.upperFluid_W_m ? BINDING.overcooling : BINDING.fluid;
  } else out.binding = BINDING.none;
  return out;
}
