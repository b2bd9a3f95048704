/**
 * Frost jacking of a pile: the uplift the freezing active layer exerts on the shaft through adfreeze,
 * against the anchorage of the shaft in the permafrost below and the dead load.
 *
 * Method. Uplift U = σ_h·p·z_f (σ_h the tangential frost-heave stress on the shaft, p the shaft
 * perimeter, z_f the depth of seasonal freezing, here the active-layer thickness: the winter freezes
 * it down to the permafrost table). Measured tangential heave stresses on steel in freezing silt are
 * about 150–350 kPa (published laboratory and field studies, e.g. Penner & Gold 1971, Can. Geotech. J.
 * 8:514–526; range as domain-notes.md gives it); non-frost-susceptible gravels and sands transmit
 * little (judgement, common practice). The pile holds when U ≤ (Q_anchor + D)/F, F a factor of safety;
 * the jacking ratio U·F/(Q_anchor + D) above 1 fails the check.
 * Validity: uniform heave stress over the frozen depth (the stress peaks near the surface in
 * reality); the anchorage is the long-term adfreeze capacity below the active layer (adfreeze-strength.ts).
 */
import { requireFinite, requireNonNegative, requirePositive } from './validate';

/** Frost-heave uplift on a pile shaft, kN: σ_h·2πr·z_f (kernel: no checks). */
export function frostHeaveUpliftKernel_kN(
  heaveStress_kPa: number,
  radius_m: number,
  frozenDepth_m: number,
): number {
  return heaveStress_kPa * 2 * Math.PI * radius_m * Math.max(0, frozenDepth_m);
}

/** Frost-heave uplift on a pile shaft, kN (checked form of frostHeaveUpliftKernel_kN). */
export function frostHeaveUplift_kN(p: {
  heaveStress_kPa: number;
  radius_m: number;
  frozenDepth_m: number;
}): number {
  return frostHeaveUpliftKernel_kN(
    requireNonNegative('heaveStress_kPa', p.heaveStress_kPa, 'kPa'),
    requirePositive('radius_m', p.radius_m, 'm'),
    requireNonNegative('frozenDepth_m', p.frozenDepth_m, 'm'),
  );
}

/**
 * Jacking ratio U·F/(Q_anchor + D): above 1 the pile jacks (kernel: NaN in → NaN; Infinity when the
 * resistance is 0 and the uplift is not).
 */
export function frostJackingRatioKernel(
  uplift_kN: number,
  anchorage_kN: number,
  deadLoad_kN: number,
  safetyFactor: number,
): number {
  const hold = anchorage_kN + deadLoad_kN;
  if (uplift_kN === 0) return 0;
  return hold > 0 ? (uplift_kN * safetyFactor) / hold : Infinity;
}

/** Checked form of frostJackingRatioKernel. */
export function frostJackingRatio(p: {
  uplift_kN: number;
  anchorage_kN: number;
  deadLoad_kN: number;
  safetyFactor: number;
}): number {
  return frostJackingRatioKernel(
    requireNonNegative('uplift_kN', p.uplift_kN, 'kN'),
    requireNonNegative('anchorage_kN', p.anchorage_kN, 'kN'),
    requireNonNegative('deadLoad_kN', p.deadLoad_kN, 'kN'),
    requireFinite('safetyFactor', p.safetyFactor),
  );
}
