/**
 * The zonal boundary as it travels in a link: its full rings when they fit in MAX_BOUNDARY_URL_CHARS,
 * otherwise its drawn (simplified) copy, grouped by polygon as the full rings are; `simplified` says
 * which, for the copy-link notice.
 */
import type { LoadedBoundary } from '../filters/boundary-job';
import { unflattenPolygons, type LonLat } from '../geometry/flat-rings';
import { encodeBoundary, MAX_BOUNDARY_URL_CHARS, type UrlBoundary } from './url-state';

export interface LinkedBoundary extends UrlBoundary {
  simplified: boolean;
}

export function boundaryForLink(b: LoadedBoundary): LinkedBoundary | null {
  const full = unflattenPolygons(b.rings);
  if (encodeBoundary(full).length <= MAX_BOUNDARY_URL_CHARS)
    return { name: b.name, polygons: full, simplified: false };
  // The drawn copy keeps the rings in order; simplifyRings keeps every ring (at least its corners).
  const polygons: LonLat[][][] = [];
  if (b.display.length === b.rings.ringPolygon.length)
    b.display.forEach((ring, r) => (polygons[b.rings.ringPolygon[r]] ??= []).push(ring));
  else b.display.forEach((ring) => polygons.push([ring]));
  if (encodeBoundary(polygons).length > MAX_BOUNDARY_URL_CHARS) return null;
  return { name: b.name, polygons, simplified: true };
}
