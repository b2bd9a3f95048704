/**
 * `npx tsx bench/model-before-after.ts [step_deg]`: the per-cell model's figures over the demo region at
 * earlier commits and now, to say which change moved what (issue 11). Each commit's `layers/` is taken
 * from git into .cache/ and its own kernel, constants and default scenario are imported from there; all
 * see the same cells, sampled from the demo region's generator (data-pipeline/demo/demo-region.ts) on a
 * regular lon/lat grid over its land, with no ground-temperature, flux or n-factor grid (model defaults).
 * Prints a Markdown table: P5/P50/P95 of piles per ton, thaw delay (finite values; the count of "after
 * the horizon" cells beside it), active layer, end-of-life ground temperature, and the class shares.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { createDemoRegion, DEMO_BOUNDS_DEG } from '../data-pipeline/demo/demo-region';
import { DEMO_SEED } from '../data-pipeline/demo/generate-demo-data';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const STEPS: [string, string][] = [
  ['cb274d4', 'before (first edition)'],
  ['0014dc5', '+ fluid convention, 4 × 4 group, monthly lagged peak (alone)'],
  ['680c334', '+ two-phase Neumann active layer (alone)'],
  ['76f68ad', '+ active layer, one surface-warming transfer'],
  ['7d0b855', '+ active layer, warming, excess ice, 2100 horizon'],
  [
    '0b8908c',
    'previous release: + the field the building needs (N piles), hard foundation checks, warming pathways',
  ],
  ['HEAD', 'after (all of issue 11: + bivalent operation at fixed loop flow)'],
];

interface Kernel {
  evaluateCellMetrics: (c: unknown, k: unknown, x: unknown, m: Float64Array) => void;
  createKernelScratch: () => unknown;
  buildCellConstants: (s: unknown) => unknown;
  DEFAULT_SCENARIO: unknown;
  METRIC: Record<string, number>;
  METRIC_COUNT: number;
}

async function kernelAt(commit: string): Promise<Kernel> {
  const base = commit === 'HEAD' ? root : join(root, '.cache', `layers-${commit}`);
  if (commit !== 'HEAD' && !existsSync(join(base, 'layers', 'screening', 'cell-kernel.ts'))) {
    mkdirSync(base, { recursive: true });
    const tar = execFileSync('git', ['-C', root, 'archive', commit, 'layers'], { maxBuffer: 1 << 28 });
    execFileSync('tar', ['-x', '-C', base], { input: tar });
  }
  const imp = (p: string) => import(pathToFileURL(join(base, 'layers', 'screening', p)).href);
  const [kernel, constants, scenario, layers] = await Promise.all([
    imp('cell-kernel.ts'),
    imp('cell-constants.ts'),
    imp('scenario.ts'),
    imp('cell-layers.ts'),
  ]);
  return { ...kernel, ...constants, ...scenario, ...layers } as Kernel;
}

const step = Number(process.argv[2] ?? 0.05);
const region = createDemoRegion(DEMO_SEED);
const [w, s, e, n] = DEMO_BOUNDS_DEG;
const cells: Record<string, number>[] = [];
for (let lat = s + step / 4; lat < n; lat += step / 2.5) {
  for (let lon = w + step / 2; lon < e; lon += step) {
    const c = region.sample(lon, lat);
    if (!c.land) continue;
    cells.push({
      meanAirTemp_C: c.meanAirTemp_C,
      airAmplitude_C: c.airAmplitude_C,
      warming_C_per_yr: c.warming_C_per_yr,
      textureClass: c.textureClass,
      waterContent_m3m3: c.waterContent_m3m3,
      bedrockDepth_m: c.bedrockDepth_m,
      groundTemp_C: NaN,
      geothermalFlux_W_m2: NaN,
      nFreeze: NaN,
      latitude_deg: lat,
    });
  }
}

const pct = (xs: number[], p: number) => {
  const a = xs.filter(Number.isFinite).sort((x, y) => x - y);
  return a.length ? a[Math.min(a.length - 1, Math.max(0, Math.ceil(p * a.length) - 1))] : NaN;
};
const trio = (xs: number[], d: number) => [0.05, 0.5, 0.95].map((p) => pct(xs, p).toFixed(d)).join(' / ');

console.log(`${cells.length} land cells of the demo region (grid ${step}° × ${(step / 2.5).toFixed(3)}°)\n`);
console.log(
  '| model | piles per ton P5/P50/P95 | thaw delay P5/P50/P95 (yr) [after horizon] | active layer P5/P50/P95 (m) | end-of-life ground P5/P50/P95 (°C) | classes excluded/poor/fair/good (%) |',
);
console.log('| --- | --- | --- | --- | --- | --- |');
for (const [commit, label] of STEPS) {
  const K = await kernelAt(commit);
  const k = K.buildCellConstants(K.DEFAULT_SCENARIO);
  const x = K.createKernelScratch();
  const m = new Float64Array(K.METRIC_COUNT);
  const piles: number[] = [];
  const delay: number[] = [];
  const al: number[] = [];
  const end: number[] = [];
  const cls = [0, 0, 0, 0];
  let after = 0;
  for (const c of cells) {
    K.evaluateCellMetrics(c, k, x, m);
    cls[m[K.METRIC.suitability]]++;
    if (m[K.METRIC.exclusion] !== 0) continue;
    piles.push(m[K.METRIC.pilesPerTon]);
    al.push(m[K.METRIC.activeLayer]);
    end.push(m[K.METRIC.groundTempEnd]);
    const d = m[K.METRIC.thawDelay];
    if (K.METRIC.thawBeyondHorizon !== undefined && m[K.METRIC.thawBeyondHorizon] === 2) after++;
    else delay.push(d);
  }
  const total = cls.reduce((a, b) => a + b, 0);
  console.log(
    `| ${label} | ${trio(piles, 1)} | ${trio(delay, 1)} [${after}] | ${trio(al, 2)} | ${trio(end, 2)} | ${cls
      .map((v) => ((100 * v) / total).toFixed(1))
      .join(' / ')} |`,
  );
}
