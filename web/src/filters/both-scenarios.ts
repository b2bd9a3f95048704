/**
 * "Good under both" (issue 17 item 3, compare view): the live filter applied to the scenario shown
 * and to the compare scenario at once. A cell matches under both when it passes the filter in each
 * scenario's cell table (each filter compiled against its own scenario's bands; the two builds share
 * one analysis grid, so a cell is found in the other table by its grid column and row). Areas are the
 * cells' ground areas, as in zonal-summary.ts.
 */
import type { CellTable } from '../data/cell-table';
import { passesAt, type CompiledFilter } from './cell-filter';
import type { ZonalSummary } from './zonal-summary';

/** Cells (and area) matching the filter under both scenarios, optionally only where mask[i] = 1 (of `a`). */
export function summariseBoth(
  a: { table: CellTable; filter: CompiledFilter },
  b: { table: CellTable; filter: CompiledFilter },
  mask?: Uint8Array,
): ZonalSummary {
  const ta = a.table;
  const tb = b.table;
  if (ta.gridWidth !== tb.gridWidth || ta.gridHeight !== tb.gridHeight) {
    throw new Error('the two scenarios do not share one analysis grid: cannot match their cells');
  }
  let screened = 0;
  let matching = 0;
  let screenedArea = 0;
  let matchingArea = 0;
  for (let i = 0; i < ta.count; i++) {
    if (mask && mask[i] === 0) continue;
    const j = tb.lookup[ta.row[i] * tb.gridWidth + ta.col[i]];
    if (j < 0) continue; // not screened in the other scenario
    screened++;
    screenedArea += ta.area_m2[i];
    const passA = !a.filter.active || passesAt(a.filter, ta.planes, i);
    if (passA && (!b.filter.active || passesAt(b.filter, tb.planes, j))) {
      matching++;
      matchingArea += ta.area_m2[i];
    }
  }
  return {
    screenedCells: screened,
    screenedArea_km2: screenedArea / 1e6,
    matchingCells: matching,
    matchingArea_km2: matchingArea / 1e6,
  };
}
