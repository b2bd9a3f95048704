/**
 * `npx tsx bench/cell-model-before-after.ts [commit]`: the per-cell model's speed and outputs at an
 * earlier commit (default: 328966b, before the kernel work of issue 11's speed target) against the
 * working tree, in one process on the same cells (cell-model.bench.ts's sample). The earlier commit's
 * `layers/` is taken from git into .cache/ and imported from there (as model-before-after.ts does).
 * Prints, for the kernel alone (one evaluation, no robustness) and for the full model (with the class
 * robustness), the median and best cells per CPU-second of 7 interleaved passes each (before, after,
 * before, ...: a load change on the machine hits both alike); then, over the sample and the default
 * scenario, its four robustness perturbations and three variants (a warming pathway, a warm and a
 * cold fluid limit), the largest absolute and relative difference of every metric that differs, and
 * the count of NaN mismatches. Figures go to the README, never into a unit test.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { sampleCells } from './cell-model.bench';
import type { CellInputs } from '../layers/screening/screening-model';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');

interface Model {
  evaluateCellMetrics: (c: CellInputs, k: unknown, x: unknown, m: Float64Array) => void;
  createKernelScratch: () => unknown;
  buildCellConstants: (s: unknown) => unknown;
  createScreeningModel: (s?: unknown) => {
    layers: unknown[];
    evaluate: (c: CellInputs, out: Float32Array) => void;
  };
  perturbedScenarios: (s: unknown) => unknown[];
  parseScenario: (s: unknown) => unknown;
  DEFAULT_SCENARIO: unknown;
  METRIC_IDS: readonly string[];
  METRIC_COUNT: number;
}

async function modelAt(commit: string | null): Promise<Model> {
  const base = commit === null ? root : join(root, '.cache', `layers-${commit}`);
  if (commit !== null && !existsSync(join(base, 'layers', 'screening', 'cell-kernel.ts'))) {
    mkdirSync(base, { recursive: true });
    const tar = execFileSync('git', ['-C', root, 'archive', commit, 'layers'], { maxBuffer: 1 << 28 });
    execFileSync('tar', ['-x', '-C', base], { input: tar });
  }
  const imp = (p: string) => import(pathToFileURL(join(base, 'layers', 'screening', p)).href);
  const mods = await Promise.all(
    [
      'cell-kernel.ts',
      'cell-constants.ts',
      'cell-screening-model.ts',
      'class-robustness.ts',
      'scenario.ts',
      'cell-layers.ts',
    ].map(imp),
  );
  return Object.assign({}, ...mods) as Model;
}

/** Cells per CPU-second of one pass of `f` over the cells. */
function rate(cells: CellInputs[], f: (c: CellInputs) => void): number {
  const start = process.cpuUsage();
  for (const c of cells) f(c);
  const used = process.cpuUsage(start);
  return cells.length / ((used.user + used.system) / 1e6);
}

function timeBoth(cells: CellInputs[], before: (c: CellInputs) => void, after: (c: CellInputs) => void) {
  for (let w = 0; w < 2; w++) {
    rate(cells, before);
    rate(cells, after);
  }
  const b: number[] = [];
  const a: number[] = [];
  for (let i = 0; i < 7; i++) {
    b.push(rate(cells, before));
    a.push(rate(cells, after));
  }
  const fmt = (r: number[]) => {
    const s = [...r].sort((p, q) => p - q);
    return `${Math.round(s[3]).toLocaleString('en')} (best ${Math.round(s[6]).toLocaleString('en')})`;
  };
  return { before: fmt(b), after: fmt(a) };
}

function kernelRunner(m: Model, scenario: unknown) {
  const k = m.buildCellConstants(scenario);
  const x = m.createKernelScratch();
  const out = new Float64Array(m.METRIC_COUNT);
  return { out, run: (c: CellInputs) => m.evaluateCellMetrics(c, k, x, out) };
}

function fullRunner(m: Model) {
  const model = m.createScreeningModel();
  const out = new Float32Array(model.layers.length);
  return (c: CellInputs) => model.evaluate(c, out);
}

function scenarios(m: Model): unknown[] {
  return [
    m.DEFAULT_SCENARIO,
    ...m.perturbedScenarios(m.DEFAULT_SCENARIO),
    m.parseScenario({
      climateHorizonYear: 2300,
      warmingPathway: {
        label: 'illustrative pathway',
        points: [
          { year: 2000, airWarming_K: 0 },
          { year: 2050, airWarming_K: 2 },
          { year: 2100, airWarming_K: 5 },
          { year: 2300, airWarming_K: 9 },
        ],
        patternReference_C_per_yr: 0.05,
      },
    }),
    m.parseScenario({ heatPump: { minEnteringFluid_C: -3 } }),
    m.parseScenario({ heatPump: { minEnteringFluid_C: -15, fluidHalfDelta_K: 4 } }),
  ];
}

/** Largest differences per metric between the two models over the cells and scenarios. */
function compare(before: Model, after: Model, cells: CellInputs[]): string[] {
  const ids = after.METRIC_IDS;
  const worst = ids.map(() => ({ abs: 0, rel: 0, nan: 0 }));
  const sb = scenarios(before);
  const sa = scenarios(after);
  for (let s = 0; s < sa.length; s++) {
    const b = kernelRunner(before, sb[s]);
    const a = kernelRunner(after, sa[s]);
    for (const c of cells) {
      b.run(c);
      a.run(c);
      for (let i = 0; i < ids.length; i++) {
        const p = b.out[i];
        const q = a.out[i];
        if (Number.isNaN(p) || Number.isNaN(q)) {
          if (Number.isNaN(p) !== Number.isNaN(q)) worst[i].nan++;
          continue;
        }
        const d = Math.abs(p - q);
        worst[i].abs = Math.max(worst[i].abs, d);
        if (d > 0) worst[i].rel = Math.max(worst[i].rel, d / Math.max(Math.abs(p), Math.abs(q)));
      }
    }
  }
  const lines = ids.flatMap((id, i) => {
    const w = worst[i];
    if (w.abs === 0 && w.nan === 0) return [];
    return [
      `${id}: max abs ${w.abs.toExponential(2)}, max rel ${w.rel.toExponential(2)}, NaN mismatches ${w.nan}`,
    ];
  });
  return lines.length > 0 ? lines : ['every metric identical'];
}

const commit = process.argv[2] ?? '328966b';
const before = await modelAt(commit);
const after = await modelAt(null);
const cells = sampleCells(50_000, 12345);
const kb = kernelRunner(before, before.DEFAULT_SCENARIO).run;
const ka = kernelRunner(after, after.DEFAULT_SCENARIO).run;
const kernel = timeBoth(cells, kb, ka);
const full = timeBoth(cells, fullRunner(before), fullRunner(after));
console.log(
  `cells/s/core, median (best) of 7 interleaved passes of ${cells.length} cells; ${commit} → working tree`,
);
console.log(`kernel alone: ${kernel.before} → ${kernel.after}`);
console.log(`full model with class robustness: ${full.before} → ${full.after}`);
console.log(`outputs over ${cells.length} cells × ${scenarios(after).length} scenarios:`);
for (const l of compare(before, after, cells)) console.log(`  ${l}`);
