/**
 * The operating window of a standard foundation pile in its group (domain-notes.md "The ground heat balance decides").
 *
 * Heat extraction, as an annual-average rate per metre of pile q'_a (W/m), is bounded
 *  - below by thaw: the least extraction that holds the ground at the reference radius and depth at
 *    −margin through the design life t_L under the warming trend:
 *      q'_min = max(0, T_ref + W(t_L) + margin) · 2πk / g_ref(t_L),
 *  - above by the fluid: the annual-average extraction of a foundation pile at its peak at the fluid
 *    limit, q'_fluid = a·Q/H, Q from the three-pulse equation month by month against the lagged ground
 *    (monthly-peak.ts; Kavanaugh & Rafferty 1997, as layers/site/pile-sizing.ts does it), a the
 *    annual-average over the peak ground load,
 *  - above by over-cooling: the largest extraction that cools the reference point by no more than
 *    ΔT_oc at the end of the design life: q'_oc = ΔT_oc·2πk / g_ref(t_L).
 * g_ref is the finite-line-source response of the whole foundation group at the reference point, at
 * the reference depth and radius (foundation-group.ts, response-tables.ts; Zeng, Diao & Fang 2002), all
 * piles carrying the same extraction. The upper bound is min(q'_fluid, q'_oc); the share of the
 * building's annual ground load the foundation piles carry is min(1, upper / q'_full). Binding limit:
 * 'thaw' when the carried extraction is below q'_min (the window is empty or the load too small to hold
 * the ground frozen), else 'over-cooling' or 'fluid' when the share is capped by that bound, else
 * 'none' (the load fits).
 * Validity: identical piles with equal loads, frozen ground around the piles (no latent heat), uniform
 * heat rate along each pile, surface held at its mean temperature.
 */
export const BINDING = { none: 0, thaw: 1, fluid: 2, overcooling: 3 } as const;
export const BINDING_LABELS: Record<number, string> = {
  0: 'none: the load fits the window',
  1: 'thaw: extraction cannot hold the ground frozen',
  2: 'fluid limit',
  3: 'over-cooling',
};

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
