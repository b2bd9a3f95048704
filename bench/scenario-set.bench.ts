/**
 * Scenario-set benchmark (`npm run bench scenario-set`): the fictional demo region built with three
 * scenarios of the demo set (present trend, high pathway, high pathway with a 50-year life) in ONE
 * build, side by side with THREE separate one-scenario builds of the same inputs, in one run. Prints
 * wall time, the input-read share (reading, checking and checksumming the grids, done once per build)
 * and peak resident memory. Options: BENCH_CELL_M (default 2000 m analysis cells), BENCH_WORKERS.
 * Nothing is asserted (style.md habit 16).
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildTiles } from '../data-pipeline/build/build-tiles';
import { loadInputs } from '../data-pipeline/build/load-inputs';
import { defaultBudget } from '../data-pipeline/build/build-budget';
import { DEMO_SCENARIO_SET } from '../data-pipeline/demo/demo-scenarios';
import { generateDemoData } from '../data-pipeline/demo/generate-demo-data';

const SET = {
  scenarios: [DEMO_SCENARIO_SET.scenarios[0], DEMO_SCENARIO_SET.scenarios[2], DEMO_SCENARIO_SET.scenarios[3]],
};

export async function run(): Promise<void> {
  const cellSize_m = Number(process.env.BENCH_CELL_M ?? 2000);
  const workers = Number(process.env.BENCH_WORKERS ?? Math.min(8, availableParallelism()));
  const dir = await mkdtemp(join(tmpdir(), 'pile-atlas-bench-set-'));
  try {
    const inDir = join(dir, 'in');
    await generateDemoData({ outDir: inDir });
    let t = performance.now();
    await loadInputs(inDir, () => undefined, defaultBudget());
    const read_s = (performance.now() - t) / 1000;

    t = performance.now();
    let cells = 0;
    for (let i = 0; i < SET.scenarios.length; i++) {
      const r = await buildTiles({
        inDir,
        outDir: join(dir, `separate-${i}`),
        cellSize_m,
        workers,
        scenario: SET.scenarios[i],
      });
      cells = r.cellsTotal;
    }
    const separate_s = (performance.now() - t) / 1000;

    t = performance.now();
    await buildTiles({ inDir, outDir: join(dir, 'set'), cellSize_m, workers, scenario: SET });
    const set_s = (performance.now() - t) / 1000;
    const rss = process.resourceUsage().maxRSS / 1024;

    console.log(`demo region, ${cells} analysis cells at ${cellSize_m} m, ${workers} workers, GeoTIFFs on`);
    console.log(`input read + check + checksums (once per build): ${read_s.toFixed(2)} s`);
    console.log('| run | wall time (s) | per scenario (s) |');
    console.log('|---|---:|---:|');
    console.log(`| three separate builds | ${separate_s.toFixed(1)} | ${(separate_s / 3).toFixed(1)} |`);
    console.log(`| one three-scenario build | ${set_s.toFixed(1)} | ${(set_s / 3).toFixed(1)} |`);
    console.log(
      `saved: ${(separate_s - set_s).toFixed(1)} s (${((1 - set_s / separate_s) * 100).toFixed(0)} %)`,
    );
    console.log(`peak resident memory of the run: ${rss.toFixed(0)} MB`);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}
