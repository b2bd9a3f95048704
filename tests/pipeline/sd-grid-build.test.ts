/**
 * Companion standard-deviation grids (issue 14 item 1, data-pipeline/build/sd-grids.ts): an inputs
 * config entry naming `sdFile` gives the ensemble each cell's standard deviation of that input.
 * Checks: a grid of zeros reproduces the build that declares no spread for the role, byte for byte
 * (zero spread leaves every member on the cell's value: cell-ensemble-model.ts design); a grid that is
 * large in the western half widens P10-P90 there and leaves the eastern half as without it (the
 * Latin-hypercube columns of the other inputs are unchanged: the σ-grid dimension is appended);
 * bad values are refused naming the file and band; the manifest records the file.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { fromFile, writeArrayBuffer, type GeotiffWriterMetadata } from 'geotiff';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';
import { INPUTS_CONFIG_FILE } from '../../data-pipeline/inputs-config';
import { manifestSchema } from '../../layers/screening/manifest';
import { RANGE_METRICS } from '../../layers/screening/cell-ensemble-model';
import {
  hashTree,
  linkedCopy,
  makeTempDir,
  removeTempDirs,
  replaceFile,
  SMALL_DEMO,
  smallDemo,
} from './pipeline-fixtures';

afterAll(removeTempDirs);

const ROLE = 'meanAirTemp_C';
const SD_FILE = 'mean-air-temperature-sd.tif';
let root: string;
let demo: string;
let midLon: number;

type Config = { grids: { role: string; file: string; [k: string]: unknown }[] };

/** A copy of the demo inputs whose air-temperature entry is edited and, optionally, a σ grid written. */
async function variant(edit: Record<string, unknown>, sd?: (lon: number) => number): Promise<string> {
  const dir = await linkedCopy(demo, 'sd-grid');
  const config = JSON.parse(await readFile(join(dir, INPUTS_CONFIG_FILE), 'utf8')) as Config;
  const entry = config.grids.find((g) => g.role === ROLE)!;
  Object.assign(entry, edit);
  await replaceFile(dir, INPUTS_CONFIG_FILE, JSON.stringify(config, null, 2));
  if (sd) {
    // Same georeferencing as the input (EPSG:4326 in the demo), σ by the pixel centre's longitude.
    const tiff = await fromFile(join(dir, entry.file));
    const image = await tiff.getImage();
    const [west, north] = image.getOrigin();
    const [px, py] = image.getResolution();
    const width = image.getWidth();
    const height = image.getHeight();
    const values = new Float32Array(width * height);
    for (let i = 0; i < values.length; i++) values[i] = sd(west + ((i % width) + 0.5) * px);
    const metadata: GeotiffWriterMetadata = {
      width,
      height,
      ModelPixelScale: [px, Math.abs(py), 0],
      ModelTiepoint: [0, 0, 0, west, north, 0],
      GTModelTypeGeoKey: 2,
      GTRasterTypeGeoKey: 1,
      GeographicTypeGeoKey: 4326,
    };
    await replaceFile(dir, SD_FILE, new Uint8Array(writeArrayBuffer(values, metadata)));
    midLon = west + (width * px) / 2;
    await tiff.close();
  }
  return dir;
}

const common = {
  cellSize_m: SMALL_DEMO.cellSize_m,
  workers: 1,
  ensemble: { members: 8, seed: 3 },
} as const;

const band = async (dir: string, id: string) =>
  (await readGeoTiffGrid(join(root, dir, 'geotiff', `${id}.tif`), { label: id })).grid.values;

beforeAll(async () => {
  demo = await smallDemo();
  root = await makeTempDir('sd-grid-builds');
  // Reference: the role declares no spread.
  const none = await variant({ uncertainty: { sd: 0 } });
  const zeros = await variant({ sdFile: SD_FILE }, () => 0);
  await buildTiles({ ...common, inDir: none, outDir: join(root, 'none') });
  await buildTiles({ ...common, inDir: zeros, outDir: join(root, 'zeros') });
  // Western half: σ = 3 K (large against the 0.5 K default; judgement), eastern half 0.
  const half = await variant({ sdFile: SD_FILE }, (lon) => (lon < midLon ? 3 : 0));
  await buildTiles({ ...common, inDir: half, outDir: join(root, 'half') });
  // The same on two worker threads (the σ grid travels with its input to every screener).
  await buildTiles({
    ...common,
    inDir: half,
    outDir: join(root, 'half-workers'),
    workers: 2,
    minCellsForWorkers: 0,
    geotiff: false,
  });
}, 400_000);

describe('companion standard-deviation grid', () => {
  it('of zeros reproduces the build with no spread for the role, band for band', async () => {
    const a = await hashTree(join(root, 'none'));
    const b = await hashTree(join(root, 'zeros'));
    const tifs = Object.keys(a).filter((f) => f.startsWith('geotiff/'));
    expect(tifs.length).toBeGreaterThan(20);
    for (const f of tifs) expect(b[f], f).toBe(a[f]);
  });

  it('large in the western half widens P10-P90 there and not in the east', async () => {
    const m = manifestSchema.parse(JSON.parse(await readFile(join(root, 'half', 'manifest.json'), 'utf8')));
    const { width, height, geoTransform, crs } = m.analysisGrid;
    const toLonLat = createTransform(crs, 'EPSG:4326');
    // Ground temperature at the end of life at the reference depth follows air temperature directly.
    const metric = RANGE_METRICS.find((r) => r === 'groundTempEnd')!;
    const [p10h, p90h, p10n, p90n] = await Promise.all([
      band('half', `${metric}P10`),
      band('half', `${metric}P90`),
      band('none', `${metric}P10`),
      band('none', `${metric}P90`),
    ]);
    let west = 0;
    let wider = 0;
    let east = 0;
    // Cells within two input pixels (bilinear footprint) of the edge are left out.
    const margin = 0.5;
    for (let row = 0; row < height; row++) {
      for (let col = 0; col < width; col++) {
        const i = row * width + col;
        if (!Number.isFinite(p10n[i]) || !Number.isFinite(p90n[i])) continue;
        const x = geoTransform[0] + (col + 0.5) * geoTransform[1];
        const y = geoTransform[3] + (row + 0.5) * geoTransform[5];
        const [lon] = toLonLat(x, y);
        if (lon < midLon - margin) {
          west++;
          if (p90h[i] - p10h[i] > p90n[i] - p10n[i]) wider++;
        } else if (lon > midLon + margin) {
          east++;
          expect(p10h[i]).toBe(p10n[i]);
          expect(p90h[i]).toBe(p90n[i]);
        }
      }
    }
    expect(west).toBeGreaterThan(20);
    expect(east).toBeGreaterThan(20);
    // A 3 K spread of air temperature moves the ground temperature of nearly every cell (Kudryavtsev /
    // TTOP: ground temperature rises about one for one with air temperature; recalled from memory).
    expect(wider / west).toBeGreaterThan(0.9);
    // Recorded in the manifest beside its input.
    const source = m.sources.find((s) => s.role === ROLE);
    expect(source?.standardDeviation?.file).toBe(SD_FILE);
    expect(source?.standardDeviation?.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('gives the same tiles whatever the worker count', async () => {
    const a = await hashTree(join(root, 'half'));
    const b = await hashTree(join(root, 'half-workers'));
    const tiles = Object.keys(a).filter((f) => f.startsWith('tiles/'));
    expect(tiles.length).toBeGreaterThan(10);
    for (const f of tiles) expect(b[f], f).toBe(a[f]);
  });

  it('refuses a negative or non-finite standard deviation, naming the file and band', async () => {
    const negative = await variant({ sdFile: SD_FILE }, (lon) => (lon < midLon ? -1 : 0.5));
    await expect(
      buildTiles({ ...common, inDir: negative, outDir: join(root, 'bad-negative') }),
    ).rejects.toThrow(
      /mean-air-temperature-sd\.tif: standard deviation of meanAirTemp_C \(band 1\) value -1/,
    );
    const infinite = await variant({ sdFile: SD_FILE }, (lon) => (lon < midLon ? Infinity : 0.5));
    await expect(
      buildTiles({ ...common, inDir: infinite, outDir: join(root, 'bad-infinite') }),
    ).rejects.toThrow(
      /mean-air-temperature-sd\.tif: standard deviation of meanAirTemp_C \(band 1\) is Infinity/,
    );
  });

  it('is refused together with a declared spread for the same grid', async () => {
    const both = await variant({ sdFile: SD_FILE, uncertainty: { sd: 1 } }, () => 0);
    await expect(buildTiles({ ...common, inDir: both, outDir: join(root, 'bad-both') })).rejects.toThrow(
      /not both/,
    );
  });
});
