import { describe, expect, it } from 'vitest';
import type { CellTable } from '../../web/src/data/cell-table';
import { compileFilter, EMPTY_FILTER } from '../../web/src/filters/cell-filter';
import { boundaryArea_km2, boundaryMask, summarise } from '../../web/src/filters/zonal-summary';
import { flattenPolygons } from '../../web/src/geometry/flat-rings';
import { testManifest } from './web-test-manifest';

/** A 4 x 3 table on a lon/lat lattice, each cell 2 km², groundTemp = col - 3, suitability = row. */
function lattice(): CellTable {
  const n = 12;
  const t: CellTable = {
    count: n,
    planes: [new Float32Array(n), new Float32Array(n), new Float32Array(n)],
    lon: new Float64Array(n),
    lat: new Float64Array(n),
    area_m2: new Float64Array(n).fill(2e6),
    col: new Int32Array(n),
    row: new Int32Array(n),
    gridWidth: 4,
    gridHeight: 3,
    lookup: new Int32Array(12),
    cellArea_m2: 2e6,
  };
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 4; c++) {
      const i = r * 4 + c;
      t.planes[0][i] = c - 3;
      t.planes[1][i] = 10;
      t.planes[2][i] = r;
      t.lon[i] = c + 0.5;
      t.lat[i] = r + 0.5;
      t.col[i] = c;
      t.row[i] = r;
      t.lookup[i] = i;
    }
  return t;
}

const bands = testManifest().bands;

describe('zonal summary', () => {
  it('counts all screened cells and their area without a filter', () => {
    const s = summarise(lattice(), compileFilter(EMPTY_FILTER, bands));
    expect(s).toEqual({ screenedCells: 12, screenedArea_km2: 24, matchingCells: 12, matchingArea_km2: 24 });
  });

  it('counts matching cells under a filter (hand count)', () => {
    // groundTemp <= -2 keeps columns 0 and 1 (values -3, -2): 2 of 4 columns x 3 rows = 6 cells, 12 km².
    const f = compileFilter({ ranges: [{ bandId: 'groundTemp', max: -2 }], excluded: [] }, bands);
    expect(summarise(lattice(), f)).toEqual({
      screenedCells: 12,
      screenedArea_km2: 24,
      matchingCells: 6,
      matchingArea_km2: 12,
    });
    // ... and excluding class 0 (row 0) leaves 4 cells.
    const g = compileFilter(
      { ranges: [{ bandId: 'groundTemp', max: -2 }], excluded: [{ bandId: 'suitability', values: [0] }] },
      bands,
    );
    expect(summarise(lattice(), g).matchingCells).toBe(4);
  });

  it('restricts to cells whose centre lies inside a boundary', () => {
    // Square lon 0..2, lat 0..2 holds centres (0.5|1.5, 0.5|1.5): 4 cells.
    const square = flattenPolygons([
      [
        [
          [0, 0],
          [2, 0],
          [2, 2],
          [0, 2],
          [0, 0],
        ],
      ],
    ]);
    const mask = boundaryMask(lattice(), square);
    expect(Array.from(mask).reduce((a, b) => a + b, 0)).toBe(4);
    const f = compileFilter({ ranges: [{ bandId: 'groundTemp', max: -3 }], excluded: [] }, bands);
    expect(summarise(lattice(), f, mask)).toEqual({
      screenedCells: 4,
      screenedArea_km2: 8,
      matchingCells: 2,
      matchingArea_km2: 4,
    });
  });

  it('measures the boundary geodesically, not in Web Mercator', () => {
    // 1° x 1° at the equator on the sphere R = 6371008.8 m: R² Δλ (sin φ2 - sin φ1) = 12 363.718 km²
    // (spherical zone formula, computed); at 70-71° N the same box is 4 127.25 km² (same formula).
    const box = (s: number) =>
      flattenPolygons([
        [
          [
            [0, s],
            [1, s],
            [1, s + 1],
            [0, s + 1],
            [0, s],
          ],
        ],
      ]);
    expect(boundaryArea_km2(box(0))).toBeCloseTo(12363.718, 2);
    const R = 6371.0088;
    const zone = R * R * (Math.PI / 180) * (Math.sin((71 * Math.PI) / 180) - Math.sin((70 * Math.PI) / 180));
    expect(boundaryArea_km2(box(70))).toBeCloseTo(zone, 1);
  });
});
