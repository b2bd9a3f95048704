/**
 * Published calibration bounds (README, "Calibration against the site simulator"): |model − simulator|
 * per quantity, median and P95, and the least number of comparable cells. Measured on the committed
 * 50-cell sample (bench/calibration.ts 50 2026; the simulator's coarse mesh and 7-day steps, start year to
 * the 2100 horizon, its pile in building mode with the study's standard pile; 46 cells simulated, 4
 * excluded by the model), then set a little above the measured value, so that a re-run after a change of
 * the simulator's own numerics of the size of issue 20's convergence study passes while a model change
 * of the size of the errors fails.
 * Measured (all textures, median / P95): ground along the pile 0.052 / 0.113 K; active layer 3.0 / 12.3 %;
 * end-of-life ground 0.10 / 0.28 K (model warmer); lowest monthly mean fluid 0.075 / 0.166 K; heat per pile
 * carried (bivalent operation, annual mean over the design life) 5.4 / 21.4 % (model lower: the simulated
 * winter ground is warmer, latent heat of the active layer and of the unfrozen water; peat's P95 42 %);
 * piles per ton 7.8 / 20.3 % (model higher, same cause); load share 0.050 / 0.076 (model lower); thaw
 * without piles at the reference point 4.1 / 5.5 yr on the 2 cells that thaw before 2100 in both (the
 * model later). Before/after-2100 agreement 46 of 46 cells without and with piles. The thaw delay has no
 * cell where both runs thaw before the horizon and is not bounded here (reported in the README).
 * Earlier bounds (200 cells, standard mesh, the simulator's pile extracting the model's load with the
 * model's monthly profile, heat at the fluid limit): README "What moved".
 */
export const BOUNDS = {
  groundPile_K: { median: 0.06, p95: 0.12, minComparable: 40 },
  activeLayer_rel: { median: 0.035, p95: 0.13, minComparable: 40 },
  groundEnd_K: { median: 0.12, p95: 0.3, minComparable: 40 },
  lowestMeanFluid_K: { median: 0.09, p95: 0.18, minComparable: 40 },
  heatCarried_rel: { median: 0.06, p95: 0.22, minComparable: 40 },
  pilesPerTon_rel: { median: 0.085, p95: 0.21, minComparable: 40 },
  loadShare_abs: { median: 0.055, p95: 0.08, minComparable: 40 },
  noPileThaw_yr: { median: 6.5, p95: 9.5, minComparable: 2 },
  thawAgreement: { minShare: 0.95 },
} as const;

export type BoundedQuantity = Exclude<keyof typeof BOUNDS, 'thawAgreement'>;
