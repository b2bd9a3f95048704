/**
 * Companion confusion-probability grids (issue 14 item 1, data-pipeline/build/sd-grids.ts): a class
 * grid's inputs-config entry naming `confusionFile` gives the ensemble each cell's probability that the
 * mapped texture class is wrong.
 * Checks: a grid of zeros reproduces the build that declares no confusion for the texture, byte for
 * byte (a zero confusion leaves every member on the mapped class: cell-ensemble-model.ts design); a grid
 * that is high in the western half makes more places "uncertain" and widens P10-P90 there and leaves
 * the eastern half exactly as without it (the hypercube columns of the other inputs are unchanged: the
 * companion-grid dimension is appended); the same tiles on two worker threads; bad values and bad
 * config entries are refused naming the file or field and what was expected; the manifest records
 * the file with its checksum.
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
import { RANGE_METRICS, UNCERTAIN_CLASS } from '../../layers/screening/cell-ensemble-model';
import { ENSEMBLE_BAND_IDS } from '../../layers/screening/band-ids';
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

const ROLE = 'textureClass';
const CONFUSION_FILE = 'texture-confusion.tif';
let root: string;
let demo: string;
let midLon: number;

type Config = { grids: { role: string; file: string; [k: string]: unknown }[] };

/** A copy of the demo inputs whose texture entry (or `role`'s) is edited and, optionally, a grid written. */
async function variant(
  edit: Record<string, unknown>,
  grid?: (lon: number) => number,
  role = ROLE,
): Promise<string> {
  const dir = await linkedCopy(demo, 'confusion-grid');
  const config = JSON.parse(await readFile(join(dir, INPUTS_CONFIG_FILE), 'utf8')) as Config;
  const entry = config.grids.find((g) => g.role === role)!;
  Object.assign(entry, edit);
  await replaceFile(dir, INPUTS_CONFIG_FILE, JSON.stringify(config, null, 2));
  if (grid) {
    // Same georeferencing as the input (the demo's texture grid is in EPSG:3413), the value by the
    // longitude of the pixel centre.
    const tiff = await fromFile(join(dir, entry.file));
    const image = await tiff.getImage();
    const keys = image.getGeoKeys() as Record<string, number | undefined>;
    const projected = keys.ProjectedCSTypeGeoKey;
    const epsg = projected ?? keys.GeographicTypeGeoKey ?? 4326;
    const toLon = createTransform(`EPSG:${epsg}`, 'EPSG:4326');
    const [west, north] = image.getOrigin();
    const [px, py] = image.getResolution();
    const width = image.getWidth();
    const height = image.getHeight();
    midLon = toLon(west + (width * px) / 2, north + (height * py) / 2)[0];
    const values = new Float32Array(width * height);
    for (let i = 0; i < values.length; i++) {
      const x = west + ((i % width) + 0.5) * px;
      const y = north + (Math.floor(i / width) + 0.5) * py;
      values[i] = grid(toLon(x, y)[0]);
    }
    const metadata: GeotiffWriterMetadata = {
      width,
      height,
      ModelPixelScale: [px, Math.abs(py), 0],
      ModelTiepoint: [0, 0, 0, west, north, 0],
      GTModelTypeGeoKey: projected ? 1 : 2,
      GTRasterTypeGeoKey: 1,
      ...(projected ? { ProjectedCSTypeGeoKey: projected } : { GeographicTypeGeoKey: epsg }),
    };
    await replaceFile(dir, CONFUSION_FILE, new Uint8Array(writeArrayBuffer(values, metadata)));
    await tiff.close();
  }
  return dir;
}

const common = {
  cellSize_m: SMALL_DEMO.cellSize_m,
  workers: 1,
  ensemble: { members: 8, seed: 5 },
} as const;

const band = async (dir: string, id: string) =>
  (await readGeoTiffGrid(join(root, dir, 'geotiff', `${id}.tif`), { label: id })).grid.values;

beforeAll(async () => {
  demo = await smallDemo();
  root = await makeTempDir('confusion-grid-builds');
  // Reference: the texture declares no confusion.
  const none = await variant({ uncertainty: { confusion: 0 } });
  const zeros = await variant({ confusionFile: CONFUSION_FILE }, () => 0);
  await buildTiles({ ...common, inDir: none, outDir: join(root, 'none') });
  await buildTiles({ ...common, inDir: zeros, outDir: join(root, 'zeros') });
  // Western half: a 60 % chance the mapped class is wrong (high against the 15 % default; judgement).
  const half = await variant({ confusionFile: CONFUSION_FILE }, (lon) => (lon < midLon ? 0.6 : 0));
  await buildTiles({ ...common, inDir: half, outDir: join(root, 'half') });
  // The same on two worker threads (the grid travels with its input to every screener).
  await buildTiles({
    ...common,
    inDir: half,
    outDir: join(root, 'half-workers'),
    workers: 2,
    minCellsForWorkers: 0,
    geotiff: false,
  });
}, 900_000);

/** West / east of the grid's edge (cells within `margin` degrees of it left out), per analysis cell. */
async function sides(margin: number): Promise<('west' | 'east' | null)[]> {
  const m = manifestSchema.parse(JSON.parse(await readFile(join(root, 'half', 'manifest.json'), 'utf8')));
  const { width, height, geoTransform, crs } = m.analysisGrid;
  const toLonLat = createTransform(crs, 'EPSG:4326');
  const out: ('west' | 'east' | null)[] = [];
  for (let row = 0; row < height; row++) {
    for (let col = 0; col < width; col++) {
      const [lon] = toLonLat(
        geoTransform[0] + (col + 0.5) * geoTransform[1],
        geoTransform[3] + (row + 0.5) * geoTransform[5],
      );
      out.push(lon < midLon - margin ? 'west' : lon > midLon + margin ? 'east' : null);
    }
  }
  return out;
}

describe('companion confusion-probability grid', () => {
  it('of zeros reproduces the build with no confusion for the texture, band for band', async () => {
    const a = await hashTree(join(root, 'none'));
    const b = await hashTree(join(root, 'zeros'));
    const tifs = Object.keys(a).filter((f) => f.startsWith('geotiff/'));
    expect(tifs.length).toBeGreaterThan(20);
    for (const f of tifs) expect(b[f], f).toBe(a[f]);
  });

  it('high in the western half makes places uncertain and widens ranges there, not in the east', async () => {
    // Nearest-neighbour warping: cells within 0.5° of longitude (about 14 km here) of the edge left out.
    const side = await sides(0.5);
    const [robustH, robustN] = await Promise.all([band('half', 'robustClass'), band('none', 'robustClass')]);
    let west = 0;
    let east = 0;
    let uncertainH = 0;
    let uncertainN = 0;
    for (let i = 0; i < side.length; i++) {
      if (!Number.isFinite(robustN[i])) continue;
      if (side[i] === 'west') {
        west++;
        if (robustH[i] === UNCERTAIN_CLASS) uncertainH++;
        if (robustN[i] === UNCERTAIN_CLASS) uncertainN++;
      } else if (side[i] === 'east') east++;
    }
    expect(west).toBeGreaterThan(20);
    expect(east).toBeGreaterThan(20);
    // Texture sets conductivity, capacity and the thaw-settlement class (Johansen 1975; the kernel's
    // soil table): with the class wrong in 60 % of the members many more places lose a robust class.
    expect(uncertainH).toBeGreaterThan(uncertainN + 0.1 * west);
    // Every ensemble band in the east as without the grid; some P10-P90 range wider in the west.
    for (const id of ENSEMBLE_BAND_IDS) {
      const [h, n] = await Promise.all([band('half', id), band('none', id)]);
      for (let i = 0; i < side.length; i++) if (side[i] === 'east') expect(h[i], `${id} @${i}`).toBe(n[i]);
    }
    let wider = 0;
    for (const metric of RANGE_METRICS) {
      const [p10h, p90h, p10n, p90n] = await Promise.all(
        ['half', 'half', 'none', 'none'].map((d, k) => band(d, `${metric}${k % 2 === 0 ? 'P10' : 'P90'}`)),
      );
      for (let i = 0; i < side.length; i++)
        if (side[i] === 'west' && p90h[i] - p10h[i] > p90n[i] - p10n[i]) wider++;
    }
    expect(wider).toBeGreaterThan(west / 2);
  });

  it('is recorded in the manifest with its checksum and gives the same tiles on two workers', async () => {
    const m = manifestSchema.parse(JSON.parse(await readFile(join(root, 'half', 'manifest.json'), 'utf8')));
    const source = m.sources.find((s) => s.role === ROLE);
    expect(source?.confusionProbability?.file).toBe(CONFUSION_FILE);
    expect(source?.confusionProbability?.unit).toBe('fraction');
    expect(source?.confusionProbability?.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(source?.standardDeviation).toBeUndefined();
    const a = await hashTree(join(root, 'half'));
    const b = await hashTree(join(root, 'half-workers'));
    const tiles = Object.keys(a).filter((f) => f.startsWith('tiles/'));
    expect(tiles.length).toBeGreaterThan(10);
    for (const f of tiles) expect(b[f], f).toBe(a[f]);
  });

  it('refuses a probability outside [0, 1] or not finite, naming the file and band', async () => {
    const above = await variant({ confusionFile: CONFUSION_FILE }, (lon) => (lon < midLon ? 1.5 : 0.1));
    await expect(buildTiles({ ...common, inDir: above, outDir: join(root, 'bad-above') })).rejects.toThrow(
      /texture-confusion\.tif: confusion probability of textureClass \(band 1\) value 1\.5 fraction .*outside the plausible range 0\.\.1/,
    );
    const infinite = await variant({ confusionFile: CONFUSION_FILE }, (lon) => (lon < midLon ? Infinity : 0));
    await expect(
      buildTiles({ ...common, inDir: infinite, outDir: join(root, 'bad-infinite') }),
    ).rejects.toThrow(
      /texture-confusion\.tif: confusion probability of textureClass \(band 1\) is Infinity .*expected a probability in \[0, 1\]/,
    );
  });

  it('is refused with a declared spread, on a continuous grid, and as a standard-deviation grid', async () => {
    const both = await variant({ confusionFile: CONFUSION_FILE, uncertainty: { confusion: 0.2 } }, () => 0);
    await expect(buildTiles({ ...common, inDir: both, outDir: join(root, 'bad-both') })).rejects.toThrow(
      /grids\.\d+\.confusionFile: textureClass: give either "uncertainty" or "confusionFile", not both/,
    );
    const continuous = await variant({ confusionFile: CONFUSION_FILE }, undefined, 'meanAirTemp_C');
    await expect(
      buildTiles({ ...common, inDir: continuous, outDir: join(root, 'bad-continuous') }),
    ).rejects.toThrow(/confusionFile: meanAirTemp_C is a continuous grid: a confusion-probability grid/);
    const asSd = await variant({ sdFile: CONFUSION_FILE });
    await expect(buildTiles({ ...common, inDir: asSd, outDir: join(root, 'bad-sd') })).rejects.toThrow(
      /sdFile: textureClass is a class grid.*"confusionFile"/,
    );
  });
});
