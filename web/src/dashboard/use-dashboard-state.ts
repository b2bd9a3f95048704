/**
 * The dashboard's state, one hook per concern: the planner's map choices (all but the hatching carried
 * by the link), the tile style they give, the cell table loaded after the first paint, the selected
 * place, the boundary being drawn, and the link kept in step with all of them.
 */
import {
  useCallback,
  useEffect,
  useMemo,
  useState,
  type Dispatch,
  type MutableRefObject,
  type SetStateAction,
} from 'react';
import type { Manifest } from '../../../layers/screening/manifest';
import { loadCellTable, type Atlas } from '../data/load-atlas';
import { cellIndexAt, type CellTable } from '../data/cell-table';
import { compileFilter, type FilterSpec } from '../filters/cell-filter';
import type { TileStyle } from '../map/colour-tile';
import type { CellSelection } from '../panels/cell-panel';
import type { uncertainClassOf } from '../panels/ensemble-ranges';
import { scenarioQuery, type CompareLink } from '../data/scenario-urls';
import type { LinkedBoundary } from '../state/boundary-link';
import { formatUrlState, type ShortlistSort, type ViewState } from '../state/url-state';
import type { UnitSystem } from '../units/display-units';

type Setter<T> = Dispatch<SetStateAction<T>>;
export type UncertainClass = ReturnType<typeof uncertainClassOf>;
export type LonLatPoint = [number, number];
/** The map's current centre and zoom (kept in a ref: panning must not re-render the dashboard). */
export type MapViewRef = MutableRefObject<{ center: LonLatPoint; zoom: number }>;

/** What the planner chose to see: layer, units, opacity, filters, shortlist order, hatching. */
export interface MapChoices {
  bandId: string;
  setBandId: Setter<string>;
  units: UnitSystem;
  setUnits: Setter<UnitSystem>;
  opacity: number;
  setOpacity: Setter<number>;
  filter: FilterSpec;
  setFilter: Setter<FilterSpec>;
  sort: ShortlistSort;
  setSort: Setter<ShortlistSort>;
  hatchUncertain: boolean;
  setHatchUncertain: Setter<boolean>;
}

export function useMapChoices(init: ViewState): MapChoices {
  const [bandId, setBandId] = useState(init.layer);
  const [units, setUnits] = useState<UnitSystem>(init.units);
  const [opacity, setOpacity] = useState(init.opacity);
  const [filter, setFilter] = useState<FilterSpec>(init.filter);
  const [sort, setSort] = useState<ShortlistSort>(init.sort);
  // Ensemble builds: hatch the cells whose robust class is "uncertain" over any layer (on by default).
  const [hatchUncertain, setHatchUncertain] = useState(true);
  return {
    bandId,
    setBandId,
    units,
    setUnits,
    opacity,
    setOpacity,
    filter,
    setFilter,
    sort,
    setSort,
    hatchUncertain,
    setHatchUncertain,
  };
}

export interface TileLook {
  band: Manifest['bands'][number];
  bandIndex: number;
  compiled: ReturnType<typeof compileFilter>;
  style: TileStyle;
  /** Changes whenever `style` changes (cheap key for recolouring). */
  styleKey: string;
}

/** The shown band, the compiled filter and the tile style they make. */
export function useTileLook(
  manifest: Manifest,
  choices: MapChoices,
  uncertainClass: UncertainClass,
): TileLook {
  const { bandId, opacity, filter, hatchUncertain } = choices;
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
  return { band, bandIndex, compiled, style, styleKey };
}

/** When the map first drew every tile of its opening view (ms after start, rounded), and its setter. */
export function useFirstPaint(): [number | null, (time_ms: number) => void] {
  const [firstPaint_ms, setFirstPaint_ms] = useState<number | null>(null);
  const onFirstPaint = useCallback((time_ms: number) => setFirstPaint_ms(Math.round(time_ms)), []);
  return [firstPaint_ms, onFirstPaint];
}

/**
 * The cell table (readout, counters, panel) loads right after the first map paint, so that it does
 * not compete with the visible tiles; at the latest 6 s after start.
 */
export function useCellTableAfterFirstPaint(
  atlas: Atlas,
  firstPaint_ms: number | null,
  onTable: (t: CellTable) => void,
  onError: (message: string) => void,
): void {
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
    loadCellTable(atlas).then(onTable, (e: unknown) => onError(`Cell table failed: ${(e as Error).message}`));
  }, [atlas, tableWanted, onTable, onError]);
}

/** The table row of the cell under a point (-1 outside the screened cells or before the table). */
export function useCellAt(atlas: Atlas, table: CellTable | null): (lon: number, lat: number) => number {
  const { manifest } = atlas;
  return useCallback(
    (lon: number, lat: number) => {
      if (!table) return -1;
      const [x, y] = atlas.toGrid(lon, lat);
      return cellIndexAt(table, manifest, x, y);
    },
    [atlas, manifest, table],
  );
}

/** The selected place, opened from the link's point; a click before the table was ready is resolved once it arrives. */
export function useSelection(
  initial: LonLatPoint | null,
  table: CellTable | null,
  cellAt: (lon: number, lat: number) => number,
): [CellSelection | null, Setter<CellSelection | null>] {
  const [selection, setSelection] = useState<CellSelection | null>(() =>
    initial ? { lon: initial[0], lat: initial[1], index: -1 } : null,
  );
  useEffect(() => {
    if (table && selection && selection.index < 0) {
      const index = cellAt(selection.lon, selection.lat);
      if (index >= 0) setSelection({ ...selection, index });
    }
  }, [table, selection, cellAt]);
  return [selection, setSelection];
}

/** A boundary being drawn corner by corner on the map; Escape abandons it. */
export interface BoundarySketch {
  drawing: boolean;
  vertices: LonLatPoint[];
  start: () => void;
  addVertex: (p: LonLatPoint) => void;
  /** Stop drawing and hand the corners over to be checked as a boundary. */
  finish: () => void;
}

export function useBoundarySketch(onFinish: (vertices: LonLatPoint[]) => void): BoundarySketch {
  const [drawing, setDrawing] = useState(false);
  const [vertices, setVertices] = useState<LonLatPoint[]>([]);
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
  const addVertex = useCallback((p: LonLatPoint) => setVertices((v) => [...v, p]), []);
  const start = () => {
    setDrawing(true);
    setVertices([]);
  };
  const finish = () => {
    setDrawing(false);
    setVertices([]);
    onFinish(vertices);
  };
  return { drawing, vertices, start, addVertex, finish };
}

/** What a map click (or the keyboard's "inspect centre") does: add a corner while drawing, else select. */
export function usePointPicker(
  sketch: BoundarySketch,
  setSelection: Setter<CellSelection | null>,
  cellAt: (lon: number, lat: number) => number,
): (p: LonLatPoint) => void {
  const { drawing, addVertex } = sketch;
  return useCallback(
    (p: LonLatPoint) => {
      if (drawing) addVertex(p);
      else setSelection({ lon: p[0], lat: p[1], index: cellAt(p[0], p[1]) });
    },
    [drawing, addVertex, setSelection, cellAt],
  );
}

/**
 * Keeps the address bar's query in step with the view, the choices, the boundary and the selection
 * (replaceState: no history entry per change). Returns the map's view-change handler.
 */
export function useLinkSync(
  manifest: Manifest,
  choices: MapChoices,
  view: MapViewRef,
  linkedBoundary: LinkedBoundary | null,
  selection: CellSelection | null,
  compare: { slug: string | null; link: CompareLink } | null = null,
): (center: LonLatPoint, zoom: number) => void {
  const { bandId, units, opacity, filter, sort } = choices;
  const compareSlug = compare?.slug ?? null;
  const compareLink = compare?.link;
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
    const sc = scenarioQuery(manifest, compareSlug, compareLink);
    window.history.replaceState(null, '', `${window.location.pathname}?${q}${sc}`);
  }, [
    view,
    bandId,
    units,
    opacity,
    filter,
    linkedBoundary,
    selection,
    sort,
    manifest,
    compareSlug,
    compareLink,
  ]);
  useEffect(() => writeUrl(), [writeUrl]);
  return useCallback(
    (center: LonLatPoint, zoom: number) => {
      view.current = { center, zoom };
      writeUrl();
    },
    [view, writeUrl],
  );
}
