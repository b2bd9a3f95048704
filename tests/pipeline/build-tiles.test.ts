import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles, type BuildSummary } from '../../data-pipeline/build/build-tiles';
import { resampleAt } from '../../data-pipeline/build/resample-to-grid';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';
import { inputsConfigSchema } from '../../data-pipeline/inputs-config';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { tileRange } from '../../data-pipeline/tiles/write-tile-pyramid';
import { SCREENING_CAUTION, FICTIONAL_DATA_NOTICE } from '../../layers/cautions';
import { createScreeningModel } from '../../layers/screening/cell-screening-model';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import type { CellInputs } from '../../layers/screening/screening-model';
import { TILE_SIZE, unpackTile } from '../../layers/screening/tile-format';
import { makeTempDir, sha256OfFile, SMALL_DEMO, smallDemo, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

let inDir: string;
let outDir: string;
let summary: BuildSummary;
let manifest: Manifest;

beforeAll(async () => {
  inDir = await smallDemo();
  outDir = join(await makeTempDir('build'), 'out');
  summary = await buildTiles({ inDir, outDir, cellSize_m: SMALL_DEMO.cellSize_m });
  manifest = manifestSchema.parse(JSON.parse(await readFile(join(outDir, 'manifest.json'), 'utf8')));
}, 180_000);

/** Decode the value of every band at (lon, lat) from the finest tile. */
async function decodeAt(lon: number, lat: number): Promise<Record<string, number>> {
  const z = manifest.tiles.maxZoom;
  const n = 2 ** z;
  const fx = ((lon + 180) / 360) * n;
  const r = (lat * Math.PI) / 180;
  const fy = ((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n;
  const [x, y] = [Math.floor(fx), Math.floor(fy)];
  const px = Math.floor((fx - x) * TILE_SIZE);
  const py = Math.floor((fy - y) * TILE_SIZE);
  const bytes = await readFile(join(outDir, 'tiles', String(z), String(x), `${y}.bin`));
  const planes = unpackTile(bytes, manifest.bands);
  return Object.fromEntries(manifest.bands.map((b, i) => [b.id, planes[i][py * TILE_SIZE + px]]));
}

describe('build on a small demo region', () => {
  it('writes a manifest valid against the schema, with cautions, provenance and checksums', async () => {
    expect(manifest.fictional).toBe(true);
    expect(manifest.notice).toContain(SCREENING_CAUTION);
    expect(manifest.notice).toContain(FICTIONAL_DATA_NOTICE);
    expect(manifest.analysisGrid.crs).toBe('EPSG:3413');
    expect(manifest.analysisGrid.cellSize_m).toBe(SMALL_DEMO.cellSize_m);
    expect(manifest.tool.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(manifest.bands.map((b) => b.id)).toEqual(
      expect.arrayContaining([
        'groundTemp',
        'activeLayer',
        'pilesPerTon',
        'thawDelay',
        'suitability',
        'inputFlags',
      ]),
    );
    expect(manifest.scenario).toBeDefined();
    expect(manifest.criteria?.length).toBeGreaterThan(0);
    for (const c of manifest.criteria ?? [])
      expect(
        manifest.bands.some((b) => b.id === c.bandId),
        c.id,
      ).toBe(true);
    expect(manifest.sources).toHaveLength(6);
    for (const s of manifest.sources) expect(s.sha256).toBe(await sha256OfFile(join(inDir, s.file)));
    expect(new Set(manifest.sources.map((s) => s.crs))).toEqual(
      new Set(['EPSG:4326', 'EPSG:3413', 'EPSG:3995']),
    );
    expect(manifest.settlements).toBe('settlements.geojson');
    expect(await readFile(join(outDir, 'land.geojson'), 'utf8')).toBe(
      await readFile(join(inDir, 'land.geojson'), 'utf8'),
    );
    expect(summary.cellsScreened).toBeGreaterThan(1000);
    expect(summary.cellsModelNodata).toBe(0);
  });

  it('writes every zoom level from min to max, each tile the size the encoding demands', async () => {
    for (let z = manifest.tiles.minZoom; z <= manifest.tiles.maxZoom; z++) {
      expect(summary.tilesByZoom[z], `zoom ${z}`).toBeGreaterThan(0);
      const range = tileRange(manifest.region.bounds, z);
      expect(summary.tilesByZoom[z]).toBeLessThanOrEqual(
        (range.x1 - range.x0 + 1) * (range.y1 - range.y0 + 1),
      );
    }
  });

  it('decodes, at a known land point, to the model evaluated on the resampled inputs', async () => {
    const grid = manifest.analysisGrid;
    const [px, py] = createTransform('EPSG:4326', grid.crs)(-2.5, 74.8);
    const col = Math.floor((px - grid.geoTransform[0]) / grid.cellSize_m);
    const row = Math.floor((grid.geoTransform[3] - py) / grid.cellSize_m);
    const cx = grid.geoTransform[0] + (col + 0.5) * grid.cellSize_m;
    const cy = grid.geoTransform[3] - (row + 0.5) * grid.cellSize_m;
    const [lon, lat] = createTransform(grid.crs, 'EPSG:4326')(cx, cy);

    const config = inputsConfigSchema.parse(
      JSON.parse(await readFile(join(inDir, 'pile-atlas-inputs.json'), 'utf8')),
    );
    const cell: Record<string, number> = {
      groundTemp_C: NaN,
      geothermalFlux_W_m2: NaN,
      nFreeze: NaN,
      latitude_deg: lat,
    };
    for (const g of config.grids) {
      const src = await readGeoTiffGrid(join(inDir, g.file), { label: g.file });
      const at = Float64Array.from(createTransform(grid.crs, src.grid.crs)(cx, cy));
      cell[g.role] = resampleAt(src.grid, at, g.kind === 'class' ? 'nearest' : 'bilinear')[0];
    }
    const model = createScreeningModel({});
    const expected = new Float32Array(model.layers.length);
    model.evaluate(cell as unknown as CellInputs, expected);
    const want = (id: string) => expected[model.layers.findIndex((l) => l.id === id)];

    const decoded = await decodeAt(lon, lat);
    const band = (id: string) => manifest.bands.find((b) => b.id === id)!;
    // Tolerances: quantisation (scale / 2) plus the pipeline interpolating projected coordinates between
    // exact transforms every 8 cells (a shift of the sampling point of a few metres): 0.2 % of the value.
    for (const id of ['groundTemp', 'activeLayer', 'extractionPerPile', 'pilesPerTon']) {
      expect(Number.isFinite(want(id)), id).toBe(true);
      expect(Math.abs(decoded[id] - want(id)), id).toBeLessThanOrEqual(
        band(id).scale / 2 + 2e-3 * Math.abs(want(id)),
      );
    }
    for (const id of ['suitability', 'exclusion', 'permafrostClassToday'])
      expect(decoded[id], id).toBe(want(id));
    expect(decoded.textureClass).toBe(cell.textureClass);
    expect(Math.abs(decoded.bedrockDepth - cell.bedrockDepth_m)).toBeLessThan(1e-3);
    expect(decoded.inputFlags).toBe(7);
  });

  it('decodes to nodata over the open sea', async () => {
    const decoded = await decodeAt(-3, 73.75).catch(() => null);
    // Either the tile is absent (all nodata) or the pixel decodes to NaN.
    if (decoded) for (const v of Object.values(decoded)) expect(v).toBeNaN();
    else expect(decoded).toBeNull();
  });
});
