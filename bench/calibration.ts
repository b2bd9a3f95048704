/**
 * `npx tsx bench/calibration.ts [n] [seed]`: calibrate the per-cell screening model against the site
 * simulator on a seeded sample spanning the demo region's inputs (bench/cell-calibration.ts) and write
 * tests/fixtures/calibration.json (regenerated only on purpose; never edited by hand). Takes about
 * 3 s per cell on one core. tests/unit/screening-calibration.test.ts checks the committed
 * distribution against the documented bounds and re-runs a seeded subset live.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { format, resolveConfig } from 'prettier';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  calibrateCell,
  DEFAULT_CALIBRATION_OPTIONS,
  errorSummary,
  sampleCalibrationCells,
} from './cell-calibration';
import { DEFAULT_SCENARIO } from '../layers/screening/scenario';

const here = dirname(fileURLToPath(import.meta.url));
const n = Number(process.argv[2] ?? 200);
const seed = Number(process.argv[3] ?? 2026);
const cells = sampleCalibrationCells(n, seed);
const r4 = (x: number | null) => (x === null || !Number.isFinite(x) ? null : Math.round(x * 1e4) / 1e4);
const cases = cells.map((c, i) => {
  const r = calibrateCell(c, DEFAULT_SCENARIO, DEFAULT_CALIBRATION_OPTIONS);
  process.stderr.write(`\r${i + 1}/${n} (${r.sim.seconds.toFixed(1)} s)`);
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
    model: {
      thawDelay_yr: r4(r.model.thawDelay_yr),
      pilesPerTon: r4(r.model.pilesPerTon),
      fluidDrop_K: r4(r.model.fluidDrop_K),
    },
    sim: {
      thawDelay_yr: r4(r.sim.thawDelay_yr),
      lowerBound: r.sim.lowerBound,
      fluidDrop_K: r4(r.sim.fluidDrop_K),
    },
    thawDelayError_yr: r4(r.thawDelayError_yr),
    pileCountError: r4(r.pileCountError),
  };
});
process.stderr.write('\n');
const thaw = errorSummary(cases.flatMap((c) => (c.thawDelayError_yr === null ? [] : [c.thawDelayError_yr])));
const piles = errorSummary(cases.flatMap((c) => (c.pileCountError === null ? [] : [c.pileCountError])));
const out = {
  generatedBy: 'bench/calibration.ts',
  seed,
  n,
  options: DEFAULT_CALIBRATION_OPTIONS,
  summary: {
    thawDelayAbsError_yr: thaw,
    pileCountAbsRelError: piles,
    excluded: cases.filter((c) => c.excluded).length,
  },
  cases,
};
const file = join(here, '..', 'tests', 'fixtures', 'calibration.json');
mkdirSync(dirname(file), { recursive: true });
// Written in the repository's Prettier style so `npm run check` accepts it as generated.
const style = (await resolveConfig(file)) ?? {};
writeFileSync(file, await format(JSON.stringify(out, null, 1), { ...style, parser: 'json' }));
console.log(JSON.stringify(out.summary, null, 2));
