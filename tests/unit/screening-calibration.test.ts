/**
 * Calibration of the per-cell screening model against the transient site simulator (layers/site),
 * absolute values (issue 11 item 10): undisturbed ground along the pile, active layer, end-of-life
 * ground, lowest monthly mean fluid at the carried load, heat per pile at the fluid limit, piles per ton,
 * load share, thaw at the reference point up to the climate horizon and the thaw delay; the model in its
 * one-pile form against the simulator's pile, each carrying one pile's share of the standard building
 * (bench/cell-calibration.ts says why and how the group is bracketed). The full sample takes minutes, so
 * `bench/calibration.ts` writes tests/fixtures/calibration.json (regenerated on purpose, never edited by
 * hand); this test
 *  1. checks the committed error distributions against the bounds published in the README;
 *  2. checks the group bracket: the model's 4 × 4 heat per pile lies between the simulator's isolated
 *     pile and the interior pile of an endless field;
 *  3. recomputes the model side of every case (fails if the model changed without re-calibration or the
 *     fixture was altered);
 *  4. re-runs a seeded subset live through the simulator and checks it reproduces the fixture.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  calibrateCell,
  calibrationSummary,
  CALIBRATION_QUANTITIES,
  DEFAULT_CALIBRATION_OPTIONS,
  modelSide,
  onePileScenario,
  sampleCalibrationCells,
  type CalibrationCase,
  type CalibrationQuantity,
} from '../../bench/cell-calibration';
import { DEFAULT_SCENARIO } from '../../layers/screening/scenario';
import { BOUNDS, type BoundedQuantity } from './screening-calibration-bounds';

interface FixtureCase extends Omit<CalibrationCase, 'cell'> {
  index: number;
  bracket: { modelGroup_W: number | null; simIsolated_W: number | null; simField_W: number | null } | null;
}

const here = dirname(fileURLToPath(import.meta.url));
const fixture = JSON.parse(readFileSync(join(here, '..', 'fixtures', 'calibration.json'), 'utf8')) as {
  seed: number;
  n: number;
  options: typeof DEFAULT_CALIBRATION_OPTIONS;
  cases: FixtureCase[];
};
const cells = sampleCalibrationCells(fixture.n, fixture.seed);
const cases: CalibrationCase[] = fixture.cases.map((c) => ({ ...c, cell: cells[c.index] }));
const summary = calibrationSummary(cases);

describe('calibration against the site simulator (committed sample)', () => {
  it('the fixture is the documented sample at the simulator defaults', () => {
    expect(fixture.n).toBeGreaterThanOrEqual(50);
    expect(fixture.cases).toHaveLength(fixture.n);
    expect(fixture.options).toEqual(DEFAULT_CALIBRATION_OPTIONS);
  });
  const bounded = CALIBRATION_QUANTITIES.filter(
    (q): q is BoundedQuantity & CalibrationQuantity => q in BOUNDS,
  );
  it('every quantity but the thaw delay has a bound', () => {
    expect(CALIBRATION_QUANTITIES.filter((q) => !(q in BOUNDS))).toEqual(['thawDelay_yr']);
  });
  for (const q of bounded) {
    it(`${q}: median and P95 of |model − simulator| within the published bounds`, () => {
      const s = summary.all[q];
      const b = BOUNDS[q];
      expect(s.n, 'comparable cases').toBeGreaterThanOrEqual(b.minComparable);
      expect(s.median).toBeLessThanOrEqual(b.median);
      expect(s.p95).toBeLessThanOrEqual(b.p95);
    });
  }
  it('thaw before or after the climate horizon: model and simulator agree on the documented share', () => {
    const t = summary.thaw;
    expect(t.noPileAgree / t.n).toBeGreaterThanOrEqual(BOUNDS.thawAgreement.minShare);
    expect(t.pileAgree / t.n).toBeGreaterThanOrEqual(BOUNDS.thawAgreement.minShare);
  });
  it('group bracket: the 4 × 4 heat per pile is no more than the isolated pile, and (coarse soils, peat) no less than the endless field', () => {
    // A field run stopped by the fluid limit has no field heat (null, bench/cell-calibration.ts groupBracket).
    const br = fixture.cases.filter(
      (c) => c.bracket && c.bracket.modelGroup_W !== null && c.bracket.simField_W !== null,
    );
    expect(br.length).toBeGreaterThanOrEqual(4);
    // Tolerance: the one-pile heat P95 error, the model's own scatter against the simulator.
    const tol = BOUNDS.heatCarried_rel.p95;
    for (const c of br) {
      const { modelGroup_W, simIsolated_W, simField_W } = c.bracket!;
      expect(simField_W as number).toBeLessThan(simIsolated_W as number);
      expect(modelGroup_W as number).toBeLessThanOrEqual((simIsolated_W as number) * (1 + tol));
      // Silt and clay (ice-rich fine soils at about −2 °C): the model's group carries 0.59–0.68 × the
      // simulated endless-field pile in bivalent operation (measured): the simulated ground around the
      // field releases the latent heat of its unfrozen water as it cools, which the conduction-only
      // group response does not hold (the model is conservative there; README). Held to ≥ 0.5.
      const fine = [3, 4].includes(cells[c.index].textureClass);
      const floor = fine ? 0.5 : 1 - tol;
      expect(modelGroup_W as number).toBeGreaterThanOrEqual((simField_W as number) * floor);
    }
  });
  it('the fixture was made with the current model (model side recomputed for every case)', () => {
    const s = onePileScenario(DEFAULT_SCENARIO);
    fixture.cases.forEach((c, i) => {
      const m = modelSide(cells[c.index], s).figures;
      expect(m.carried_W_m, `case ${i}`).toBeCloseTo(c.model.carried_W_m, 3);
      for (const k of [
        'groundPile_C',
        'activeLayer_m',
        'groundEnd_C',
        'heatCarried_W',
        'pilesPerTon',
      ] as const) {
        if (c.model[k] === null) expect(m[k], `case ${i} ${k}`).toBeNull();
        else expect(m[k] as number, `case ${i} ${k}`).toBeCloseTo(c.model[k] as number, 3);
      }
      expect(m.noPileThaw_yr === null).toBe(c.model.noPileThaw_yr === null);
      expect(m.pileThaw_yr === null).toBe(c.model.pileThaw_yr === null);
    });
  });
});

describe('calibration, live subset', () => {
  // The simulator is deterministic: a live run of two seeded cases (the first simulated gravel and silt
  // cells) reproduces the fixture to its rounding; a larger change needs a re-run of the calibration.
  const pick = (tex: number) =>
    fixture.cases.find((c) => !c.excluded && c.sim.seconds > 0 && cells[c.index].textureClass === tex);
  for (const c of [pick(1), pick(3)].filter((x): x is FixtureCase => x !== undefined)) {
    it(`cell ${c.index}: the simulator reproduces the fixture`, () => {
      const r = calibrateCell(cells[c.index], DEFAULT_SCENARIO, fixture.options);
      for (const k of [
        'groundPile_C',
        'activeLayer_m',
        'groundEnd_C',
        'lowestMeanFluid_C',
        'heatCarried_W',
      ] as const) {
        expect(r.sim[k] as number, k).toBeCloseTo(c.sim[k] as number, 2);
      }
      expect(r.sim.noPileThaw_yr === null).toBe(c.sim.noPileThaw_yr === null);
      expect(r.sim.pileThaw_yr === null).toBe(c.sim.pileThaw_yr === null);
    }, 240_000);
  }
});
