/**
 * Cell-by-cell difference of a scenario from the first scenario of a set (issue 17): the change of
 * suitability class, the years of frozen-ground margin lost and the piles per ton added. The pipeline
 * writes these as bands of every scenario after the first (data-pipeline/build/
 * scenario-difference-bands.ts); the map, legend, readout and filters show them like any band.
 */
import { SUITABILITY_LABELS } from './suitability';

/** Classes of the class-change band (value 0 reads as "none" and is drawn grey, class-colours.ts). */
export const CLASS_CHANGE = { excludedInOne: 0, worse: 1, same: 2, better: 3 } as const;

export const CLASS_CHANGE_LABELS: Record<number, string> = {
  [CLASS_CHANGE.excludedInOne]: 'excluded under only one of the two',
  [CLASS_CHANGE.worse]: 'worse class',
  [CLASS_CHANGE.same]: 'same class',
  [CLASS_CHANGE.better]: 'better class',
};

const EXCLUDED = Number(
  Object.keys(SUITABILITY_LABELS).find((k) => SUITABILITY_LABELS[Number(k)] === 'excluded'),
);

/**
 * Class change of a cell from its first-scenario class `first` to this scenario's class `other`
 * (suitability values: excluded < poor < fair < good); NaN where either is nodata. Excluded under both
 * is the same class.
 */
export function classChange(first: number, other: number): number {
  if (first !== first || other !== other) return NaN;
  if (first === other) return CLASS_CHANGE.same;
  if (first === EXCLUDED || other === EXCLUDED) return CLASS_CHANGE.excludedInOne;
  return other > first ? CLASS_CHANGE.better : CLASS_CHANGE.worse;
}

/** Years of frozen-ground margin lost (positive = this scenario leaves less margin); NaN if either is missing. */
export function frozenMarginLost(first_yr: number, other_yr: number): number {
  return Number.isFinite(first_yr) && Number.isFinite(other_yr) ? first_yr - other_yr : NaN;
}

/** Piles per ton added by this scenario (positive = more piles); NaN if either is missing. */
export function pilesPerTonAdded(first: number, other: number): number {
  return Number.isFinite(first) && Number.isFinite(other) ? other - first : NaN;
}
