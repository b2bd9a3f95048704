/**
 * Point-in-polygon for many points against a polygon of up to millions of vertices.
 *
 * Method: the crossing-number (even-odd) test: a point is inside a polygon when a ray from it towards
 * +x crosses the polygon's rings an odd number of times; an edge counts when one end lies on or below
 * the point and the other above (half-open in y), which counts each vertex once (W. R. Franklin,
 * PNPOLY; E. Haines, "Point in Polygon Strategies", Graphics Gems IV, 1994). Holes need no special
 * case under the even-odd rule. To avoid testing every edge, the edges are binned into horizontal
 * strips of equal height (the "bins" acceleration described by Haines, recalled from memory): a point
 * tests only the edges of its strip. The strip count is about one per four edges, lowered when long
 * edges would be binned into too many strips (at most eight strip entries per edge on average), so
 * memory stays linear. The polygons of a MultiPolygon are tested one by one and a point inside any
 * of them is inside (a union, so overlapping parts do not cancel). A point exactly on an edge may
 * fall either side; cell centres on a boundary line are measure-zero and do not matter here.
 */
import { ringCount, type FlatRings } from './flat-rings';

export interface PolygonStripIndex {
  west: number;
  south: number;
  east: number;
  north: number;
  strips: number;
  stripHeight: number;
  /** CSR layout: edges of strip k are entries[stripStart[k] .. stripStart[k + 1]), in polygon order. */
  stripStart: Uint32Array;
  entries: Uint32Array;
  /** Edge end points and polygon. */
  x1: Float64Array;
  y1: Float64Array;
  x2: Float64Array;
  y2: Float64Array;
  polygon: Uint32Array;
}

const ENTRIES_PER_EDGE = 8;
const MAX_STRIPS = 1 << 18;

/** Build the strip index of all rings (horizontal edges are left out: they never count). */
export function buildStripIndex(rings: FlatRings): PolygonStripIndex {
  const { coords, ringStart, ringPolygon } = rings;
  let m = 0;
  for (let r = 0; r < ringCount(rings); r++)
    for (let i = ringStart[r]; i < ringStart[r + 1] - 1; i++)
      if (coords[2 * i + 1] !== coords[2 * i + 3]) m++;
  const x1 = new Float64Array(m);
  const y1 = new Float64Array(m);
  const x2 = new Float64Array(m);
  const y2 = new Float64Array(m);
  const polygon = new Uint32Array(m);
  let west = Infinity;
  let south = Infinity;
  let east = -Infinity;
  let north = -Infinity;
  let sumDy = 0;
  let k = 0;
  for (let r = 0; r < ringCount(rings); r++)
    for (let i = ringStart[r]; i < ringStart[r + 1] - 1; i++) {
      const ay = coords[2 * i + 1];
      const by = coords[2 * i + 3];
      if (ay === by) continue;
      x1[k] = coords[2 * i];
      y1[k] = ay;
      x2[k] = coords[2 * i + 2];
      y2[k] = by;
      polygon[k] = ringPolygon[r];
      west = Math.min(west, x1[k], x2[k]);
      east = Math.max(east, x1[k], x2[k]);
      south = Math.min(south, ay, by);
      north = Math.max(north, ay, by);
      sumDy += Math.abs(by - ay);
      k++;
    }
  const height = Math.max(north - south, 1e-12);
  // entries ≈ m + strips * sumDy / height; keep that under ENTRIES_PER_EDGE * m.
  let strips = Math.max(1, Math.ceil(m / 4));
  if (sumDy > 0) strips = Math.min(strips, Math.floor(((ENTRIES_PER_EDGE - 1) * m * height) / sumDy));
  strips = Math.max(1, Math.min(strips, MAX_STRIPS));
  const stripHeight = height / strips;
  const stripOf = (y: number) => Math.max(0, Math.min(strips - 1, Math.floor((y - south) / stripHeight)));
  const stripStart = new Uint32Array(strips + 1);
  for (let j = 0; j < m; j++) {
    const a = stripOf(Math.min(y1[j], y2[j]));
    const b = stripOf(Math.max(y1[j], y2[j]));
    for (let t = a; t <= b; t++) stripStart[t + 1]++;
  }
  for (let t = 0; t < strips; t++) stripStart[t + 1] += stripStart[t];
  const fill = stripStart.slice(0, strips);
  const entries = new Uint32Array(stripStart[strips]);
  for (let j = 0; j < m; j++) {
    const a = stripOf(Math.min(y1[j], y2[j]));
    const b = stripOf(Math.max(y1[j], y2[j]));
    for (let t = a; t <= b; t++) entries[fill[t]++] = j;
  }
  return { west, south, east, north, strips, stripHeight, stripStart, entries, x1, y1, x2, y2, polygon };
}

/** Whether (x, y) lies inside the indexed polygons (see the module comment for points on an edge). */
export function pointInStripIndex(idx: PolygonStripIndex, x: number, y: number): boolean {
  if (!(x >= idx.west && x <= idx.east && y >= idx.south && y < idx.north)) return false;
  const t = Math.min(idx.strips - 1, Math.floor((y - idx.south) / idx.stripHeight));
  const { entries, x1, y1, x2, y2, polygon } = idx;
  let current = -1;
  let odd = false;
  for (let a = idx.stripStart[t]; a < idx.stripStart[t + 1]; a++) {
    const j = entries[a];
    if (polygon[j] !== current) {
      if (odd) return true;
      current = polygon[j];
      odd = false;
    }
    const ay = y1[j];
    const by = y2[j];
    if (ay <= y !== by <= y) {
      const xCross = x1[j] + ((y - ay) * (x2[j] - x1[j])) / (by - ay);
      if (x < xCross) odd = !odd;
    }
  }
  return odd;
}

/** 1 where point i (lon[i], lat[i]) lies inside the polygons, else 0. */
export function maskPointsInPolygons(
  idx: PolygonStripIndex,
  lon: ArrayLike<number>,
  lat: ArrayLike<number>,
): Uint8Array {
  const n = lon.length;
  const mask = new Uint8Array(n);
  for (let i = 0; i < n; i++) if (pointInStripIndex(idx, lon[i], lat[i])) mask[i] = 1;
  return mask;
}
