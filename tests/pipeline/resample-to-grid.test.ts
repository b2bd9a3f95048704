import { describe, expect, it } from 'vitest';
import type { AnalysisGrid } from '../../data-pipeline/build/analysis-grid';
import { cellCentresIn, resampleAt } from '../../data-pipeline/build/resample-to-grid';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';
import type { Grid } from '../../layers/grid';

describe('resampling onto the analysis grid', () => {
  const source: Grid = {
    // 3 x 2 pixels of 10 units, origin (0, 20); row 0 north.
    values: Float32Array.from([1, 2, 3, 4, NaN, 6]),
    width: 3,
    height: 2,
    geoTransform: [0, 10, 0, 20, 0, -10],
    crs: 'EPSG:3413',
  };
  const at = (x: number, y: number, method: 'nearest' | 'bilinear') =>
    resampleAt(source, Float64Array.from([x, y]), method)[0];

  it('nearest takes the pixel containing the point; outside the grid is nodata', () => {
    expect(at(5, 15, 'nearest')).toBe(1);
    expect(at(29.9, 0.1, 'nearest')).toBe(6);
    expect(at(-0.1, 15, 'nearest')).toBeNaN();
    expect(at(15, 5, 'nearest')).toBeNaN();
  });

  it('bilinear interpolates between pixel centres and renormalises over valid neighbours', () => {
    // Halfway between centres (5,15) and (15,15): mean of 1 and 2.
    expect(at(10, 15, 'bilinear')).toBeCloseTo(1.5, 6);
    // Centre of the four pixels 1, 2, 4, NaN: the nodata pixel drops out, weights renormalised.
    expect(at(10, 10, 'bilinear')).toBeCloseTo((1 + 2 + 4) / 3, 6);
    // At a pixel centre, its own value.
    expect(at(25, 5, 'bilinear')).toBeCloseTo(6, 6);
  });

  it('interpolated cell centres stay within 5 m of exact transforms (8 km spans), also across the antimeridian', () => {
    const t = createTransform('EPSG:4326', 'EPSG:3413');
    const [x0, y0] = t(179.5, 66);
    const grid: AnalysisGrid = {
      crs: 'EPSG:3413',
      proj4: '',
      width: 120,
      height: 2,
      cellSize_m: 1000,
      geoTransform: [x0 - 60_000, 1000, 0, y0, 0, -1000],
    };
    const coords = cellCentresIn(grid, 0, 2, 'EPSG:4326');
    const exact = createTransform('EPSG:3413', 'EPSG:4326');
    let maxErr = 0;
    let wraps = false;
    for (let r = 0; r < 2; r++) {
      for (let c = 0; c < grid.width; c++) {
        const [lon, lat] = exact(grid.geoTransform[0] + (c + 0.5) * 1000, y0 - (r + 0.5) * 1000);
        const k = 2 * (r * grid.width + c);
        const dLon = coords[k] - lon;
        if (Math.sign(lon) !== Math.sign(coords[0])) wraps = true;
        maxErr = Math.max(
          maxErr,
          Math.abs(dLon) * 111_320 * Math.cos((lat * Math.PI) / 180),
          Math.abs(coords[k + 1] - lat) * 110_574,
        );
      }
    }
    expect(wraps).toBe(true);
    expect(maxErr).toBeLessThan(5);
  });
});
