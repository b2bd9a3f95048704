/**
 * The planner's dashboard: map in the middle, layer / legend / filters / counter / sources on the
 * left, the selected place and the shortlist on the right, cautions and the demo-data notice always
 * visible. State that a link should carry (view, layer, units, opacity, filters) lives in the URL.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { DEFAULT_MAP_BAND } from '../../layers/screening/band-registry';
import { AtlasLoadError, loadAtlas, type Atlas } from './data/load-atlas';
import type { CellTable } from './data/cell-table';
import { EMPTY_FILTER } from './filters/cell-filter';
import { useBoundary } from './filters/use-boundary';
import { DEFAULT_SORT, parseUrlState, type ViewState } from './state/url-state';
import { shortlistStore } from './shortlist/shortlist-store';
import { useShortlist } from './shortlist/use-shortlist';
import { defaultSiteName } from './shortlist/site-name';
import type { UnitSystem } from './units/display-units';
import { cellValues, type CellSelection } from './panels/cell-panel';
import { ScreeningCaution } from './panels/caution-notes';
import { uncertainClassOf } from './panels/ensemble-ranges';
import {
  currentScenarioSlug,
  linkedCompare,
  linkedScenarios,
  scenarioBase,
  scenarioMetrics,
} from './data/scenario-urls';
import { useCompareAtlas, useCompareTable, type CompareState } from './dashboard/compare-view';
import { useCompareFilters } from './dashboard/compare-filters';
import {
  useBoundarySketch,
  useCellAt,
  useCellTableAfterFirstPaint,
  useFirstPaint,
  useLinkSync,
  useMapChoices,
  usePointPicker,
  useSelection,
  useTileLook,
} from './dashboard/use-dashboard-state';
import { LayersSide, MapArea, PlaceSide, TopBar, UrlNotice } from './dashboard/dashboard-parts';

const DATA_BASE = new URL('data/', document.baseURI);

/** Metres per degree of latitude, rounded (WGS 84 meridian degree is 110.6-111.7 km): for a tolerance only. */
const METRES_PER_DEGREE = 111_320;

export function App() {
  const [atlas, setAtlas] = useState<Atlas | null>(null);
  const [error, setError] = useState<{ message: string; issues: string[] } | null>(null);
  const fail = useCallback(
    (e: unknown) =>
      setError({ message: (e as Error).message, issues: e instanceof AtlasLoadError ? e.issues : [] }),
    [],
  );
  useEffect(() => {
    // A link may name a scenario of a scenario-set build (?scenario=<slug>): open that one.
    const wanted = linkedScenarios(window.location.search).scenario;
    loadAtlas(DATA_BASE).then((root) => {
      const base = wanted ? scenarioBase(root.manifest, DATA_BASE, wanted) : null;
      if (!base || wanted === currentScenarioSlug(root.manifest)) setAtlas(root);
      else loadAtlas(base).then(setAtlas, fail);
    }, fail);
  }, [fail]);
  const [openedWith] = useState(() => ({
    slug: linkedScenarios(window.location.search).compare,
    link: linkedCompare(window.location.search),
  }));
  const compare = useCompareAtlas(atlas, openedWith, fail);
  const pickScenario = useCallback(
    (slug: string) => {
      if (!atlas) return;
      const base = scenarioBase(atlas.manifest, atlas.dataBase, slug);
      if (base) loadAtlas(base).then(setAtlas, fail);
    },
    [atlas, fail],
  );
  if (error) {
    return (
      <main className="load-error" role="alert">
        <h1>Pile Atlas could not open its data</h1>
        <p>{error.message}</p>
        <ul>
          {error.issues.map((i) => (
            <li key={i}>{i}</li>
          ))}
        </ul>
        <p>
          Run <code>npm start</code> to build the demo data, or point PILE_ATLAS_DATA at a pipeline build.
        </p>
      </main>
    );
  }
  if (!atlas) return <main className="loading">Loading the map data…</main>;
  // Keyed by scenario: switching remounts the dashboard, which takes the view, layer and filters from the URL.
  return (
    <Dashboard key={atlas.dataBase.href} atlas={atlas} onPickScenario={pickScenario} compare={compare} />
  );
}

function initialState(atlas: Atlas): { state: ViewState; problems: string[]; hasView: boolean } {
  const m = atlas.manifest;
  const [w, s, e, n] = m.region.bounds;
  const layer = m.bands.find((b) => b.id === DEFAULT_MAP_BAND)?.id ?? m.bands[0].id;
  const defaults: ViewState = {
    center: [(w + e) / 2, (s + n) / 2],
    zoom: m.tiles.minZoom + 1,
    layer,
    units: 'SI',
    opacity: 0.85,
    filter: EMPTY_FILTER,
    boundary: null,
    selection: null,
    sort: DEFAULT_SORT,
  };
  const parsed = parseUrlState(window.location.search, defaults, {
    ids: m.bands.map((b) => b.id),
    title: (id) => m.bands.find((b) => b.id === id)?.title ?? id,
  });
  const { state } = parsed;
  // The link's view is used when both its centre and its zoom could be read.
  return { ...parsed, hasView: state.center !== defaults.center && state.zoom !== defaults.zoom };
}

/** Shortlist the selected place with its cell's values (nothing while its cell is not known). */
function addToShortlist(
  atlas: Atlas,
  table: CellTable | null,
  selection: CellSelection | null,
  count: number,
  units: UnitSystem,
) {
  if (!selection || !table || selection.index < 0) return;
  shortlistStore.add({
    lon: selection.lon,
    lat: selection.lat,
    name: defaultSiteName(selection.lon, selection.lat, atlas.settlements, count + 1, units),
    origin: 'map',
    values: cellValues(table, atlas.manifest.bands, selection.index),
    metrics: scenarioMetrics(atlas.manifest),
  });
}

function Dashboard(props: { atlas: Atlas; onPickScenario: (slug: string) => void; compare: CompareState }) {
  const { atlas, onPickScenario, compare } = props;
  const { manifest } = atlas;
  const init = useMemo(() => initialState(atlas), [atlas]);
  const choices = useMapChoices(init.state);
  const uncertainClass = useMemo(() => uncertainClassOf(manifest), [manifest]);
  const look = useTileLook(manifest, choices, uncertainClass);
  const view = useRef({ center: init.state.center, zoom: init.state.zoom });
  const [flyTarget, setFlyTarget] = useState<{ lon: number; lat: number; seq: number } | null>(null);
  const shortlist = useShortlist();
  const [table, setTable] = useState<CellTable | null>(null);
  const zone = useBoundary(table, manifest.analysisGrid.cellSize_m / METRES_PER_DEGREE / 4);
  const loadPolygons = zone.loadPolygons;
  useEffect(() => {
    if (init.state.boundary) loadPolygons(init.state.boundary.polygons, init.state.boundary.name);
  }, [init, loadPolygons]);
  // Worked out in the boundary worker: encoding a large boundary would hold up the page.
  const linkedBoundary = zone.boundary?.link ?? null;
  const [firstPaint_ms, onFirstPaint] = useFirstPaint();
  useCellTableAfterFirstPaint(atlas, firstPaint_ms, setTable, zone.setMessage);
  const cellAt = useCellAt(atlas, table);
  const [selection, setSelection] = useSelection(init.state.selection, table, cellAt);
  const compareTable = useCompareTable(compare.atlas, table !== null);
  const onViewChange = useLinkSync(manifest, choices, view, linkedBoundary, selection, compare);
  const filters = useCompareFilters(choices.filter, look.compiled, compare.atlas, compare.link.scope);
  const sketch = useBoundarySketch(zone.finishDrawing);
  const pick = usePointPicker(sketch, setSelection, cellAt);

  return (
    <div className="app">
      <TopBar
        manifest={manifest}
        onPickScenario={onPickScenario}
        compare={compare}
        hasBoundary={zone.boundary !== null}
        linkedBoundary={linkedBoundary}
      />
      <UrlNotice problems={init.problems} />
      <LayersSide
        {...{ atlas, choices, look, uncertainClass, table, zone, sketch, compareTable, compare, filters }}
      />
      <MapArea
        {...{ atlas, look, table, view, sketch, selection, shortlist, cellAt, flyTarget, firstPaint_ms }}
        {...{ choices, compare, compareTable, filters }}
        units={choices.units}
        initialView={init.hasView ? { center: init.state.center, zoom: init.state.zoom } : null}
        boundary={zone.boundary}
        onPick={pick}
        onViewChange={onViewChange}
        onFirstPaint={onFirstPaint}
      />
      <PlaceSide
        {...{ atlas, table, selection, choices }}
        listedAs={selection ? (shortlistStore.atPlace(selection.lon, selection.lat)?.name ?? null) : null}
        onAdd={() => addToShortlist(atlas, table, selection, shortlist.length, choices.units)}
        onClose={() => setSelection(null)}
        onLocate={(lon, lat) => setFlyTarget({ lon, lat, seq: (flyTarget?.seq ?? 0) + 1 })}
      />
      <footer className="footer">
        <ScreeningCaution full />
      </footer>
    </div>
  );
}
