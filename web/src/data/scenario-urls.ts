/**
 * Where each scenario of a scenario-set build lives (manifest.scenarioSet, scenario-set.ts): the data
 * base URL of a scenario from any scenario's base, and the name the header shows. Pure.
 */
import type { Manifest } from '../../../layers/screening/manifest';

/** The scenario a manifest describes: its set's current name, else the scenario's own name. */
export function currentScenarioName(manifest: Manifest): string {
  if (manifest.scenarioSet) return manifest.scenarioSet.current;
  const name = (manifest.scenario as { name?: unknown } | undefined)?.name;
  return typeof name === 'string' ? name : 'default';
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
 * shown is the first of its set, and `&compare=<slug>` while the compare view shows a second scenario.
 */
export function scenarioQuery(manifest: Manifest, compareSlug: string | null): string {
  const set = manifest.scenarioSet;
  if (!set) return '';
  const slug = currentScenarioSlug(manifest);
  const sc = slug && set.scenarios[0].slug !== slug ? `&scenario=${encodeURIComponent(slug)}` : '';
  const known = compareSlug !== null && set.scenarios.some((s) => s.slug === compareSlug);
  return known ? `${sc}&compare=${encodeURIComponent(compareSlug)}` : sc;
}

/** The scenario and the compare scenario a link names (null where it names none). */
export function linkedScenarios(search: string): { scenario: string | null; compare: string | null } {
  const params = new URLSearchParams(search);
  return { scenario: params.get('scenario'), compare: params.get('compare') };
}

/** The scenario the compare view opens on: the first of the set other than the one shown. */
export function defaultCompareSlug(manifest: Manifest): string | null {
  const current = currentScenarioSlug(manifest);
  return manifest.scenarioSet?.scenarios.find((s) => s.slug !== current)?.slug ?? null;
}
