/**
 * The compare view (issue 17 item 3): with a scenario set, a "Compare" control in the header shows a
 * second scenario, picked next to the control, beside the scenario shown: either two maps side by
 * side (the scenario shown on the left) or one map with a swipe divider (the scenario shown left of
 * it, the second scenario right of it; swipe-divider.tsx). Both draw the same layer with the same
 * filters (applied as compare-filters.tsx says), their pan and zoom are linked (linked-views.ts),
 * each is labelled with its scenario and has its hover readout. The link carries the second scenario
 * (`compare=<slug>`), the view, the divider and the filters' scope (scenario-urls.ts); leaving compare
 * restores the single map.
 */
import { useCallback, useEffect, useMemo, useState } from 'react';
import type { Manifest } from '../../../layers/screening/manifest';
import { loadAtlas, loadCellTable, type Atlas } from '../data/load-atlas';
import { cellIndexAt, type CellTable } from '../data/cell-table';
import type { ScopedFilter } from '../filters/both-scenarios';
import {
  currentScenarioName,
  defaultCompareSlug,
  scenarioBase,
  type CompareLink,
  type CompareMode,
} from '../data/scenario-urls';
import { MapView } from '../map/map-view';
import type { ViewLink } from '../map/linked-views';
import { uncertainClassOf } from '../panels/ensemble-ranges';
import { HoverReadout } from '../panels/hover-readout';
import type { UnitSystem } from '../units/display-units';
import { scopedLook } from './compare-filters';
import { useTileLook, type LonLatPoint, type MapChoices, type MapViewRef } from './use-dashboard-state';

/**
 * The compare state the dashboard gets from the app: the second scenario (slug and data), the view
 * (side by side or swipe), the divider and the filters' scope, and their setters.
 */
export interface CompareState {
  slug: string | null;
  atlas: Atlas | null;
  setSlug: (slug: string | null) => void;
  link: CompareLink;
  setLink: (change: Partial<CompareLink>) => void;
}

/** The second scenario's data, loaded whenever the compare slug changes (null outside compare). */
export function useCompareAtlas(
  atlas: Atlas | null,
  initial: { slug: string | null; link: CompareLink },
  fail: (e: unknown) => void,
): CompareState {
  const [slug, setSlug] = useState<string | null>(initial.slug);
  const [link, setLinkState] = useState<CompareLink>(initial.link);
  const setLink = useCallback(
    (change: Partial<CompareLink>) => setLinkState((l) => ({ ...l, ...change })),
    [],
  );
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
  return { slug, atlas: compareAtlas, setSlug, link, setLink };
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
            aria-label="Scenario shown on the right-hand map, or right of the divider"
          >
            {set.scenarios.map((s) => (
              <option key={s.slug} value={s.slug}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
      )}
      {on && (
        <select
          data-testid="compare-mode"
          value={compare.link.mode}
          onChange={(e) => compare.setLink({ mode: e.target.value === 'swipe' ? 'swipe' : 'side' })}
          aria-label="How to show the two scenarios: side by side, or one map with a swipe divider"
          title="Side by side: two maps. Swipe: one map, a divider between the two scenarios"
        >
          <option value="side">side by side</option>
          <option value="swipe">swipe</option>
        </select>
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

/**
 * The second scenario's map: side by side, the right-hand map; in the swipe view, a map over the
 * first one, cut away left of the divider. Same layer and filters (its veil filter from
 * compare-filters.tsx, tested on `otherAtlas` too where the scope asks), linked view.
 */
export function ComparePane(props: {
  atlas: Atlas;
  otherAtlas: Atlas;
  choices: MapChoices;
  filter: ScopedFilter | null;
  filterKey: string;
  link: ViewLink;
  view: MapViewRef;
  shortlist: { lon: number; lat: number; name: string }[];
  selected: LonLatPoint | null;
  onPick: (p: LonLatPoint) => void;
  onHover: (p: LonLatPoint | null) => void;
  /** Swipe view: the divider's place, percent of the width (the map is cut away left of it). */
  swipe_pct: number | null;
}) {
  const { atlas, choices } = props;
  const manifest = atlas.manifest;
  const uncertainClass = useMemo(() => uncertainClassOf(manifest), [manifest]);
  const ownLook = useTileLook(manifest, choices, uncertainClass);
  const look = useMemo(
    () => scopedLook(ownLook, props.filter, props.filterKey),
    [ownLook, props.filter, props.filterKey],
  );
  const hasBand = manifest.bands.some((b) => b.id === choices.bandId);
  // The map opens where the left-hand map is; from then on the link keeps them together.
  const [initialView] = useState(() => ({ ...props.view.current }));
  const clip = props.swipe_pct === null ? undefined : { clipPath: `inset(0 0 0 ${props.swipe_pct}%)` };
  return (
    <div className="compare-pane compare-right" data-testid="compare-right" style={clip}>
      <MapView
        atlas={atlas}
        otherAtlas={props.otherAtlas}
        style={look.style}
        styleKey={look.styleKey}
        initialView={initialView}
        boundaryRings={NO_RINGS}
        drawingPath={NO_PATH}
        drawing={false}
        selected={props.selected}
        shortlist={props.shortlist}
        onHover={props.onHover}
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

/**
 * The hover readout of the second scenario: the same readout as the first map's, for the same place,
 * from the second scenario's cell table (its band of the layer shown, as its map draws it).
 */
export function CompareReadout(props: {
  hover: LonLatPoint | null;
  compare: CompareTable | null;
  bandId: string;
  units: UnitSystem;
  mode: CompareMode;
}) {
  const { hover, compare } = props;
  if (!hover || !compare) return null;
  const { manifest } = compare.atlas;
  const bandIndex = Math.max(
    0,
    manifest.bands.findIndex((b) => b.id === props.bandId),
  );
  const [x, y] = compare.atlas.toGrid(hover[0], hover[1]);
  const index = cellIndexAt(compare.table, manifest, x, y);
  return (
    <HoverReadout
      hover={{ lon: hover[0], lat: hover[1], index }}
      table={compare.table}
      manifest={manifest}
      band={manifest.bands[bandIndex]}
      bandIndex={bandIndex}
      units={props.units}
      scenario={currentScenarioName(manifest)}
      testId="hover-readout-right"
      className={`readout-right readout-${props.mode}`}
    />
  );
}

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
