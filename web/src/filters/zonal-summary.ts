/**
 * Zonal summary of the live filter: matching cells and their area, for the whole region or inside a
 * boundary polygon. Areas are summed over analysis-grid cells (each cell's ground area, see
 * cell-table.ts), never measured in Web Mercator; the boundary's own area is the spherical (geodesic) area from turf (@turf/area, WGS 84
 * mean radius 6371008.8 m). A cell belongs to the boundary when its centre lies inside it.
 */
import booleanPointInPolygon from '@turf/boolean-point-in-polygon';
import { area } from '@turf/area';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import type { CellTable } from '../data/cell-table';
import { passesAt, type CompiledFilter } from './cell-filter';

export interface ZonalSummary {
  screenedCells: number;
  screenedArea_km2: number;
  matchingCells: number;
  matchingArea_km2: number;
}

export type Boundary = Feature<Polygon | MultiPolygon>;

/** 1 for cells whose centre lies inside the boundary, else 0 (bbox pre-test, then turf). */
export function boundaryMask(table: CellTable, boundary: Boundary): Uint8Array {
  const mask = new Uint8Array(table.count);
  let w = Infinity;
  let s = Infinity;
  let e = -Infinity;
  let n = -Infinity;
  const rings =
    boundary.geometry.type === 'Polygon' ? [boundary.geometry.coordinates] : boundary.geometry.coordinates;
  for (const poly of rings)
    for (const [x, y] of poly[0]) {
      w = Math.min(w, x);
      e = Math.max(e, x);
      s = Math.min(s, y);
      n = Math.max(n, y);
    }
  for (let i = 0; i < table.count; i++) {
    const x = table.lon[i];
    const y = table.lat[i];
    if (x < w || x > e || y < s || y > n) continue;
    if (booleanPointInPolygon([x, y], boundary)) mask[i] = 1;
  }
  return mask;
}

/** Count screened and matching cells (optionally only where mask[i] = 1). */
export function summarise(table: CellTable, filter: CompiledFilter, mask?: Uint8Array): ZonalSummary {
  let screened = 0;
  let matching = 0;
  let screenedArea = 0;
  let matchingArea = 0;
  for (let i = 0; i < table.count; i++) {
    if (mask && mask[i] === 0) continue;
    screened++;
    screenedArea += table.area_m2[i];
    if (!filter.active || passesAt(filter, table.planes, i)) {
      matching++;
      matchingArea += table.area_m2[i];
    }
  }
  return {
    screenedCells: screened,
    screenedArea_km2: screenedArea / 1e6,
    matchingCells: matching,
    matchingArea_km2: matchingArea / 1e6,
  };
}

/** Geodesic area of the boundary itself, km². */
export function boundaryArea_km2(boundary: Boundary): number {
  return area(boundary) / 1e6;
}
