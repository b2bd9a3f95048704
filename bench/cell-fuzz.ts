/**
 * Per-cell model fuzz (issue 16 item 7): seeded cells over everything the pipeline accepts, through the
 * kernel the build runs, with the physical checks of `checkCell`. Used by
 * tests/unit/cell-model-fuzz.property.test.ts (2,000 cells) and bench/cell-fuzz.bench.ts (10,000).
 */
import { createRandom } from '../data-pipeline/demo/seeded-random';
import { GRID_ROLES } from '../data-pipeline/inputs-config';
import { buildCellConstants } from '../layers/screening/cell-constants';
import { createKernelScratch, evaluateCellMetrics } from '../layers/screening/cell-kernel';
import { METRIC, METRIC_COUNT } from '../layers/screening/cell-layers';
import type { CellInputs } from '../layers/screening/screening-model';
import { DEFAULT_SCENARIO, type Scenario } from '../layers/screening/scenario';

/**
 * One cell: 30 % drawn uniformly over each grid role's whole accepted range, 70 % over the part where
 * permafrost and pile heat exchangers are in question (air −25 to 0 °C, amplitude 8–30 K), so that most
 * cells reach the pile model instead of being excluded; optional grids absent half the time.
 */
export function drawCell(r: () => number): CellInputs {
  const u = (range: readonly [number, number]) => range[0] + (range[1] - range[0]) * r();
  const cold = r() < 0.7;
  const opt = (range: readonly [number, number]) => (r() < 0.5 ? NaN : u(range));
  const R = GRID_ROLES;
  return {
    meanAirTemp_C: u(cold ? [-25, 0] : R.meanAirTemp_C.range),
    airAmplitude_C: u(cold ? [8, 30] : R.airAmplitude_C.range),
    warming_C_per_yr: u(R.warming_C_per_yr.range),
    textureClass: 1 + Math.floor(r() * R.textureClass.range[1]),
    waterContent_m3m3: u(R.waterContent_m3m3.range),
    bedrockDepth_m: r() < 0.2 ? u([0, 12]) : u(R.bedrockDepth_m.range),
    groundTemp_C: opt(cold ? [-15, 2] : R.groundTemp_C.range),
    geothermalFlux_W_m2: opt(R.geothermalFlux_W_m2.range),
    nFreeze: opt(R.nFreeze.range),
    latitude_deg: NaN,
  };
}

/** Physical checks of one cell's outputs; returns what fails (empty: all hold). */
export function checkCell(c: CellInputs, m: Float64Array, s: Scenario = DEFAULT_SCENARIO): string[] {
  const out: string[] = [];
  const v = (id: keyof typeof METRIC) => m[METRIC[id]];
  const need = (ok: boolean, what: string) => {
    if (!ok) out.push(`${what} (cell ${JSON.stringify(c)})`);
  };
  const ex = v('exclusion');
  need(Number.isInteger(ex) && ex >= 0, `exclusion code ${ex}`);
  for (let i = 0; i < METRIC_COUNT; i++)
    need(m[i] !== Infinity && m[i] !== -Infinity, `metric ${i} infinite`);
  if (ex !== 0) return out;
  const inRange = (x: number, lo: number, hi: number) => Number.isFinite(x) && x >= lo && x <= hi;
  need(inRange(v('suitabilityScore'), 0, 1), `score ${v('suitabilityScore')}`);
  need(inRange(v('groundTemp'), -60, 40), `ground ${v('groundTemp')} °C`);
  need(inRange(v('groundTempEnd'), -60, 60), `end-of-life ground ${v('groundTempEnd')} °C`);
  need(v('groundTempEnd') >= v('groundTemp') - 1e-9 || c.warming_C_per_yr < 0, 'warming cooled the ground');
  need(inRange(v('activeLayer'), 0, 1000), `active layer ${v('activeLayer')} m`);
  need(inRange(v('loadShare'), 0, 1), `load share ${v('loadShare')}`);
  need(inRange(v('extractionCarried'), 0, 1e4), `carried ${v('extractionCarried')} W/m`);
  need(Number.isNaN(v('pilesPerTon')) || v('pilesPerTon') > 0, `piles per ton ${v('pilesPerTon')}`);
  need(inRange(v('seasonalCop'), 1, 10), `seasonal COP ${v('seasonalCop')}`);
  need(Number.isFinite(v('fuelSaved')), `fuel saved ${v('fuelSaved')}`);
  const ty = v('thawYear');
  if (Number.isFinite(ty)) {
    need(inRange(ty, s.startYear, s.climateHorizonYear), `thaw year ${ty}`);
    need(inRange(v('thawYearPiles'), ty, s.climateHorizonYear), `thaw year with piles ${v('thawYearPiles')}`);
    const d = v('thawDelay');
    need(Number.isNaN(d) || inRange(d, 0, s.climateHorizonYear - s.startYear), `thaw delay ${d}`);
  }
  return out;
}

/** Runs `n` seeded cells; crashes (thrown errors) and check failures are collected. */
export function fuzzCells(
  n: number,
  seed: number,
  check: (c: CellInputs, m: Float64Array) => string[],
  s: Scenario = DEFAULT_SCENARIO,
): { cells: number; excluded: number; crashes: string[]; violations: string[] } {
  const r = createRandom(seed);
  const k = buildCellConstants(s);
  const x = createKernelScratch();
  const m = new Float64Array(METRIC_COUNT);
  const crashes: string[] = [];
  const violations: string[] = [];
  let excluded = 0;
  for (let i = 0; i < n; i++) {
    const c = drawCell(r);
    try {
      m.fill(NaN);
      evaluateCellMetrics(c, k, x, m);
      if (m[METRIC.exclusion] !== 0) excluded++;
      violations.push(...check(c, m));
    } catch (e) {
      crashes.push(`${e instanceof Error ? e.message : String(e)} (cell ${JSON.stringify(c)})`);
    }
  }
  return { cells: n, excluded, crashes, violations };
}
