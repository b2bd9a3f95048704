/**
 * Convergence study of the per-cell ensemble (layers/screening/cell-ensemble-model.ts): how P10, P50
 * and P90 settle as the member count N grows, which picks the default N of
 * layers/screening/uncertainty-schema.ts.
 *
 * Sample: every k-th land cell of the demo region (`pile-atlas demo-data` defaults, 1 km cells), its
 * inputs as the build resamples them (a recording model passed to buildTiles). Reference: N = 1024
 * (seed 1). For each N and 4 seeds (2…5, independent of the reference's), the error of each percentile
 * against the reference, divided by the reference's P10-P90 range (cells with a range > 0), gives the
 * median and 90th percentile over cells and seeds; robust-class agreement is the share of cells whose
 * robust class equals the reference's; success is the mean absolute difference of the probability of
 * success. Rule: the smallest N whose median scaled P10/P90 error is below 0.1 and whose robust class
 * agrees with the reference on at least 90 % of cells.
 *
 * Run: npx tsx bench/ensemble-convergence.ts [--cells 300]   (prints a Markdown table)
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateDemoData } from '../data-pipeline/demo/generate-demo-data';
import { buildTiles } from '../data-pipeline/build/build-tiles';
import { createEnsembleModel, RANGE_METRICS } from '../layers/screening/cell-ensemble-model';
import { percentileOfSorted } from '../layers/screening/ensemble-statistics';
import type { CellInputs, ScreeningModel } from '../layers/screening/screening-model';
import { METRIC_COUNT } from '../layers/screening/cell-layers';

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const CELLS = arg('cells', 300);
const REFERENCE_N = 1024;
const NS = [4, 8, 16, 32, 64, 128, 256];
const SEEDS = [2, 3, 4, 5];

async function demoCells(): Promise<{ cell: CellInputs; index: number }[]> {
  const dir = await mkdtemp(join(tmpdir(), 'pile-atlas-convergence-'));
  try {
    const inDir = join(dir, 'demo');
    await generateDemoData({ outDir: inDir });
    const seen: { cell: CellInputs; index: number }[] = [];
    let count = 0;
    const recorder: ScreeningModel = {
      layers: [{ id: 'seen', title: 'seen', unit: '', kind: 'continuous', description: '', source: '' }],
      evaluate(cell, out, cellIndex) {
        out[0] = 1;
        seen.push({ cell: { ...cell }, index: cellIndex ?? count });
        count++;
      },
    };
    await buildTiles({ inDir, outDir: join(dir, 'out'), model: recorder, geotiff: false });
    const step = Math.max(1, Math.floor(seen.length / CELLS));
    return seen.filter((_, i) => i % step === 0).slice(0, CELLS);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

function run(cells: { cell: CellInputs; index: number }[], members: number, seed: number): Float32Array[] {
  const model = createEnsembleModel({ scenario: { uncertainty: { members, seed } } });
  return cells.map(({ cell, index }) => {
    const out = new Float32Array(model.layers.length);
    model.evaluate(cell, out, index);
    return out.slice(METRIC_COUNT);
  });
}

const median = (v: number[]) =>
  percentileOfSorted(
    [...v].sort((a, b) => a - b),
    0.5,
  );
const p90 = (v: number[]) =>
  percentileOfSorted(
    [...v].sort((a, b) => a - b),
    0.9,
  );

async function main(): Promise<void> {
  const cells = await demoCells();
  const t0 = performance.now();
  const ref = run(cells, REFERENCE_N, 1);
  const refSeconds = (performance.now() - t0) / 1000;
  const nRange = RANGE_METRICS.length * 3;
  const robustAt = nRange + 1;
  const rows: string[] = [];
  rows.push(
    '| N | median error P10 / P50 / P90 (share of the P10-P90 range) | 90th pct error P10 / P50 / P90 | robust class as reference | success probability, mean abs. difference | CPU s per 1000 cells |',
  );
  rows.push('|---|---|---|---|---|---|');
  let chosen = 0;
  for (const n of NS) {
    const err: number[][] = [[], [], []];
    let agree = 0;
    let total = 0;
    const dSuccess: number[] = [];
    let seconds = 0;
    for (const seed of SEEDS) {
      const t = performance.now();
      const res = run(cells, n, seed);
      seconds += (performance.now() - t) / 1000;
      res.forEach((r, c) => {
        const f = ref[c];
        for (let m = 0; m < RANGE_METRICS.length; m++) {
          const range = f[3 * m + 2] - f[3 * m];
          if (!(range > 0)) continue;
          for (let p = 0; p < 3; p++) {
            const e = Math.abs(r[3 * m + p] - f[3 * m + p]);
            if (Number.isFinite(e)) err[p].push(e / range);
          }
        }
        dSuccess.push(Math.abs(r[nRange] - f[nRange]));
        if (r[robustAt] === f[robustAt]) agree++;
        total++;
      });
    }
    const med = err.map(median);
    const hi = err.map(p90);
    const agreeShare = agree / total;
    if (!chosen && Math.max(med[0], med[2]) < 0.1 && agreeShare >= 0.9) chosen = n;
    rows.push(
      `| ${n} | ${med.map((v) => v.toFixed(3)).join(' / ')} | ${hi.map((v) => v.toFixed(3)).join(' / ')} | ` +
        `${(100 * agreeShare).toFixed(1)} % | ${median(dSuccess).toFixed(3)} (median), ${(dSuccess.reduce((a, b) => a + b, 0) / dSuccess.length).toFixed(3)} (mean) | ` +
        `${((seconds / SEEDS.length / cells.length) * 1000).toFixed(2)} |`,
    );
  }
  process.stdout.write(
    `Convergence of the per-cell ensemble: ${cells.length} demo cells, reference N = ${REFERENCE_N} ` +
      `(${refSeconds.toFixed(1)} s), ${SEEDS.length} seeds per N.\n\n${rows.join('\n')}\n\n` +
      `Smallest N meeting the rule (median P10/P90 error < 0.1 of the range, robust class agreeing on ≥ 90 %): ${chosen || 'none'}\n`,
  );
}

await main();
