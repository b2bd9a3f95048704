/**
 * `npx tsx bench/calibration.ts [n] [seed] [--workers k] [--bracket m]`: calibrate the per-cell screening
 * model against the site simulator on a seeded sample spanning the demo region's inputs
 * (bench/cell-calibration.ts: absolute values, the model's one-pile form against the simulator's pile,
 * each carrying one pile's share of the standard building, from the start year to the climate horizon)
 * and write tests/fixtures/calibration.json (regenerated only on purpose; never edited by hand). The
 * first m cells (default 5, one per texture) also get the group bracket (isolated and endless-field
 * simulated pile against the model's 4 × 4 group). About 8 s per simulated cell on one loaded core
 * (75 years, 7-day steps, standard mesh; about 1.4 × that at the 3.5-day default); `--workers k` splits the cells over k child processes (default
 * 2; each cell is independent, so the result does not depend on k).
 * tests/unit/screening-calibration.test.ts checks the committed distribution against the documented
 * bounds, recomputes the model side and re-runs a seeded subset live.
 */
import { fork } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { format, resolveConfig } from 'prettier';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  calibrateCell,
  calibrationSummary,
  DEFAULT_CALIBRATION_OPTIONS,
  groupBracket,
  sampleCalibrationCells,
} from './cell-calibration';
import { DEFAULT_SCENARIO } from '../layers/screening/scenario';

const here = dirname(fileURLToPath(import.meta.url));
const argv = process.argv.slice(2);
const flag = (name: string) => {
  const i = argv.indexOf(name);
  return i >= 0 ? argv.splice(i, 2)[1] : undefined;
};
const shard = flag('--shard');
const workers = Math.max(1, Number(flag('--workers') ?? 2));
const n = Number(argv[0] ?? 200);
const seed = Number(argv[1] ?? 2026);
const cells = sampleCalibrationCells(n, seed);
const r4 = (x: number | null) => (x === null || !Number.isFinite(x) ? null : Math.round(x * 1e4) / 1e4);

const bracketCells = Number(flag('--bracket') ?? 5);

const roundFigures = <T extends object>(f: T): T =>
  Object.fromEntries(Object.entries(f).map(([k, v]) => [k, typeof v === 'number' ? r4(v) : v])) as T;

function calibrationRow(i: number) {
  const c = cells[i];
  const r = calibrateCell(c, DEFAULT_SCENARIO, DEFAULT_CALIBRATION_OPTIONS);
  return {
    index: i,
    cell: {
      meanAirTemp_C: r4(c.meanAirTemp_C),
      airAmplitude_C: r4(c.airAmplitude_C),
      warming_C_per_yr: r4(c.warming_C_per_yr),
      textureClass: c.textureClass,
      waterContent_m3m3: r4(c.waterContent_m3m3),
    },
    excluded: r.excluded,
    model: roundFigures(r.model),
    sim: { ...roundFigures(r.sim), seconds: Math.round(r.sim.seconds * 10) / 10 },
    bracket: i < bracketCells ? roundFigures(groupBracket(c)) : null,
  };
}
type Row = ReturnType<typeof calibrationRow>;

if (shard !== undefined) {
  // Child process: cells i ≡ part (mod parts), interleaved so the parts get similar work.
  const [part, parts] = shard.split('/').map(Number);
  const rows: Row[] = [];
  for (let i = part; i < n; i += parts) rows.push(calibrationRow(i));
  process.send?.(rows, () => process.exit(0));
} else {
  const t0 = performance.now();
  let done = 0;
  const parts = await Promise.all(
    Array.from(
      { length: workers },
      (_, part) =>
        new Promise<Row[]>((resolve, reject) => {
          const child = fork(fileURLToPath(import.meta.url), [
            String(n),
            String(seed),
            '--shard',
            `${part}/${workers}`,
          ]);
          child.on('message', (rows) => {
            done += (rows as Row[]).length;
            process.stderr.write(`${done}/${n} cells\n`);
            resolve(rows as Row[]);
          });
          child.on('exit', (code) => (code === 0 ? undefined : reject(new Error(`worker exit ${code}`))));
        }),
    ),
  );
  const cases = parts.flat().sort((a, b) => a.index - b.index);
  const wall_s = (performance.now() - t0) / 1000;
  const out = {
    generatedBy: 'bench/calibration.ts',
    seed,
    n,
    options: DEFAULT_CALIBRATION_OPTIONS,
    summary: {
      ...calibrationSummary(cases.map((c) => ({ ...c, cell: cells[c.index] }))),
      excluded: cases.filter((c) => c.excluded).length,
      runTime: {
        workers,
        wall_s: Math.round(wall_s),
        cpu_s: Math.round(cases.reduce((s, c) => s + c.sim.seconds, 0)),
      },
    },
    cases,
  };
  const file = join(here, '..', 'tests', 'fixtures', 'calibration.json');
  mkdirSync(dirname(file), { recursive: true });
  // Written in the repository's Prettier style so `npm run check` accepts it as generated.
  const style = (await resolveConfig(file)) ?? {};
  writeFileSync(file, await format(JSON.stringify(out, null, 1), { ...style, parser: 'json' }));
  console.log(JSON.stringify(out.summary, null, 2));
}
