/**
 * A default name for a new shortlisted site that a planner can recognise: its number, distance and
 * compass direction from the nearest settlement, e.g. "Site 3, 12 km NE of Lanternhook". Distances
 * are great-circle (mean sphere); the direction is the initial bearing from the settlement, rounded
 * to 8 points. The distance is in the unit switch's length unit at the time the site is added
 * (km in SI, miles, 1 mi = 1609.344 m exactly, in North American units); the name is editable text.
 */
import type { FeatureCollection } from 'geojson';
import { greatCircle_m, type LonLat } from '../data/cell-table';

const POINTS = ['N', 'NE', 'E', 'SE', 'S', 'SW', 'W', 'NW'];
/** International mile, m (exact by the 1959 international yard and pound agreement). */
const MILE_M = 1609.344;

/** Initial great-circle bearing from (lon1, lat1) to (lon2, lat2), degrees clockwise from north. */
export function bearing_deg([lon1, lat1]: LonLat, [lon2, lat2]: LonLat): number {
  const d = Math.PI / 180;
  const y = Math.sin((lon2 - lon1) * d) * Math.cos(lat2 * d);
  const x =
    Math.cos(lat1 * d) * Math.sin(lat2 * d) -
    Math.sin(lat1 * d) * Math.cos(lat2 * d) * Math.cos((lon2 - lon1) * d);
  return (((Math.atan2(y, x) / d) % 360) + 360) % 360;
}

export function defaultSiteName(
  lon: number,
  lat: number,
  settlements: FeatureCollection | null,
  ordinal: number,
  units: 'SI' | 'NA' = 'SI',
): string {
  let best: { name: string; lon: number; lat: number; d: number } | null = null;
  for (const f of settlements?.features ?? []) {
    if (f.geometry?.type !== 'Point') continue;
    const [slon, slat] = f.geometry.coordinates;
    const name = f.properties?.name;
    if (typeof name !== 'string') continue;
    const d = greatCircle_m([slon, slat], [lon, lat]);
    if (!best || d < best.d) best = { name, lon: slon, lat: slat, d };
  }
  if (!best) return `Site ${ordinal}`;
  if (best.d < 1000) return `Site ${ordinal}, at ${best.name}`;
  const dir = POINTS[Math.round(bearing_deg([best.lon, best.lat], [lon, lat]) / 45) % 8];
  const distance = units === 'NA' ? `${Math.round(best.d / MILE_M)} mi` : `${Math.round(best.d / 1000)} km`;
  return `Site ${ordinal}, ${distance} ${dir} of ${best.name}`;
}
