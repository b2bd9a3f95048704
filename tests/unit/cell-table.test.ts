import { describe, expect, it } from 'vitest';
import proj4 from 'proj4';
import {
  buildCellTable,
  cellIndexAt,
  greatCircle_m,
  localDistance_m,
  samplingZoom,
} from '../../web/src/data/cell-table';
import { lonLatToTileXY, tilesCovering } from '../../web/src/map/web-mercator';
import { TILE_SIZE } from '../../layers/screening/tile-format';
import { testManifest } from './web-test-manifest';

const manifest0 = testManifest();
const conv = proj4('EPSG:4326', manifest0.analysisGrid.proj4);
// Put a 10 x 8 grid of 1 km cells with its north-west corner at 75° N, 3° W.
const [x0, y0] = conv.forward([-3, 75]) as [number, number];
const manifest = testManifest({
  analysisGrid: { ...manifest0.analysisGrid, geoTransform: [x0, 1000, 0, y0, 0, -1000] },
});
const toLonLat = (x: number, y: number) => conv.inverse([x, y]) as [number, number];
const toGrid = (lon: number, lat: number) => conv.forward([lon, lat]) as [number, number];

/** Tiles at zoom z whose pixels hold the analysis cell index (row * width + col) in band 0. */
function syntheticTiles(z: number) {
  const { width, height } = manifest.analysisGrid;
  const tiles = new Map<string, Float32Array[]>();
  const get = (tx: number, ty: number) => {
    const key = `${tx}/${ty}`;
    let t = tiles.get(key);
    if (!t) {
      t = [0, 1, 2].map(() => new Float32Array(TILE_SIZE * TILE_SIZE).fill(NaN));
      for (let py = 0; py < TILE_SIZE; py++)
        for (let px = 0; px < TILE_SIZE; px++) {
          const n = 2 ** z;
          const lon = ((tx + (px + 0.5) / TILE_SIZE) / n) * 360 - 180;
          const lat =
            (Math.atan(Math.sinh(Math.PI * (1 - (2 * (ty + (py + 0.5) / TILE_SIZE)) / n))) * 180) / Math.PI;
          const [x, y] = toGrid(lon, lat);
          const c = Math.floor((x - x0) / 1000);
          const r = Math.floor((y0 - y) / 1000);
          if (c >= 0 && r >= 0 && c < width && r < height) {
            t[0][py * TILE_SIZE + px] = r * width + c;
            t[1][py * TILE_SIZE + px] = 5;
            t[2][py * TILE_SIZE + px] = r === 0 ? NaN : 1;
          }
        }
      tiles.set(key, t);
    }
    return t;
  };
  return get;
}

describe('cell table', () => {
  it('recovers every analysis cell from fine tile pixels, with its grid position', () => {
    const z = 11; // pixel ≈ 20 m at 75° N, far finer than the 1 km cells
    const table = buildCellTable({ manifest, zoom: z, getTile: syntheticTiles(z), gridToLonLat: toLonLat });
    expect(table.count).toBe(80);
    for (let i = 0; i < table.count; i++) {
      expect(table.planes[0][i]).toBe(table.row[i] * 10 + table.col[i]);
      expect(table.lookup[table.row[i] * 10 + table.col[i]]).toBe(i);
    }
    // A point inside cell (col 3, row 2) finds that cell.
    const [lon, lat] = toLonLat(x0 + 3500, y0 - 2500);
    const [gx, gy] = toGrid(lon, lat);
    expect(table.planes[0][cellIndexAt(table, manifest, gx, gy)]).toBe(23);
    expect(cellIndexAt(table, manifest, x0 - 10, y0)).toBe(-1);
  });

  it('gives each cell its ground area through the projection scale', () => {
    const z = 11;
    const table = buildCellTable({ manifest, zoom: z, getTile: syntheticTiles(z), gridToLonLat: toLonLat });
    // Ellipsoidal polar stereographic scale factor (Snyder 1987, Map Projections—A Working Manual,
    // eqs. 15-9, 14-15, 21-34, 21-32; recalled from memory): t = tan(π/4 − φ/2) / ((1 − e sinφ)/(1 + e sinφ))^(e/2),
    // m = cosφ / √(1 − e² sin²φ), k = m_c t / (t_c m), true scale at φc = 70°. A conformal cell of
    // 1 km² in the grid covers 1/k² km² on the ground (k(75°) ≈ 0.9867, computed). Tolerance 0.05 %.
    const e2 = 0.00669437999014;
    const e = Math.sqrt(e2);
    const tOf = (phi: number) =>
      Math.tan(Math.PI / 4 - phi / 2) / ((1 - e * Math.sin(phi)) / (1 + e * Math.sin(phi))) ** (e / 2);
    const mOf = (phi: number) => Math.cos(phi) / Math.sqrt(1 - e2 * Math.sin(phi) ** 2);
    const pc = (70 * Math.PI) / 180;
    for (let i = 0; i < table.count; i++) {
      const phi = (table.lat[i] * Math.PI) / 180;
      const k = (mOf(pc) * tOf(phi)) / (tOf(pc) * mOf(phi));
      expect(Math.abs(table.area_m2[i] * k * k - 1e6) / 1e6).toBeLessThan(5e-4);
    }
  });

  it('picks the coarsest zoom whose pixels are no larger than a cell', () => {
    // Pixel size at zoom z = 2πR cos φ / (256·2^z), R = 6378137 m (spherical Mercator):
    // at 74.8° N zoom 6 is 640 m, zoom 5 is 1281 m, so 1 km cells need zoom 6 (computed).
    expect(samplingZoom(manifest, 74.8)).toBe(6);
    expect(
      samplingZoom(testManifest({ analysisGrid: { ...manifest.analysisGrid, cellSize_m: 5 } }), 74.8),
    ).toBe(10);
  });

  it('measures great-circle distances on the mean sphere', () => {
    // One degree of longitude on the equator: 2π·6371008.8/360 = 111 195.08 m (computed).
    expect(greatCircle_m([0, 0], [1, 0])).toBeCloseTo(111195.08, 1);
    expect(greatCircle_m([10, 60], [10, 60])).toBe(0);
  });

  it('addresses Web Mercator tiles consistently', () => {
    const [tx, ty] = lonLatToTileXY(-3, 75, 6);
    const { x0: a, x1: b, y0: c, y1: d } = tilesCovering([-3.01, 74.99, -2.99, 75.01], 6);
    expect([a, c]).toEqual([Math.floor(tx), Math.floor(ty)]);
    expect([b, d]).toEqual([Math.floor(tx), Math.floor(ty)]);
  });
});

describe('local ellipsoidal distance', () => {
  it('matches the WGS 84 meridian and parallel arc lengths for short steps', () => {
    // WGS 84 radii of curvature at 75° N (Snyder 1987, eqs. 4-18 and 4-20, computed with a = 6378137 m,
    // e² = 0.00669437999014); a degree of latitude is M·π/180, of longitude N·cos φ·π/180.
    const e2 = 0.00669437999014;
    const phi = (75 * Math.PI) / 180;
    const w = 1 - e2 * Math.sin(phi) ** 2;
    const M = (6378137 * (1 - e2)) / w ** 1.5;
    const N = 6378137 / Math.sqrt(w);
    expect(localDistance_m([0, 74.995], [0, 75.005])).toBeCloseTo((M * Math.PI) / 180 / 100, 1);
    expect(localDistance_m([0, 75], [0.01, 75])).toBeCloseTo((N * Math.cos(phi) * Math.PI) / 180 / 100, 1);
  });
});
