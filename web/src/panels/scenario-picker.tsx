/**
 * The scenario picker in the header (issue 17): the scenario the map shows is always named; when the
 * build holds a scenario set (manifest.scenarioSet) a select switches to another scenario, each option
 * with its differences from the first scenario as a tooltip.
 */
import type { Manifest } from '../../../layers/screening/manifest';
import { currentScenarioName } from '../data/scenario-urls';

export function ScenarioPicker({ manifest, onPick }: { manifest: Manifest; onPick: (slug: string) => void }) {
  const set = manifest.scenarioSet;
  const name = currentScenarioName(manifest);
  if (!set || set.scenarios.length < 2) {
    return (
      <span className="scenario-name" data-testid="scenario-name">
        Scenario: <strong>{name}</strong>
      </span>
    );
  }
  const current = set.scenarios.find((s) => s.name === set.current) ?? set.scenarios[0];
  return (
    <label className="scenario-name" data-testid="scenario-name" title={describe(current)}>
      Scenario:{' '}
      <select
        data-testid="scenario-picker"
        value={current.slug}
        onChange={(e) => onPick(e.target.value)}
        aria-label="Scenario shown on the map"
      >
        {set.scenarios.map((s) => (
          <option key={s.slug} value={s.slug} title={describe(s)}>
            {s.name}
          </option>
        ))}
      </select>
    </label>
  );
}

function describe(s: NonNullable<Manifest['scenarioSet']>['scenarios'][number]): string {
  const diff = s.differences.length ? s.differences.map((d) => d.text).join('; ') : 'the first scenario';
  return `${s.name}: warming ${s.warming}, design life ${s.designLife_yr} yr, climate horizon ${s.horizonYear}. Differs from the first in: ${diff}`;
}
