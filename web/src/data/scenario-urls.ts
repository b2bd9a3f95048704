/**
 * Where each scenario of a scenario-set build lives (manifest.scenarioSet, scenario-set.ts): the data
 * base URL of a scenario from any scenario's base, and the name the header shows. Pure.
 */
import type { Manifest } from '../../../layers/screening/manifest';
import { FILTER_SCOPES, type FilterScope } from '../filters/both-scenarios';

/** How the compare view shows its two scenarios: two maps side by side, or one map with a divider. */
export type CompareMode = 'side' | 'swipe';

/** What the link carries of the compare view besides the second scenario. */
export interface CompareLink {
  mode: CompareMode;
  /** Where the swipe divider stands, percent of the map's width from its left edge (0..100). */
  divider_pct: number;
  /** Which scenario(s) the filters apply to. */
  scope: FilterScope;
}

export const DEFAULT_COMPARE_LINK: CompareLink = { mode: 'side', divider_pct: 50, scope: 'each' };

/** The scenario a manifest describes: its set's current name, else the scenario's own name. */
export function currentScenarioName(manifest: Manifest): string {
  if (manifest.scenarioSet) return manifest.scenarioSet.current;
  const name = (manifest.scenario as { name?: unknown } | undefined)?.name;
  return typeof name === 'string' ? name : 'default';
}

/**
 * The figure recorded with every site added to the shortlist (from the map or the site study): the
 * scenario its values were taken under (shortlist metrics; the exports' `scenarioName`).
 */
export function scenarioMetrics(manifest: Manifest): { scenario: string } {
  return { scenario: currentScenarioName(manifest) };
}

/** The data base URL (directory of its manifest.json) of scenario `slug`, or null if the set lacks it. */
export function scenarioBase(manifest: Manifest, dataBase: URL, slug: string): URL | null {
  const set = manifest.scenarioSet;
  const entry = set?.scenarios.find((s) => s.slug === slug);
  if (!set || !entry) return null;
  const root = new URL(set.root || './', dataBase);
  return new URL('.', new URL(entry.manifest, root));
}

/** The slug of the scenario a manifest describes ('' when the build is not a set). */
export function currentScenarioSlug(manifest: Manifest): string {
  const set = manifest.scenarioSet;
  return set?.scenarios.find((s) => s.name === set.current)?.slug ?? '';
}

/**
 * The scenario part of a link (appended to the view's query): `&scenario=<slug>` unless the scenario
 * shown is the first of its set, and `&compare=<slug>` while the compare view shows a second scenario,
 * then, where they differ from the defaults, `&compareView=swipe&divider=<percent>` and
 * `&filtersUnder=both|shown|compared`.
 */
export function scenarioQuery(
  manifest: Manifest,
  compareSlug: string | null,
  link: CompareLink = DEFAULT_COMPARE_LINK,
): string {
  const set = manifest.scenarioSet;
  if (!set) return '';
  const slug = currentScenarioSlug(manifest);
  const sc = slug && set.scenarios[0].slug !== slug ? `&scenario=${encodeURIComponent(slug)}` : '';
  const known = compareSlug !== null && set.scenarios.some((s) => s.slug === compareSlug);
  if (!known) return sc;
  const swipe = link.mode === 'swipe' ? `&compareView=swipe&divider=${Math.round(link.divider_pct)}` : '';
  const scope = link.scope !== 'each' ? `&filtersUnder=${link.scope}` : '';
  return `${sc}&compare=${encodeURIComponent(compareSlug)}${swipe}${scope}`;
}

/** The scenario and the compare scenario a link names (null where it names none). */
export function linkedScenarios(search: string): { scenario: string | null; compare: string | null } {
  const params = new URLSearchParams(search);
  return { scenario: params.get('scenario'), compare: params.get('compare') };
}

/** The compare view's mode, divider and filter scope a link names (defaults where it names none or a bad value). */
export function linkedCompare(search: string): CompareLink {
  const params = new URLSearchParams(search);
  const mode = params.get('compareView') === 'swipe' ? 'swipe' : 'side';
  const raw = params.get('divider');
  const d = raw && /^\d+(\.\d+)?$/.test(raw) ? Number(raw) : NaN;
  const divider_pct = Number.isFinite(d) ? Math.max(0, Math.min(100, d)) : DEFAULT_COMPARE_LINK.divider_pct;
  const wanted = params.get('filtersUnder');
  const scope = FILTER_SCOPES.find((s) => s === wanted) ?? DEFAULT_COMPARE_LINK.scope;
  return { mode, divider_pct, scope };
}

/** The scenario the compare view opens on: the first of the set other than the one shown. */
export function defaultCompareSlug(manifest: Manifest): string | null {
  const current = currentScenarioSlug(manifest);
  return manifest.scenarioSet?.scenarios.find((s) => s.slug !== current)?.slug ?? null;
}
