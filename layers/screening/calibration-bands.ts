/**
 * The published agreement bounds between the per-cell model (the map's quick estimate) and the site
 * simulator, as the site study shows them beside each shared quantity: the P95 bounds of
 * |model − simulator| from README "Calibration against the site simulator" (50 seeded demo cells,
 * simulator at its coarse mesh and 7-day steps from the start year to the 2100 horizon, the model's one-pile form against
 * the simulator's pile). tests/unit/calibration-bands.test.ts holds
 * these equal to the bounds the calibration test enforces (tests/unit/screening-calibration-bounds.ts),
 * so they cannot drift apart. Quantities without a published bound (thaw delay, COP, fuel, CO2) are
 * shown without a band and the study says so.
 */

export interface CalibrationBand {
  /** 'absolute': |quick − simulated| ≤ value (in the quantity's unit); 'relative': ≤ value × |simulated|. */
  kind: 'absolute' | 'relative';
  value: number;
  /** What the bound was measured on, in words. */
  source: string;
}

const ON =
  'P95 bound, map model (one pile) against the site simulator on 50 demo cells (README, Calibration)';

export const CALIBRATION_BANDS = {
  /** Ground along the pile, K (bounds groundPile_K). */
  groundTemp: { kind: 'absolute', value: 0.12, source: ON },
  /** Active layer thickness, relative (activeLayer_rel). */
  activeLayer: { kind: 'relative', value: 0.13, source: ON },
  /** Heat per pile carried in bivalent operation, annual mean over the design life, relative (heatCarried_rel). */
  heatPerPile: { kind: 'relative', value: 0.22, source: ON },
  /** Piles per ton, relative (pilesPerTon_rel). */
  pileCount: { kind: 'relative', value: 0.21, source: ON },
  /** Share of the load carried, absolute (loadShare_abs). */
  loadShare: { kind: 'absolute', value: 0.08, source: ON },
  /** Thaw year without piles at the reference point, yr (noPileThaw_yr). */
  noPileThaw: { kind: 'absolute', value: 9.5, source: ON },
} as const satisfies Record<string, CalibrationBand>;

/** Whether a quick estimate is within a band of the simulated value. */
export function withinBand(band: CalibrationBand, quick: number, simulated: number): boolean {
  const limit = band.kind === 'absolute' ? band.value : band.value * Math.abs(simulated);
  return Math.abs(quick - simulated) <= limit + 1e-9;
}
