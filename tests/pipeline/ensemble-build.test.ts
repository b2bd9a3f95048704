import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles, type BuildSummary } from '../../data-pipeline/build/build-tiles';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import { ENSEMBLE_BAND_IDS } from '../../layers/screening/band-ids';
import { RANGE_METRICS } from '../../layers/screening/cell-ensemble-model';
import { scenarioUncertaintySchema, zeroSpread } from '../../layers/screening/uncertainty-schema';
import { hashTree, makeTempDir, SMALL_DEMO, smallDemo, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

let root: string;
let det: BuildSummary;
let zero: BuildSummary;
let manifest: Manifest;

const zeroUncertainty = zeroSpread(scenarioUncertaintySchema.parse({ members: 4 }));

beforeAll(async () => {
  const inDir = await smallDemo();
  root = await makeTempDir('ensemble');
  const common = { inDir, cellSize_m: SMALL_DEMO.cellSize_m, workers: 1 };
  det = await buildTiles({ ...common, outDir: join(root, 'det') });
  zero = await buildTiles({
    ...common,
    outDir: join(root, 'zero'),
    scenario: { uncertainty: zeroUncertainty },
  });
  await buildTiles({
    ...common,
    outDir: join(root, 'seeded-a'),
    ensemble: { members: 8, seed: 5 },
    geotiff: false,
  });
  await buildTiles({
    ...common,
    outDir: join(root, 'seeded-b'),
    ensemble: { members: 8, seed: 5 },
    geotiff: false,
    workers: 2,
    minCellsForWorkers: 0,
  });
  await buildTiles({
    ...common,
    outDir: join(root, 'seeded-c'),
    ensemble: { members: 8, seed: 6 },
    geotiff: false,
  });
  manifest = manifestSchema.parse(
    JSON.parse(await readFile(join(root, 'seeded-a', 'manifest.json'), 'utf8')),
  );
}, 300_000);

const values = async (dir: string, band: string) =>
  (await readGeoTiffGrid(join(root, dir, 'geotiff', `${band}.tif`), { label: band })).grid.values;

describe('ensemble build', () => {
  it('with zero spread writes the deterministic bands byte for byte, and P10 = P50 = P90 = the deterministic value', async () => {
    const a = await hashTree(join(root, 'det'));
    const b = await hashTree(join(root, 'zero'));
    for (const band of det.bands) expect(b[`geotiff/${band}.tif`]).toBe(a[`geotiff/${band}.tif`]);
    expect(zero.bands.length).toBe(det.bands.length + ENSEMBLE_BAND_IDS.length);
    for (const m of RANGE_METRICS) {
      const base = Array.from(await values('det', m));
      for (const p of ['P10', 'P50', 'P90'])
        expect(Array.from(await values('zero', `${m}${p}`))).toEqual(base);
    }
    // Robust class = the deterministic class on every screened cell.
    const cls = await values('det', 'suitability');
    const robust = await values('zero', 'robustClass');
    expect(Array.from(robust)).toEqual(Array.from(cls));
  });

  it('is byte-identical from one seed, whatever the worker count, and changes with the seed', async () => {
    const a = await hashTree(join(root, 'seeded-a'));
    const b = await hashTree(join(root, 'seeded-b'));
    const c = await hashTree(join(root, 'seeded-c'));
    for (const t of [a, b, c]) delete t['manifest.json'];
    expect(Object.keys(a).filter((f) => f.startsWith('tiles/')).length).toBeGreaterThan(10);
    expect(b).toEqual(a);
    expect(c).not.toEqual(a);
  });

  it('records the uncertainty declarations and the ensemble bands in the manifest', () => {
    const u = manifest.parameters.uncertainty as {
      members: number;
      seed: number;
      grids: object;
      parameters: object;
    };
    expect(u.members).toBe(8);
    expect(u.seed).toBe(5);
    expect(Object.keys(u.grids)).toContain('textureClass');
    expect(Object.keys(u.parameters)).toContain('copScale');
    expect((manifest.scenario as { uncertainty?: { members: number } }).uncertainty?.members).toBe(8);
    const ids = manifest.bands.map((b) => b.id);
    for (const id of [
      'pilesPerTonP10',
      'thawDelayP90',
      'successProbability',
      'robustClass',
      'classAgreement',
    ])
      expect(ids).toContain(id);
    const robust = manifest.bands.find((b) => b.id === 'robustClass');
    expect(robust?.classes?.map((c) => c.label)).toContain('uncertain');
  });
});
