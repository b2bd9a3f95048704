/**
 * The regions of the dashboard: the top bar (scenario, notices, copy link), the link notice, the left
 * side (layer, legend, filters, counter, sources), the map with its keyboard inspect button and hover
 * readout, and the right side (selected place and shortlist).
 */
import { useEffect, useMemo, useState, type ChangeEvent } from 'react';
import { SCREENING_CAUTION } from '../../../layers/cautions';
import type { Manifest } from '../../../layers/screening/manifest';
import type { Atlas } from '../data/load-atlas';
import type { CellTable } from '../data/cell-table';
import type { BoundaryState } from '../filters/use-boundary';
import { summarise } from '../filters/zonal-summary';
import { RadiusFilter } from '../filters/radius-filter';
import { MapView } from '../map/map-view';
import { MAX_SHORTLIST_PINS } from '../map/point-markers';
import { LayerPanel } from '../panels/layer-panel';
import { LegendPanel } from '../panels/legend-panel';
import { activeFilterTexts, FilterPanel } from '../panels/filter-panel';
import { SummaryPanel } from '../panels/summary-panel';
import { SourcesPanel } from '../panels/sources-panel';
import { CellPanel, type CellSelection } from '../panels/cell-panel';
import { ShortlistPanel } from '../panels/shortlist-panel';
import { FictionalNotice } from '../panels/caution-notes';
import { HoverReadout, type HoverState } from '../panels/hover-readout';
import { ScenarioPicker } from '../panels/scenario-picker';
import type { ShortlistItem } from '../shortlist/shortlist-item';
import { ViewLink } from '../map/linked-views';
import {
  CompareControl,
  CompareLabel,
  ComparePane,
  CompareReadout,
  type CompareState,
  type CompareTable,
} from './compare-view';
import {
  BothCounts,
  FilterScopePicker,
  scopedLook,
  useCompareCounts,
  type CompareFilters,
} from './compare-filters';
import { SwipeDivider } from './swipe-divider';
import { currentScenarioName } from '../data/scenario-urls';
import { SitePanel } from '../site/site-panel';
import type { LinkedBoundary } from '../state/boundary-link';
import { CopyLink } from '../state/copy-link';
import type { UnitSystem } from '../units/display-units';
import type {
  BoundarySketch,
  LonLatPoint,
  MapChoices,
  MapViewRef,
  TileLook,
  UncertainClass,
} from './use-dashboard-state';

const NO_RINGS: LonLatPoint[][] = [];

/** Why the copy link does not carry the boundary as drawn, or null when it does. */
function boundaryLinkNote(hasBoundary: boolean, linked: LinkedBoundary | null): string | null {
  if (hasBoundary && !linked) return 'the boundary is too large to travel in a link and is left out';
  if (linked?.simplified)
    return `the boundary travels as its drawn copy (${linked.polygons.flat().length} ring(s), simplified)`;
  return null;
}

export function TopBar(props: {
  manifest: Manifest;
  onPickScenario: (slug: string) => void;
  compare: CompareState;
  hasBoundary: boolean;
  linkedBoundary: LinkedBoundary | null;
}) {
  const { manifest } = props;
  return (
    <header className={props.compare.slug !== null ? 'topbar comparing' : 'topbar'}>
      <h1>
        Pile Atlas <span className="muted">· {manifest.region.name}</span>
      </h1>
      <ScenarioPicker manifest={manifest} onPick={props.onPickScenario} />
      <CompareControl manifest={manifest} compare={props.compare} />
      <FictionalNotice fictional={manifest.fictional} notice={manifest.notice} />
      <span className="caution-pill" title={SCREENING_CAUTION}>
        Screening estimate, not a design
      </span>
      <CopyLink note={boundaryLinkNote(props.hasBoundary, props.linkedBoundary)} />
    </header>
  );
}

/** The parts of the opening link that could not be used, until dismissed. */
export function UrlNotice({ problems }: { problems: string[] }) {
  const [shown, setShown] = useState<string[]>(problems);
  if (shown.length === 0) return null;
  return (
    <div className="notice warn url-notice" role="alert" data-testid="url-notice">
      Parts of the link could not be used and were left at their defaults:
      <ul>
        {shown.map((p) => (
          <li key={p}>{p}</li>
        ))}
      </ul>
      <button type="button" className="icon" onClick={() => setShown([])} aria-label="Dismiss link notice">
        ×
      </button>
    </div>
  );
}

export function LayersSide(props: {
  atlas: Atlas;
  choices: MapChoices;
  look: TileLook;
  uncertainClass: UncertainClass;
  table: CellTable | null;
  zone: BoundaryState;
  sketch: BoundarySketch;
  compare: CompareState;
  compareTable: CompareTable | null;
  filters: CompareFilters;
}) {
  const { atlas, choices: c, look, uncertainClass, table, zone, sketch, compare } = props;
  const { manifest } = atlas;
  const { compiled } = look;
  const mask = zone.mask;
  const counts = useCompareCounts(table, props.compareTable, props.filters, manifest, mask);
  const regionSummary = useMemo(() => (table ? summarise(table, compiled) : null), [table, compiled]);
  const zoneSummary = useMemo(
    () => (table && mask ? summarise(table, compiled, mask) : null),
    [table, mask, compiled],
  );
  const importBoundary = (ev: ChangeEvent<HTMLInputElement>) => {
    const file = ev.target.files?.[0];
    ev.target.value = '';
    if (file) zone.importFile(file);
  };
  return (
    <aside className="side left" aria-label="Layers and filters">
      <LayerPanel
        bands={manifest.bands}
        bandId={c.bandId}
        units={c.units}
        opacity={c.opacity}
        onBand={c.setBandId}
        onUnits={c.setUnits}
        onOpacity={c.setOpacity}
        hatch={uncertainClass ? { on: c.hatchUncertain, onChange: c.setHatchUncertain } : null}
      />
      <LegendPanel
        band={look.band}
        units={c.units}
        filterActive={props.filters.left.active}
        uncertain={c.hatchUncertain && uncertainClass ? uncertainClass.band : null}
      />
      <FilterPanel bands={manifest.bands} filter={c.filter} units={c.units} onChange={c.setFilter} />
      <RadiusFilter settlements={atlas.settlements} units={c.units} onApply={zone.loadPolygons} />
      <SummaryPanel
        region={counts.scoped ? counts.scoped.region : regionSummary}
        zone={counts.scoped ? counts.scoped.zone : zoneSummary}
        scopeText={counts.scoped?.text}
        scopePicker={
          <FilterScopePicker
            shown={manifest}
            compared={compare.atlas?.manifest ?? null}
            scope={compare.link.scope}
            onScope={(scope) => compare.setLink({ scope })}
          />
        }
        filters={activeFilterTexts(c.filter, manifest.bands, c.units)}
        zoneArea_km2={zone.boundary?.area_km2 ?? null}
        units={c.units}
        drawing={sketch.drawing}
        hasBoundary={zone.boundary !== null}
        boundaryMessage={zone.message}
        boundaryBusy={zone.busy}
        onDraw={sketch.start}
        onFinish={sketch.finish}
        onClear={zone.clear}
        onImport={importBoundary}
      >
        <BothCounts both={counts.both} units={c.units} />
      </SummaryPanel>
      <SourcesPanel manifest={manifest} />
    </aside>
  );
}

/** What the map area draws: the map (or the two maps of the compare view), readouts, inspect button. */
export interface MapAreaProps {
  atlas: Atlas;
  look: TileLook;
  units: UnitSystem;
  table: CellTable | null;
  initialView: { center: LonLatPoint; zoom: number } | null;
  view: MapViewRef;
  boundary: BoundaryState['boundary'];
  sketch: BoundarySketch;
  selection: CellSelection | null;
  shortlist: readonly ShortlistItem[];
  cellAt: (lon: number, lat: number) => number;
  onPick: (p: LonLatPoint) => void;
  onViewChange: (center: LonLatPoint, zoom: number) => void;
  flyTarget: { lon: number; lat: number; seq: number } | null;
  firstPaint_ms: number | null;
  onFirstPaint: (time_ms: number) => void;
  choices: MapChoices;
  compare: CompareState;
  compareTable: CompareTable | null;
  filters: CompareFilters;
}

export function MapArea(props: MapAreaProps) {
  const { atlas, look, sketch, selection, shortlist, cellAt, compare, filters } = props;
  // One place under the pointer for every map: each readout shows its own scenario there.
  const [hover, setHover] = useState<LonLatPoint | null>(null);
  const hoverCell = useMemo<HoverState | null>(
    () => (hover ? { lon: hover[0], lat: hover[1], index: cellAt(hover[0], hover[1]) } : null),
    [hover, cellAt],
  );
  const shortlistPoints = useMemo(
    () => shortlist.slice(0, MAX_SHORTLIST_PINS).map((s) => ({ lon: s.lon, lat: s.lat, name: s.name })),
    [shortlist],
  );
  const selectedPoint = useMemo<LonLatPoint | null>(
    () => (selection ? [selection.lon, selection.lat] : null),
    [selection],
  );
  const leftLook = useMemo(() => scopedLook(look, filters.left, filters.key), [look, filters]);
  // One link per map area: the left map is always on it, the right map joins while comparing.
  const [link] = useState(() => new ViewLink());
  const comparing = compare.slug !== null;
  const swipe = comparing && compare.link.mode === 'swipe';
  return (
    <main
      className={`map-wrap${comparing ? ' comparing' : ''}${swipe ? ' swipe' : ''}`}
      data-testid="map-wrap"
      data-first-paint-ms={props.firstPaint_ms ?? undefined}
    >
      <div className="compare-pane compare-left">
        <MapView
          {...{ atlas, link }}
          onHover={setHover}
          otherAtlas={compare.atlas}
          style={leftLook.style}
          styleKey={leftLook.styleKey}
          initialView={props.initialView}
          boundaryRings={props.boundary?.display ?? NO_RINGS}
          drawingPath={sketch.vertices}
          drawing={sketch.drawing}
          selected={selectedPoint}
          shortlist={shortlistPoints}
          onClick={props.onPick}
          onViewChange={props.onViewChange}
          flyTarget={props.flyTarget}
          onFirstPaint={props.onFirstPaint}
        />
        {comparing && <CompareLabel manifest={atlas.manifest} side="left" />}
      </div>
      <SecondScenario
        {...{ atlas, compare, filters, link, swipe, onHover: setHover, hover }}
        view={props.view}
        choices={props.choices}
        selected={selectedPoint}
        shortlist={shortlistPoints}
        onPick={props.onPick}
        compareTable={props.compareTable}
      />
      <InspectCentre view={props.view} drawing={sketch.drawing} onPick={props.onPick} />
      <span className="centre-mark" aria-hidden="true" />
      <HoverReadout
        {...{ table: props.table, units: props.units }}
        hover={hoverCell}
        manifest={atlas.manifest}
        band={look.band}
        bandIndex={look.bandIndex}
        scenario={comparing ? currentScenarioName(atlas.manifest) : undefined}
      />
    </main>
  );
}

/**
 * The second scenario of the compare view: its map (right-hand, or over the first map right of the
 * swipe divider), the divider in the swipe view, and its hover readout.
 */
function SecondScenario(props: {
  atlas: Atlas;
  compare: CompareState;
  compareTable: CompareTable | null;
  filters: CompareFilters;
  link: ViewLink;
  view: MapViewRef;
  choices: MapChoices;
  swipe: boolean;
  selected: LonLatPoint | null;
  shortlist: { lon: number; lat: number; name: string }[];
  hover: LonLatPoint | null;
  onHover: (p: LonLatPoint | null) => void;
  onPick: (p: LonLatPoint) => void;
}) {
  const { atlas, compare, swipe } = props;
  // The divider moves live while dragged; the link takes its place when the drag ends.
  const committed = compare.link.divider_pct;
  const [divider, setDivider] = useState(committed);
  useEffect(() => setDivider(committed), [committed]);
  if (!compare.atlas) return null;
  return (
    <>
      <ComparePane
        {...{ link: props.link, view: props.view, choices: props.choices, selected: props.selected }}
        atlas={compare.atlas}
        otherAtlas={atlas}
        filter={props.filters.right}
        filterKey={props.filters.key}
        shortlist={props.shortlist}
        onPick={props.onPick}
        onHover={props.onHover}
        swipe_pct={swipe ? divider : null}
      />
      {swipe && (
        <SwipeDivider
          pct={divider}
          leftName={currentScenarioName(atlas.manifest)}
          rightName={currentScenarioName(compare.atlas.manifest)}
          onMove={setDivider}
          onCommit={(divider_pct) => compare.setLink({ divider_pct })}
        />
      )}
      <CompareReadout
        hover={props.hover}
        compare={props.compareTable}
        bandId={props.choices.bandId}
        units={props.choices.units}
        mode={compare.link.mode}
      />
    </>
  );
}

/** For keyboard use: inspect (or, while drawing, add a corner at) the map centre. */
function InspectCentre(props: { view: MapViewRef; drawing: boolean; onPick: (p: LonLatPoint) => void }) {
  return (
    <button
      type="button"
      className="inspect-centre"
      onClick={() => {
        const [lon, lat] = props.view.current.center;
        props.onPick([lon, lat]);
      }}
      title="For keyboard use: pan with the arrow keys, then press this button"
      data-testid="inspect-centre"
    >
      {props.drawing ? 'Add corner at map centre' : 'Inspect map centre'}
    </button>
  );
}

export function PlaceSide(props: {
  atlas: Atlas;
  table: CellTable | null;
  selection: CellSelection | null;
  choices: MapChoices;
  /** Name of the shortlisted site at the selected place, or null. */
  listedAs: string | null;
  onAdd: () => void;
  onClose: () => void;
  onLocate: (lon: number, lat: number) => void;
}) {
  const { atlas, table, selection, choices } = props;
  const { manifest } = atlas;
  return (
    <aside className="side right" aria-label="Selected place and shortlist">
      {selection ? (
        <SitePanel
          manifest={manifest}
          table={table}
          selection={selection}
          settlements={atlas.settlements}
          units={choices.units}
          dataBase={atlas.dataBase}
        />
      ) : null}
      {selection ? (
        <CellPanel
          manifest={manifest}
          table={table}
          selection={selection}
          units={choices.units}
          listedAs={props.listedAs}
          onAdd={props.onAdd}
          onClose={props.onClose}
        />
      ) : (
        <section className="panel muted">Click the map to see every value of a place.</section>
      )}
      <ShortlistPanel
        manifest={manifest}
        units={choices.units}
        metricBandId={choices.bandId}
        sort={choices.sort}
        onSort={choices.setSort}
        land={atlas.land}
        dataBase={atlas.dataBase}
        onLocate={props.onLocate}
      />
    </aside>
  );
}
