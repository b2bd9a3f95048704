/**
 * The compare view's filter scopes (issue 17 item 3): the matching-area counter (summariseScoped over
 * the cell tables) and the maps' veil (colourTile over the tile pixels) agree cell by cell, on both
 * maps, for every scope, because both call one rule (web/src/filters/both-scenarios.ts). Two invented
 * scenarios on a 10 x 8 grid of 1 km cells are written into synthetic tiles; the cell tables are read
 * back from those tiles as the app does (cell-table.ts). The expected cells are worked out here
 * directly from the two scenarios' invented values (the filter's definition, cell-filter.ts), not
 * through the code under test.
 */
import { describe, expect, it } from 'vitest';
import proj4 from 'proj4';
import { buildCellTable, type CellTable } from '../../web/src/data/cell-table';
import { compileFilter, EMPTY_FILTER } from '../../web/src/filters/cell-filter';
import {
  FILTER_SCOPES,
  scopedFilter,
  summariseScoped,
  type FilterScope,
  type ScopedFilter,
} from '../../web/src/filters/both-scenarios';
import { colourTile, FADED_ALPHA } from '../../web/src/map/colour-tile';
import { lonLatToTileXY } from '../../web/src/map/web-mercator';
import { TILE_SIZE } from '../../layers/screening/tile-format';
import { testManifest } from './web-test-manifest';

const manifest0 = testManifest();
const conv = proj4('EPSG:4326', manifest0.analysisGrid.proj4);
const [x0, y0] = conv.forward([-3, 75]) as [number, number];
const manifest = testManifest({
  analysisGrid: { ...manifest0.analysisGrid, geoTransform: [x0, 1000, 0, y0, 0, -1000] },
});
const { bands } = manifest;
const W = manifest.analysisGrid.width;
const H = manifest.analysisGrid.height;
const toLonLat = (x: number, y: number) => conv.inverse([x, y]) as [number, number];
const Z = 9; // pixels of ~80 m at 75° N, finer than the 1 km cells

/** One invented scenario: ground temperature, piles per ton and suitability class of cell (c, r), or null (not screened). */
type Scenario = (c: number, r: number) => [number, number, number] | null;
const A: Scenario = (c, r) => [-8 + 0.5 * c, 10, (c + r) % 4];
// The other scenario: warmer to the south, classes shuffled, its south-east corner cell not screened.
const B: Scenario = (c, r) => (c === W - 1 && r === H - 1 ? null : [-8 + r, 12, (3 * c + r) % 4]);

// good or fair (classes 2, 3) and ground at or below -5 °C
const spec = {
  ranges: [{ bandId: 'groundTemp', max: -5 }],
  excluded: [{ bandId: 'suitability', values: [0, 1] }],
};
const passesSpec = (v: [number, number, number] | null) => v !== null && v[0] <= -5 && v[2] >= 2;

/** Tiles at zoom Z holding a scenario's values, cell by cell (nearest cell per pixel, as the pipeline). */
function tilesOf(sc: Scenario) {
  const cache = new Map<string, Float32Array[] | null>();
  return (tx: number, ty: number): Float32Array[] | null => {
    const key = `${tx}/${ty}`;
    if (cache.has(key)) return cache.get(key) ?? null;
    const t = bands.map(() => new Float32Array(TILE_SIZE * TILE_SIZE).fill(NaN));
    let any = false;
    for (let py = 0; py < TILE_SIZE; py++)
      for (let px = 0; px < TILE_SIZE; px++) {
        const n = 2 ** Z;
        const lon = ((tx + (px + 0.5) / TILE_SIZE) / n) * 360 - 180;
        const lat =
          (Math.atan(Math.sinh(Math.PI * (1 - (2 * (ty + (py + 0.5) / TILE_SIZE)) / n))) * 180) / Math.PI;
        const [x, y] = conv.forward([lon, lat]) as [number, number];
        const c = Math.floor((x - x0) / 1000);
        const r = Math.floor((y0 - y) / 1000);
        const v = c >= 0 && r >= 0 && c < W && r < H ? sc(c, r) : null;
        if (!v) continue;
        any = true;
        v.forEach((value, b) => (t[b][py * TILE_SIZE + px] = value));
      }
    cache.set(key, any ? t : null);
    return any ? t : null;
  };
}

const tilesA = tilesOf(A);
const tilesB = tilesOf(B);
const tableA = buildCellTable({ manifest, zoom: Z, getTile: tilesA, gridToLonLat: toLonLat });
const tableB = buildCellTable({ manifest, zoom: Z, getTile: tilesB, gridToLonLat: toLonLat });
const fA = compileFilter(spec, bands);
const fB = compileFilter(spec, bands);
const NONE = compileFilter(EMPTY_FILTER, bands);
const SUIT = bands.findIndex((b) => b.id === 'suitability');

/** Grid cells ("c,r") a map leaves unveiled: the pixel at each of its table's cell centres, coloured. */
function unveiled(table: CellTable, f: ScopedFilter, own: typeof tilesA, other: typeof tilesB): Set<string> {
  const painted = new Map<string, Uint8ClampedArray>();
  const style = {
    band: bands[SUIT],
    bandIndex: SUIT,
    opacity: 1,
    filter: f.own ?? NONE,
    otherFilter: f.other,
  };
  const veilAlpha = Math.round(255 * FADED_ALPHA);
  const out = new Set<string>();
  for (let i = 0; i < table.count; i++) {
    const [tx, ty] = lonLatToTileXY(table.lon[i], table.lat[i], Z);
    const key = `${Math.floor(tx)}/${Math.floor(ty)}`;
    let rgba = painted.get(key);
    if (!rgba) {
      const planes = own(Math.floor(tx), Math.floor(ty));
      if (!planes) throw new Error(`no tile under a screened cell (${key})`);
      rgba = colourTile(planes, style, undefined, other(Math.floor(tx), Math.floor(ty)));
      painted.set(key, rgba);
    }
    const px = Math.min(TILE_SIZE - 1, Math.floor((tx - Math.floor(tx)) * TILE_SIZE));
    const py = Math.min(TILE_SIZE - 1, Math.floor((ty - Math.floor(ty)) * TILE_SIZE));
    const alpha = rgba[(py * TILE_SIZE + px) * 4 + 3];
    expect([255, veilAlpha]).toContain(alpha); // coloured or veiled, never empty
    if (alpha === 255) out.add(`${table.col[i]},${table.row[i]}`);
  }
  return out;
}

/** The cells a scope should leave unveiled, from the invented values (the scope's meaning, in words). */
function expected(scope: FilterScope, side: 'shown' | 'compared'): Set<string> {
  const out = new Set<string>();
  for (let r = 0; r < H; r++)
    for (let c = 0; c < W; c++) {
      const own = side === 'shown' ? A(c, r) : B(c, r);
      if (!own) continue; // not on this map at all
      const a = passesSpec(A(c, r));
      const b = passesSpec(B(c, r));
      const ok = { each: passesSpec(own), both: a && b, shown: a, compared: b }[scope];
      if (ok) out.add(`${c},${r}`);
    }
  return out;
}

describe('filter scopes: the counter and the veil agree cell by cell', () => {
  it('the tables hold the invented cells (B lacks its south-east corner)', () => {
    expect(tableA.count).toBe(W * H);
    expect(tableB.count).toBe(W * H - 1);
  });
  for (const scope of FILTER_SCOPES) {
    it(`filters applied to ${scope}`, () => {
      const left = scopedFilter(scope, 'shown', fA, fB);
      const right = scopedFilter(scope, 'compared', fB, fA);
      const onLeft = unveiled(tableA, left, tilesA, tilesB);
      const onRight = unveiled(tableB, right, tilesB, tilesA);
      expect(onLeft).toEqual(expected(scope, 'shown'));
      expect(onRight).toEqual(expected(scope, 'compared'));
      // The counter counts exactly the left map's unveiled cells (and the right map's, from its side).
      const countLeft = summariseScoped(tableA, left, tableB);
      const countRight = summariseScoped(tableB, right, tableA);
      expect(countLeft.matchingCells).toBe(onLeft.size);
      expect(countRight.matchingCells).toBe(onRight.size);
      expect(countLeft.matchingCells).toBeGreaterThan(0);
      // The cell B did not screen is left out of the count wherever B takes part.
      expect(countLeft.screenedCells).toBe(scope === 'each' || scope === 'shown' ? W * H : W * H - 1);
      if (scope === 'each')
        expect(onLeft).not.toEqual(onRight); // the data tell the scopes apart
      else expect([...onRight].every((k) => onLeft.has(k))).toBe(true); // one set of cells on both maps
    });
  }
  it('the scopes pick different cells on these data', () => {
    const sizes = FILTER_SCOPES.map((s) => expected(s, 'shown').size);
    expect(new Set(sizes).size).toBeGreaterThanOrEqual(3);
  });
});
