/**
 * Reading a boundary for the zonal summary: a GeoJSON Polygon or MultiPolygon (bare geometry, a
 * Feature or a FeatureCollection; all polygons of a collection are merged into one MultiPolygon),
 * in WGS 84 lon/lat (RFC 7946). Also builds the boundary from vertices drawn on the map.
 *
 * Checks, each reported with its path in the file:
 * - a `crs` member (GeoJSON 2008; removed by RFC 7946, section 4) must name OGC CRS84 (WGS 84
 *   lon/lat); any other is refused, since reading projected metres or lat/lon order as lon/lat would
 *   put the boundary in the wrong place;
 * - every position has finite numbers, longitude -180..180, latitude -90..90;
 * - every ring has at least four positions and is closed (RFC 7946 section 3.1.6: the first and last
 *   positions are equivalent); repeated consecutive positions are dropped;
 * - no ring crosses or touches itself and no two rings of a polygon cross (geometry/ring-crossings);
 * - rings that run the wrong way (RFC 7946: exterior counter-clockwise, holes clockwise) are rewound
 *   and a note says so: the standard says parsers should not refuse them.
 */
import { z } from 'zod';
import {
  flattenPolygons,
  reverseRing,
  ringCount,
  ringSignedArea2,
  type FlatRings,
  type LonLat,
} from '../geometry/flat-rings';
import { findRingCrossing, type RingCrossing } from '../geometry/ring-crossings';

/** A checked boundary: its rings, how many vertices it has, and notes on what was changed. */
export interface CheckedBoundary {
  rings: FlatRings;
  polygons: number;
  vertices: number;
  notes: string[];
}

export interface BoundaryParse {
  boundary: CheckedBoundary | null;
  problems: string[];
}

/** Names of OGC CRS84 (WGS 84 longitude, latitude) as GeoJSON 2008 files write them. */
const CRS84_NAMES = new Set([
  'urn:ogc:def:crs:ogc:1.3:crs84',
  'urn:ogc:def:crs:ogc::crs84',
  'ogc:crs84',
  'crs84',
]);
/** Most problems listed; the rest are counted. */
const MAX_LISTED = 8;

const crsMember = z.object({
  type: z.string(),
  properties: z.record(z.string(), z.unknown()).optional(),
});
const geometry = z.object({
  type: z.enum(['Polygon', 'MultiPolygon']),
  coordinates: z.array(z.unknown()).min(1),
  crs: z.unknown().optional(),
});
const feature = z.object({
  type: z.literal('Feature'),
  geometry: z.unknown(),
  properties: z.unknown().optional(),
  crs: z.unknown().optional(),
});
const collection = z.object({
  type: z.literal('FeatureCollection'),
  features: z.array(feature),
  crs: z.unknown().optional(),
});

class Problems {
  list: string[] = [];
  more = 0;
  add(text: string): void {
    if (this.list.length < MAX_LISTED) this.list.push(text);
    else this.more++;
  }
  get count(): number {
    return this.list.length + this.more;
  }
  result(): string[] {
    return this.more > 0 ? [...this.list, `… and ${this.more} more problem(s)`] : this.list;
  }
}

function checkCrs(crs: unknown, path: string, problems: Problems): void {
  if (crs === undefined || crs === null) return;
  const parsed = crsMember.safeParse(crs);
  if (!parsed.success) {
    problems.add(`${path}: a crs member must be {"type": "name", "properties": {"name": …}}`);
    return;
  }
  const name = parsed.data.properties?.name;
  if (parsed.data.type === 'name' && typeof name === 'string' && CRS84_NAMES.has(name.trim().toLowerCase()))
    return;
  const shown =
    typeof name === 'string' ? `"${name.slice(0, 80)}"` : `of type "${parsed.data.type.slice(0, 40)}"`;
  problems.add(
    `${path}: coordinate reference system ${shown} is not supported; boundaries must be WGS 84 ` +
      'longitude/latitude (OGC CRS84, as RFC 7946 GeoJSON requires): export the file again in WGS 84',
  );
}

function fmt(v: unknown): string {
  return typeof v === 'number' ? String(v) : (JSON.stringify(v)?.slice(0, 40) ?? String(v));
}

/** One ring: positions checked, consecutive repeats dropped; null when it cannot be used. */
function readRing(raw: unknown, path: string, problems: Problems): LonLat[] | null {
  if (!Array.isArray(raw)) {
    problems.add(`${path}: a ring must be an array of positions`);
    return null;
  }
  const before = problems.count;
  const ring: LonLat[] = [];
  for (let i = 0; i < raw.length; i++) {
    const p: unknown = raw[i];
    if (!Array.isArray(p) || p.length < 2) {
      problems.add(`${path}.${i}: a position must be [longitude, latitude]`);
      continue;
    }
    const [x, y] = p as unknown[];
    if (typeof x !== 'number' || !Number.isFinite(x) || x < -180 || x > 180) {
      problems.add(`${path}.${i}.0: longitude must be a finite number in -180..180, got ${fmt(x)}`);
      continue;
    }
    if (typeof y !== 'number' || !Number.isFinite(y) || y < -90 || y > 90) {
      problems.add(`${path}.${i}.1: latitude must be a finite number in -90..90, got ${fmt(y)}`);
      continue;
    }
    const last = ring[ring.length - 1];
    if (!last || last[0] !== x || last[1] !== y) ring.push([x, y]);
  }
  if (problems.count > before) return null;
  if (raw.length < 4) {
    problems.add(`${path}: a ring needs at least 4 positions (a closed triangle), got ${raw.length}`);
    return null;
  }
  const first = raw[0] as number[];
  const lastRaw = raw[raw.length - 1] as number[];
  if (first[0] !== lastRaw[0] || first[1] !== lastRaw[1]) {
    problems.add(
      `${path}: the ring is not closed: its last position [${lastRaw[0]}, ${lastRaw[1]}] must repeat ` +
        `its first [${first[0]}, ${first[1]}] (RFC 7946 section 3.1.6)`,
    );
    return null;
  }
  if (ring.length < 4) {
    problems.add(`${path}: the ring has fewer than 3 distinct corners`);
    return null;
  }
  return ring;
}

function readPolygon(raw: unknown, path: string, problems: Problems): LonLat[][] | null {
  if (!Array.isArray(raw) || raw.length === 0) {
    problems.add(`${path}: a polygon must be a non-empty array of rings`);
    return null;
  }
  const rings = raw.map((r, i) => readRing(r, `${path}.${i}`, problems));
  return rings.every((r) => r !== null) ? (rings as LonLat[][]) : null;
}

/** Polygons found in a file, each with its path (for messages). */
interface Found {
  polys: LonLat[][][];
  paths: string[];
}

/** One Polygon or MultiPolygon geometry at `path`; `isRoot`: its crs is the root's (checked once). */
function takeGeometry(g: unknown, path: string, isRoot: boolean, found: Found, problems: Problems): void {
  const r = geometry.safeParse(g);
  if (!r.success) {
    for (const i of r.error.issues)
      problems.add(`${path}${i.path.length ? '.' + i.path.join('.') : ''}: ${i.message}`);
    return;
  }
  if (!isRoot) checkCrs(r.data.crs, `${path}.crs`, problems);
  const coordsPath = `${path}.coordinates`;
  const polygons: [unknown, string][] =
    r.data.type === 'Polygon'
      ? [[r.data.coordinates, coordsPath]]
      : r.data.coordinates.map((raw, i) => [raw, `${coordsPath}.${i}`]);
  for (const [raw, at] of polygons) {
    const p = readPolygon(raw, at, problems);
    if (p) {
      found.polys.push(p);
      found.paths.push(at);
    }
  }
}

/** Every polygon of a bare geometry, a Feature or a FeatureCollection, crs members checked. */
function collectPolygons(json: unknown, problems: Problems): Found {
  const found: Found = { polys: [], paths: [] };
  const root = json as { crs?: unknown } | null;
  if (root && typeof root === 'object') checkCrs(root.crs, 'crs', problems);
  const asCollection = collection.safeParse(json);
  if (asCollection.success) {
    asCollection.data.features.forEach((f, i) => {
      checkCrs(f.crs, `features.${i}.crs`, problems);
      const t = (f.geometry as { type?: string } | null)?.type;
      if (t === 'Polygon' || t === 'MultiPolygon')
        takeGeometry(f.geometry, `features.${i}.geometry`, false, found, problems);
    });
    if (found.polys.length === 0 && problems.count === 0)
      problems.add('features: no Polygon or MultiPolygon found');
    return found;
  }
  const asFeature = feature.safeParse(json);
  if (asFeature.success) {
    checkCrs(asFeature.data.crs, 'crs', problems);
    takeGeometry(asFeature.data.geometry, 'geometry', false, found, problems);
  } else takeGeometry(json, '(root)', true, found, problems);
  return found;
}

/** The message for a crossing found in `rings` (flattened from polygons at `paths`). */
function crossingProblem(rings: FlatRings, paths: string[], c: RingCrossing): string {
  const ringPath = (r: number) => {
    const p = rings.ringPolygon[r];
    let first = r;
    while (first > 0 && rings.ringPolygon[first - 1] === p) first--;
    return `${paths[p]}.${r - first}`;
  };
  const where = `near lon ${c.lon.toFixed(5)}, lat ${c.lat.toFixed(5)}`;
  const what =
    c.kind === 'overlap'
      ? 'runs back along itself'
      : c.kind === 'touch'
        ? 'touches itself'
        : 'crosses itself';
  return c.ringA === c.ringB
    ? `${ringPath(c.ringA)}: the ring ${what} ${where} (edges ${c.edgeA} and ${c.edgeB}); a boundary must be a simple polygon`
    : `${ringPath(c.ringA)} and ${ringPath(c.ringB)}: the rings cross ${where}; holes must lie inside their polygon without crossing it`;
}

/** Rewind rings to RFC 7946 orientation (exterior counter-clockwise, holes clockwise); how many. */
function rewindRings(rings: FlatRings): number {
  let rewound = 0;
  for (let r = 0; r < ringCount(rings); r++) {
    const exterior = r === 0 || rings.ringPolygon[r - 1] !== rings.ringPolygon[r];
    const a2 = ringSignedArea2(rings, r);
    if ((exterior && a2 < 0) || (!exterior && a2 > 0)) {
      reverseRing(rings, r);
      rewound++;
    }
  }
  return rewound;
}

/** Read, check and normalise a boundary (see the module comment). */
export function parseBoundary(json: unknown): BoundaryParse {
  const problems = new Problems();
  const { polys, paths } = collectPolygons(json, problems);
  if (problems.count > 0 || polys.length === 0) return { boundary: null, problems: problems.result() };
  const rings = flattenPolygons(polys);
  const search = findRingCrossing(rings);
  if (search.crossing) {
    problems.add(crossingProblem(rings, paths, search.crossing));
    return { boundary: null, problems: problems.result() };
  }
  const notes: string[] = [];
  if (!search.complete) notes.push('the boundary is too intricate to be fully checked for self-crossings');
  const rewound = rewindRings(rings);
  if (rewound > 0)
    notes.push(
      `${rewound} ring(s) rewound to the RFC 7946 orientation (exterior counter-clockwise, holes clockwise)`,
    );
  return {
    boundary: { rings, polygons: polys.length, vertices: rings.coords.length / 2 - ringCount(rings), notes },
    problems: [],
  };
}

/** The GeoJSON Polygon of vertices drawn on the map (closed here), or null for fewer than three. */
export function polygonFromVertices(vertices: LonLat[]): { type: 'Polygon'; coordinates: LonLat[][] } | null {
  if (vertices.length < 3) return null;
  return { type: 'Polygon', coordinates: [[...vertices, vertices[0]]] };
}
