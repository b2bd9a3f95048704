/**
 * Pilot for the calibration's simulation horizon and time step (bench/calibration.ts).
 *
 * `npx tsx bench/calibration-pilot.ts run <years> <timeStep_days> <from> <to> [fidelity]` runs the cells
 * from..to−1 of the seeded 200-cell calibration sample and prints, per cell, the simulator's thaw
 * times at the reference point (no pile, with pile), the model's thaw delay and the run time (JSON).
 *
 * `npx tsx bench/calibration-pilot.ts summarise <run.json> [<other-step.json>]` reads one run and
 * reports, for shorter horizons H, how many cells would have been comparable had the run stopped at H
 * (the site mesh does not depend on the run length and the march is causal, so a thaw found before H
 * in a long run is the one a run of H years finds, up to the time step's 1e-4 rounding to fit the run),
 * and the cost per cell. With a second run at another time step it reports the change in the
 * simulated thaw delay on the cells that are two-sided in both.
 */
import { readFileSync } from 'node:fs';
import {
  calibrateCell,
  DEFAULT_CALIBRATION_OPTIONS,
  sampleCalibrationCells,
  type CalibrationOptions,
} from './cell-calibration';
import { DEFAULT_SCENARIO } from '../layers/screening/scenario';

interface PilotCell {
  index: number;
  excluded: boolean;
  comparable: boolean;
  noPileThaw_yr: number | null;
  pileThaw_yr: number | null;
  modelDelay_yr: number;
  seconds: number;
}
interface PilotRun {
  years: number;
  timeStep_days: number;
  cells: PilotCell[];
}

const [mode, ...args] = process.argv.slice(2);
if (mode === 'run') {
  const [years, step, from, to] = args.slice(0, 4).map(Number);
  const fidelity = (args[4] ?? DEFAULT_CALIBRATION_OPTIONS.fidelity) as CalibrationOptions['fidelity'];
  const cells = sampleCalibrationCells(200, 2026);
  const out: PilotRun = { years, timeStep_days: step, cells: [] };
  for (let i = from; i < to; i++) {
    const r = calibrateCell(cells[i], DEFAULT_SCENARIO, {
      ...DEFAULT_CALIBRATION_OPTIONS,
      years,
      timeStep_days: step,
      fidelity,
    });
    out.cells.push({
      index: i,
      excluded: r.excluded,
      comparable: !r.excluded && r.model.carried_W_m > 0 && Number.isFinite(r.model.thawDelay_yr),
      noPileThaw_yr: r.sim.noPileThaw_yr,
      pileThaw_yr: r.sim.pileThaw_yr,
      modelDelay_yr: r.model.thawDelay_yr,
      seconds: r.sim.seconds,
    });
    process.stderr.write(`\r${i + 1 - from}/${to - from} (${r.sim.seconds.toFixed(1)} s)`);
  }
  process.stderr.write('\n');
  console.log(JSON.stringify(out));
} else if (mode === 'summarise') {
  const read = (f: string) => JSON.parse(readFileSync(f, 'utf8')) as PilotRun;
  const a = read(args[0]);
  const sim = a.cells.filter((c) => c.comparable);
  const within = (t: number | null, h: number) => t !== null && t <= h;
  const rows = [80, 100, 120, 140, 160, 180, 200]
    .filter((h) => h <= a.years)
    .map((h) => ({
      horizon_yr: h,
      twoSided: sim.filter((c) => within(c.noPileThaw_yr, h) && within(c.pileThaw_yr, h)).length,
      lowerBound: sim.filter((c) => within(c.noPileThaw_yr, h) && !within(c.pileThaw_yr, h)).length,
      neither: sim.filter((c) => !within(c.noPileThaw_yr, h)).length,
      secondsPerCell: (sim.reduce((s, c) => s + c.seconds, 0) / sim.length) * (h / a.years),
    }));
  console.log(`${a.cells.length} cells, ${sim.length} simulated (not excluded, load carried)`);
  console.table(rows);
  if (args[1]) {
    const b = read(args[1]);
    const diffs = a.cells.flatMap((c) => {
      const d = b.cells.find((x) => x.index === c.index);
      if (!d || c.noPileThaw_yr === null || c.pileThaw_yr === null) return [];
      if (d.noPileThaw_yr === null || d.pileThaw_yr === null) return [];
      const delayA = c.pileThaw_yr - c.noPileThaw_yr;
      const delayB = d.pileThaw_yr - d.noPileThaw_yr;
      return [{ index: c.index, delayA, delayB, change: delayB - delayA }];
    });
    console.log(`time step ${a.timeStep_days} d -> ${b.timeStep_days} d, thaw delay change (yr):`);
    console.table(diffs);
    const cost = (r: PilotRun) => r.cells.reduce((s, c) => s + c.seconds, 0);
    console.log(`run time ${cost(a).toFixed(1)} s -> ${cost(b).toFixed(1)} s`);
  }
} else {
  console.error(
    'usage: calibration-pilot.ts run <years> <step_days> <from> <to> [fidelity] | summarise <a.json> [b.json]',
  );
  process.exit(1);
}
