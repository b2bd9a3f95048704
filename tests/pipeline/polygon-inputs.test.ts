/**
 * Polygon inputs: the demo's soil-texture grid re-published as a surficial-geology map, one polygon per
 * run of equal pixels along each row, with a geology-unit name as attribute, in a GeoPackage (written
 * by GDAL's ogr2ogr). The inputs config maps unit -> texture class. The build's texture band must equal
 * the plain build's within half a cell: each cell's class is the plain class of the cell or of a
 * neighbour it touches (classes are not interpolated).
 */
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles, type BuildSummary } from '../../data-pipeline/build/build-tiles';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { TEXTURE_CODES } from '../../layers/physics/texture-codes';
import { makeTempDir, removeTempDirs, runCli, SMALL_DEMO, smallDemo } from './pipeline-fixtures';

afterAll(removeTempDirs);

const UNIT_OF: Record<number, string> = {
  1: 'glaciofluvial gravel',
  2: 'eolian sand',
  3: 'lacustrine silt',
  4: 'marine clay',
  5: 'organic deposits (peat)',
  6: 'bedrock outcrop',
};

async function writeGeologyGpkg(dir: string): Promise<void> {
  const src = await readGeoTiffGrid(join(dir, 'soil-texture.tif'), { label: 'soil-texture.tif' });
  const { width, height, geoTransform: gt, values } = src.grid;
  const features: unknown[] = [];
  for (let r = 0; r < height; r++) {
    let c0 = 0;
    for (let c = 1; c <= width; c++) {
      const v = values[r * width + c0];
      if (c < width && values[r * width + c] === v) continue;
      if (!Number.isNaN(v)) {
        const [x0, x1] = [gt[0] + c0 * gt[1], gt[0] + c * gt[1]];
        const [y0, y1] = [gt[3] + r * gt[5], gt[3] + (r + 1) * gt[5]];
        features.push({
          type: 'Feature',
          properties: { unit: UNIT_OF[v], map_sheet: 'demo' },
          geometry: {
            type: 'Polygon',
            coordinates: [
              [
                [x0, y0],
                [x1, y0],
                [x1, y1],
                [x0, y1],
                [x0, y0],
              ],
            ],
          },
        });
      }
      c0 = c;
    }
  }
  const geojson = join(dir, 'geology-runs.json');
  await writeFile(geojson, JSON.stringify({ type: 'FeatureCollection', features }));
  const gdal = await loadGdal();
  gdal.vectorTranslate(geojson, join(dir, 'surficial-geology.gpkg'), [
    '-f',
    'GPKG',
    '-s_srs',
    src.grid.crs,
    '-a_srs',
    src.grid.crs,
    '-nln',
    'surficial_geology',
  ]);
}

let plain: BuildSummary;
let poly: BuildSummary;
let plainDir: string;
let polyDir: string;
let polyIn: string;

beforeAll(async () => {
  const plainIn = await smallDemo();
  polyIn = await smallDemo();
  await writeGeologyGpkg(polyIn);
  const configFile = join(polyIn, 'pile-atlas-inputs.json');
  const config = JSON.parse(await readFile(configFile, 'utf8'));
  for (const g of config.grids) {
    if (g.role !== 'textureClass') continue;
    g.file = 'surficial-geology.gpkg';
    g.attribute = 'unit';
    g.values = Object.fromEntries(Object.entries(UNIT_OF).map(([code, unit]) => [unit, Number(code)]));
    delete g.nodata;
  }
  await writeFile(configFile, JSON.stringify(config));
  const root = await makeTempDir('poly');
  plainDir = join(root, 'plain');
  polyDir = join(root, 'poly');
  const common = { cellSize_m: SMALL_DEMO.cellSize_m, modelKind: 'basic' as const };
  plain = await buildTiles({ inDir: plainIn, outDir: plainDir, ...common });
  poly = await buildTiles({ inDir: polyIn, outDir: polyDir, ...common });
}, 300_000);

describe('polygon inputs (GeoPackage, attribute mapped to a role)', () => {
  it('records the attribute, the value table and the rasterisation in the manifest', async () => {
    const manifest = JSON.parse(await readFile(join(polyDir, 'manifest.json'), 'utf8'));
    const src = manifest.sources.find((s: { role: string }) => s.role === 'textureClass');
    expect(src.file).toBe('surficial-geology.gpkg');
    expect(src.reading.format).toBe('polygons');
    expect(src.reading.polygons.attribute).toBe('unit');
    expect(src.reading.polygons.values['marine clay']).toBe(4);
    expect(src.reading.polygons.features).toBeGreaterThan(10);
  });

  it('gives the plain build texture classes within half a cell', async () => {
    expect(Math.abs(poly.cellsScreened - plain.cellsScreened) / plain.cellsScreened).toBeLessThan(0.03);
    const a = (await readGeoTiffGrid(join(plainDir, 'geotiff', 'textureClass.tif'), { label: 'a' })).grid;
    const b = (await readGeoTiffGrid(join(polyDir, 'geotiff', 'textureClass.tif'), { label: 'b' })).grid;
    const dc = Math.round((a.geoTransform[0] - b.geoTransform[0]) / SMALL_DEMO.cellSize_m);
    const dr = Math.round((b.geoTransform[3] - a.geoTransform[3]) / SMALL_DEMO.cellSize_m);
    let n = 0;
    let same = 0;
    let nearby = 0;
    for (let r = 0; r < a.height; r++) {
      for (let c = 0; c < a.width; c++) {
        const rb = r + dr;
        const cb = c + dc;
        if (rb < 0 || cb < 0 || rb >= b.height || cb >= b.width) continue;
        const va = a.values[r * a.width + c];
        const vb = b.values[rb * b.width + cb];
        if (Number.isNaN(va) || Number.isNaN(vb)) continue;
        n++;
        if (va === vb) same++;
        let near = false;
        for (let i = -1; i <= 1; i++) {
          for (let j = -1; j <= 1; j++) {
            const q = a.values[(r + i) * a.width + (c + j)];
            if (r + i >= 0 && r + i < a.height && c + j >= 0 && c + j < a.width && q === vb) near = true;
          }
        }
        if (near) nearby++;
        expect(Object.keys(TEXTURE_CODES)).toContain(String(vb));
      }
    }
    expect(n).toBeGreaterThan(0.9 * plain.cellsScreened);
    expect(same / n).toBeGreaterThan(0.9);
    expect(nearby / n).toBeGreaterThan(0.99);
  });

  it('refuses an attribute value the config does not map, naming it', async () => {
    const configFile = join(polyIn, 'pile-atlas-inputs.json');
    const good = await readFile(configFile, 'utf8');
    try {
      const config = JSON.parse(good);
      for (const g of config.grids) if (g.role === 'textureClass') delete g.values['marine clay'];
      await writeFile(configFile, JSON.stringify(config));
      const out = join(await makeTempDir('poly-bad'), 'out');
      const r = await runCli([
        'build',
        '--in',
        polyIn,
        '--out',
        out,
        '--cell-size',
        '4000',
        '--model',
        'basic',
      ]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(
        /surficial-geology\.gpkg: feature \d+ has unit = "marine clay", not in the inputs config's values/,
      );
    } finally {
      await writeFile(configFile, good);
    }
  });
});
