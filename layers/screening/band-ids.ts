/**
 * Every band id of the screening tiles, once: the per-cell model's output layers (in output order), the
 * basic TTOP + Stefan model's layers, the input grids the build echoes for the map and the site-study
 * prefill, and the pipeline's input-fallback flags. `BAND.thawDelay === 'thawDelay'`: code anywhere
 * else names a band through `BAND` (a typo is a type error), never through a string literal
 * (tests/unit/band-registry.test.ts greps the source for strays). Titles, units, kinds and classes of
 * each band are in band-registry.ts. This file imports nothing, so any module of layers/screening can
 * use it without an import cycle.
 *
 * To add a band: add its id to the right list here, then its entry in band-registry.ts (the type
 * checker asks for it); a model band also needs its value in the model (cell-kernel.ts) and its
 * scenario-dependent description in cell-layers.ts (DEVELOPERS.md, "Adding a band").
 */

/** Output layers of the per-cell screening model, in the order of its output array. */
export const METRIC_BAND_IDS = [
  'suitability',
  'suitabilityScore',
  'exclusion',
  'groundTemp',
  'groundTempEnd',
  'permafrostClassToday',
  'permafrostClassEnd',
  'activeLayer',
  'thawYear',
  'thawYearPiles',
  'thawDelay',
  'frozenMargin',
  'extractionPerPile',
  'pilesPerTon',
  'windowLower',
  'windowUpper',
  'windowUpperFluid',
  'windowUpperOvercool',
  'loadShare',
  'extractionCarried',
  'bindingLimit',
  'seasonalCop',
  'heatingDemand',
  'fuelSaved',
  'co2Avoided',
  'costSaved',
  'breakEvenCopFuel',
  'breakEvenCopCo2',
  'breakEvenCopCost',
  'fuelIncrease',
  'bedrockDepth',
  'thawStability',
  'excessIce',
  'zeroCurtain',
  'thawBeyondHorizon',
  // foundation checks, structure, system economics and class robustness (issue 13)
  'adfreezeTempEndPiles',
  'activeLayerEnd',
  'capacityStart',
  'capacityEnd',
  'capacityEndPiles',
  'capacityKept',
  'frostJackingUplift',
  'frostJackingRatio',
  'thawSettlement',
  'iceRichThawYear',
  'systemCop',
  'pumpPower',
  'capitalCost',
  'simplePayback',
  'classRobust',
  'robustnessFlags',
] as const;

/** Output layers of the basic TTOP + Stefan model (`pile-atlas build --model basic`). */
export const BASIC_BAND_IDS = ['magt_C', 'alt_m', 'permafrostClass'] as const;

/**
 * Input grids echoed as bands (when the model has no band of the same id): the map draws them and the
 * site study prefills from them. Depth to bedrock is echoed under the model's own id `bedrockDepth`,
 * so that every build, with either model, carries it under one id.
 */
export const INPUT_ECHO_BAND_IDS = [
  'textureClass',
  'bedrockDepth',
  'waterContent_m3m3',
  'meanAirTemp_C',
  'airAmplitude_C',
  'warming_C_per_yr',
] as const;

/**
 * Bands of the per-cell ensemble (`pile-atlas build --ensemble`, cell-ensemble-model.ts), after the
 * model's layers: P10/P50/P90 of five metrics, then the probability of success, the robust class, the
 * class agreement and which thaw-delay percentiles are lower bounds (thaw after the climate horizon).
 */
export const ENSEMBLE_BAND_IDS = [
  'pilesPerTonP10',
  'pilesPerTonP50',
  'pilesPerTonP90',
  'thawDelayP10',
  'thawDelayP50',
  'thawDelayP90',
  'groundTempEndP10',
  'groundTempEndP50',
  'groundTempEndP90',
  'fuelSavedP10',
  'fuelSavedP50',
  'fuelSavedP90',
  'simplePaybackP10',
  'simplePaybackP50',
  'simplePaybackP90',
  'successProbability',
  'robustClass',
  'classAgreement',
  'thawDelayRangeBound',
] as const;

/** Bands the pipeline itself adds (input fallbacks; distances to the settlements and to the roads layer). */
export const PIPELINE_BAND_IDS = ['inputFlags', 'settlementDistance_km', 'roadDistance_km'] as const;

/**
 * Bands a scenario-set build adds to every scenario after the first (data-pipeline/build/
 * scenario-difference-bands.ts): the change of suitability class from the first scenario, the years of
 * frozen-ground margin lost and the piles per ton added, cell by cell.
 */
export const SCENARIO_DIFFERENCE_BAND_IDS = ['classChange', 'frozenMarginLost', 'pilesPerTonAdded'] as const;

export type MetricBandId = (typeof METRIC_BAND_IDS)[number];
export type BasicBandId = (typeof BASIC_BAND_IDS)[number];
export type InputEchoBandId = (typeof INPUT_ECHO_BAND_IDS)[number];
export type PipelineBandId = (typeof PIPELINE_BAND_IDS)[number];
export type EnsembleBandId = (typeof ENSEMBLE_BAND_IDS)[number];
export type ScenarioDifferenceBandId = (typeof SCENARIO_DIFFERENCE_BAND_IDS)[number];
/** Any band id a build can write. */
export type BandId =
  MetricBandId | BasicBandId | InputEchoBandId | PipelineBandId | EnsembleBandId | ScenarioDifferenceBandId;

/** All band ids, no duplicates (bedrockDepth is both a model band and an echo: listed once). */
export const BAND_IDS: readonly BandId[] = [
  ...new Set<BandId>([
    ...METRIC_BAND_IDS,
    ...BASIC_BAND_IDS,
    ...INPUT_ECHO_BAND_IDS,
    ...PIPELINE_BAND_IDS,
    ...ENSEMBLE_BAND_IDS,
    ...SCENARIO_DIFFERENCE_BAND_IDS,
  ]),
];

/** `BAND.x === 'x'` for every band id: name a band in code through this object. */
export const BAND = Object.fromEntries(BAND_IDS.map((id) => [id, id])) as { readonly [K in BandId]: K };

/** Whether a string (e.g. a manifest band id or a `--where` name) is a known band id. */
export function isBandId(id: string): id is BandId {
  return (BAND_IDS as readonly string[]).includes(id);
}
