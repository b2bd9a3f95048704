/**
 * The up-front budget (issue 16 item 3): the disk estimate covers what a build really writes (its
 * output plus the band files it removes before the swap) without overstating it tenfold, and the
 * declared-size check computes the decoded size of a raster by hand-checkable arithmetic.
 */
import { readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  checkRasterBudget,
  defaultBudget,
  estimateBuild,
  type BuildBudget,
} from '../../data-pipeline/build/build-budget';
import { manifestSchema } from '../../layers/screening/manifest';
import { hashTree, makeTempDir, removeTempDirs, runCli, SMALL_DEMO, smallDemo } from './pipeline-fixtures';

afterAll(removeTempDirs);

describe('build budget', () => {
  it('the disk estimate covers the bytes a demo build writes, within a factor of 10', async () => {
    const inDir = await smallDemo();
    const out = join(await makeTempDir('budget'), 'tiles');
    const cellSize = 2 * SMALL_DEMO.cellSize_m;
    const r = await runCli([
      'build',
      '--in',
      inDir,
      '--out',
      out,
      '--cell-size',
      String(cellSize),
      '--quiet',
    ]);
    expect(r.code, r.stderr).toBe(0);
    const manifest = manifestSchema.parse(JSON.parse(await readFile(join(out, 'manifest.json'), 'utf8')));
    const { width, height } = manifest.analysisGrid;
    const bands = manifest.bands.length;
    let written = 0;
    for (const file of Object.keys(await hashTree(out))) written += (await stat(join(out, file))).size;
    const bandFiles = bands * width * height * 4; // removed before the swap, but on disk until then
    const estimate = estimateBuild({
      width,
      height,
      bands,
      inputs: manifest.sources.length,
      threads: 1,
      inputWidthMax: Math.max(...manifest.sources.map((s) => s.width)),
      geotiff: true,
    });
    expect(estimate.diskBytes).toBeGreaterThanOrEqual(written + bandFiles);
    expect(estimate.diskBytes).toBeLessThan(10 * (written + bandFiles));
  }, 120_000);

  it('refuses 60,000 x 60,000 Float32 (14.4 GB decoded: 60000^2 x 4 B) over the 4 GiB default', () => {
    const budget: BuildBudget = defaultBudget();
    const declaration = {
      width: 60_000,
      height: 60_000,
      bitsPerSample: 32,
      samplesPerPixel: 1,
      blocks: 60_000,
      blockWidth: 60_000,
      blockHeight: 1,
      distinctOffsets: 1,
      fileBytes: 480_300,
    };
    expect(() => checkRasterBudget('bomb.tif', declaration, budget)).toThrow(
      /bomb\.tif: declares 60000 x 60000 pixels of 32 bits x 1 \(14\.4 GB decoded from a 480 kB file, 60000 strips or tiles; 60000 blocks share 1 data offsets\), over the budget of 4\.3 GB/,
    );
    // 16,000 x 16,000 Float32 is 1.02 GB decoded: within the default budget.
    expect(() =>
      checkRasterBudget(
        'big.tif',
        {
          ...declaration,
          width: 16_000,
          height: 16_000,
          blocks: 16_000,
          blockWidth: 16_000,
          distinctOffsets: 16_000,
        },
        budget,
      ),
    ).not.toThrow();
  });
});
