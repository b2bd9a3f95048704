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

/** Exclusion reason codes (band `exclusion`). */
export const EXCLUSION = {
  none: 0,
  outsideData: 1,
  bedrockShallow: 2,
  noPermafrost: 3,
  alreadyThawed: 4,
  fluidLimit: 5,
} as const;

export const EXCLUSION_LABELS: Record<number, string> = {
  0: 'not excluded',
  1: 'outside the data',
  2: 'bedrock too shallow for screw piles',
  3: 'no permafrost',
  4: 'ground already thawed at the reference depth',
  5: 'fluid limit reached (ground too cold to extract heat)',
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

/** The ids of the soft criteria, in score order (the hot path indexes by this order). */
export const SOFT_CRITERIA_IDS = [
  'coldness',
  BAND.pilesPerTon,
  BAND.frozenMargin,
  BAND.loadShare,
  BAND.thawStability,
  BAND.fuelSaved,
] as const;

/** Hard exclusions then soft criteria of a scenario, with thresholds, units and normalised weights. */
export function criteriaDefinitions(s: Scenario): CriterionDefinition[] {
  const u = s.suitability;
  const soft: [string, string, string, string, number, number, number, string][] = [
    [
      'coldness',
      'Permafrost temperature at pile depth',
      BAND.groundTemp,
      '°C',
      u.coldness.good_C,
      u.coldness.poor_C,
      u.coldness.weight,
      'Colder permafrost keeps adfreeze strength and takes longer to thaw.',
    ],
    [
      BAND.pilesPerTon,
      'Piles per ton of peak heating',
      BAND.pilesPerTon,
      'piles/ton',
      u.pilesPerTon.good,
      u.pilesPerTon.poor,
      u.pilesPerTon.weight,
      'Standard piles needed per ton (3.517 kW) of peak heating at the fluid limit.',
    ],
    [
      BAND.frozenMargin,
      'Frozen ground beyond the design life',
      BAND.frozenMargin,
      'yr',
      u.frozenMargin.good_yr,
      u.frozenMargin.poor_yr,
      u.frozenMargin.weight,
      'Years the reference ground stays frozen, with the piles operating, after the design life ends (natural margin plus thaw delay).',
    ],
    [
      BAND.loadShare,
      "Share of the building's heat the piles carry",
      BAND.loadShare,
      '',
      u.loadShare.good,
      u.loadShare.poor,
      u.loadShare.weight,
      'Fraction of annual heating the foundation piles supply within the operating window.',
    ],
    [
      BAND.thawStability,
      'Thaw stability of the ground',
      BAND.thawStability,
      '',
      1,
      0,
      u.thawStability.weight,
      'Texture and ice content: gravels and bedrock are stable, ice-rich silts and peat settle.',
    ],
    [
      BAND.fuelSaved,
      'Community fuel saved',
      BAND.fuelSaved,
      'L/yr',
      u.fuelSaved.good_L,
      u.fuelSaved.poor_L,
      u.fuelSaved.weight,
      'Heating oil avoided minus generator diesel added, per standard building.',
    ],
  ];
  const wSum = soft.reduce((a, r) => a + r[6], 0) || 1;
  const exclusions: CriterionDefinition[] = [
    {
      id: 'data',
      title: 'Inside the data',
      bandId: BAND.exclusion,
      unit: '',
      kind: 'exclusion',
      comparison: '!=',
      threshold: EXCLUSION.outsideData,
      weight: 0,
      description: 'All required input grids have a value at the cell (exclusion code is not 1).',
    },
    {
      id: 'bedrock',
      title: 'Soil depth over bedrock',
      bandId: BAND.bedrockDepth,
      unit: 'm',
      kind: 'exclusion',
      comparison: '>=',
      threshold: u.minBedrockDepth_m,
      weight: 0,
      description: 'Screw piles need soil, not rock, over their embedment.',
    },
    {
      id: 'permafrost',
      title: 'Permafrost at pile depth',
      bandId: BAND.groundTemp,
      unit: '°C',
      kind: 'exclusion',
      comparison: '<',
      threshold: 0,
      weight: 0,
      description: 'Mean annual ground temperature at mid-pile depth below 0 °C.',
    },
    {
      id: 'thawed',
      title: 'Active layer above the reference depth',
      bandId: BAND.activeLayer,
      unit: 'm',
      kind: 'exclusion',
      comparison: '<',
      threshold: s.referenceDepth_m,
      weight: 0,
      description: 'Seasonal thaw must not already reach the foundation reference depth.',
    },
    {
      id: 'fluid',
      title: 'Fluid can extract heat',
      bandId: BAND.windowUpperFluid,
      unit: 'W/m',
      kind: 'exclusion',
      comparison: '>',
      threshold: 0,
      weight: 0,
      description: 'Ground warm enough for the fluid to take heat above the minimum entering temperature.',
    },
  ];
  return [
    ...exclusions,
    ...soft.map(([id, title, bandId, unit, good, poor, weight, description]) => ({
      id,
      title,
      bandId,
      unit,
      kind: 'soft' as const,
      comparison: (good >= poor ? '>=' : '<=') as Comparison,
      threshold: (good + poor) / 2,
      weight: weight / wSum,
      good,
      poor,
      description,
    })),
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
  const w = [
    u.coldness.weight,
    u.pilesPerTon.weight,
    u.frozenMargin.weight,
    u.loadShare.weight,
    u.thawStability.weight,
    u.fuelSaved.weight,
  ];
  const sum = w.reduce((a, b) => a + b, 0);
  if (!(sum > 0)) throw new RangeError(`suitability weights must sum to > 0; received ${sum}`);
  return Float64Array.from(w, (x) => x / sum);
}
