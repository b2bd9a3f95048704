/**
 * Structural screening of the standard pile, per cell, with and without the heat-exchanger piles
 * operating: long-term adfreeze capacity at the start and the end of the design life, the capacity the
 * piles' cooling keeps, frost-jacking uplift against the anchorage below the active layer, and thaw
 * settlement from excess ice.
 *
 * Method.
 *  - Design ground temperature along the shaft (below the permafrost table only; the active layer
 *    carries no adfreeze): the mean annual profile of the kernel (TTOP plus the geothermal gradient
 *    below the active layer, or the ground-temperature grid plus the gradient), plus the conduction
 *    warming W(z, t) of the surface trend at each depth (Carslaw & Jaeger §2.5, response-tables.ts),
 *    minus the piles' long-term cooling at the reference radius (the group's finite-line-source
 *    response at the reference point, held along the shaft: the ground between piles, cooled less than
 *    the shaft wall, so cautious), plus the warm-season anomaly of the annual wave, pinned so the
 *    warmest temperature of the year is 0 °C at the permafrost table (its definition) and decaying
 *    below it with the damping depth of frozen ground (Kusuda & Achenbach 1965 amplitude decay). The
 *    standard reads its adfreeze strength at the warmest design temperature of the year, as here.
 *  - Adfreeze capacity: adfreeze-strength.ts over the shaft from the permafrost table (today's active
 *    layer at the start, the end-of-life active layer at the end) to the pile tip, 10 midpoint slices.
 *  - Frost jacking: frost-jacking.ts with the end-of-life active layer as the frozen depth, the heave
 *    stress of the texture (frost-susceptible or not) and the smaller of the start and end-of-life
 *    (piles operating) capacities as the anchorage.
 *  - Thaw settlement: thaw-settlement.ts, excess ice times the thickness thawed within the life: the
 *    deepening of the active layer, or the ground down to the reference depth where that thaws with
 *    the piles operating within the life.
 * Validity: screening only; end bearing of the helices, negative skin friction in the thawing layer,
 * creep settlement and the cooling's end effects near the pile top and tip are not modelled.
 */
import { adfreezeStrengthKernel_kPa } from '../physics/adfreeze-strength';
import { frostHeaveUpliftKernel_kN, frostJackingRatioKernel } from '../physics/frost-jacking';
import { thawSettlementKernel_m } from '../physics/thaw-settlement';
import type { CellConstants } from './cell-constants';
import { rampWarming_K } from './response-tables';

const SEGMENTS = 10;

/** The shaft's ground-temperature profile of one cell (kernel step 3 quantities). */
export interface ShaftProfile {
  /** Mean annual temperature at the permafrost table today (TTOP or grid-based), °C. */
  tableTemp_C: number;
  /** Today's active layer, m. */
  activeLayer_m: number;
  /** Geothermal gradient below the table, K/m. */
  gradient_K_m: number;
  /** Surface warming rate, K/yr. */
  warmingRate_K_yr: number;
  /** Frozen-ground diffusivity, m²/yr. */
  diffusivity_m2_yr: number;
  /** Damping depth of the annual wave in frozen ground, m. */
  dampingDepth_m: number;
}

/**
 * Long-term adfreeze capacity of the standard pile, kN, `time_yr` into the life with permafrost table
 * at `table_m`, without piles and with the piles cooling the ground by `cooling_K` (both into
 * `out[0]`, `out[1]`: one pass over the same depths).
 */
export function shaftCapacityKernel_kN(
  k: CellConstants,
  p: ShaftProfile,
  time_yr: number,
  table_m: number,
  cooling_K: number,
  out: Float64Array,
): void {
  const s = k.scenario;
  const tip = s.pile.topDepth_m + s.pile.length_m;
  out[0] = 0;
  out[1] = 0;
  if (!(tip > table_m)) return;
  const t = k.tables;
  const b = p.warmingRate_K_yr;
  const a = p.diffusivity_m2_yr;
  // Mean annual temperature at the table at this time (warming included) pins the warm anomaly.
  const meanTable =
    p.tableTemp_C +
    p.gradient_K_m * Math.max(0, table_m - p.activeLayer_m) +
    rampWarming_K(t, table_m, time_yr, b, a);
  const anomaly0 = Math.max(0, -meanTable);
  const anomaly1 = Math.max(0, -(meanTable - cooling_K));
  const dz = (tip - table_m) / SEGMENTS;
  // e^(−(z − table)/d) at the slice midpoints, as a geometric sequence (one exponential per call).
  const ratio = Math.exp(-dz / p.dampingDepth_m);
  let decay = Math.exp((-0.5 * dz) / p.dampingDepth_m);
  let sum0 = 0;
  let sum1 = 0;
  for (let i = 0; i < SEGMENTS; i++, decay *= ratio) {
    const z = table_m + (i + 0.5) * dz;
    const mean =
      p.tableTemp_C + p.gradient_K_m * Math.max(0, z - p.activeLayer_m) + rampWarming_K(t, z, time_yr, b, a);
    sum0 += adfreezeStrengthKernel_kPa(mean + anomaly0 * decay);
    // No cooling: the same temperature (mean − 0, the same anomaly), so the same strength.
    if (cooling_K !== 0) sum1 += adfreezeStrengthKernel_kPa(mean - cooling_K + anomaly1 * decay);
  }
  if (cooling_K === 0) sum1 = sum0;
  const area = 2 * Math.PI * s.pile.radius_m * dz;
  out[0] = sum0 * area;
  out[1] = sum1 * area;
}

/** Structural results of one cell (kN, m). */
export interface FoundationResult {
  capacityStart_kN: number;
  capacityEnd_kN: number;
  capacityEndPiles_kN: number;
  uplift_kN: number;
  jackingRatio: number;
  settlement_m: number;
  /** Scratch for shaftCapacityKernel_kN. */
  work: Float64Array;
}

/**
 * Capacities, frost jacking and thaw settlement of one cell into `out` (kernel: no checks).
 * `coolingEnd_K` is the piles' cooling at the reference point at the end of the life;
 * `thawsInLife` whether the reference depth thaws within the life with the piles operating.
 */
export function foundationKernel(
  k: CellConstants,
  p: ShaftProfile,
  q: {
    activeLayerEnd_m: number;
    coolingEnd_K: number;
    frostSusceptible: boolean;
    excessIce_m3m3: number;
    thawsInLife: boolean;
  },
  out: FoundationResult,
): void {
  const s = k.scenario;
  const f = s.suitability.foundation;
  const life = s.designLife_yr;
  const altEnd = Math.max(p.activeLayer_m, q.activeLayerEnd_m);
  const c = out.work;
  shaftCapacityKernel_kN(k, p, 0, p.activeLayer_m, 0, c);
  out.capacityStart_kN = c[0];
  shaftCapacityKernel_kN(k, p, life, altEnd, q.coolingEnd_K, c);
  out.capacityEnd_kN = c[0];
  out.capacityEndPiles_kN = c[1];
  const heave = q.frostSusceptible ? f.heaveStressFrostSusceptible_kPa : f.heaveStressCoarse_kPa;
  out.uplift_kN = frostHeaveUpliftKernel_kN(heave, s.pile.radius_m, altEnd);
  out.jackingRatio = frostJackingRatioKernel(
    out.uplift_kN,
    Math.min(out.capacityStart_kN, out.capacityEndPiles_kN),
    f.deadLoadPerPile_kN,
    f.jackingSafetyFactor,
  );
  const thawed = q.thawsInLife ? s.referenceDepth_m - p.activeLayer_m : altEnd - p.activeLayer_m;
  out.settlement_m = thawSettlementKernel_m(q.excessIce_m3m3, thawed);
}

export function createFoundationResult(): FoundationResult {
  return {
    capacityStart_kN: 0,
    capacityEnd_kN: 0,
    capacityEndPiles_kN: 0,
    uplift_kN: 0,
    jackingRatio: 0,
    settlement_m: 0,
    work: new Float64Array(2),
  };
}
