/**
 * The regions of the dashboard: the top bar (scenario, notices, copy link), the link notice, the left
 * side (layer, legend, filters, counter, sources), the map with its keyboard inspect button and hover
 * readout, and the right side (selected place and shortlist).
 */
import { useCallback, useMemo, useState, type ChangeEvent } from 'react';
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
  BothCounts,
  CompareControl,
  CompareLabel,
  ComparePane,
  useBothSummary,
  type CompareState,
  type CompareTable,
} from './compare-view';
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
    <header className="topbar">
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
  compareTable: CompareTable | null;
}) {
  const { atlas, choices: c, look, uncertainClass, table, zone, sketch } = props;
  const both = useBothSummary(table, look.compiled, props.compareTable, c.filter, zone.mask);
  const { manifest } = atlas;
  const { compiled } = look;
  const regionSummary = useMemo(() => (table ? summarise(table, compiled) : null), [table, compiled]);
  const mask = zone.mask;
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
        filterActive={compiled.active}
        uncertain={c.hatchUncertain && uncertainClass ? uncertainClass.band : null}
      />
      <FilterPanel bands={manifest.bands} filter={c.filter} units={c.units} onChange={c.setFilter} />
      <RadiusFilter settlements={atlas.settlements} units={c.units} onApply={zone.loadPolygons} />
      <SummaryPanel
        region={regionSummary}
        zone={zoneSummary}
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
        <BothCounts both={both} units={c.units} />
      </SummaryPanel>
      <SourcesPanel manifest={manifest} />
    </aside>
  );
}

export function MapArea(props: {
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
}) {
  const { atlas, look, sketch, selection, shortlist, cellAt, compare } = props;
  const [hover, setHover] = useState<HoverState | null>(null);
  const onHover = useCallback(
    (p: LonLatPoint | null) => setHover(p ? { lon: p[0], lat: p[1], index: cellAt(p[0], p[1]) } : null),
    [cellAt],
  );
  const shortlistPoints = useMemo(
    () => shortlist.slice(0, MAX_SHORTLIST_PINS).map((s) => ({ lon: s.lon, lat: s.lat, name: s.name })),
    [shortlist],
  );
  const selectedPoint = useMemo<LonLatPoint | null>(
    () => (selection ? [selection.lon, selection.lat] : null),
    [selection],
  );
  // One link per map area: the left map is always on it, the right map joins while comparing.
  const [link] = useState(() => new ViewLink());
  const comparing = compare.slug !== null;
  return (
    <main
      className={comparing ? 'map-wrap comparing' : 'map-wrap'}
      data-testid="map-wrap"
      data-first-paint-ms={props.firstPaint_ms ?? undefined}
    >
      <div className="compare-pane compare-left">
        <MapView
          {...{ atlas, onHover, link }}
          style={look.style}
          styleKey={look.styleKey}
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
      {compare.atlas && (
        <ComparePane
          {...{ link, view: props.view, choices: props.choices, selected: selectedPoint }}
          atlas={compare.atlas}
          shortlist={shortlistPoints}
          onPick={props.onPick}
        />
      )}
      <InspectCentre view={props.view} drawing={sketch.drawing} onPick={props.onPick} />
      <span className="centre-mark" aria-hidden="true" />
      <HoverReadout
        {...{ hover, table: props.table, units: props.units }}
        manifest={atlas.manifest}
        band={look.band}
        bandIndex={look.bandIndex}
      />
    </main>
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
