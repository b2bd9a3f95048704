import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { fromFile } from 'geotiff';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles, type BuildSummary } from '../../data-pipeline/build/build-tiles';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import { hashTree, makeTempDir, SMALL_DEMO, smallDemo, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

let serialDir: string;
let parallelDir: string;
let parallel: BuildSummary;
let manifest: Manifest;

beforeAll(async () => {
  const inDir = await smallDemo();
  const root = await makeTempDir('parallel');
  serialDir = join(root, 'serial');
  parallelDir = join(root, 'parallel');
  await buildTiles({ inDir, outDir: serialDir, cellSize_m: SMALL_DEMO.cellSize_m, workers: 1 });
  parallel = await buildTiles({
    inDir,
    outDir: parallelDir,
    cellSize_m: SMALL_DEMO.cellSize_m,
    workers: 2,
    minCellsForWorkers: 0,
  });
  manifest = manifestSchema.parse(JSON.parse(await readFile(join(parallelDir, 'manifest.json'), 'utf8')));
}, 240_000);

describe('parallel screening and GeoTIFF export', () => {
  it('gives byte-identical tiles and GeoTIFFs with two worker threads as on the main thread', async () => {
    expect(parallel.workers).toBe(2);
    const serial = await hashTree(serialDir);
    const par = await hashTree(parallelDir);
    delete serial['manifest.json'];
    delete par['manifest.json'];
    expect(Object.keys(par).length).toBeGreaterThan(20);
    expect(par).toEqual(serial);
    // The output bands stream through temporary raw files that must not ship with the output.
    expect(Object.keys(par).filter((f) => f.endsWith('.f32') || f.includes('.bands'))).toEqual([]);
    expect(Object.keys(par).some((f) => f.startsWith('tiles/'))).toBe(true);
  });

  it('writes every band as a georeferenced EPSG:3413 GeoTIFF holding the band values', async () => {
    const grid = manifest.analysisGrid;
    const files = manifest.parameters.geotiffs as Record<string, string>;
    expect(Object.keys(files).sort()).toEqual(manifest.bands.map((b) => b.id).sort());
    const tif = await readGeoTiffGrid(join(parallelDir, files.groundTemp), { label: files.groundTemp });
    expect(tif.grid.crs).toBe('EPSG:3413');
    expect([tif.grid.width, tif.grid.height]).toEqual([grid.width, grid.height]);
    expect(tif.grid.geoTransform).toEqual(grid.geoTransform);
    expect(tif.nodata).toBe(-9999);
    const finite = Array.from(tif.grid.values).filter((v) => !Number.isNaN(v));
    expect(finite.length).toBe(parallel.cellsScreened);
    const band = manifest.bands.find((b) => b.id === 'groundTemp')!;
    expect(Math.min(...finite)).toBeCloseTo(band.min, 5);
    expect(Math.max(...finite)).toBeCloseTo(band.max, 5);
    const image = await (await fromFile(join(parallelDir, files.groundTemp))).getImage();
    expect(image.getGeoKeys()?.ProjectedCSTypeGeoKey).toBe(3413);
    expect(String(await image.fileDirectory.loadValue('ImageDescription'))).toMatch(/not a design/);
  });
});
