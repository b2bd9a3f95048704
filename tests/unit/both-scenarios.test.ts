/**
 * "Good under both" (issue 17 item 3): the live filter applied to two scenarios' cell tables at once
 * (web/src/filters/both-scenarios.ts). Expected counts are hand counts on a 4 x 3 lattice (definition
 * of the filter: cell-filter.ts), each cell 2 km².
 */
import { describe, expect, it } from 'vitest';
import type { CellTable } from '../../web/src/data/cell-table';
import { compileFilter, EMPTY_FILTER } from '../../web/src/filters/cell-filter';
import { summariseBoth } from '../../web/src/filters/both-scenarios';
import { summarise } from '../../web/src/filters/zonal-summary';
import { BAND } from '../../layers/screening/band-ids';
import { testManifest } from './web-test-manifest';

const bands = testManifest().bands;
const SUIT = bands.findIndex((b) => b.id === BAND.suitability);

/**
 * A 4 x 3 table, suitability from `cls(col, row)`; cells listed in `order` (table row k holds grid
 * cell order[k]); `skip` cells are not screened.
 */
function lattice(cls: (c: number, r: number) => number, reverse = false, skip: number[] = []): CellTable {
  const cells = [...Array(12).keys()].filter((g) => !skip.includes(g));
  if (reverse) cells.reverse();
  const n = cells.length;
  const t: CellTable = {
    count: n,
    planes: bands.map(() => new Float32Array(n)),
    lon: new Float64Array(n),
    lat: new Float64Array(n),
    area_m2: new Float64Array(n).fill(2e6),
    col: new Int32Array(n),
    row: new Int32Array(n),
    gridWidth: 4,
    gridHeight: 3,
    lookup: new Int32Array(12).fill(-1),
    cellArea_m2: 2e6,
  };
  cells.forEach((g, k) => {
    const [c, r] = [g % 4, Math.floor(g / 4)];
    t.planes[SUIT][k] = cls(c, r);
    t.col[k] = c;
    t.row[k] = r;
    t.lon[k] = c + 0.5;
    t.lat[k] = r + 0.5;
    t.lookup[g] = k;
  });
  return t;
}

// good only: exclude excluded (0), poor (1) and fair (2)
const goodOnly = { ranges: [], excluded: [{ bandId: BAND.suitability, values: [0, 1, 2] }] };

describe('matching under both scenarios', () => {
  it('counts the cells that pass the filter in each scenario, found by grid cell, not table row', () => {
    const a = lattice((_c, r) => r + 1); // row 2 good (4 cells)
    // the other scenario: one class worse from column 2 on, listed in reverse, grid cell 8 (col 0, row 2) unscreened
    const b = lattice((c, r) => (c >= 2 ? r : r + 1), true, [8]);
    const fa = compileFilter(goodOnly, bands);
    expect(summarise(a, fa).matchingCells).toBe(4);
    const both = summariseBoth(
      { table: a, filter: fa },
      { table: b, filter: compileFilter(goodOnly, bands) },
    );
    // row 2: col 0 not screened in b, col 1 good in both, cols 2-3 fair in b -> 1 cell
    expect(both).toEqual({ screenedCells: 11, screenedArea_km2: 22, matchingCells: 1, matchingArea_km2: 2 });
    // within a mask of column 1 only (rows 0-2): one good under both
    const mask = new Uint8Array(a.count).map((_, i) => (a.col[i] === 1 ? 1 : 0));
    expect(summariseBoth({ table: a, filter: fa }, { table: b, filter: fa }, mask).matchingCells).toBe(1);
  });
  it('without a filter every cell screened in both matches; different grids are refused', () => {
    const a = lattice(() => 3);
    const b = lattice(() => 1, false, [0, 5]);
    const none = compileFilter(EMPTY_FILTER, bands);
    expect(summariseBoth({ table: a, filter: none }, { table: b, filter: none }).matchingCells).toBe(10);
    const other = { ...b, gridWidth: 5 };
    expect(() => summariseBoth({ table: a, filter: none }, { table: other, filter: none })).toThrow(
      /analysis grid/,
    );
  });
});
