/**
 * The planner's dashboard: map in the middle, layer / legend / filters / counter / sources on the
 * left, the selected place and the shortlist on the right, cautions and the demo-data notice always
 * visible. State that a link should carry (view, layer, units, opacity, filters) lives in the URL.
 */
import { useCallback, useEffect, useMemo, useRef, useState, type ChangeEvent } from 'react';
import { SCREENING_CAUTION } from '../../layers/cautions';
import { DEFAULT_MAP_BAND } from '../../layers/screening/band-registry';
import { AtlasLoadError, loadAtlas, loadCellTable, type Atlas } from './data/load-atlas';
import { cellIndexAt, type CellTable } from './data/cell-table';
import { compileFilter, EMPTY_FILTER, type FilterSpec } from './filters/cell-filter';
import { summarise } from './filters/zonal-summary';
import { useBoundary } from './filters/use-boundary';
import { MapView } from './map/map-view';
import { MAX_SHORTLIST_PINS } from './map/point-markers';
import type { TileStyle } from './map/colour-tile';
import {
  DEFAULT_SORT,
  formatUrlState,
  parseUrlState,
  type ShortlistSort,
  type ViewState,
} from './state/url-state';
import { CopyLink } from './state/copy-link';
import { RadiusFilter } from './filters/radius-filter';
import type { UnitSystem } from './units/display-units';
import { shortlistStore } from './shortlist/shortlist-store';
import { useShortlist } from './shortlist/use-shortlist';
import { defaultSiteName } from './shortlist/site-name';
import { LayerPanel } from './panels/layer-panel';
import { LegendPanel } from './panels/legend-panel';
import { FilterPanel } from './panels/filter-panel';
import { SummaryPanel } from './panels/summary-panel';
import { SourcesPanel } from './panels/sources-panel';
import { CellPanel, cellValues, type CellSelection } from './panels/cell-panel';
import { ShortlistPanel } from './panels/shortlist-panel';
import { FictionalNotice, ScreeningCaution } from './panels/caution-notes';
import { HoverReadout, type HoverState } from './panels/hover-readout';
import { uncertainClassOf } from './panels/ensemble-ranges';
import { SitePanel } from './site/site-panel';
import { ScenarioPicker } from './panels/scenario-picker';
import { currentScenarioName, currentScenarioSlug, scenarioBase } from './data/scenario-urls';

const DATA_BASE = new URL('data/', document.baseURI);
const NO_RINGS: [number, number][][] = [];

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
    const wanted = new URLSearchParams(window.location.search).get('scenario');
    loadAtlas(DATA_BASE).then((root) => {
      const base = wanted ? scenarioBase(root.manifest, DATA_BASE, wanted) : null;
      if (!base || wanted === currentScenarioSlug(root.manifest)) setAtlas(root);
      else loadAtlas(base).then(setAtlas, fail);
    }, fail);
  }, [fail]);
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
  return <Dashboard key={atlas.dataBase.href} atlas={atlas} onPickScenario={pickScenario} />;
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

function Dashboard({ atlas, onPickScenario }: { atlas: Atlas; onPickScenario: (slug: string) => void }) {
  const { manifest } = atlas;
  const init = useMemo(() => initialState(atlas), [atlas]);
  const [urlProblems, setUrlProblems] = useState<string[]>(init.problems);
  const [bandId, setBandId] = useState(init.state.layer);
  const [units, setUnits] = useState<UnitSystem>(init.state.units);
  const [opacity, setOpacity] = useState(init.state.opacity);
  const [filter, setFilter] = useState<FilterSpec>(init.state.filter);
  // Ensemble builds: hatch the cells whose robust class is "uncertain" over any layer (on by default).
  const uncertainClass = useMemo(() => uncertainClassOf(manifest), [manifest]);
  const [hatchUncertain, setHatchUncertain] = useState(true);
  const view = useRef({ center: init.state.center, zoom: init.state.zoom });
  const [table, setTable] = useState<CellTable | null>(null);
  const [hover, setHover] = useState<HoverState | null>(null);
  const [selection, setSelection] = useState<CellSelection | null>(() =>
    init.state.selection ? { lon: init.state.selection[0], lat: init.state.selection[1], index: -1 } : null,
  );
  const [sort, setSort] = useState<ShortlistSort>(init.state.sort);
  const [drawing, setDrawing] = useState(false);
  const [vertices, setVertices] = useState<[number, number][]>([]);
  const [flyTarget, setFlyTarget] = useState<{ lon: number; lat: number; seq: number } | null>(null);
  const shortlist = useShortlist();
  const zone = useBoundary(table, manifest.analysisGrid.cellSize_m / METRES_PER_DEGREE / 4);
  const setZoneMessage = zone.setMessage;
  const loadPolygons = zone.loadPolygons;
  useEffect(() => {
    if (init.state.boundary) loadPolygons(init.state.boundary.polygons, init.state.boundary.name);
  }, [init, loadPolygons]);
  // Worked out in the boundary worker: encoding a large boundary would hold up the page.
  const linkedBoundary = zone.boundary?.link ?? null;
  const [firstPaint_ms, setFirstPaint_ms] = useState<number | null>(null);
  const onFirstPaint = useCallback((time_ms: number) => setFirstPaint_ms(Math.round(time_ms)), []);

  // The cell table (readout, counters, panel) loads right after the first map paint, so that it does
  // not compete with the visible tiles; at the latest 6 s after start.
  const [tableWanted, setTableWanted] = useState(false);
  useEffect(() => {
    const t = setTimeout(() => setTableWanted(true), 6000);
    return () => clearTimeout(t);
  }, []);
  useEffect(() => {
    if (firstPaint_ms !== null) setTableWanted(true);
  }, [firstPaint_ms]);
  useEffect(() => {
    if (!tableWanted) return;
    loadCellTable(atlas).then(setTable, (e: unknown) =>
      setZoneMessage(`Cell table failed: ${(e as Error).message}`),
    );
  }, [atlas, tableWanted, setZoneMessage]);

  const bandIndex = Math.max(
    0,
    manifest.bands.findIndex((b) => b.id === bandId),
  );
  const band = manifest.bands[bandIndex];
  const compiled = useMemo(() => compileFilter(filter, manifest.bands), [filter, manifest.bands]);
  const style: TileStyle = useMemo(
    () => ({
      band,
      bandIndex,
      opacity,
      filter: compiled,
      uncertainty: hatchUncertain && uncertainClass ? uncertainClass : null,
    }),
    [band, bandIndex, opacity, compiled, hatchUncertain, uncertainClass],
  );
  const styleKey = useMemo(
    () => `${bandId}|${opacity}|${JSON.stringify(filter)}|${hatchUncertain}`,
    [bandId, opacity, filter, hatchUncertain],
  );

  const writeUrl = useCallback(() => {
    const q = formatUrlState({
      center: view.current.center,
      zoom: view.current.zoom,
      layer: bandId,
      units,
      opacity,
      filter,
      boundary: linkedBoundary,
      selection: selection ? [selection.lon, selection.lat] : null,
      sort,
    });
    const slug = currentScenarioSlug(manifest);
    const sc =
      slug && manifest.scenarioSet?.scenarios[0].slug !== slug ? `&scenario=${encodeURIComponent(slug)}` : '';
    window.history.replaceState(null, '', `${window.location.pathname}?${q}${sc}`);
  }, [bandId, units, opacity, filter, linkedBoundary, selection, sort, manifest]);
  useEffect(() => writeUrl(), [writeUrl]);

  const regionSummary = useMemo(() => (table ? summarise(table, compiled) : null), [table, compiled]);
  const mask = zone.mask;
  const zoneSummary = useMemo(
    () => (table && mask ? summarise(table, compiled, mask) : null),
    [table, mask, compiled],
  );

  const cellAt = useCallback(
    (lon: number, lat: number) => {
      if (!table) return -1;
      const [x, y] = atlas.toGrid(lon, lat);
      return cellIndexAt(table, manifest, x, y);
    },
    [atlas, manifest, table],
  );

  const onHover = useCallback(
    (p: [number, number] | null) => setHover(p ? { lon: p[0], lat: p[1], index: cellAt(p[0], p[1]) } : null),
    [cellAt],
  );
  const onClick = useCallback(
    (p: [number, number]) => {
      if (drawing) setVertices((v) => [...v, p]);
      else setSelection({ lon: p[0], lat: p[1], index: cellAt(p[0], p[1]) });
    },
    [drawing, cellAt],
  );
  // A click before the table was ready: resolve it once the table arrives.
  useEffect(() => {
    if (table && selection && selection.index < 0) {
      const index = cellAt(selection.lon, selection.lat);
      if (index >= 0) setSelection({ ...selection, index });
    }
  }, [table, selection, cellAt]);
  const onViewChange = useCallback(
    (center: [number, number], zoom: number) => {
      view.current = { center, zoom };
      writeUrl();
    },
    [writeUrl],
  );

  const finishDrawing = () => {
    setDrawing(false);
    setVertices([]);
    zone.finishDrawing(vertices);
  };
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape' && drawing) {
        setDrawing(false);
        setVertices([]);
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [drawing]);
  const importBoundary = (ev: ChangeEvent<HTMLInputElement>) => {
    const file = ev.target.files?.[0];
    ev.target.value = '';
    if (file) zone.importFile(file);
  };

  const rings = zone.boundary?.display ?? NO_RINGS;
  const shortlistPoints = useMemo(
    () => shortlist.slice(0, MAX_SHORTLIST_PINS).map((s) => ({ lon: s.lon, lat: s.lat, name: s.name })),
    [shortlist],
  );
  const selectedPoint = useMemo<[number, number] | null>(
    () => (selection ? [selection.lon, selection.lat] : null),
    [selection],
  );

  const addSelection = () => {
    if (!selection || !table || selection.index < 0) return;
    shortlistStore.add({
      lon: selection.lon,
      lat: selection.lat,
      name: defaultSiteName(selection.lon, selection.lat, atlas.settlements, shortlist.length + 1),
      origin: 'map',
      values: cellValues(table, manifest.bands, selection.index),
      metrics: { scenario: currentScenarioName(manifest) },
    });
  };

  return (
    <div className="app">
      <header className="topbar">
        <h1>
          Pile Atlas <span className="muted">· {manifest.region.name}</span>
        </h1>
        <ScenarioPicker manifest={manifest} onPick={onPickScenario} />
        <FictionalNotice fictional={manifest.fictional} notice={manifest.notice} />
        <span className="caution-pill" title={SCREENING_CAUTION}>
          Screening estimate, not a design
        </span>
        <CopyLink
          note={
            zone.boundary && !linkedBoundary
              ? 'the boundary is too large to travel in a link and is left out'
              : linkedBoundary?.simplified
                ? `the boundary travels as its drawn copy (${linkedBoundary.polygons.flat().length} ring(s), simplified)`
                : null
          }
        />
      </header>
      {urlProblems.length > 0 ? (
        <div className="notice warn url-notice" role="alert" data-testid="url-notice">
          Parts of the link could not be used and were left at their defaults:
          <ul>
            {urlProblems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
          <button
            type="button"
            className="icon"
            onClick={() => setUrlProblems([])}
            aria-label="Dismiss link notice"
          >
            ×
          </button>
        </div>
      ) : null}
      <aside className="side left" aria-label="Layers and filters">
        <LayerPanel
          bands={manifest.bands}
          bandId={bandId}
          units={units}
          opacity={opacity}
          onBand={setBandId}
          onUnits={setUnits}
          onOpacity={setOpacity}
          hatch={uncertainClass ? { on: hatchUncertain, onChange: setHatchUncertain } : null}
        />
        <LegendPanel
          band={band}
          units={units}
          filterActive={compiled.active}
          uncertain={hatchUncertain && uncertainClass ? uncertainClass.band : null}
        />
        <FilterPanel bands={manifest.bands} filter={filter} units={units} onChange={setFilter} />
        <RadiusFilter settlements={atlas.settlements} units={units} onApply={loadPolygons} />
        <SummaryPanel
          region={regionSummary}
          zone={zoneSummary}
          zoneArea_km2={zone.boundary?.area_km2 ?? null}
          units={units}
          drawing={drawing}
          hasBoundary={zone.boundary !== null}
          boundaryMessage={zone.message}
          boundaryBusy={zone.busy}
          onDraw={() => {
            setDrawing(true);
            setVertices([]);
          }}
          onFinish={finishDrawing}
          onClear={zone.clear}
          onImport={importBoundary}
        />
        <SourcesPanel manifest={manifest} />
      </aside>
      <main className="map-wrap" data-testid="map-wrap" data-first-paint-ms={firstPaint_ms ?? undefined}>
        <MapView
          atlas={atlas}
          style={style}
          styleKey={styleKey}
          initialView={init.hasView ? { center: init.state.center, zoom: init.state.zoom } : null}
          boundaryRings={rings}
          drawingPath={vertices}
          drawing={drawing}
          selected={selectedPoint}
          shortlist={shortlistPoints}
          onHover={onHover}
          onClick={onClick}
          onViewChange={onViewChange}
          flyTarget={flyTarget}
          onFirstPaint={onFirstPaint}
        />
        <button
          type="button"
          className="inspect-centre"
          onClick={() => {
            const [lon, lat] = view.current.center;
            if (drawing) setVertices((v) => [...v, [lon, lat]]);
            else setSelection({ lon, lat, index: cellAt(lon, lat) });
          }}
          title="For keyboard use: pan with the arrow keys, then press this button"
          data-testid="inspect-centre"
        >
          {drawing ? 'Add corner at map centre' : 'Inspect map centre'}
        </button>
        <span className="centre-mark" aria-hidden="true" />
        <HoverReadout
          hover={hover}
          table={table}
          manifest={manifest}
          band={band}
          bandIndex={bandIndex}
          units={units}
        />
      </main>
      <aside className="side right" aria-label="Selected place and shortlist">
        {selection ? (
          <SitePanel
            manifest={manifest}
            table={table}
            selection={selection}
            settlements={atlas.settlements}
            units={units}
          />
        ) : null}
        {selection ? (
          <CellPanel
            manifest={manifest}
            table={table}
            selection={selection}
            units={units}
            onAdd={addSelection}
            onClose={() => setSelection(null)}
          />
        ) : (
          <section className="panel muted">Click the map to see every value of a place.</section>
        )}
        <ShortlistPanel
          manifest={manifest}
          units={units}
          metricBandId={bandId}
          sort={sort}
          onSort={setSort}
          land={atlas.land}
          onLocate={(lon, lat) => setFlyTarget({ lon, lat, seq: (flyTarget?.seq ?? 0) + 1 })}
        />
      </aside>
      <footer className="footer">
        <ScreeningCaution full />
      </footer>
    </div>
  );
}
