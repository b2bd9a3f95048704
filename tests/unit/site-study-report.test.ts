/**
 * The site study's report (layers/screening/site-study-report.ts): the dashboard's study and
 * `pile-atlas site --report` show the same figures and notes, and the operating-window chart and the
 * window note are built from one result and cannot disagree. Short runs (3 years, coarse mesh) keep it
 * fast; what is compared is the plumbing, not the physics (the physics is in the calibration and in
 * tests/pipeline/site-study-agreement.test.ts).
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { siteInputSchema, SITE_DEFAULTS } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';
import { DEFAULT_SCENARIO } from '../../layers/screening/scenario';
import { sitePrefill } from '../../layers/screening/site-prefill';
import { sizeStudy, studyFoundation, studyRunInput } from '../../layers/screening/run-site-study';
import { sizeSiteByPulse } from '../../layers/site/site-sizing';
import { studyRunYears } from '../../layers/screening/site-prefill';
import { siteRunCost } from '../../layers/site/site-run-cost';
import { studyWindow } from '../../layers/screening/study-window';
import { screenCell } from '../../layers/screening/cell-screening-model';
import { cellInputsFromSite } from '../../layers/screening/site-prefill';
import { siteDerived, SiteSummaryTable, comparisonValueText } from '../../web/src/site/site-results';
import { windowChartData } from '../../web/src/site/charts/operating-window-chart';

const root = fileURLToPath(new URL('../..', import.meta.url));

// A demo-like sandy cell (values of the demo settlement with sand at about −1.2 °C, rounded).
const cell = {
  meanAirTemp_C: -3.6,
  airAmplitude_C: 17.6,
  warming_C_per_yr: 0.05,
  textureClass: 2,
  waterContent_m3m3: 0.24,
  bedrockDepth: 36.3,
};
const draft = { ...sitePrefill(cell).draft, years: 3, numerics: { fidelity: 'coarse' as const } };

describe('site study report', () => {
  it('the dashboard panel and `pile-atlas site --report` show the same figures and notes', () => {
    // The dashboard: the worker's steps, then the panel's model of the result.
    const { input, column } = studyRunInput(siteInputSchema.parse(draft), DEFAULT_SCENARIO);
    const result = simulateSite(input);
    const sizing = sizeStudy(input, result, column, DEFAULT_SCENARIO);
    const web = siteDerived({ input, result, column, sizing, elapsed_ms: 0 }, DEFAULT_SCENARIO);

    const r = spawnSync(
      process.execPath,
      ['--import', 'tsx', 'data-pipeline/cli.ts', 'site', '-', '--report', '--compact'],
      { cwd: root, input: JSON.stringify(draft), encoding: 'utf8', timeout: 180_000 },
    );
    expect(r.status, r.stderr).toBe(0);
    const cli = JSON.parse(r.stdout) as Record<string, unknown>;
    const webReport = JSON.parse(
      JSON.stringify(Object.fromEntries(Object.keys(cli).map((k) => [k, web[k as keyof typeof web]]))),
    ) as Record<string, unknown>;
    expect(webReport).toEqual(cli);
    // The headline figures the issue names are there: pile count, fuel, COP, and the comparison rows.
    const rows = web.comparison.map((x) => x.quantity);
    expect(rows).toEqual(
      expect.arrayContaining(['thawDelay', 'pileCount', 'heatPerPile', 'seasonalCop', 'fuelSaved']),
    );
    expect(web.savings?.seasonalCop).toBeGreaterThan(1);
    expect(web.sizing?.ok).toBe(true);

    // What the table prints is what the report holds.
    const html = renderToStaticMarkup(createElement(SiteSummaryTable, { derived: web, units: 'SI' }));
    for (const row of web.comparison) {
      expect(html).toContain(comparisonValueText(row, row.simulated, row.simulatedText, 'SI'));
      expect(html).toContain(row.reason.slice(0, 40).replace(/'/g, '&#x27;'));
    }
    // No internal field names or validator wording on screen.
    expect(html).not.toMatch(/\b[a-z][A-Za-z0-9]*_[A-Za-z0-9]+\b|must be in \[/);
    for (const n of web.notes) expect(n.text).not.toMatch(/\b[a-z][A-Za-z0-9]*_[A-Za-z0-9]+\b|must be in \[/);
  }, 240_000);

  it('builds the window chart and the window note from one result: the marker sits in the zone the note names', () => {
    const ci = cellInputsFromSite(siteInputSchema.parse(draft), DEFAULT_SCENARIO);
    if (!ci) throw new Error('no quick estimate');
    const quick = screenCell(ci, DEFAULT_SCENARIO);
    const words = {
      'too little': /below the map's lower bound/,
      window: /inside the map's window/,
      'too much': /above the map's upper bound/,
    };
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.boolean(),
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.double({ min: 0, max: 30, noNaN: true }),
        fc.double({ min: 0, max: 30, noNaN: true }),
        (sim, atLimit, lower, fluid, over) => {
          const q = structuredClone(quick);
          q.metrics.windowLower.value = lower;
          q.metrics.windowUpperFluid.value = fluid;
          q.metrics.windowUpperOvercool.value = over;
          const w = studyWindow({
            quick: q,
            extraction_W_m: sim,
            lowestFluid_C: atLimit ? -8 : -5,
            minEnteringFluid_C: -8,
            loadShare: 0.8,
            scenario: DEFAULT_SCENARIO,
          });
          if (!w || w.zone === null) throw new Error('no window');
          const chart = windowChartData(w);
          expect(chart.markerZone).toBe(w.zone);
          expect(w.note).toMatch(words[w.zone]);
          // The note's fluid statement follows the run's fluid.
          if (w.zone === 'too much') expect(/stays above the heat pump/.test(w.note)).toBe(!atLimit);
        },
      ),
      { seed: 12, numRuns: 300 },
    );
  });

  it('sizes for every design life the scenario and the site input allow (1 to 200 yr), with no validator wording', () => {
    const { input, column } = studyRunInput(siteInputSchema.parse({ ...draft, years: 1 }), DEFAULT_SCENARIO);
    const result = simulateSite(input);
    for (const life of [1, 30, 100, 120, 200]) {
      const sized = sizeSiteByPulse(input, result, column, {
        ...studyFoundation(DEFAULT_SCENARIO),
        designLife_yr: life,
      });
      expect(sized?.ok, `${life} yr: ${sized && !sized.ok ? sized.reason : ''}`).toBe(true);
    }
    // A run of 120 or 200 years sizes for the map's design life, not the run length (the old bug
    // printed "designLife_yr must be in [1, 100] yr; received 120" in the sizing row).
    expect(studyFoundation({ ...DEFAULT_SCENARIO, designLife_yr: 100 }).designLife_yr).toBe(100);
  }, 120_000);

  it("defaults the run length to the map's thaw (or the climate horizon), within the design life and 200 yr, with its cost stated", () => {
    const quick = screenCell(
      cellInputsFromSite(siteInputSchema.parse(draft), DEFAULT_SCENARIO),
      DEFAULT_SCENARIO,
    );
    const horizon = DEFAULT_SCENARIO.climateHorizonYear - DEFAULT_SCENARIO.startYear;
    fc.assert(
      fc.property(
        fc.option(fc.double({ min: 2026, max: 2400, noNaN: true })),
        fc.boolean(),
        (year, after) => {
          const q = structuredClone(quick);
          q.metrics.thawYearPiles.value = year;
          q.metrics.thawYearPiles.qualifier = after ? 'after 2100' : undefined;
          const r = studyRunYears(q, DEFAULT_SCENARIO);
          expect(r.years).toBeGreaterThanOrEqual(DEFAULT_SCENARIO.designLife_yr);
          expect(r.years).toBeLessThanOrEqual(200);
          if (year !== null && !after)
            expect(r.years).toBe(Math.min(200, Math.max(30, Math.ceil(year - 2025 + 5))));
          else expect(r.years).toBe(Math.max(30, horizon));
          expect(r.reason).toMatch(/^\d+ years/);
        },
      ),
      { seed: 3, numRuns: 200 },
    );
    // The cost before the run: cells × steps × the measured cost per cell-step.
    const cost = siteRunCost(siteInputSchema.parse({ ...draft, years: 20 }));
    expect(cost.timeSteps).toBe(Math.ceil((20 * 365.25) / SITE_DEFAULTS.timeStep_days.value));
    expect(cost.cells).toBeGreaterThan(100);
    expect(cost.estimate_s).toBeGreaterThan(0);
  });
});
