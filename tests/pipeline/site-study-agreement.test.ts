/**
 * Agreement of the map's quick estimate and the site study on a dozen cells of a real demo build: each
 * cell prefilled from the built tiles as the dashboard does it, run through the study (simulation,
 * sizing, report) and compared quantity by quantity against the published calibration bounds
 * (layers/screening/calibration-bands.ts, README "Calibration against the site simulator").
 *
 * Conditions: the simulator's coarse mesh and 30-year runs (the design life) to keep the test near a
 * minute on an idle machine; the published bounds were measured at the same coarse mesh over the 75 years
 * to the climate horizon (bench/cell-calibration.ts), heat and load share over the design life.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BAND } from '../../layers/screening/band-ids';
import { runSiteStudy } from '../../layers/screening/run-site-study';
import { scenarioFromManifest, sitePrefill } from '../../layers/screening/site-prefill';
import type { StudyComparisonRow } from '../../layers/screening/study-comparison';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { buildSmallDemo, type DemoBuild } from './demo-build-fixture';
import { removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

interface CellRun {
  texture: number;
  rows: Record<string, StudyComparisonRow>;
}
const runs: CellRun[] = [];

/** A dozen screened (not excluded) land cells spread over the region, in a fixed order. */
async function dozenCells(demo: DemoBuild) {
  const [w, s, e, n] = demo.manifest.region.bounds;
  const cells: Record<string, number | null>[] = [];
  for (let i = 1; i < 12 && cells.length < 12; i++)
    for (let j = 1; j < 12 && cells.length < 12; j++) {
      if ((i * 7 + j * 3) % 4 !== 0) continue;
      const v = await demo.valuesAt(w + ((e - w) * (i + 0.5 * (j % 2))) / 12, s + ((n - s) * j) / 12);
      if (v && v[BAND.exclusion] === 0) cells.push(v);
    }
  return cells;
}

beforeAll(async () => {
  const demo = await buildSmallDemo();
  const scenario = scenarioFromManifest(demo.manifest.scenario);
  for (const values of await dozenCells(demo)) {
    const { draft } = sitePrefill(values, demo.manifest.scenario);
    const input = siteInputSchema.parse({ ...draft, years: 30, numerics: { fidelity: 'coarse' } });
    const { report } = runSiteStudy(input, scenario);
    runs.push({
      texture: values[BAND.textureClass] ?? NaN,
      rows: Object.fromEntries(report.comparison.map((r) => [r.quantity, r])),
    });
  }
  const f = (x: number | null) => (x === null ? '—' : String(+x.toPrecision(3)));
  const table = runs.map(
    (r, i) =>
      `${i + 1} tex ${r.texture}: ` +
      ['groundTemp', 'activeLayer', 'heatPerPile', 'loadShare', 'pileCount', 'seasonalCop', 'fuelSaved']
        .map((q) => `${q} ${f(r.rows[q].quick)}/${f(r.rows[q].quickOnePile)}/${f(r.rows[q].simulated)}`)
        .join(' | '),
  );
  console.log(`map / map one pile / simulated\n${table.join('\n')}`);
}, 1_500_000);

const PEAT = 5;

describe('map and site study on a dozen demo cells', () => {
  it('runs a dozen cells', () => {
    expect(runs.length).toBe(12);
  });

  it('active layer: every cell within the published bound (18 %)', () => {
    for (const r of runs) {
      const row = r.rows[BAND.activeLayer];
      expect(row.agreement, JSON.stringify(row)).toBe('within band');
    }
  });

  it('ground at pile mid-depth: mineral soils within the published bound (0.12 K); peat within 0.25 K', () => {
    for (const r of runs) {
      const row = r.rows[BAND.groundTemp];
      expect(row.quick).not.toBeNull();
      expect(row.simulated).not.toBeNull();
      if (r.texture !== PEAT) expect(row.agreement, JSON.stringify(row)).toBe('within band');
      // Peat: measured 0.12–0.14 K here (0.15–0.18 K before issue 20; coarse mesh, mid-depth rather than the mean along the pile the
      // bound is for); outside the published bound, reported in the issue note, held to 0.25 K.
      else expect(Math.abs(row.difference as number)).toBeLessThan(0.25);
    }
  });

  it('heat per pile, load share and pile count: every cell within the published bounds', () => {
    // Both sides run the heat pump bivalently (layers/screening/bivalent-operation.ts; the simulator's
    // building mode), so the quantities the calibration bounds are the ones the study shows.
    for (const r of runs) {
      for (const q of ['heatPerPile', BAND.loadShare, 'pileCount'] as const) {
        const row = r.rows[q];
        expect(row.band, q).not.toBeNull();
        expect(row.agreement, `${q} ${JSON.stringify(row)}`).toBe('within band');
        expect(row.reason.length).toBeGreaterThan(60);
      }
    }
  });
});
