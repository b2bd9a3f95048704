/**
 * Polygon rings as flat typed arrays (style.md habit 8: flat arrays with a shape), so that a boundary
 * of a million vertices moves between the page and a worker as a few buffers instead of a million
 * small arrays. Coordinates are lon/lat degrees (WGS 84, RFC 7946 order); every ring is closed (its
 * last position repeats its first).
 */

export interface FlatRings {
  /** x0, y0, x1, y1, ... for all rings one after another (lon, lat in degrees). */
  coords: Float64Array;
  /** Position index where each ring starts, plus one final entry (the total position count). */
  ringStart: Uint32Array;
  /** Polygon each ring belongs to (the first ring of a polygon is its exterior). */
  ringPolygon: Uint32Array;
}

export type LonLat = [number, number];

/** Number of rings. */
export function ringCount(rings: FlatRings): number {
  return rings.ringStart.length - 1;
}

/** Number of polygons (rings are grouped by polygon in order). */
export function polygonCount(rings: FlatRings): number {
  const n = ringCount(rings);
  return n === 0 ? 0 : rings.ringPolygon[n - 1] + 1;
}

/** Flatten polygons given as GeoJSON-style nested arrays (each ring closed). */
export function flattenPolygons(polygons: LonLat[][][]): FlatRings {
  let positions = 0;
  let nRings = 0;
  for (const p of polygons)
    for (const r of p) {
      positions += r.length;
      nRings++;
    }
  const coords = new Float64Array(positions * 2);
  const ringStart = new Uint32Array(nRings + 1);
  const ringPolygon = new Uint32Array(nRings);
  let k = 0;
  let ri = 0;
  polygons.forEach((p, pi) => {
    for (const r of p) {
      ringStart[ri] = k / 2;
      ringPolygon[ri] = pi;
      ri++;
      for (const [x, y] of r) {
        coords[k++] = x;
        coords[k++] = y;
      }
    }
  });
  ringStart[nRings] = positions;
  return { coords, ringStart, ringPolygon };
}

/** The rings back as nested arrays, grouped by polygon (GeoJSON MultiPolygon coordinates). */
export function unflattenPolygons(rings: FlatRings): LonLat[][][] {
  const out: LonLat[][][] = [];
  for (let r = 0; r < ringCount(rings); r++) {
    const ring: LonLat[] = [];
    for (let i = rings.ringStart[r]; i < rings.ringStart[r + 1]; i++)
      ring.push([rings.coords[2 * i], rings.coords[2 * i + 1]]);
    const p = rings.ringPolygon[r];
    (out[p] ??= []).push(ring);
  }
  return out;
}

/**
 * Twice the signed planar area of ring `r` in lon/lat degrees (shoelace formula): positive when the
 * ring runs counter-clockwise (the RFC 7946 section 3.1.6 orientation of an exterior ring).
 */
export function ringSignedArea2(rings: FlatRings, r: number): number {
  const { coords } = rings;
  const s = rings.ringStart[r];
  const e = rings.ringStart[r + 1];
  let sum = 0;
  // Relative to the first position, to keep the products small (same area, less rounding).
  const x0 = coords[2 * s];
  const y0 = coords[2 * s + 1];
  for (let i = s; i < e - 1; i++) {
    const ax = coords[2 * i] - x0;
    const ay = coords[2 * i + 1] - y0;
    const bx = coords[2 * i + 2] - x0;
    const by = coords[2 * i + 3] - y0;
    sum += ax * by - bx * ay;
  }
  return sum;
}

/** Reverse ring `r` in place (keeps it closed). */
export function reverseRing(rings: FlatRings, r: number): void {
  const { coords } = rings;
  let i = rings.ringStart[r];
  let j = rings.ringStart[r + 1] - 1;
  while (i < j) {
    const x = coords[2 * i];
    const y = coords[2 * i + 1];
    coords[2 * i] = coords[2 * j];
    coords[2 * i + 1] = coords[2 * j + 1];
    coords[2 * j] = x;
    coords[2 * j + 1] = y;
    i++;
    j--;
  }
}

/** Bounding box [west, south, east, north] of all rings. */
export function ringsBounds(rings: FlatRings): [number, number, number, number] {
  let w = Infinity;
  let s = Infinity;
  let e = -Infinity;
  let n = -Infinity;
  const { coords } = rings;
  for (let i = 0; i < coords.length; i += 2) {
    const x = coords[i];
    const y = coords[i + 1];
    if (x < w) w = x;
    if (x > e) e = x;
    if (y < s) s = y;
    if (y > n) n = y;
  }
  return [w, s, e, n];
}
