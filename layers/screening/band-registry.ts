/**
 * The band registry: for every band id (band-ids.ts) its title in the trade's words, its unit as stored
 * (SI, or the North American unit the trade quotes, as piles per ton) with the unit shown in the North
 * American display system, its kind, colour ramp, legend range and, for class bands, the classes.
 * The pipeline writes these into the manifest (cell-layers.ts, compute-layers.ts), the web app reads
 * titles and units from the manifest and headline bands from here, the shortlist and the CLI name
 * bands through `BAND`. Scenario-dependent descriptions of the model bands live in cell-layers.ts.
 *
 * Unit `'¤/yr'`: ¤ is the scenario's currency code (cellLayers substitutes it).
 * `unitNA` must equal what web/src/units/display-units.ts prints for `unit` in the North American
 * system (tests/unit/band-registry.test.ts checks it).
 */
import { BAND_IDS, type BandId } from './band-ids';
import { EXCLUSION_LABELS, PERMAFROST_CLASS_LABELS, SUITABILITY_LABELS } from './suitability';
import { BINDING_LABELS } from './operating-window';
import { RANGE_BOUND_LABELS, THAW_HORIZON_LABELS } from './climate-horizon';
import { TEXTURE_CODES } from '../physics/texture-codes';
import { ROBUSTNESS_LABELS } from './robustness-labels';
import { CLASS_CHANGE_LABELS } from './scenario-difference';

export interface BandClass {
  value: number;
  label: string;
  description?: string;
}

export interface BandEntry {
  /** Title in the trade's words (map legend, readout, exports). */
  title: string;
  /** Unit as stored in the tiles ('' for classes, scores and ratios). */
  unit: string;
  /** Unit shown in the North American display system. */
  unitNA: string;
  kind: 'continuous' | 'class';
  ramp?: string;
  legendMin?: number;
  legendMax?: number;
  classes?: BandClass[];
  /** Description and source of bands whose text does not depend on the scenario (model bands: cell-layers.ts). */
  description?: string;
  source?: string;
}

const classes = (labels: Record<number, string>): BandClass[] =>
  Object.entries(labels).map(([value, label]) => ({ value: Number(value), label }));

const same = (unit: string) => ({ unit, unitNA: unit });
const degC = { unit: '°C', unitNA: '°F' };
const metre = { unit: 'm', unitNA: 'ft' };
const perMetre = { unit: 'W/m', unitNA: 'Btu/h·ft' };
const years = same('yr');
const none = same('');
const cont = (ramp: string, legendMin?: number, legendMax?: number) => ({
  kind: 'continuous' as const,
  ramp,
  ...(legendMin !== undefined ? { legendMin } : {}),
  ...(legendMax !== undefined ? { legendMax } : {}),
});
const cls = (c: BandClass[]) => ({ kind: 'class' as const, classes: c, ...none });
const INPUT = 'input grid (see sources)';
const echo = (title: string) => ({
  description: `${title} (input grid, bilinear resampling).`,
  source: INPUT,
});

/** Robust-class value meaning "uncertain" (after the suitability classes 0-3; cell-ensemble-model.ts). */
export const UNCERTAIN_CLASS_VALUE = 4;

/** The five metrics the ensemble reports as percentiles (their entries are shared with the percentiles). */
const METRIC_ENTRIES = {
  pilesPerTon: { title: 'Piles per ton of peak heating', ...same('piles/ton'), ...cont('cividis', 0, 40) },
  thawDelay: { title: 'Thaw delay', ...years, ...cont('viridis', 0, 50) },
  groundTempEnd: {
    title: 'Ground temperature at pile depth, end of life',
    ...degC,
    ...cont('blueOrange', -10, 2),
  },
  fuelSaved: { title: 'Fuel saved', unit: 'L/yr', unitNA: 'US gal/yr', ...cont('blueOrange') },
  simplePayback: { title: 'Simple payback against an oil furnace', ...years, ...cont('cividis', 0, 40) },
} satisfies Record<string, BandEntry>;
const kN = { unit: 'kN', unitNA: 'kip' };

/** One entry per band. */
export const BAND_REGISTRY: { readonly [K in BandId]: BandEntry } = {
  suitability: { title: 'Suitability class', ...cls(classes(SUITABILITY_LABELS)) },
  suitabilityScore: { title: 'Suitability score', ...none, ...cont('viridis', 0, 1) },
  exclusion: { title: 'Exclusion reason', ...cls(classes(EXCLUSION_LABELS)) },
  groundTemp: { title: 'Ground temperature at pile depth', ...degC, ...cont('blueOrange', -10, 2) },
  groundTempEnd: METRIC_ENTRIES.groundTempEnd,
  permafrostClassToday: { title: 'Permafrost class today', ...cls(classes(PERMAFROST_CLASS_LABELS)) },
  permafrostClassEnd: {
    title: 'Permafrost class, end of design life',
    ...cls(classes(PERMAFROST_CLASS_LABELS)),
  },
  activeLayer: { title: 'Active layer thickness', ...metre, ...cont('cividis', 0, 4) },
  thawYear: { title: 'Thaw year without piles', ...years, ...cont('viridis') },
  thawYearPiles: { title: 'Thaw year with piles', ...years, ...cont('viridis') },
  thawDelay: METRIC_ENTRIES.thawDelay,
  frozenMargin: { title: 'Frozen-ground margin', ...years, ...cont('viridis', -20, 100) },
  extractionPerPile: {
    title: 'Sustainable extraction per pile',
    unit: 'W',
    unitNA: 'Btu/h',
    ...cont('viridis'),
  },
  pilesPerTon: METRIC_ENTRIES.pilesPerTon,
  windowLower: { title: 'Operating window, lower bound', ...perMetre, ...cont('viridis') },
  windowUpper: { title: 'Operating window, upper bound', ...perMetre, ...cont('viridis') },
  windowUpperFluid: { title: 'Fluid-limited extraction', ...perMetre, ...cont('viridis') },
  windowUpperOvercool: { title: 'Over-cooling-limited extraction', ...perMetre, ...cont('viridis') },
  loadShare: { title: 'Share of heating load carried', ...none, ...cont('viridis', 0, 1) },
  extractionCarried: { title: 'Extraction carried', ...perMetre, ...cont('viridis') },
  bindingLimit: { title: 'Binding limit', ...cls(classes(BINDING_LABELS)) },
  seasonalCop: { title: 'Seasonal COP of the heat pump unit', ...none, ...cont('viridis', 1.5, 4) },
  heatingDemand: { title: 'Heating demand of the standard building', ...same('kWh/yr'), ...cont('cividis') },
  fuelSaved: METRIC_ENTRIES.fuelSaved,
  co2Avoided: { title: 'CO2 avoided', unit: 't/yr', unitNA: 'short ton/yr', ...cont('blueOrange') },
  costSaved: { title: 'Cost saved', ...same('¤/yr'), ...cont('blueOrange') },
  breakEvenCopFuel: { title: 'Break-even COP, fuel', ...none, ...cont('cividis') },
  breakEvenCopCo2: { title: 'Break-even COP, CO2', ...none, ...cont('cividis') },
  breakEvenCopCost: { title: 'Break-even COP, cost', ...none, ...cont('cividis') },
  fuelIncrease: {
    title: 'Heat pump increases fuel burn',
    ...cls([
      { value: 0, label: 'no' },
      { value: 1, label: 'yes: system COP below the fuel break-even' },
    ]),
  },
  bedrockDepth: {
    title: 'Depth to bedrock',
    ...metre,
    ...cont('cividis', 0, 40),
    description: 'Depth to bedrock (input grid, bilinear resampling; criterion raw value).',
    source: INPUT,
  },
  thawStability: { title: 'Thaw stability', ...none, ...cont('viridis', 0, 1) },
  excessIce: { title: 'Excess ice', ...same('m³/m³'), ...cont('cividis', 0, 0.5) },
  zeroCurtain: {
    title: 'Zero curtain at the end of life',
    ...cls([
      { value: 0, label: 'no' },
      { value: 1, label: 'yes: held at 0 °C while its ice melts' },
    ]),
  },
  thawBeyondHorizon: { title: 'Thaw beyond the climate horizon', ...cls(classes(THAW_HORIZON_LABELS)) },
  adfreezeTempEndPiles: {
    title: 'Adfreeze-zone ground temperature, end of life, piles operating',
    ...degC,
    ...cont('blueOrange', -6, 1),
  },
  activeLayerEnd: { title: 'Active layer thickness, end of life', ...metre, ...cont('cividis', 0, 4) },
  capacityStart: { title: 'Pile adfreeze capacity, start of life', ...kN, ...cont('viridis', 0, 1500) },
  capacityEnd: {
    title: 'Pile adfreeze capacity, end of life, no heat extraction',
    ...kN,
    ...cont('viridis', 0, 1500),
  },
  capacityEndPiles: {
    title: 'Pile adfreeze capacity, end of life, piles operating',
    ...kN,
    ...cont('viridis', 0, 1500),
  },
  capacityKept: { title: 'Pile capacity kept by the heat extraction', ...kN, ...cont('viridis', 0, 1000) },
  frostJackingUplift: { title: 'Frost-jacking uplift', ...kN, ...cont('cividis', 0, 400) },
  frostJackingRatio: { title: 'Frost-jacking demand over anchorage', ...none, ...cont('cividis', 0, 1.5) },
  thawSettlement: { title: 'Thaw settlement within the design life', ...metre, ...cont('cividis', 0, 0.3) },
  iceRichThawYear: {
    title: 'Thaw year of thaw-unstable ground, piles operating',
    ...years,
    ...cont('viridis'),
  },
  systemCop: { title: 'System seasonal COP', ...none, ...cont('viridis', 1.5, 4) },
  pumpPower: { title: 'Loop circulation pump power', unit: 'W', unitNA: 'Btu/h', ...cont('cividis') },
  capitalCost: { title: 'Capital cost of the heat-pump system', ...same('¤'), ...cont('cividis') },
  simplePayback: METRIC_ENTRIES.simplePayback,
  classRobust: {
    title: 'Class robust to the settings',
    ...cls([
      { value: 0, label: 'no: a nearby setting changes the class' },
      { value: 1, label: 'yes: same class under every tested change' },
    ]),
  },
  robustnessFlags: { title: 'Settings that change the class', ...cls(ROBUSTNESS_LABELS) },

  magt_C: {
    title: 'Mean annual ground temperature',
    ...degC,
    ...cont('blueOrange', -10, 4),
    description:
      'Mean annual temperature at the top of permafrost (or of the ground where none), from climate and soil.',
    source: 'TTOP model, Smith & Riseborough (1996, 2002); ground-temperature grid where given',
  },
  alt_m: {
    title: 'Active layer thickness',
    ...metre,
    ...cont('viridis', 0, 4),
    description: 'Depth of summer thaw below the surface.',
    source:
      'Stefan equation (e.g. Lunardini 1981, ch. 9) with Johansen conductivity and latent heat of the soil water',
  },
  permafrostClass: {
    title: 'Permafrost class',
    ...cls([
      { value: 0, label: 'no permafrost', description: 'Mean annual ground temperature above 0 °C.' },
      {
        value: 1,
        label: 'warm permafrost',
        description: 'Between the warm threshold and 0 °C: low adfreeze strength, creep.',
      },
      { value: 2, label: 'cold permafrost', description: 'Below the warm threshold (default −2 °C).' },
    ]),
    description: 'Permafrost class from the mean annual ground temperature.',
    source: 'thresholds: common practice (warm permafrost above about −2 °C)',
  },

  textureClass: {
    title: 'Soil texture class',
    ...cls(Object.entries(TEXTURE_CODES).map(([value, label]) => ({ value: Number(value), label }))),
    description: 'Dominant soil texture of the cell (input grid, nearest neighbour).',
    source: INPUT,
  },
  waterContent_m3m3: {
    title: 'Volumetric water + ice content',
    ...same('m³/m³'),
    ...cont('viridis', 0, 1),
    ...echo('Volumetric water + ice content'),
  },
  meanAirTemp_C: {
    title: 'Mean annual air temperature',
    ...degC,
    ...cont('blueOrange', -14, 2),
    ...echo('Mean annual air temperature'),
  },
  airAmplitude_C: {
    title: 'Annual air temperature amplitude',
    unit: 'K',
    unitNA: '°F (difference)',
    ...cont('viridis', 8, 26),
    ...echo('Annual air temperature amplitude'),
  },
  warming_C_per_yr: {
    title: 'Air warming trend',
    unit: 'K/yr',
    unitNA: '°F/yr',
    ...cont('cividis', 0, 0.1),
    ...echo('Air warming trend'),
  },
  inputFlags: { title: 'Input fallbacks', ...none, kind: 'class' },
  settlementDistance_km: {
    title: 'Distance to the nearest settlement',
    unit: 'km',
    unitNA: 'mi',
    ...cont('cividis', 0, 150),
    description:
      'Great-circle distance from the cell centre to the nearest settlement of the settlements layer (haversine, mean Earth radius).',
    source: 'pipeline: settlements layer (see sources); layers/screening/proximity.ts',
  },
  roadDistance_km: {
    title: 'Distance to the nearest road or track',
    unit: 'km',
    unitNA: 'mi',
    ...cont('cividis', 0, 100),
    description:
      'Distance from the cell centre to the nearest point or line of the imported roads layer (haversine to the nearest point of a segment).',
    source: 'pipeline: roads layer (see sources); layers/screening/proximity.ts',
  },

  // The per-cell ensemble (cell-ensemble-model.ts): percentiles keep their metric's unit and ramp.
  pilesPerTonP10: pct('pilesPerTon', 'P10'),
  pilesPerTonP50: pct('pilesPerTon', 'P50'),
  pilesPerTonP90: pct('pilesPerTon', 'P90'),
  thawDelayP10: pct('thawDelay', 'P10'),
  thawDelayP50: pct('thawDelay', 'P50'),
  thawDelayP90: pct('thawDelay', 'P90'),
  groundTempEndP10: pct('groundTempEnd', 'P10'),
  groundTempEndP50: pct('groundTempEnd', 'P50'),
  groundTempEndP90: pct('groundTempEnd', 'P90'),
  fuelSavedP10: pct('fuelSaved', 'P10'),
  fuelSavedP50: pct('fuelSaved', 'P50'),
  fuelSavedP90: pct('fuelSaved', 'P90'),
  simplePaybackP10: pct('simplePayback', 'P10'),
  simplePaybackP50: pct('simplePayback', 'P50'),
  simplePaybackP90: pct('simplePayback', 'P90'),
  successProbability: { title: 'Probability of success', ...none, ...cont('viridis', 0, 1) },
  robustClass: {
    title: 'Robust suitability class',
    ...cls([...classes(SUITABILITY_LABELS), { value: UNCERTAIN_CLASS_VALUE, label: 'uncertain' }]),
  },
  classAgreement: { title: 'Class agreement', ...none, ...cont('cividis', 0, 1) },
  thawDelayRangeBound: {
    title: 'Thaw delay percentiles past the climate horizon',
    ...cls(classes(RANGE_BOUND_LABELS)),
  },

  // Differences from the first scenario of a set, on every other scenario (scenario-difference.ts).
  classChange: {
    title: 'Suitability class against the first scenario',
    ...cls(classes(CLASS_CHANGE_LABELS)),
    description:
      'Suitability class of this scenario against the first scenario of the set, cell by cell: better, same or worse (poor < fair < good), or excluded under only one of the two.',
    source: 'pipeline: the two scenarios’ suitability classes (layers/screening/scenario-difference.ts)',
  },
  frozenMarginLost: {
    title: 'Frozen-ground margin lost against the first scenario',
    ...years,
    ...cont('blueOrange', -20, 20),
    description:
      'Frozen-ground margin of the first scenario minus that of this scenario: positive where this scenario leaves less margin.',
    source: 'pipeline: the two scenarios’ frozen-ground margins (layers/screening/scenario-difference.ts)',
  },
  pilesPerTonAdded: {
    title: 'Piles per ton added against the first scenario',
    ...same('piles/ton'),
    ...cont('blueOrange', -5, 5),
    description:
      'Piles per ton of peak heating of this scenario minus those of the first scenario: positive where this scenario needs more piles.',
    source: 'pipeline: the two scenarios’ piles per ton (layers/screening/scenario-difference.ts)',
  },
};

/** Registry entry of a percentile band: its metric's title with the percentile, unit, kind and ramp. */
function pct(metric: keyof typeof METRIC_ENTRIES, p: string): BandEntry {
  const m = METRIC_ENTRIES[metric];
  return { ...m, title: `${m.title}, ${p}` };
}

/** The registry entry of a band id, or undefined for an id no build writes. */
export function bandEntry(id: string): BandEntry | undefined {
  return (BAND_IDS as readonly string[]).includes(id) ? BAND_REGISTRY[id as BandId] : undefined;
}

/**
 * Bands the map's hover readout and the cell panel lead with, in this order (class, ground, sizing,
 * thaw margin).
 */
export const HEADLINE_BAND_IDS: readonly BandId[] = ['suitability', 'groundTemp', 'pilesPerTon', 'thawDelay'];

/** The band the map opens on when the manifest has it. */
export const DEFAULT_MAP_BAND: BandId = 'suitability';
