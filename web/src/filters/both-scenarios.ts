/**
 * The live filter while two scenarios are compared (issue 17 item 3): the filter can apply to each
 * map's own scenario, to both scenarios at once ("good under both"), or to one of the two scenarios on
 * both maps. One rule (`passesScoped`) decides whether a cell passes; the matching-area counter
 * (`summariseScoped`, over the cell tables) and the map's veil (colour-tile.ts, over the tile pixels)
 * both call it, so the cells counted are the cells left unveiled.
 *
 * A map shows one scenario (its own); the other scenario is the other map's. Each filter is compiled
 * against its own scenario's bands; the two builds share one analysis grid and one tile pyramid, so a
 * cell is found in the other table by its grid column and row, and in the other scenario's tile at the
 * same pixel. A cell the other scenario did not screen fails a filter tested there (its values are
 * unknown) and, when the other scenario takes part, is left out of the cells screened. Areas are the
 * cells' ground areas, as in zonal-summary.ts.
 */
import type { CellTable } from '../data/cell-table';
import { filterConditions, passesAt, type CompiledFilter, type FilterCondition } from './cell-filter';
import type { ZonalSummary } from './zonal-summary';

/** Which scenario(s) the filters apply to while comparing: each map its own, both, the one shown, the compared one. */
export type FilterScope = 'each' | 'both' | 'shown' | 'compared';
export const FILTER_SCOPES: readonly FilterScope[] = ['each', 'both', 'shown', 'compared'];

/** The filter one map tests, split by scenario. */
export interface ScopedFilter {
  /** Tested on the map's own scenario's values (null: nothing tested there). */
  own: CompiledFilter | null;
  /** Tested on the other scenario's values of the same cell (null: nothing tested there). */
  other: CompiledFilter | null;
  /** Whether the other scenario takes part (its unscreened cells are then left out of the counts). */
  otherTakesPart: boolean;
  /** Whether any cell can fail (own or other is set). */
  active: boolean;
}

/**
 * The filter of the map showing `side` ('shown': the scenario of the header, 'compared': the second
 * one) under `scope`; `own` compiled against this map's bands, `other` against the other scenario's
 * (null while the other scenario is not loaded, or outside compare).
 */
export function scopedFilter(
  scope: FilterScope,
  side: 'shown' | 'compared',
  own: CompiledFilter,
  other: CompiledFilter | null,
): ScopedFilter {
  const useOwn = scope === 'each' || scope === 'both' || scope === side;
  const otherTakesPart = other !== null && (scope === 'both' || (scope !== 'each' && scope !== side));
  const o = useOwn && own.active ? own : null;
  const t = otherTakesPart && other.active ? other : null;
  return { own: o, other: t, otherTakesPart, active: o !== null || t !== null };
}

/**
 * Whether a cell passes (the one rule of the module comment): its values are element k of the map's
 * own band planes and element j of the other scenario's (j < 0 or `other` null: not screened there).
 */
export function passesScoped(
  f: ScopedFilter,
  own: ArrayLike<number>[],
  k: number,
  other: ArrayLike<number>[] | null,
  j: number,
): boolean {
  if (f.own && !passesAt(f.own, own, k)) return false;
  if (f.other) return other !== null && j >= 0 && passesAt(f.other, other, j);
  return true;
}

/**
 * The same rule over every element of two aligned sets of planes at once (the map's tiles: the other
 * scenario's tile holds the same cell at the same pixel, `otherPresent` false where it has no tile),
 * from the pass masks of the single conditions (cell-filter.ts conditionMask, here through `maskOf`, so
 * that the caller can keep the masks of conditions not edited): out[k] = 1 where passesScoped holds.
 */
export function scopedPassMask(
  f: ScopedFilter,
  maskOf: (side: 'own' | 'other', c: FilterCondition) => Uint8Array,
  otherPresent: boolean,
  out: Uint8Array,
): Uint8Array {
  out.fill(1);
  if (f.other && !otherPresent) return out.fill(0);
  const and = (m: Uint8Array) => {
    for (let k = 0; k < out.length; k++) out[k] &= m[k];
  };
  if (f.own) for (const c of filterConditions(f.own)) and(maskOf('own', c));
  if (f.other) for (const c of filterConditions(f.other)) and(maskOf('other', c));
  return out;
}

/**
 * Cells (and area) of `table` passing the scoped filter, optionally only where mask[i] = 1 (of
 * `table`); `other` is the other scenario's table (needed when the other scenario takes part).
 */
export function summariseScoped(
  table: CellTable,
  f: ScopedFilter,
  other: CellTable | null,
  mask?: Uint8Array,
): ZonalSummary {
  if (f.otherTakesPart && !other)
    throw new Error('the other scenario takes part but its cells are not loaded');
  if (other && (table.gridWidth !== other.gridWidth || table.gridHeight !== other.gridHeight)) {
    throw new Error('the two scenarios do not share one analysis grid: cannot match their cells');
  }
  let screened = 0;
  let matching = 0;
  let screenedArea = 0;
  let matchingArea = 0;
  for (let i = 0; i < table.count; i++) {
    if (mask && mask[i] === 0) continue;
    const j = other ? other.lookup[table.row[i] * other.gridWidth + table.col[i]] : -1;
    if (f.otherTakesPart && j < 0) continue; // not screened in the other scenario
    screened++;
    screenedArea += table.area_m2[i];
    if (passesScoped(f, table.planes, i, other?.planes ?? null, j)) {
      matching++;
      matchingArea += table.area_m2[i];
    }
  }
  return {
    screenedCells: screened,
    screenedArea_km2: screenedArea / 1e6,
    matchingCells: matching,
    matchingArea_km2: matchingArea / 1e6,
  };
}

/** Cells (and area) matching the filter under both scenarios, optionally only where mask[i] = 1 (of `a`). */
export function summariseBoth(
  a: { table: CellTable; filter: CompiledFilter },
  b: { table: CellTable; filter: CompiledFilter },
  mask?: Uint8Array,
): ZonalSummary {
  return summariseScoped(a.table, scopedFilter('both', 'shown', a.filter, b.filter), b.table, mask);
}
