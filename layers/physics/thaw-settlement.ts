/**
 * Thaw settlement of ice-rich permafrost from its excess ice.
 *
 * Method. When excess ice (ice beyond the soil's pore space) melts and its water drains, the ground
 * loses that volume: the thaw strain at zero load is the excess-ice volume fraction e, and the
 * settlement of a thawed thickness h is S = e·h (the settlement potential of Nelson, Anisimov &
 * Shiklomanov 2001, Nature 410:889–890, and 2002, Natural Hazards 26:203–225, thaw depth times ice
 * content; the A0 term of the thaw-consolidation relation S = Σ(A0 + A1·σ)·h, Andersland & Ladanyi
 * 2004, "Frozen Ground Engineering", 2nd ed., ch. on thaw settlement; recalled from memory, medium
 * confidence). Neglected: the 8.3 % volume loss of melting pore ice (small beside excess ice) and
 * consolidation under load (the A1·σ term: a foundation load adds to it, so S is a lower bound).
 */
import { requireNonNegative, requireRange } from './validate';

/** Thaw strain of frozen ground with excess-ice volume fraction e: e (drained, zero load). */
export function thawStrain(excessIce_m3m3: number): number {
  return requireRange('excessIce_m3m3', excessIce_m3m3, 0, 1, 'm3/m3');
}

/** Thaw settlement S = e·h, m (kernel: no checks; negative h counts as 0). */
export function thawSettlementKernel_m(excessIce_m3m3: number, thawedThickness_m: number): number {
  return excessIce_m3m3 * Math.max(0, thawedThickness_m);
}

/** Thaw settlement of `thawedThickness_m` of ground with excess ice e, m (checked). */
export function thawSettlement_m(p: { excessIce_m3m3: number; thawedThickness_m: number }): number {
  return thawSettlementKernel_m(
    thawStrain(p.excessIce_m3m3),
    requireNonNegative('thawedThickness_m', p.thawedThickness_m, 'm'),
  );
}
