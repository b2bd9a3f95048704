/**
 * Zonal summary of the live filter: matching cells and their area, for the whole region or inside a
 * boundary polygon. Areas are summed over analysis-grid cells (each cell's ground area, see
 * cell-table.ts), never measured in Web Mercator; the boundary's own area is the spherical (geodesic)
 * area from turf (@turf/area, WGS 84 mean radius 6371008.8 m). A cell belongs to the boundary when its
 * centre lies inside it (geometry/polygon-strip-index.ts). For a large boundary both run in the
 * boundary worker (boundary-job.ts), off the page's main thread.
 */
import { area } from '@turf/area';
import type { CellTable } from '../data/cell-table';
import { unflattenPolygons, type FlatRings } from '../geometry/flat-rings';
import { buildStripIndex, maskPointsInPolygons } from '../geometry/polygon-strip-index';
import { passesAt, type CompiledFilter } from './cell-filter';

export interface ZonalSummary {
  screenedCells: number;
  screenedArea_km2: number;
  matchingCells: number;
  matchingArea_km2: number;
}

/** 1 for cells whose centre lies inside the boundary, else 0 (strip-indexed crossing-number test). */
export function boundaryMask(table: Pick<CellTable, 'lon' | 'lat'>, rings: FlatRings): Uint8Array {
  return maskPointsInPolygons(buildStripIndex(rings), table.lon, table.lat);
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

/** Geodesic area of the boundary itself (all its polygons, holes taken out), km². */
export function boundaryArea_km2(rings: FlatRings): number {
  return (
    area({
      type: 'Feature',
      properties: {},
      geometry: { type: 'MultiPolygon', coordinates: unflattenPolygons(rings) },
    }) / 1e6
  );
}
