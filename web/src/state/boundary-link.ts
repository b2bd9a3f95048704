/**
 * The zonal boundary as it travels in a link: its full rings when they fit in MAX_BOUNDARY_URL_CHARS,
 * otherwise its drawn (simplified) copy, grouped by polygon as the full rings are; `simplified` says
 * which, for the copy-link notice. Worked out in the boundary worker (filters/boundary-job.ts), since
 * encoding a large boundary takes a noticeable time.
 */
import { unflattenPolygons, type FlatRings, type LonLat } from '../geometry/flat-rings';
import { encodeBoundary, MAX_BOUNDARY_URL_CHARS, type UrlBoundary } from './url-state';

export interface LinkedBoundary extends UrlBoundary {
  simplified: boolean;
}

/**
 * `rings`: the full rings; `display`: the drawn copy grouped by polygon. A position encodes to at
 * least two characters, so rings of more than MAX_BOUNDARY_URL_CHARS / 2 positions are not encoded.
 */
export function boundaryForLink(
  name: string,
  rings: FlatRings,
  display: LonLat[][][],
): LinkedBoundary | null {
  if (rings.coords.length <= MAX_BOUNDARY_URL_CHARS) {
    const full = unflattenPolygons(rings);
    if (encodeBoundary(full).length <= MAX_BOUNDARY_URL_CHARS)
      return { name, polygons: full, simplified: false };
  }
  if (encodeBoundary(display).length > MAX_BOUNDARY_URL_CHARS) return null;
  return { name, polygons: display, simplified: true };
}

/** Drawn rings (one per ring of `rings`, in order) grouped by polygon as the full rings are. */
export function groupByPolygon(drawn: LonLat[][], ringPolygon: Uint32Array): LonLat[][][] {
  const polygons: LonLat[][][] = [];
  if (drawn.length === ringPolygon.length)
    drawn.forEach((ring, r) => (polygons[ringPolygon[r]] ??= []).push(ring));
  else drawn.forEach((ring) => polygons.push([ring]));
  return polygons;
}
