/**
 * Suitability of a cell for foundation-pile heat exchangers: hard exclusions kept apart from weighted
 * soft criteria, and permafrost temperature classes (domain-notes.md "Permafrost classes and hazards").
 *
 * Method. A cell is excluded (class 0) by the first failing hard criterion, in this order: outside the
 * data (a required input is missing), bedrock too shallow for screw piles (or bedrock texture), no
 * permafrost (ground at pile depth ≥ 0 °C), ground already thawed (active layer reaches the reference
 * depth), fluid limit reached (the ground is too cold for the fluid to take any heat above the heat
 * pump's minimum entering temperature). Otherwise each soft criterion scores linearly from 0 at its
 * `poor` value to 1 at its `good` value (clamped; a missing value scores 0), and the suitability score
 * is the weight-normalised sum: score ≥ goodScore → good (3), ≥ fairScore → fair (2), else poor (1).
 * The verdict of a soft criterion is 'pass' when its score ≥ 0.5, i.e. its raw value is on the good side
 * of the midpoint `threshold` = (good + poor)/2. Thresholds and weights are scenario settings
 * (judgement, common practice); permafrost classes follow Ran et al. (2022, ESSD 14:865-884):
 * cold < −3 °C, cool −3 to −1.5 °C, warm > −1.5 °C, configurable.
 */
import type { Scenario } from './scenario';
import { BAND } from './band-ids';

/** Exclusion reason codes (band `exclusion`), in the order the checks run (cell-class.ts). */
export const EXCLUSION = {
  none: 0,
  outsideData: 1,
  bedrockShallow: 2,
  noPermafrost: 3,
  alreadyThawed: 4,
  fluidLimit: 5,
  adfreezeWarm: 6,
  thawUnstable: 7,
  frostJacking: 8,
} as const;

export const EXCLUSION_LABELS: Record<number, string> = {
  0: 'not excluded',
  1: 'outside the data',
  2: 'rock within the pile length (screw piles need soil to the tip and below)',
  3: 'no permafrost',
  4: 'ground already thawed at the reference depth',
  5: 'fluid limit reached (ground too cold to extract heat)',
  6: 'adfreeze zone too warm at the end of the design life, piles operating',
  7: 'thaw-unstable (ice-rich) ground thaws within the design life plus margin',
  8: 'frost-jacking uplift exceeds the anchorage',
};

/** Suitability classes (band `suitability`). */
export const SUITABILITY_LABELS: Record<number, string> = { 0: 'excluded', 1: 'poor', 2: 'fair', 3: 'good' };

/** Permafrost temperature classes (bands `permafrostClassToday`, `permafrostClassEnd`). */
export const PERMAFROST_CLASS_LABELS: Record<number, string> = {
  0: 'not frozen',
  1: 'warm',
  2: 'cool',
  3: 'cold',
};

/**
 * Permafrost class of a mean annual ground temperature: 0 not frozen (≥ 0 °C), 1 warm (> warmAbove_C),
 * 2 cool, 3 cold (< coldBelow_C); NaN → NaN.
 */
export function permafrostClass(temp_C: number, t: Scenario['permafrostClasses']): number {
  if (Number.isNaN(temp_C)) return NaN;
  if (temp_C >= 0) return 0;
  if (temp_C > t.warmAbove_C) return 1;
  if (temp_C >= t.coldBelow_C) return 2;
  return 3;
}

/** Linear score: 1 at `good`, 0 at `poor`, clamped to [0, 1]; NaN → 0 (a missing value never helps). */
export function linearScore(value: number, good: number, poor: number): number {
  if (Number.isNaN(value)) return 0;
  if (good === poor) return value === good ? 1 : good > poor ? (value > good ? 1 : 0) : value < good ? 1 : 0;
  const s = (value - poor) / (good - poor);
  return s <= 0 ? 0 : s > 1 ? 1 : s;
}

/**
 * Thaw stability of the ground, 0 (unstable) to 1 (stable): a texture factor (gravel and bedrock 1,
 * sand 0.9, silt 0.4, clay 0.3, peat 0: ice-rich fine soils and peat settle on thaw, gravels and bedrock
 * are thaw-stable, domain-notes; factors are judgement (common practice)) times an ice-content factor,
 * 1 at ≤ 0.2 m³/m³ falling linearly to 0 at ≥ 0.7 m³/m³ (ice-rich) (common practice).
 */
export function thawStabilityScore(textureClass: number, waterContent_m3m3: number): number {
  const f = TEXTURE_STABILITY[textureClass];
  if (f === undefined || Number.isNaN(waterContent_m3m3)) return NaN;
  return f * linearScore(waterContent_m3m3, 0.2, 0.7);
}
const TEXTURE_STABILITY: Record<number, number> = { 1: 1, 2: 0.9, 3: 0.4, 4: 0.3, 5: 0, 6: 1 };

/** Frost-susceptible textures (silt, clay, peat): cooling them risks heave and frost jacking. */
export function isFrostSusceptible(textureClass: number): boolean {
  return textureClass === 3 || textureClass === 4 || textureClass === 5;
}

export type Comparison = '<' | '<=' | '>' | '>=' | '!=';

/** One criterion of the class card (also written to the manifest's `criteria`). */
export interface CriterionDefinition {
  id: string;
  title: string;
  /** Band holding the criterion's raw value. */
  bandId: string;
  unit: string;
  kind: 'exclusion' | 'soft';
  /** The raw value passes when `value <comparison> threshold`. */
  comparison: Comparison;
  threshold: number;
  /** Normalised weight in the score (0 for exclusions). */
  weight: number;
  /** Soft criteria: raw value scoring 1 and 0. */
  good?: number;
  poor?: number;
  description: string;
}

export function passes(value: number, c: Comparison, threshold: number): boolean {
  switch (c) {
    case '<':
      return value < threshold;
    case '<=':
      return value <= threshold;
    case '>':
      return value > threshold;
    case '>=':
      return value >= threshold;
    case '!=':
      return value !== threshold;
  }
}

/**
 * The ids of the soft criteria, in score order (the hot path indexes by this order). One energy
 * criterion (community fuel saved at the system COP: it already holds the load share and the COP),
 * coldness judged at the end of the design life with the piles operating, the frost-jacking margin
 * (the structural margin of the cooled foundation, independent of the temperature criteria: it is set
 * by the active layer and the texture) and thaw stability (texture and ice).
 */
export const SOFT_CRITERIA_IDS = ['coldness', 'energy', 'jackingMargin', BAND.thawStability] as const;

/** Band holding each soft criterion's raw value. */
export const SOFT_CRITERIA_BANDS = [
  BAND.adfreezeTempEndPiles,
  BAND.fuelSaved,
  BAND.frostJackingRatio,
  BAND.thawStability,
] as const;

/** The good (score 1) and poor (score 0) ends of each soft criterion, in SOFT_CRITERIA_IDS order. */
export function softRanges(s: Scenario): [number, number][] {
  const u = s.suitability;
  return [
    [u.coldness.good_C, u.coldness.poor_C],
    [u.energy.good_L, u.energy.poor_L],
    [u.jackingMargin.good, u.jackingMargin.poor],
    [1, 0],
  ];
}

/** Title, unit and description of each soft criterion, in SOFT_CRITERIA_IDS order. */
const SOFT_CRITERIA_TEXTS: readonly [string, string, string][] = [
  [
    'Adfreeze-zone temperature at the end of life (piles operating)',
    '°C',
    'Colder ground at the end of the design life keeps more adfreeze strength and creeps less.',
  ],
  [
    'Community fuel saved (system COP)',
    'L/yr',
    'Heating oil avoided minus generator diesel added per standard building, at the system seasonal COP: the one energy criterion (it holds the load share and the COP).',
  ],
  [
    'Frost-jacking demand over anchorage',
    '',
    'Uplift of the freezing active layer (with the factor of safety) over the anchorage below it: lower is a larger structural margin.',
  ],
  [
    'Thaw stability of the ground',
    '',
    'Texture and ice content: gravels and bedrock are stable, ice-rich silts and peat settle.',
  ],
];

/** A hard exclusion (weight 0). */
function exclusion(
  d: Pick<
    CriterionDefinition,
    'id' | 'title' | 'bandId' | 'unit' | 'comparison' | 'threshold' | 'description'
  >,
): CriterionDefinition {
  const { id, title, bandId, unit, comparison, threshold, description } = d;
  return { id, title, bandId, unit, kind: 'exclusion', comparison, threshold, weight: 0, description };
}

/** The hard exclusions of a scenario, in the order they are checked (cell-class.ts). */
function exclusionDefinitions(s: Scenario): CriterionDefinition[] {
  const f = s.suitability.foundation;
  const tip = s.pile.topDepth_m + s.pile.length_m;
  return [
    exclusion({
      id: 'data',
      title: 'Inside the data',
      bandId: BAND.exclusion,
      unit: '',
      comparison: '!=',
      threshold: EXCLUSION.outsideData,
      description: 'All required input grids have a value at the cell (exclusion code is not 1).',
    }),
    exclusion({
      id: 'rock',
      title: 'Soil depth over bedrock (pile tip plus margin)',
      bandId: BAND.bedrockDepth,
      unit: 'm',
      comparison: '>=',
      threshold: tip + f.rockMargin_m,
      description: `Screw piles need soil, not rock, down to the ${tip} m tip plus ${f.rockMargin_m} m; bedrock texture always fails.`,
    }),
    exclusion({
      id: 'permafrost',
      title: 'Permafrost at pile depth',
      bandId: BAND.groundTemp,
      unit: '°C',
      comparison: '<',
      threshold: 0,
      description: 'Mean annual ground temperature at mid-pile depth below 0 °C today.',
    }),
    exclusion({
      id: 'thawed',
      title: 'Active layer above the reference depth',
      bandId: BAND.activeLayer,
      unit: 'm',
      comparison: '<',
      threshold: s.referenceDepth_m,
      description: 'Seasonal thaw must not already reach the foundation reference depth.',
    }),
    exclusion({
      id: 'adfreezeTemp',
      title: 'Adfreeze-zone temperature at the end of life (piles operating)',
      bandId: BAND.adfreezeTempEndPiles,
      unit: '°C',
      comparison: '<=',
      threshold: f.maxAdfreezeTempEnd_C,
      description: `Permafrost warmer than ${f.maxAdfreezeTempEnd_C} °C around the piles at the end of the design life loses most of its adfreeze bond and creeps.`,
    }),
    exclusion({
      id: 'thawUnstable',
      title: 'Thaw year of thaw-unstable ground (piles operating)',
      bandId: BAND.iceRichThawYear,
      unit: 'yr',
      comparison: '>',
      threshold: s.startYear + s.designLife_yr + f.thawMargin_yr,
      description: `Ice-rich ground (excess ice above ${f.thawUnstableExcessIce_m3m3} m³/m³) must stay frozen at the reference depth beyond the design life plus ${f.thawMargin_yr} yr. No value: the ground is not ice-rich (passes).`,
    }),
    exclusion({
      id: 'frostJacking',
      title: 'Frost-jacking demand over anchorage',
      bandId: BAND.frostJackingRatio,
      unit: '',
      comparison: '<=',
      threshold: 1,
      description: `Uplift of the freezing active layer times ${f.jackingSafetyFactor} must not exceed the adfreeze anchorage below it plus the dead load.`,
    }),
    exclusion({
      id: 'fluid',
      title: 'Fluid can extract heat',
      bandId: BAND.windowUpperFluid,
      unit: 'W/m',
      comparison: '>',
      threshold: 0,
      description: 'Ground warm enough for the fluid to take heat above the minimum entering temperature.',
    }),
  ];
}

/** Hard exclusions then soft criteria of a scenario, with thresholds, units and normalised weights. */
export function criteriaDefinitions(s: Scenario): CriterionDefinition[] {
  const texts = SOFT_CRITERIA_TEXTS;
  const w = softWeights(s);
  const ranges = softRanges(s);
  return [
    ...exclusionDefinitions(s),
    ...SOFT_CRITERIA_IDS.map((id, i): CriterionDefinition => {
      const [good, poor] = ranges[i];
      return {
        id,
        title: texts[i][0],
        bandId: SOFT_CRITERIA_BANDS[i],
        unit: texts[i][1],
        kind: 'soft',
        comparison: good >= poor ? '>=' : '<=',
        threshold: (good + poor) / 2,
        weight: w[i],
        good,
        poor,
        description: texts[i][2],
      };
    }),
  ];
}

/** Suitability class from the weighted score: 3 good, 2 fair, 1 poor (NaN → NaN). */
export function suitabilityClass(score: number, u: Scenario['suitability']): number {
  if (Number.isNaN(score)) return NaN;
  return score >= u.goodScore ? 3 : score >= u.fairScore ? 2 : 1;
}

/** Normalised soft-criterion weights in SOFT_CRITERIA_IDS order (precompute once per scenario). */
export function softWeights(s: Scenario): Float64Array {
  const u = s.suitability;
  const w = [u.coldness.weight, u.energy.weight, u.jackingMargin.weight, u.thawStability.weight];
  const sum = w.reduce((a, b) => a + b, 0);
  if (!(sum > 0)) throw new RangeError(`suitability weights must sum to > 0; received ${sum}`);
  return Float64Array.from(w, (x) => x / sum);
}
