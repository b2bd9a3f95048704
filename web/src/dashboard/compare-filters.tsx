/**
 * The filters while two scenarios are compared (issue 17 item 3): the planner picks whether the
 * filters apply to each map's own scenario, to both scenarios, or to one of them on both maps; the
 * maps' veils and the matching-area counter follow the one rule of filters/both-scenarios.ts.
 */
import { useMemo } from 'react';
import type { Manifest } from '../../../layers/screening/manifest';
import type { Atlas } from '../data/load-atlas';
import type { CellTable } from '../data/cell-table';
import { compileFilter, EMPTY_FILTER, type CompiledFilter, type FilterSpec } from '../filters/cell-filter';
import {
  FILTER_SCOPES,
  scopedFilter,
  summariseBoth,
  summariseScoped,
  type FilterScope,
  type ScopedFilter,
} from '../filters/both-scenarios';
import type { ZonalSummary } from '../filters/zonal-summary';
import { currentScenarioName } from '../data/scenario-urls';
import { Counts } from '../panels/summary-panel';
import type { UnitSystem } from '../units/display-units';
import type { TileLook } from './use-dashboard-state';

/** The veil filter of each map; `right` is null outside compare (or while the second scenario loads). */
export interface CompareFilters {
  scope: FilterScope;
  left: ScopedFilter;
  right: ScopedFilter | null;
  /** The filter compiled against each scenario's bands (compared: null outside compare). */
  shownCompiled: CompiledFilter;
  compareCompiled: CompiledFilter | null;
  /** Changes whenever either map's veil filter changes (part of the tile style key). */
  key: string;
}

/** The two maps' veil filters for the live filter spec under `scope` (only `each` outside compare). */
export function useCompareFilters(
  filter: FilterSpec,
  shownCompiled: CompiledFilter,
  compareAtlas: Atlas | null,
  scope: FilterScope,
): CompareFilters {
  const otherBands = compareAtlas?.manifest.bands;
  const compareCompiled = useMemo(
    () => (otherBands ? compileFilter(filter, otherBands) : null),
    [filter, otherBands],
  );
  return useMemo(() => {
    const s: FilterScope = compareCompiled ? scope : 'each';
    return {
      scope: s,
      left: scopedFilter(s, 'shown', shownCompiled, compareCompiled),
      right: compareCompiled ? scopedFilter(s, 'compared', compareCompiled, shownCompiled) : null,
      shownCompiled,
      compareCompiled,
      key: `${s}|${compareAtlas?.dataBase.href ?? ''}`,
    };
  }, [scope, shownCompiled, compareCompiled, compareAtlas]);
}

const NO_FILTER = compileFilter(EMPTY_FILTER, []);

/** A map's look with its veil filter (the own part as the style's filter, the other part as otherFilter). */
export function scopedLook(look: TileLook, f: ScopedFilter | null, key: string): TileLook {
  if (!f) return look;
  return {
    ...look,
    style: { ...look.style, filter: f.own ?? NO_FILTER, otherFilter: f.other },
    styleKey: `${look.styleKey}|${key}`,
  };
}

export interface CompareCounts {
  /** The counts of the left map's unveiled cells when the filters apply to other than each map's own scenario. */
  scoped: { region: ZonalSummary | null; zone: ZonalSummary | null; text: string } | null;
  /** Each map its own scenario: the cells matching under both, besides (null when not comparing). */
  both: { region: ZonalSummary; zone: ZonalSummary | null; name: string } | null;
}

/** Words for what the counts count under a scope ("under both scenarios (with …)", "under …"). */
function scopeText(scope: FilterScope, shown: Manifest, compared: Manifest): string {
  if (scope === 'both') return `under both scenarios (with ${currentScenarioName(compared)})`;
  return `under ${currentScenarioName(scope === 'shown' ? shown : compared)}`;
}

/** The matching-area counts while comparing (region, and inside the boundary when one is set). */
export function useCompareCounts(
  table: CellTable | null,
  compare: { table: CellTable; atlas: Atlas } | null,
  filters: CompareFilters,
  manifest: Manifest,
  mask: Uint8Array | null,
): CompareCounts {
  const { scope, left, shownCompiled, compareCompiled } = filters;
  const otherTable = compare?.table ?? null;
  const otherManifest = compare?.atlas.manifest ?? null;
  return useMemo(() => {
    if (!table || !otherTable || !otherManifest || !compareCompiled) {
      const waiting = scope !== 'each' && left.otherTakesPart;
      return { scoped: waiting ? { region: null, zone: null, text: '' } : null, both: null };
    }
    if (scope === 'each') {
      const a = { table, filter: shownCompiled };
      const b = { table: otherTable, filter: compareCompiled };
      return {
        scoped: null,
        both: {
          region: summariseBoth(a, b),
          zone: mask ? summariseBoth(a, b, mask) : null,
          name: currentScenarioName(otherManifest),
        },
      };
    }
    const region = summariseScoped(table, left, otherTable);
    const zone = mask ? summariseScoped(table, left, otherTable, mask) : null;
    return { scoped: { region, zone, text: scopeText(scope, manifest, otherManifest) }, both: null };
  }, [table, otherTable, otherManifest, scope, left, shownCompiled, compareCompiled, mask, manifest]);
}

/** The counts under both scenarios, in the matching-area panel while each map filters its own scenario. */
export function BothCounts({ both, units }: { both: CompareCounts['both']; units: UnitSystem }) {
  if (!both) return null;
  return (
    <>
      <Counts
        label={`Whole region, under both scenarios (with ${both.name})`}
        s={both.region}
        units={units}
        testId="both-count"
      />
      {both.zone ? (
        <Counts
          label="Inside the boundary, under both scenarios"
          s={both.zone}
          units={units}
          testId="both-zone-count"
        />
      ) : null}
    </>
  );
}

/** "Filters apply to": each map's own scenario, both, or one of the two on both maps (while comparing). */
export function FilterScopePicker(props: {
  shown: Manifest;
  compared: Manifest | null;
  scope: FilterScope;
  onScope: (scope: FilterScope) => void;
}) {
  if (!props.compared) return null;
  const shownName = currentScenarioName(props.shown);
  const comparedName = currentScenarioName(props.compared);
  return (
    <label className="filter-scope small">
      Filters apply to{' '}
      <select
        data-testid="filter-scope"
        value={props.scope}
        onChange={(e) => props.onScope(FILTER_SCOPES.find((f) => f === e.target.value) ?? 'each')}
      >
        <option value="each">each map: its own scenario</option>
        <option value="both">both scenarios: pass under both</option>
        <option value="shown">{shownName}, on both maps</option>
        <option value="compared">{comparedName}, on both maps</option>
      </select>
    </label>
  );
}
