/**
 * The compare view (issue 17 item 3): with a scenario set, a "Compare" control in the header splits
 * the map into two side by side, the scenario shown on the left and a second scenario, picked next to
 * the control, on the right; both draw the same layer with the same filters, their pan and zoom are
 * linked (linked-views.ts) and each is labelled with its scenario. The link carries the second
 * scenario (`compare=<slug>`); leaving compare restores the single map.
 */
import { useEffect, useMemo, useState } from 'react';
import type { Manifest } from '../../../layers/screening/manifest';
import { loadAtlas, loadCellTable, type Atlas } from '../data/load-atlas';
import type { CellTable } from '../data/cell-table';
import { compileFilter, type CompiledFilter, type FilterSpec } from '../filters/cell-filter';
import { summariseBoth } from '../filters/both-scenarios';
import type { ZonalSummary } from '../filters/zonal-summary';
import { currentScenarioName, defaultCompareSlug, scenarioBase } from '../data/scenario-urls';
import { MapView } from '../map/map-view';
import type { ViewLink } from '../map/linked-views';
import { uncertainClassOf } from '../panels/ensemble-ranges';
import { Counts } from '../panels/summary-panel';
import type { UnitSystem } from '../units/display-units';
import { useTileLook, type LonLatPoint, type MapChoices, type MapViewRef } from './use-dashboard-state';

/** The compare state the dashboard gets from the app: the second scenario (slug and data) and its setter. */
export interface CompareState {
  slug: string | null;
  atlas: Atlas | null;
  setSlug: (slug: string | null) => void;
}

/** The second scenario's data, loaded whenever the compare slug changes (null outside compare). */
export function useCompareAtlas(
  atlas: Atlas | null,
  initialSlug: string | null,
  fail: (e: unknown) => void,
): CompareState {
  const [slug, setSlug] = useState<string | null>(initialSlug);
  const [loaded, setLoaded] = useState<{ slug: string; atlas: Atlas } | null>(null);
  useEffect(() => {
    if (!atlas || !slug) return;
    const base = scenarioBase(atlas.manifest, atlas.dataBase, slug);
    if (!base) {
      setSlug(null); // a link naming a scenario this build lacks: stay on the single map
      return;
    }
    let live = true;
    loadAtlas(base).then((a) => live && setLoaded({ slug, atlas: a }), fail);
    return () => {
      live = false;
    };
  }, [atlas, slug, fail]);
  const compareAtlas = slug && loaded?.slug === slug ? loaded.atlas : null;
  return { slug, atlas: compareAtlas, setSlug };
}

/** Header control: "Compare" toggle and, while comparing, the second scenario's picker. */
export function CompareControl({ manifest, compare }: { manifest: Manifest; compare: CompareState }) {
  const set = manifest.scenarioSet;
  if (!set || set.scenarios.length < 2) return null;
  const on = compare.slug !== null;
  return (
    <span className="compare-control">
      <button
        type="button"
        data-testid="compare-toggle"
        aria-pressed={on}
        onClick={() => compare.setSlug(on ? null : defaultCompareSlug(manifest))}
        title="Show a second scenario beside this one, with pan and zoom linked"
      >
        {on ? 'Leave compare' : 'Compare'}
      </button>
      {on && (
        <label>
          {' '}
          with{' '}
          <select
            data-testid="compare-picker"
            value={compare.slug ?? ''}
            onChange={(e) => compare.setSlug(e.target.value)}
            aria-label="Scenario shown on the right-hand map"
          >
            {set.scenarios.map((s) => (
              <option key={s.slug} value={s.slug}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
      )}
    </span>
  );
}

/** The label over a compare map: its scenario, and a note when it lacks the layer shown. */
export function CompareLabel({ manifest, side, note }: { manifest: Manifest; side: string; note?: string }) {
  return (
    <div className={`compare-label compare-label-${side}`} data-testid={`compare-label-${side}`}>
      {currentScenarioName(manifest)}
      {note ? <span className="muted"> · {note}</span> : null}
    </div>
  );
}

/** The right-hand map of the compare view: the second scenario, same layer and filters, linked view. */
export function ComparePane(props: {
  atlas: Atlas;
  choices: MapChoices;
  link: ViewLink;
  view: MapViewRef;
  shortlist: { lon: number; lat: number; name: string }[];
  selected: LonLatPoint | null;
  onPick: (p: LonLatPoint) => void;
}) {
  const { atlas, choices } = props;
  const manifest = atlas.manifest;
  const uncertainClass = useMemo(() => uncertainClassOf(manifest), [manifest]);
  const look = useTileLook(manifest, choices, uncertainClass);
  const hasBand = manifest.bands.some((b) => b.id === choices.bandId);
  // The map opens where the left-hand map is; from then on the link keeps them together.
  const [initialView] = useState(() => ({ ...props.view.current }));
  return (
    <div className="compare-pane compare-right" data-testid="compare-right">
      <MapView
        atlas={atlas}
        style={look.style}
        styleKey={look.styleKey}
        initialView={initialView}
        boundaryRings={NO_RINGS}
        drawingPath={NO_PATH}
        drawing={false}
        selected={props.selected}
        shortlist={props.shortlist}
        onHover={ignore}
        onClick={props.onPick}
        onViewChange={ignore}
        flyTarget={null}
        link={props.link}
        label={`Map of the screening layer, scenario ${currentScenarioName(manifest)}`}
      />
      <CompareLabel
        manifest={manifest}
        side="right"
        note={hasBand ? undefined : `no such layer in this scenario: showing ${look.band.title}`}
      />
    </div>
  );
}

const NO_RINGS: LonLatPoint[][] = [];
const NO_PATH: LonLatPoint[] = [];
const ignore = () => undefined;

/** The compare scenario's cell table, loaded once the shown scenario's table is there (null outside compare). */
export function useCompareTable(compareAtlas: Atlas | null, shownTableReady: boolean): CompareTable | null {
  const [loaded, setLoaded] = useState<CompareTable | null>(null);
  useEffect(() => {
    if (!compareAtlas || !shownTableReady) return;
    let live = true;
    loadCellTable(compareAtlas).then(
      (table) => live && setLoaded({ atlas: compareAtlas, table }),
      () => undefined, // the counter under both then stays away; the maps still compare
    );
    return () => {
      live = false;
    };
  }, [compareAtlas, shownTableReady]);
  return loaded && loaded.atlas === compareAtlas ? loaded : null;
}

export interface CompareTable {
  atlas: Atlas;
  table: CellTable;
}

/** Cells matching the live filter under both scenarios (region, and inside the boundary when one is set). */
export function useBothSummary(
  table: CellTable | null,
  compiled: CompiledFilter,
  compareTable: CompareTable | null,
  filter: FilterSpec,
  mask: Uint8Array | null,
): { region: ZonalSummary; zone: ZonalSummary | null; name: string } | null {
  const otherBands = compareTable?.atlas.manifest.bands;
  const otherFilter = useMemo(
    () => (otherBands ? compileFilter(filter, otherBands) : null),
    [filter, otherBands],
  );
  return useMemo(() => {
    if (!table || !compareTable || !otherFilter) return null;
    const a = { table, filter: compiled };
    const b = { table: compareTable.table, filter: otherFilter };
    return {
      region: summariseBoth(a, b),
      zone: mask ? summariseBoth(a, b, mask) : null,
      name: currentScenarioName(compareTable.atlas.manifest),
    };
  }, [table, compiled, compareTable, otherFilter, mask]);
}

/** The counts under both scenarios, in the matching-area panel while comparing. */
export function BothCounts({ both, units }: { both: ReturnType<typeof useBothSummary>; units: UnitSystem }) {
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
