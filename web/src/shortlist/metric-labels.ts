/**
 * The planner's words for every figure stored with a shortlisted site (ShortlistItem.metrics): one
 * glossary from the stored key (`studyThawDelay_yr`, `thawDelayIsLowerBound`, …) to the trade label and
 * what kind of figure it is, and the text the screen shows for each, converted to the unit switch's
 * system by the display's conversion tables (display-units.ts). The producers of the keys are the
 * site study (site-study-run.ts shortlistMetrics), "Study all" (report/study-all-metrics.ts) and the
 * scenario recorded with every added site (data/scenario-urls.ts scenarioMetrics). Exports keep the
 * stored keys as their column ids (shortlist-export.ts); only the screen reads this glossary.
 *
 * Yes/no flags are not shown as rows of their own: each qualifies a figure and is folded into its text
 * ("at least 23 yr"). A key the glossary does not know (from a file of another version) is shown in
 * words made from its name, never as the name itself.
 */
import { displayTitle, formatNumber, formatQuantity, type UnitSystem } from '../units/display-units';

export type MetricValue = number | string | null;

/** What a stored figure is, and so how it is shown. */
export type MetricKind =
  /** A quantity in a stored SI (or trade) unit, converted for display; `none` is said for no value. */
  | { kind: 'quantity'; unit: string; none?: string }
  /** A whole number (piles, ensemble members, a sampling seed, years simulated), with its unit if any. */
  | { kind: 'count'; unit?: string }
  /** A ratio without unit (a COP). */
  | { kind: 'ratio'; none?: string }
  /** An amount of money in the scenario's currency. */
  | { kind: 'currency' }
  /** Words (a scenario name). */
  | { kind: 'text' }
  /** 'yes' / 'no' qualifying the figure `qualifies`: 'yes' puts `word` before its value. */
  | { kind: 'flag'; qualifies: string; word: 'at least' | 'at most' };

export type MetricEntry = MetricKind & { label: string };

const yr = (label: string, none?: string): MetricEntry => ({ label, kind: 'quantity', unit: 'yr', none });
const degC = (label: string): MetricEntry => ({ label, kind: 'quantity', unit: '°C' });
const count = (label: string): MetricEntry => ({ label, kind: 'count' });

const SIMULATED_NO_THAW = 'no thaw in the simulated years';
const STUDY = '(study of all sites)';
const ENSEMBLE = 'Simulated ensemble';

/** Stored key -> the planner's label and the kind of figure. */
export const METRIC_GLOSSARY: Readonly<Record<string, MetricEntry>> = {
  scenario: { label: 'Scenario', kind: 'text' },
  // The site study (site-study-run.ts): the quick map estimate and the simulation's figures.
  quickThawDelay_yr: yr('Thaw delay (quick map estimate)'),
  quickPilesPerTon: {
    label: 'Piles per ton of peak heating (quick map estimate)',
    kind: 'quantity',
    unit: 'piles/ton',
  },
  thawDelay_yr: yr('Thaw delay at the first probe (site study)', SIMULATED_NO_THAW),
  thawDelayIsLowerBound: {
    label: 'Thaw delay at the first probe is a lower bound (site study)',
    kind: 'flag',
    qualifies: 'thawDelay_yr',
    word: 'at least',
  },
  thawDelayIsUpperBound: {
    label: 'Thaw delay at the first probe is an upper bound (site study)',
    kind: 'flag',
    qualifies: 'thawDelay_yr',
    word: 'at most',
  },
  pileCount: count('Piles by design-pulse sizing (site study)'),
  peakLoad_kW: { label: 'Peak heating load (site study)', kind: 'quantity', unit: 'kW' },
  lowestFluid_C: degC('Lowest fluid temperature (site study)'),
  fuelSaved_L_per_yr: { label: 'Fuel saved (site study)', kind: 'quantity', unit: 'L/yr' },
  co2Avoided_t_per_yr: { label: 'CO2 avoided (site study)', kind: 'quantity', unit: 't/yr' },
  systemCop: { label: 'System seasonal COP (site study)', kind: 'ratio' },
  capitalCost: { label: 'Capital cost of the heat-pump system (site study)', kind: 'currency' },
  simplePayback_yr: yr('Simple payback against an oil furnace (site study)', 'never pays back'),
  simulatedYears_yr: { label: 'Years simulated (site study)', kind: 'count', unit: 'yr' },
  // "Study all" (report/study-all-metrics.ts): the site's own run, then its simulated ensemble.
  studyThawDelay_yr: yr(`Thaw delay at the first probe ${STUDY}`, SIMULATED_NO_THAW),
  studyThawDelayAtLeast: {
    label: `Thaw delay at the first probe is a lower bound ${STUDY}`,
    kind: 'flag',
    qualifies: 'studyThawDelay_yr',
    word: 'at least',
  },
  studyLowestFluid_C: degC(`Lowest fluid temperature ${STUDY}`),
  studyEnsembleMembers: count(`${ENSEMBLE} members`),
  studyEnsembleSeed: count(`${ENSEMBLE} sampling seed`),
  studyThawDelayP10_yr: yr(`${ENSEMBLE} thaw delay, P10`, 'not defined in half the members'),
  studyThawDelayP50_yr: yr(`${ENSEMBLE} thaw delay, P50`, 'not defined in half the members'),
  studyThawDelayP90_yr: yr(`${ENSEMBLE} thaw delay, P90`, 'not defined in half the members'),
  studyThawDelayDefinedMembers: count(`${ENSEMBLE} members with a thaw delay`),
  studyThawDelayLowerBoundMembers: count(`${ENSEMBLE} members whose thaw delay is a lower bound`),
  studyLowestFluidP10_C: degC(`${ENSEMBLE} lowest fluid temperature, P10`),
  studyLowestFluidP50_C: degC(`${ENSEMBLE} lowest fluid temperature, P50`),
  studyLowestFluidP90_C: degC(`${ENSEMBLE} lowest fluid temperature, P90`),
};

/** Stored unit suffixes of keys the glossary does not know (shortlist-item.ts: a key ends in its unit). */
const SUFFIX_UNITS: ReadonlyArray<readonly [suffix: string, unit: string]> = [
  ['_L_per_yr', 'L/yr'],
  ['_t_per_yr', 't/yr'],
  ['_kW', 'kW'],
  ['_C', '°C'],
  ['_m', 'm'],
  ['_yr', 'yr'],
];

/** 'someFigureP10' -> 'Some figure P10': the words of a name the glossary does not know. */
function wordsOf(name: string): string {
  const words = name
    .replace(/_/g, ' ')
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/\s+/g, ' ')
    .trim()
    .toLowerCase()
    .replace(/\bp(\d+)\b/g, 'P$1');
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** The glossary entry of a key; for an unknown key, words made from its name and its unit suffix. */
export function metricEntry(key: string): MetricEntry {
  const known = METRIC_GLOSSARY[key];
  if (known) return known;
  const hit = SUFFIX_UNITS.find(([suffix]) => key.endsWith(suffix) && key.length > suffix.length);
  if (hit) return { label: wordsOf(key.slice(0, -hit[0].length)), kind: 'quantity', unit: hit[1] };
  return { label: wordsOf(key), kind: 'text' };
}

/** The label in the chosen system ("per ton" / "per kW" follows the unit, display-units.ts). */
export function metricLabel(key: string, system: UnitSystem): string {
  const e = metricEntry(key);
  return e.kind === 'quantity' ? displayTitle(e.label, e.unit, system) : e.label;
}

/** What the screen shows for one figure: its value in the chosen system, with the flags that qualify it. */
export function metricValueText(
  key: string,
  metrics: Readonly<Record<string, MetricValue>>,
  system: UnitSystem,
  currency = '',
): string {
  const e = metricEntry(key);
  const v = metrics[key];
  if (e.kind === 'flag') return v === 'yes' ? 'yes' : v === 'no' ? 'no' : 'no data';
  if (typeof v === 'string') return v;
  const none = 'none' in e && e.none ? e.none : 'no data';
  if (v === null || v === undefined || !Number.isFinite(v)) return none;
  const text = numberText(e, v, system, currency);
  const qualifier = qualifierOf(key, metrics);
  return qualifier ? `${qualifier} ${text}` : text;
}

function numberText(e: MetricEntry, v: number, system: UnitSystem, currency: string): string {
  switch (e.kind) {
    case 'quantity':
      return formatQuantity(v, e.unit, system);
    case 'count': {
      const n = Math.round(v).toLocaleString('en-US');
      return e.unit ? `${n} ${e.unit}` : n;
    }
    case 'currency':
      return currency ? `${formatNumber(v)} ${currency}` : formatNumber(v);
    default:
      return formatNumber(v);
  }
}

/** "at least" / "at most" from the flags qualifying `key` that say 'yes' (the first one). */
function qualifierOf(key: string, metrics: Readonly<Record<string, MetricValue>>): string | null {
  for (const [k, v] of Object.entries(metrics)) {
    const e = METRIC_GLOSSARY[k];
    if (e?.kind === 'flag' && e.qualifies === key && v === 'yes') return e.word;
  }
  return null;
}

/** One figure as the shortlist shows it. */
export interface MetricLine {
  key: string;
  label: string;
  text: string;
}

/**
 * The figures of a site as the screen lists them, in stored order: each with its label and value
 * text; a flag whose figure is there is folded into it and not listed (a flag alone is listed).
 */
export function metricLines(
  metrics: Readonly<Record<string, MetricValue>>,
  system: UnitSystem,
  currency = '',
): MetricLine[] {
  return Object.keys(metrics)
    .filter((k) => {
      const e = METRIC_GLOSSARY[k];
      return !(e?.kind === 'flag' && e.qualifies in metrics);
    })
    .map((key) => ({
      key,
      label: metricLabel(key, system),
      text: metricValueText(key, metrics, system, currency),
    }));
}
