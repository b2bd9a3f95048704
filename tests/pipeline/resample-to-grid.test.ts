import { describe, expect, it } from 'vitest';
import type { AnalysisGrid } from '../../data-pipeline/build/analysis-grid';
import { cellCentresIn, footprintBox, resampleAt } from '../../data-pipeline/build/resample-to-grid';
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

  it('resampling from the footprint box alone gives exactly what the whole grid gives', () => {
    // 50 x 40 pixels of 1000 m with nodata holes; the points: a 3-row window of 3413 cell centres seen
    // from a grid in a different CRS, so the footprint is a curved band, not a rectangle.
    const width = 50;
    const height = 40;
    const values = new Float32Array(width * height);
    for (let i = 0; i < values.length; i++) values[i] = i % 7 === 0 ? NaN : Math.sin(i * 0.37) * 10;
    const [cx, cy] = createTransform('EPSG:4326', 'EPSG:3338')(-150, 66);
    const whole: Grid = {
      values,
      width,
      height,
      geoTransform: [cx - 25_000, 1000, 0, cy + 20_000, 0, -1000],
      crs: 'EPSG:3338',
    };
    // The window is centred on the raster's centre, and longer than the raster is wide.
    const [ax, ay] = createTransform('EPSG:3338', 'EPSG:3413')(cx, cy);
    const grid: AnalysisGrid = {
      crs: 'EPSG:3413',
      proj4: '',
      width: 70,
      height: 3,
      cellSize_m: 900,
      geoTransform: [ax - 35 * 900, 900, 0, ay + 1.5 * 900, 0, -900],
    };
    const coords = cellCentresIn(grid, 0, 3, 'EPSG:3338');
    const box = footprintBox(whole, coords);
    expect(box).not.toBeNull();
    const [x0, y0, x1, y1] = box as [number, number, number, number];
    // A proper sub-box, so the comparison exercises the index translation.
    expect((x1 - x0) * (y1 - y0)).toBeLessThan(width * height);
    const part = new Float32Array((x1 - x0) * (y1 - y0));
    for (let r = y0; r < y1; r++)
      part.set(values.subarray(r * width + x0, r * width + x1), (r - y0) * (x1 - x0));
    for (const method of ['nearest', 'bilinear'] as const) {
      const expected = resampleAt(whole, coords, method);
      const got = resampleAt({ ...whole, values: part }, coords, method, [x0, y0, x1, y1]);
      expect(expected.some((v) => !Number.isNaN(v))).toBe(true);
      expect(expected.some((v) => Number.isNaN(v))).toBe(true);
      expect(Array.from(got)).toEqual(Array.from(expected));
    }
  });

  it('footprintBox is null when every point misses the raster', () => {
    expect(footprintBox(source, Float64Array.from([-50, 15, 100, 100]))).toBeNull();
  });
});
