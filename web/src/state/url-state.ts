/**
 * What is on screen, in the page URL (query string), so that a view can be bookmarked and shared: the
 * map view, the layer, the unit system, the opacity, the filters, the zonal boundary (drawn or
 * imported), the selected place and the shortlist's sort. Each part is read on its own: a part that
 * cannot be used is named in plain words (for a visible notice) and left at its default, and the
 * other parts are kept.
 *
 * Format: ?c=<lon>,<lat>&z=<zoom>&layer=<bandId>&units=SI|NA&opacity=<0..1>
 *         &f=<bandId>:<min>:<max>;...   (SI values, either bound may be empty)
 *         &x=<bandId>:<class>,<class>;... (excluded classes)
 *         &b=<ring>,<ring>;<polygon>...&bn=<name>  (boundary: polygons of rings, each ring an encoded
 *                                         polyline of lat/lon at 1e-5 degrees, see polyline-code.ts)
 *         &sel=<lon>,<lat>                (the selected place)
 *         &sort=<key>:asc|desc            (shortlist sort: addedAt, name or band:<bandId>)
 */
import type { FilterSpec } from '../filters/cell-filter';
import type { UnitSystem } from '../units/display-units';
import { decodeRing, encodeRing } from './polyline-code';

export type LonLat = [number, number];

export interface ShortlistSort {
  key: string;
  direction: 'asc' | 'desc';
}

export interface UrlBoundary {
  name: string;
  /** Polygons, each a list of closed rings (outer first), lon/lat degrees. */
  polygons: LonLat[][][];
}

export interface ViewState {
  center: [number, number];
  zoom: number;
  layer: string;
  units: UnitSystem;
  opacity: number;
  filter: FilterSpec;
  boundary: UrlBoundary | null;
  selection: LonLat | null;
  sort: ShortlistSort;
}

export const DEFAULT_SORT: ShortlistSort = { key: 'addedAt', direction: 'asc' };

/** Longest boundary part written into a link, characters (common practice: links up to ~32k work). */
export const MAX_BOUNDARY_URL_CHARS = 24_000;

const NUMBER = /^-?\d+(\.\d+)?(e[-+]?\d+)?$/i;
const BAND_ID = /^[a-zA-Z][a-zA-Z0-9_]*$/;

function quote(v: string): string {
  return `“${v.length > 40 ? `${v.slice(0, 40)}…` : v}”`;
}

function parseNumber(s: string): number | null {
  return NUMBER.test(s) ? Number(s) : null;
}

function parseLonLat(s: string): LonLat | null {
  const parts = s.split(',');
  if (parts.length !== 2) return null;
  const [lon, lat] = parts.map(parseNumber);
  if (lon === null || lat === null || Math.abs(lon) > 180 || Math.abs(lat) > 85) return null;
  return [lon, lat];
}

/** Band ids plus their titles, for messages in the trade's words. */
export interface UrlBands {
  ids: readonly string[];
  title?: (id: string) => string;
}

/** One read of a query string: the parameters, the state being filled, the problems met so far. */
interface UrlRead {
  get(key: string): string | null;
  state: ViewState;
  problems: string[];
  known: ReadonlySet<string>;
  title(id: string): string;
}

/**
 * Parse a query string against the defaults and the known band ids. Returns the state (every part
 * that could be read, defaults for the rest) and one plain-words problem per part that could not.
 */
export function parseUrlState(
  search: string,
  defaults: ViewState,
  bandIds: readonly string[] | UrlBands,
): { state: ViewState; problems: string[] } {
  const bands: UrlBands = Array.isArray(bandIds) ? { ids: bandIds } : (bandIds as UrlBands);
  const params = new URLSearchParams(search);
  const read: UrlRead = {
    get: (k) => params.get(k),
    state: { ...defaults, filter: { ranges: [], excluded: [] } },
    problems: [],
    known: new Set(bands.ids),
    title: (id) => bands.title?.(id) ?? id,
  };
  // In the order of the format above, so that the problems are listed in it too.
  readView(read);
  readDisplay(read);
  readRangeFilters(read);
  readClassFilters(read);
  readBoundary(read);
  readSelection(read);
  readSort(read);
  return { state: read.state, problems: read.problems };
}

/** c (centre) and z (zoom). */
function readView({ get, state, problems }: UrlRead): void {
  const c = get('c');
  if (c !== null) {
    const p = parseLonLat(c);
    if (p) state.center = p;
    else
      problems.push(
        `the map centre ${quote(c)} should be longitude,latitude in degrees (longitude −180 to 180, latitude −85 to 85)`,
      );
  }
  const z = get('z');
  if (z !== null) {
    const v = parseNumber(z);
    if (v !== null && v >= 0 && v <= 22) state.zoom = v;
    else problems.push(`the zoom ${quote(z)} should be a number from 0 to 22`);
  }
}

/** layer, units and opacity. */
function readDisplay({ get, state, problems, known }: UrlRead): void {
  const layer = get('layer');
  if (layer !== null) {
    if (known.has(layer)) state.layer = layer;
    else problems.push(`the layer ${quote(layer)} is not in this map's data`);
  }
  const units = get('units');
  if (units !== null) {
    if (units === 'SI' || units === 'NA') state.units = units;
    else problems.push(`the units ${quote(units)} should be SI or NA (North American)`);
  }
  const opacity = get('opacity');
  if (opacity !== null) {
    const v = parseNumber(opacity);
    if (v !== null && v >= 0 && v <= 1) state.opacity = v;
    else problems.push(`the opacity ${quote(opacity)} should be a number from 0 to 1`);
  }
}

/** f: range filters, each read on its own. */
function readRangeFilters({ get, state, problems, known, title }: UrlRead): void {
  const f = get('f');
  if (!f) return;
  for (const part of f.split(';')) {
    const [id, lo, hi, ...rest] = part.split(':');
    const min = lo === '' || lo === undefined ? undefined : parseNumber(lo);
    const max = hi === '' || hi === undefined ? undefined : parseNumber(hi);
    if (!BAND_ID.test(id ?? '') || rest.length > 0 || min === null || max === null)
      problems.push(`the filter ${quote(part)} should read layer:minimum:maximum with numbers`);
    else if (!known.has(id)) problems.push(`the filter on ${quote(id)} names a layer not in this map's data`);
    else if (min !== undefined && max !== undefined && min > max)
      problems.push(`the filter on ${title(id)} has its minimum ${min} above its maximum ${max}`);
    else state.filter.ranges.push({ bandId: id, min, max });
  }
}

/** x: excluded classes, each band read on its own. */
function readClassFilters({ get, state, problems, known }: UrlRead): void {
  const x = get('x');
  if (!x) return;
  for (const part of x.split(';')) {
    const [id, list, ...rest] = part.split(':');
    const values = (list ?? '').split(',').map(parseNumber);
    if (!BAND_ID.test(id ?? '') || rest.length > 0 || values.some((v) => v === null || !Number.isInteger(v)))
      problems.push(`the class filter ${quote(part)} should read layer:class,class with whole numbers`);
    else if (!known.has(id))
      problems.push(`the class filter on ${quote(id)} names a layer not in this map's data`);
    else state.filter.excluded.push({ bandId: id, values: values as number[] });
  }
}

/** b and bn: the boundary and its name. */
function readBoundary({ get, state, problems }: UrlRead): void {
  const b = get('b');
  if (!b) return;
  const polygons = decodeBoundary(b);
  if (polygons) state.boundary = { name: get('bn') || 'the linked boundary', polygons };
  else
    problems.push(
      'the boundary in the link is damaged (it may have been cut short when the link was copied)',
    );
}

/** sel: the selected place. */
function readSelection({ get, state, problems }: UrlRead): void {
  const sel = get('sel');
  if (sel === null) return;
  const p = parseLonLat(sel);
  if (p) state.selection = p;
  else problems.push(`the selected place ${quote(sel)} should be longitude,latitude in degrees`);
}

/** sort: the shortlist's sort key and direction. */
function readSort({ get, state, problems, known }: UrlRead): void {
  const sort = get('sort');
  if (sort === null) return;
  const i = sort.lastIndexOf(':');
  const key = i < 0 ? sort : sort.slice(0, i);
  const dir = i < 0 ? 'asc' : sort.slice(i + 1);
  const keyOk = key === 'addedAt' || key === 'name' || (key.startsWith('band:') && known.has(key.slice(5)));
  if (keyOk && (dir === 'asc' || dir === 'desc')) state.sort = { key, direction: dir };
  else
    problems.push(
      `the shortlist sort ${quote(sort)} should be date added, name or a layer of this map's data, then ascending or descending`,
    );
}

function decodeBoundary(b: string): LonLat[][][] | null {
  try {
    const polygons = b.split(';').map((p) => p.split(',').map(decodeRing));
    const ok = polygons.every((rings) =>
      rings.every(
        (r) =>
          r.length >= 4 &&
          r.every(([lon, lat]) => Number.isFinite(lon) && Math.abs(lon) <= 180 && Math.abs(lat) <= 90),
      ),
    );
    return ok && polygons.length > 0 ? polygons : null;
  } catch {
    return null;
  }
}

/** The boundary part of a link: polygons of encoded rings. */
export function encodeBoundary(polygons: LonLat[][][]): string {
  return polygons.map((rings) => rings.map(encodeRing).join(',')).join(';');
}

/** Query string for a state (without the leading '?'); compact numbers. */
export function formatUrlState(s: ViewState): string {
  const params = new URLSearchParams();
  params.set('c', `${s.center[0].toFixed(5)},${s.center[1].toFixed(5)}`);
  params.set('z', s.zoom.toFixed(3));
  params.set('layer', s.layer);
  params.set('units', s.units);
  params.set('opacity', String(Math.round(s.opacity * 100) / 100));
  const ranges = s.filter.ranges.filter((r) => r.min !== undefined || r.max !== undefined);
  if (ranges.length > 0)
    params.set('f', ranges.map((r) => `${r.bandId}:${fmt(r.min)}:${fmt(r.max)}`).join(';'));
  const excluded = s.filter.excluded.filter((e) => e.values.length > 0);
  if (excluded.length > 0)
    params.set('x', excluded.map((e) => `${e.bandId}:${e.values.join(',')}`).join(';'));
  if (s.boundary) {
    params.set('b', encodeBoundary(s.boundary.polygons));
    params.set('bn', s.boundary.name);
  }
  if (s.selection) params.set('sel', `${s.selection[0].toFixed(5)},${s.selection[1].toFixed(5)}`);
  if (s.sort.key !== DEFAULT_SORT.key || s.sort.direction !== DEFAULT_SORT.direction)
    params.set('sort', `${s.sort.key}:${s.sort.direction}`);
  return params.toString();
}

function fmt(v: number | undefined): string {
  return v === undefined ? '' : String(Number(v.toPrecision(8)));
}
