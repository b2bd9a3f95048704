/**
 * Scenario sets on the web side (issue 17 items 3 and 4): where each scenario's data lives relative to
 * any scenario's base URL, the name the header shows, and the export properties of a site from a
 * scenario-set build (the scenario it came from and every scenario's differences and figures); the
 * scenario differences computed by the build (scenario-set.ts).
 */
import { describe, expect, it } from 'vitest';
import {
  currentScenarioName,
  DEFAULT_COMPARE_LINK,
  defaultCompareSlug,
  linkedCompare,
  linkedScenarios,
  scenarioBase,
  scenarioQuery,
} from '../../web/src/data/scenario-urls';
import { exportProperties } from '../../web/src/shortlist/shortlist-export';
import { dividerAfterKey } from '../../web/src/dashboard/swipe-divider';
import { parseScenario } from '../../layers/screening/scenario';
import { differenceText, scenarioDifferences, scenarioSlug } from '../../layers/screening/scenario-set';
import type { Manifest } from '../../layers/screening/manifest';
import { testManifest } from './web-test-manifest';

const scenarios = [
  {
    name: 'Present trend',
    slug: 'present-trend',
    manifest: 'manifest.json',
    warming: 'linear trend per cell',
    designLife_yr: 30,
    horizonYear: 2100,
    differences: [],
    keyFigures: { 'share good': 0.2, cellsScreened: 100 },
  },
  {
    name: 'High, 50 yr',
    slug: 'high-50-yr',
    manifest: 'scenarios/high-50-yr/manifest.json',
    warming: 'high pathway (illustrative)',
    designLife_yr: 50,
    horizonYear: 2100,
    differences: [{ path: 'designLife_yr', text: 'designLife_yr: 50 (first scenario: 30)' }],
    keyFigures: { 'share good': 0.1, cellsScreened: 100 },
  },
];
const setManifest = (current: string, root: string): Manifest =>
  testManifest({ scenarioSet: { current, root, scenarios } });

describe('scenario URLs and names', () => {
  it('resolves every scenario from the root and from a sub-scenario', () => {
    const rootBase = new URL('http://x/data/');
    const subBase = new URL('http://x/data/scenarios/high-50-yr/');
    expect(scenarioBase(setManifest('Present trend', ''), rootBase, 'high-50-yr')?.href).toBe(subBase.href);
    expect(scenarioBase(setManifest('High, 50 yr', '../../'), subBase, 'present-trend')?.href).toBe(
      rootBase.href,
    );
    expect(scenarioBase(setManifest('Present trend', ''), rootBase, 'nope')).toBeNull();
    expect(currentScenarioName(setManifest('High, 50 yr', '../../'))).toBe('High, 50 yr');
    expect(currentScenarioName(testManifest({ scenario: { name: 'default' } }))).toBe('default');
  });
  it('writes the shown and the compare scenario into the link and reads them back', () => {
    const sub = setManifest('High, 50 yr', '../../');
    const root = setManifest('Present trend', '');
    expect(scenarioQuery(root, null)).toBe('');
    expect(scenarioQuery(sub, null)).toBe('&scenario=high-50-yr');
    expect(scenarioQuery(sub, 'present-trend')).toBe('&scenario=high-50-yr&compare=present-trend');
    expect(scenarioQuery(root, 'nope')).toBe(''); // a scenario the set lacks is not written
    expect(linkedScenarios(`?c=1,2${scenarioQuery(sub, 'present-trend')}`)).toEqual({
      scenario: 'high-50-yr',
      compare: 'present-trend',
    });
    expect(linkedScenarios('?c=1,2')).toEqual({ scenario: null, compare: null });
    expect(defaultCompareSlug(root)).toBe('high-50-yr');
    expect(defaultCompareSlug(sub)).toBe('present-trend');
    expect(defaultCompareSlug(testManifest())).toBeNull();
  });
  it('writes the compare view (swipe, divider, filter scope) into the link and reads it back', () => {
    const root = setManifest('Present trend', '');
    const swipe = { mode: 'swipe', divider_pct: 37.4, scope: 'both' } as const;
    const q = scenarioQuery(root, 'high-50-yr', swipe);
    expect(q).toBe('&compare=high-50-yr&compareView=swipe&divider=37&filtersUnder=both');
    expect(linkedCompare(q)).toEqual({ mode: 'swipe', divider_pct: 37, scope: 'both' });
    // the defaults (side by side, filters on each map's own scenario) add nothing to the link
    expect(scenarioQuery(root, 'high-50-yr', DEFAULT_COMPARE_LINK)).toBe('&compare=high-50-yr');
    expect(linkedCompare('?compare=high-50-yr')).toEqual(DEFAULT_COMPARE_LINK);
    // outside compare nothing of the compare view is written
    expect(scenarioQuery(root, null, swipe)).toBe('');
    // bad values fall back to the defaults, a divider beyond the edges to the edge
    expect(linkedCompare('?compareView=zoom&divider=abc&filtersUnder=all')).toEqual(DEFAULT_COMPARE_LINK);
    expect(linkedCompare('?compareView=swipe&divider=140').divider_pct).toBe(100);
    expect(linkedCompare('?compareView=swipe&divider=').divider_pct).toBe(50);
  });
  it('moves the swipe divider by key: 5 % per arrow, 1 % with Shift, Home and End to the edges', () => {
    expect(dividerAfterKey(50, 'ArrowLeft', false)).toBe(45);
    expect(dividerAfterKey(50, 'ArrowRight', true)).toBe(51);
    expect(dividerAfterKey(2, 'ArrowLeft', false)).toBe(0);
    expect(dividerAfterKey(98, 'ArrowUp', false)).toBe(100);
    expect(dividerAfterKey(40, 'Home', false)).toBe(0);
    expect(dividerAfterKey(40, 'End', false)).toBe(100);
    expect(dividerAfterKey(40, 'a', false)).toBeNull();
  });
  it('exports name the scenario and carry every scenario’s differences and figures', () => {
    const p = exportProperties(
      {
        id: 'a',
        name: 'A',
        note: '',
        lon: 1,
        lat: 70,
        addedAt: '2026-12-01T00:00:00Z',
        origin: 'map',
        values: {},
        metrics: { scenario: 'High, 50 yr' },
      },
      1,
      setManifest('High, 50 yr', '../../'),
    );
    expect(p.scenarioName).toBe('High, 50 yr');
    expect(p.metric_scenario).toBe('High, 50 yr');
    expect(p.scenarioSet).toEqual({
      'Present trend': { differences: [], 'share good': 0.2, cellsScreened: 100 },
      'High, 50 yr': {
        differences: ['designLife_yr: 50 (first scenario: 30)'],
        'share good': 0.1,
        cellsScreened: 100,
      },
    });
    expect(String(p.cautions)).toMatch(/not a design/);
  });
});

describe('scenario differences', () => {
  it('lists changed fields by dotted path, pathways whole, names never', () => {
    const a = parseScenario({ name: 'a' });
    const b = parseScenario({
      name: 'b',
      designLife_yr: 50,
      pile: { length_m: 12 },
      warmingPathway: {
        label: 'high',
        points: [
          { year: 2000, airWarming_K: 0 },
          { year: 2100, airWarming_K: 6 },
        ],
      },
    });
    const d = scenarioDifferences(a, b);
    expect(d.map((x) => x.path).sort()).toEqual(['designLife_yr', 'pile.length_m', 'warmingPathway']);
    expect(differenceText(d.find((x) => x.path === 'warmingPathway')!)).toBe(
      'warmingPathway: high (first scenario: none)',
    );
    expect(scenarioDifferences(a, a)).toEqual([]);
    expect(scenarioSlug('High pathway, 50-year life')).toBe('high-pathway-50-year-life');
  });
});
