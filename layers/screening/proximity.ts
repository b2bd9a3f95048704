/**
 * Distance from a place to the nearest of a set of points and line segments (settlements, roads), for
 * the proximity bands and the radius filters.
 *
 * Method: point to point by the haversine formula on a sphere of the mean Earth radius
 * R1 = 6371.0088 km (IUGG mean radius, Moritz 2000, "Geodetic Reference System 1980", Bull. Géod.
 * 74); against the ellipsoid the error is below 0.5 % (the sphere's usual bound). Point to segment:
 * the foot of the perpendicular is found in a local equirectangular plane about the place
 * (x = Δlon·cos(lat), y = Δlat), clamped to the segment, and the distance to that foot is taken by
 * haversine; for segments of a few tens of km (road vertices) the foot's error is far below a cell.
 * Special cases: no features gives Infinity; a place on a feature gives 0.
 */

export type LonLat = readonly [number, number];

/** IUGG mean Earth radius R1, km (Moritz 2000). */
export const EARTH_MEAN_RADIUS_km = 6371.0088;

const RAD = Math.PI / 180;

/** Great-circle distance between two lon/lat points (degrees), km, by the haversine formula. */
export function haversine_km(a: LonLat, b: LonLat): number {
  const dLat = (b[1] - a[1]) * RAD;
  const dLon = (b[0] - a[0]) * RAD;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a[1] * RAD) * Math.cos(b[1] * RAD) * Math.sin(dLon / 2) ** 2;
  return 2 * EARTH_MEAN_RADIUS_km * Math.asin(Math.min(1, Math.sqrt(h)));
}

export interface ProximityFeatures {
  points: LonLat[];
  segments: [LonLat, LonLat][];
}

/** Distance from `p` to segment a-b, km (see the module comment). */
export function segmentDistance_km(p: LonLat, a: LonLat, b: LonLat): number {
  const k = Math.cos(p[1] * RAD);
  const wrap = (d: number) => (d > 180 ? d - 360 : d < -180 ? d + 360 : d);
  const ax = wrap(a[0] - p[0]) * k;
  const ay = a[1] - p[1];
  const bx = wrap(b[0] - p[0]) * k;
  const by = b[1] - p[1];
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  const t = len2 > 0 ? Math.max(0, Math.min(1, -(ax * dx + ay * dy) / len2)) : 0;
  const foot: LonLat = [a[0] + t * wrap(b[0] - a[0]), a[1] + t * (b[1] - a[1])];
  return haversine_km(p, foot);
}

/** Distance from `p` to the nearest feature, km (Infinity when there is none). */
export function nearestDistance_km(p: LonLat, features: ProximityFeatures): number {
  let best = Infinity;
  for (const q of features.points) best = Math.min(best, haversine_km(p, q));
  for (const [a, b] of features.segments) best = Math.min(best, segmentDistance_km(p, a, b));
  return best;
}

/** Points and segments of GeoJSON geometries (Point, MultiPoint, LineString, MultiLineString; polygon outlines). */
export function proximityFeatures(
  geometries: readonly { type: string; coordinates?: unknown }[],
): ProximityFeatures {
  const out: ProximityFeatures = { points: [], segments: [] };
  const line = (cs: number[][]) => {
    if (cs.length === 1) out.points.push([cs[0][0], cs[0][1]]);
    for (let i = 1; i < cs.length; i++)
      out.segments.push([
        [cs[i - 1][0], cs[i - 1][1]],
        [cs[i][0], cs[i][1]],
      ]);
  };
  for (const g of geometries) {
    const c = g.coordinates;
    if (g.type === 'Point') out.points.push([(c as number[])[0], (c as number[])[1]]);
    else if (g.type === 'MultiPoint') for (const p of c as number[][]) out.points.push([p[0], p[1]]);
    else if (g.type === 'LineString') line(c as number[][]);
    else if (g.type === 'MultiLineString' || g.type === 'Polygon') for (const l of c as number[][][]) line(l);
    else if (g.type === 'MultiPolygon') for (const poly of c as number[][][][]) for (const l of poly) line(l);
  }
  return out;
}

/** A circle of `radius_km` about `centre` as a closed ring of `n` vertices (lon/lat), by the direct geodesic on the sphere. */
export function circleRing(centre: LonLat, radius_km: number, n = 72): [number, number][] {
  const d = radius_km / EARTH_MEAN_RADIUS_km;
  const lat1 = centre[1] * RAD;
  const lon1 = centre[0] * RAD;
  const ring: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    const az = (2 * Math.PI * i) / n;
    const lat2 = Math.asin(Math.sin(lat1) * Math.cos(d) + Math.cos(lat1) * Math.sin(d) * Math.cos(az));
    const lon2 =
      lon1 +
      Math.atan2(Math.sin(az) * Math.sin(d) * Math.cos(lat1), Math.cos(d) - Math.sin(lat1) * Math.sin(lat2));
    ring.push([+(lon2 / RAD).toFixed(6), +(lat2 / RAD).toFixed(6)]);
  }
  // Counter-clockwise (RFC 7946 exterior): azimuth runs clockwise, so reverse.
  ring.reverse();
  ring.push(ring[0]);
  return ring;
}
