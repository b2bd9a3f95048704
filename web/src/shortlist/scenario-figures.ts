/**
 * Every scenario's key figures at the shortlisted sites (issue 17 item 4), for the exports: with a
 * scenario-set build, each scenario's key bands (export-schema.ts, SCENARIO_KEY_BAND_IDS) read from
 * that scenario's own tiles at each site's cell (data/scenario-cells.ts). Null for a one-scenario build.
 */
import type { Manifest } from '../../../layers/screening/manifest';
import { scenarioKeyBands, type ScenarioKeyBands } from '../../../layers/screening/export-schema';
import { loadSetScenarios, valuesAtPlaces, type PlaceValues } from '../data/scenario-cells';
import type { ShortlistItem } from './shortlist-item';

/** The column groups and, per site id, each scenario's values at its cell (in the groups' order). */
export interface ScenarioFigures {
  sets: ScenarioKeyBands[];
  values: Map<string, PlaceValues[]>;
}

export async function loadScenarioFigures(
  manifest: Manifest,
  dataBase: URL,
  items: readonly ShortlistItem[],
): Promise<ScenarioFigures | null> {
  const scenarios = await loadSetScenarios(manifest, dataBase);
  if (scenarios.length === 0) return null;
  const perScenario = await Promise.all(scenarios.map((s) => valuesAtPlaces(s, items)));
  const values = new Map<string, PlaceValues[]>();
  items.forEach((item, j) =>
    values.set(
      item.id,
      perScenario.map((vals) => vals[j]),
    ),
  );
  return { sets: scenarios.map((s) => scenarioKeyBands(s.name, s.manifest.bands)), values };
}
