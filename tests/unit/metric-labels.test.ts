/**
 * The shortlist's glossary of stored figures (web/src/shortlist/metric-labels.ts): every key that the
 * producers store with a site has a label in the planner's words, never the key itself; each value is
 * shown in the unit switch's system; yes/no flags are folded into the figure they qualify. The keys
 * are enumerated by running the producers on a short real study (3 years, coarse mesh, a demo-like
 * sandy cell as in site-study-report.test.ts) and a two-member simulated ensemble of it: the plumbing
 * is checked here, not the physics.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { siteInputSchema, type SiteResult } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';
import { DEFAULT_SCENARIO } from '../../layers/screening/scenario';
import { sitePrefill } from '../../layers/screening/site-prefill';
import { sizeStudy, studyRunInput } from '../../layers/screening/run-site-study';
import { planSiteEnsemble } from '../../layers/screening/site-ensemble';
import { siteEnsembleFigures } from '../../layers/screening/site-ensemble-figures';
import { scenarioUncertaintySchema } from '../../layers/screening/uncertainty-schema';
import { siteDerived } from '../../web/src/site/site-results';
import { quickEstimateOf, shortlistMetrics } from '../../web/src/site/site-study-run';
import { ensembleMetrics, studyMetrics } from '../../web/src/report/study-all-metrics';
import { scenarioMetrics } from '../../web/src/data/scenario-urls';
import { exportMetric, unitSlug } from '../../web/src/shortlist/shortlist-export';
import {
  METRIC_GLOSSARY,
  metricLabel,
  metricLines,
  metricValueText,
  type MetricValue,
} from '../../web/src/shortlist/metric-labels';
import { displayConversion, formatNumber } from '../../web/src/units/display-units';
import { testManifest } from './web-test-manifest';

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

/** Everything the producers store for one site: map add, site study, study all with its ensemble. */
let produced: Record<string, MetricValue>[];
let siteStudy: Record<string, MetricValue>;
let studyAll: Record<string, MetricValue>;

beforeAll(() => {
  const { input, column } = studyRunInput(siteInputSchema.parse(draft), DEFAULT_SCENARIO);
  const result = simulateSite(input);
  const sizing = sizeStudy(input, result, column, DEFAULT_SCENARIO);
  const outcome = { input, result, column, sizing, elapsed_ms: 0 };
  const derived = siteDerived(outcome, DEFAULT_SCENARIO);
  const quick = quickEstimateOf(draft, DEFAULT_SCENARIO);
  expect(quick, 'the quick estimate of the draft').not.toBeNull();
  siteStudy = shortlistMetrics(quick, derived, { kind: 'done', outcome });
  // "Study all": the site's run, then a simulated ensemble of two members (study-all.tsx studySite).
  const u = scenarioUncertaintySchema.parse(DEFAULT_SCENARIO.uncertainty ?? {});
  const base = siteInputSchema.parse({
    ...input,
    probes: input.probes.slice(0, Math.max(1, column.firstProbe)),
  });
  const plan = planSiteEnsemble(base, u, 2, u.seed);
  const members: SiteResult[] = plan.members.map((m) => simulateSite(m));
  studyAll = { ...studyMetrics(result), ...ensembleMetrics(siteEnsembleFigures(members), u.seed) };
  const mapAdd = scenarioMetrics(testManifest());
  produced = [mapAdd, { ...mapAdd, ...siteStudy }, { ...mapAdd, ...studyAll }];
}, 300_000);

/**
 * An internal key written in camelCase (`pileCount`, `studyThawDelay`): two or more lower-case letters
 * before the first capital, so that units ("kW", "kWh") do not count.
 */
const CAMEL_CASE = /\b[a-z]{2,}[A-Z][a-zA-Z]*\b/;
const CAMEL_CASE_OR_UNDERSCORE = /\b[a-z]{2,}[A-Z][a-zA-Z]*\b|_/;

const producedKeys = () => [...new Set(produced.flatMap((m) => Object.keys(m)))].sort();

describe('shortlist figure labels', () => {
  it('labels every key the producers store, in words: never the key, no underscore, no camelCase', () => {
    const keys = producedKeys();
    // The site study stores its run's figures and the study-all ensemble its percentiles.
    expect(keys.length).toBeGreaterThan(20);
    for (const key of keys) {
      expect(METRIC_GLOSSARY[key], `glossary entry for ${key}`).toBeDefined();
      for (const system of ['SI', 'NA'] as const) {
        const label = metricLabel(key, system);
        expect(label).not.toBe(key);
        expect(label).not.toContain('_');
        expect(label, `${key}: ${label}`).not.toMatch(CAMEL_CASE);
      }
    }
    // One label per figure, so that two figures never read alike.
    const labels = keys.map((k) => metricLabel(k, 'SI'));
    expect(new Set(labels).size).toBe(labels.length);
  });

  it('keeps no glossary entry that no producer stores', () => {
    expect(Object.keys(METRIC_GLOSSARY).sort()).toEqual(producedKeys());
  });

  it('folds each yes/no flag into the figure it qualifies; the rows carry no key and no bare flag', () => {
    for (const metrics of produced) {
      const lines = metricLines(metrics, 'SI');
      for (const l of lines) {
        expect(METRIC_GLOSSARY[l.key]?.kind, `${l.key} listed`).not.toBe('flag');
        expect(`${l.label}: ${l.text}`).not.toMatch(CAMEL_CASE_OR_UNDERSCORE);
        expect(l.text).not.toMatch(/^(yes|no)$/);
      }
    }
    // A stored lower bound reads "at least …" in the value it qualifies (and the flag is no row).
    const lower = { ...studyAll, studyThawDelay_yr: 23, studyThawDelayAtLeast: 'yes' };
    expect(metricValueText('studyThawDelay_yr', lower, 'SI')).toBe(`at least ${formatNumber(23)} yr`);
    const upper = {
      ...siteStudy,
      thawDelay_yr: -4,
      thawDelayIsLowerBound: 'no',
      thawDelayIsUpperBound: 'yes',
    };
    expect(metricValueText('thawDelay_yr', upper, 'SI')).toBe(`at most ${formatNumber(-4)} yr`);
    const exact = { ...lower, studyThawDelayAtLeast: 'no' };
    expect(metricValueText('studyThawDelay_yr', exact, 'SI')).toBe(`${formatNumber(23)} yr`);
    // No thaw in either case of the run: said in words, not "no data".
    const none = { ...studyAll, studyThawDelay_yr: null };
    expect(metricValueText('studyThawDelay_yr', none, 'SI')).toBe('no thaw in the simulated years');
  });

  it('converts to North American units: °C to °F, kW to tons, L to US gallons', () => {
    const fluid = siteStudy.lowestFluid_C;
    expect(typeof fluid).toBe('number');
    // Fahrenheit scale definition: °F = °C × 9/5 + 32 (exact).
    const f = (fluid as number) * 1.8 + 32;
    expect(metricValueText('lowestFluid_C', siteStudy, 'NA')).toBe(`${formatNumber(f)} °F`);
    expect(metricValueText('lowestFluid_C', siteStudy, 'SI')).toBe(`${formatNumber(fluid as number)} °C`);
    expect(metricValueText('studyLowestFluidP50_C', studyAll, 'NA')).toMatch(/ °F$/);
    // 1 ton of refrigeration = 12 000 Btu_IT/h = 3.516853 kW (reference-values.md §12, from the definition).
    const peak = siteStudy.peakLoad_kW;
    expect(typeof peak).toBe('number');
    expect(metricValueText('peakLoad_kW', siteStudy, 'NA')).toBe(
      `${formatNumber((peak as number) / 3.516853)} ton`,
    );
    // 1 US gal = 3.785411784 L exactly.
    const fuel = { fuelSaved_L_per_yr: 1000 };
    expect(metricValueText('fuelSaved_L_per_yr', fuel, 'NA')).toBe(
      `${formatNumber(1000 / 3.785411784)} US gal/yr`,
    );
    // The label follows the unit: piles per kW in SI, per ton in North American units.
    expect(metricLabel('quickPilesPerTon', 'SI')).toMatch(/per kW/);
    expect(metricLabel('quickPilesPerTon', 'NA')).toMatch(/per ton/);
    expect(metricValueText('quickPilesPerTon', siteStudy, 'SI')).toMatch(/ piles\/kW$/);
  });

  it('shows each figure in the unit the North American export column names', () => {
    for (const metrics of produced)
      for (const [key, value] of Object.entries(metrics)) {
        const e = METRIC_GLOSSARY[key];
        if (e?.kind !== 'quantity' || typeof value !== 'number') continue;
        const [name] = exportMetric(key, value, 'NA');
        const shown = displayConversion(e.unit, 'NA').unit;
        // A key whose unit the export converts carries the shown unit in its column name.
        if (name !== `metric_${key}`) expect(name, key).toMatch(new RegExp(`_${unitSlug(shown)}$`));
        else expect(shown, `${key}: the export leaves it unconverted, so must the screen`).toBe(e.unit);
      }
  });

  it('words a key from another version instead of showing it', () => {
    const old = { someOldFigure_m: 3 };
    expect(metricLabel('someOldFigure_m', 'SI')).toBe('Some old figure');
    expect(metricValueText('someOldFigure_m', old, 'NA')).toBe(`${formatNumber(3 / 0.3048)} ft`);
  });
});
