/**
 * Ensemble benchmark (`npm run bench ensemble`). Nothing is asserted (style.md habit 16).
 *
 * 1. Demo region, side by side in one run: `pile-atlas build` of the demo deterministic, then with
 *    `--ensemble` (default N), each in its own process under GNU time: wall time, CPU time and peak
 *    resident memory (maxRSS of the process tree), and the ratio of the two wall times.
 * 2. Throughput of the ensemble screening on the 4.4 M-cell synthetic region of pipeline.bench.ts
 *    (the same smooth fields, evaluated directly at the cell centres of the 2100 x 2100 km square at
 *    1 km, every 8th row and column: 69 000 cells), with the default N: cells x members per CPU-second
 *    on one thread, against the deterministic model on the same cells, and the projected screening
 *    time for 4.4 M and 70 M cells on this machine's cores. The tile and GeoTIFF stages scale with
 *    cells x bands and are projected from pipeline.bench.ts's measured stage times.
 * 3. With PILE_ATLAS_BENCH_FULL=1: the whole 4.4 M-cell synthetic build with --ensemble (default N) on
 *    every core, end to end (several minutes; peak memory from maxRSS of this process and its workers).
 */
import { spawnSync } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { createEnsembleModel } from '../layers/screening/cell-ensemble-model';
import { createScreeningModel } from '../layers/screening/cell-screening-model';
import type { CellInputs } from '../layers/screening/screening-model';
import { createTransform } from '../data-pipeline/crs/crs-definitions';
import { scenarioUncertaintySchema } from '../layers/screening/uncertainty-schema';
import { buildTiles } from '../data-pipeline/build/build-tiles';
import { writeSyntheticInputs } from './pipeline.bench';
import { mkdir } from 'node:fs/promises';

interface Timed {
  wall_s: number;
  cpu_s: number;
  maxRss_MB: number;
  ok: boolean;
}

function timed(args: string[]): Timed {
  const r = spawnSync('/usr/bin/time', ['-v', 'npx', 'pile-atlas', ...args], { encoding: 'utf8' });
  const err = r.stderr ?? '';
  const num = (re: RegExp) => Number(re.exec(err)?.[1] ?? NaN);
  const wall = /Elapsed \(wall clock\) time \(h:mm:ss or m:ss\): (?:(\d+):)?(\d+):([\d.]+)/.exec(err);
  const wall_s = wall ? Number(wall[1] ?? 0) * 3600 + Number(wall[2]) * 60 + Number(wall[3]) : NaN;
  return {
    wall_s,
    cpu_s: num(/User time \(seconds\): ([\d.]+)/) + num(/System time \(seconds\): ([\d.]+)/),
    maxRss_MB: num(/Maximum resident set size \(kbytes\): (\d+)/) / 1024,
    ok: r.status === 0,
  };
}

async function demoSideBySide(): Promise<void> {
  const root = await mkdtemp(join(tmpdir(), 'pile-atlas-ensemble-bench-'));
  try {
    const demo = join(root, 'demo');
    const gen = spawnSync('npx', ['pile-atlas', 'demo-data', '--out', demo], { encoding: 'utf8' });
    if (gen.status !== 0) throw new Error(`demo-data failed: ${gen.stderr}`);
    const common = ['build', '--in', demo, '--quiet'];
    const det = timed([...common, '--out', join(root, 'det')]);
    const ens = timed([...common, '--out', join(root, 'ens'), '--ensemble']);
    const n = scenarioUncertaintySchema.parse({}).members;
    const row = (name: string, t: Timed) =>
      `  ${name.padEnd(28)} wall ${t.wall_s.toFixed(1)} s, CPU ${t.cpu_s.toFixed(1)} s, peak RSS ${t.maxRss_MB.toFixed(0)} MB${t.ok ? '' : ' (FAILED)'}`;
    console.log(
      `demo region, whole build (read, screen, tiles, GeoTIFFs, manifest), ${availableParallelism()} cores:`,
    );
    console.log(row('deterministic', det));
    console.log(row(`ensemble, N = ${n}`, ens));
    console.log(
      `  ensemble / deterministic wall time: ${(ens.wall_s / det.wall_s).toFixed(2)} (target ≤ 10)`,
    );
  } finally {
    await rm(root, { recursive: true, force: true });
  }
}

/** The synthetic fields of pipeline.bench.ts at (lon, lat) (not data, not the demo region). */
function syntheticCell(lon: number, lat: number): CellInputs {
  return {
    meanAirTemp_C: -2 - 0.5 * (lat - 64) + Math.sin(lon / 7),
    airAmplitude_C: 15 + 3 * Math.sin(lon / 5) + 0.1 * (lat - 64),
    warming_C_per_yr: 0.03 + 0.002 * (lat - 64),
    textureClass: 1 + (((Math.floor(lon * 3 + lat * 5) % 6) + 6) % 6),
    waterContent_m3m3: 0.2 + 0.15 * (1 + Math.sin(lon * 2 + lat)),
    bedrockDepth_m: 12 + 10 * Math.sin(lon + lat * 3),
    groundTemp_C: NaN,
    geothermalFlux_W_m2: NaN,
    nFreeze: NaN,
    latitude_deg: lat,
  };
}

function syntheticThroughput(): void {
  const HALF = 1_050_000;
  const STEP = 8;
  const side = 2100;
  const [cx, cy] = createTransform('EPSG:4326', 'EPSG:3413')(-3, 73);
  const toLonLat = createTransform('EPSG:3413', 'EPSG:4326');
  const cells: { cell: CellInputs; index: number }[] = [];
  for (let r = 0; r < side; r += STEP)
    for (let c = 0; c < side; c += STEP) {
      const [lon, lat] = toLonLat(cx - HALF + (c + 0.5) * 1000, cy + HALF - (r + 0.5) * 1000);
      cells.push({ cell: syntheticCell(lon, lat), index: r * side + c });
    }
  const det = createScreeningModel({});
  const ens = createEnsembleModel({ scenario: { uncertainty: {} } });
  const n = ens.uncertainty.members;
  const cpu = (f: () => void) => {
    const t = process.cpuUsage();
    f();
    const d = process.cpuUsage(t);
    return (d.user + d.system) / 1e6;
  };
  const outD = new Float32Array(det.layers.length);
  const outE = new Float32Array(ens.layers.length);
  // Warm up both.
  for (let i = 0; i < 2000; i++) {
    det.evaluate(cells[i].cell, outD);
    ens.evaluate(cells[i].cell, outE, cells[i].index);
  }
  const tDet = cpu(() => {
    for (const { cell } of cells) det.evaluate(cell, outD);
  });
  const tEns = cpu(() => {
    for (const { cell, index } of cells) ens.evaluate(cell, outE, index);
  });
  const rate = (cells.length * n) / tEns;
  const cores = availableParallelism();
  console.log(
    `synthetic region (4.41 M cells; ${cells.length} sampled, every ${STEP}th row and column), N = ${n}:`,
  );
  console.log(`  deterministic model: ${Math.round(cells.length / tDet)} cells per CPU-second`);
  console.log(
    `  ensemble: ${Math.round(cells.length / tEns)} cells per CPU-second = ${Math.round(rate)} cells x members per CPU-second ` +
      `(${((rate * tDet) / cells.length).toFixed(2)} x the deterministic model per evaluation)`,
  );
  for (const total of [4.41e6, 70e6]) {
    const cpuS = (total * n) / rate;
    console.log(
      `  projected ensemble screening of ${(total / 1e6).toFixed(2)} M cells: ${(cpuS / 60).toFixed(1)} CPU-min, ` +
        `${(cpuS / cores / 60).toFixed(1)} min wall on ${cores} cores`,
    );
  }
}

export async function syntheticFullBuild(): Promise<void> {
  const root = await mkdtemp(join(tmpdir(), 'pile-atlas-ensemble-full-'));
  try {
    await mkdir(join(root, 'in'));
    await writeSyntheticInputs(join(root, 'in'));
    const stages: Record<string, [number, number]> = {};
    const t0 = Date.now();
    const cpu0 = process.cpuUsage();
    const summary = await buildTiles({
      inDir: join(root, 'in'),
      outDir: join(root, 'out'),
      cellSize_m: 1000,
      workers: availableParallelism(),
      ensemble: true,
      onProgress: (p) => {
        stages[p.stage] ??= [Date.now(), Date.now()];
        stages[p.stage][1] = Date.now();
      },
    });
    const wall = (Date.now() - t0) / 1000;
    const cpu = process.cpuUsage(cpu0);
    const n = scenarioUncertaintySchema.parse({}).members;
    console.log(`synthetic region, whole ensemble build (N = ${n}, ${summary.workers} workers):`);
    console.log(
      `  cells ${summary.cellsTotal} (screened ${summary.cellsScreened}); bands ${summary.bands.length}`,
    );
    for (const [k, [a, b]] of Object.entries(stages))
      console.log(`  stage ${k.padEnd(8)} ${((b - a) / 1000).toFixed(1)} s`);
    console.log(
      `  wall ${wall.toFixed(1)} s; ${Math.round((summary.cellsScreened * n) / wall)} cells x members per wall-second; ` +
        `main-thread CPU ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s; peak RSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`,
    );
  } finally {
    await rm(root, { recursive: true, force: true });
  }
}

export async function run(): Promise<void> {
  await demoSideBySide();
  syntheticThroughput();
  if (process.env.PILE_ATLAS_BENCH_FULL === '1') await syntheticFullBuild();
}
