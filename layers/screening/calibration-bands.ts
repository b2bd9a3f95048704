/**
 * The published agreement bounds between the per-cell model (the map's quick estimate) and the site
 * simulator, as the site study shows them beside each shared quantity.
 *
 * Source: README "Calibration against the site simulator" and the bounds the calibration test holds
 * (tests/unit/screening-calibration.test.ts, measured on 200 seeded demo cells against 196-year runs at
 * the simulator's standard numerics): thaw delay at the reference point |model − simulator| P95 bound
 * 5.5 yr where both runs thaw; pile count |relative error| P95 bound 33 %. Only these two quantities
 * have a published calibration; every other shared quantity is shown without a band and the study says
 * so (it is not calibrated, not "agreed"). When the calibration is rerun, update the figures here and in
 * the README together.
 */

export interface CalibrationBand {
  /** 'absolute': |quick − simulated| ≤ value (in the quantity's unit); 'relative': ≤ value × |simulated|. */
  kind: 'absolute' | 'relative';
  value: number;
  /** Where the bound comes from, in words. */
  source: string;
}

const SOURCE =
  'P95 bound of the calibration against the site simulator on 200 demo cells (README, Calibration)';

export const CALIBRATION_BANDS = {
  thawDelay: { kind: 'absolute', value: 5.5, source: SOURCE },
  pileCount: { kind: 'relative', value: 0.33, source: SOURCE },
} as const satisfies Record<string, CalibrationBand>;

/** Whether a quick estimate is within a band of the simulated value. */
export function withinBand(band: CalibrationBand, quick: number, simulated: number): boolean {
  const limit = band.kind === 'absolute' ? band.value : band.value * Math.abs(simulated);
  return Math.abs(quick - simulated) <= limit + 1e-9;
}
