/**
 * The analysis grid every build resamples onto: square cells of `cellSize_m` in EPSG:3413 (polar
 * stereographic, true scale at 70°N; cells are not equal-area, so areas are computed on the ellipsoid
 * or from the scale factor, never in Web Mercator). Its extent is the intersection of the data
 * footprints (valid, non-nodata pixels) of the required input grids, snapped outward to the cell size.
 */
import type { GridHeader } from '../read/read-geotiff-grid';
import { ANALYSIS_CRS, CRS_DEFINITIONS, createTransform } from '../crs/crs-definitions';
import { InputError } from '../input-error';

export interface AnalysisGrid {
  crs: string;
  proj4: string;
  width: number;
  height: number;
  cellSize_m: number;
  /** GDAL-style transform; row 0 is the north (max y) edge. */
  geoTransform: [number, number, number, number, number, number];
}

export type Box = [number, number, number, number];

/**
 * Footprint of a grid's valid pixels in `targetCrs`: [minX, minY, maxX, maxY], or null if all nodata.
 * `box` is the bounding box of the valid pixels [col0, row0, col1, row1) (load-inputs.ts finds it).
 */
export function dataFootprint(grid: GridHeader, box: Box | null, targetCrs: string): Box | null {
  if (!box) return null;
  const toTarget = createTransform(grid.crs, targetCrs);
  const gt = grid.geoTransform;
  const [c0, r0, c1, r1] = box;
  const out: Box = [Infinity, Infinity, -Infinity, -Infinity];
  const steps = 64;
  const add = (c: number, r: number) => {
    const [x, y] = toTarget(gt[0] + c * gt[1] + r * gt[2], gt[3] + c * gt[4] + r * gt[5]);
    if (!Number.isFinite(x) || !Number.isFinite(y)) return;
    out[0] = Math.min(out[0], x);
    out[1] = Math.min(out[1], y);
    out[2] = Math.max(out[2], x);
    out[3] = Math.max(out[3], y);
  };
  for (let i = 0; i <= steps; i++) {
    const t = i / steps;
    add(c0 + t * (c1 - c0), r0);
    add(c0 + t * (c1 - c0), r1);
    add(c0, r0 + t * (r1 - r0));
    add(c1, r0 + t * (r1 - r0));
  }
  return out;
}

/** Analysis grid covering the intersection of the given grids' data footprints. */
export function analysisGridFor(
  sources: { label: string; grid: GridHeader; validBox: Box | null }[],
  cellSize_m: number,
): AnalysisGrid {
  if (!(cellSize_m >= 10 && cellSize_m <= 100_000)) {
    throw new RangeError(`cellSize_m must be in [10, 100000] m, got ${cellSize_m}`);
  }
  let box: Box | null = null;
  const seen: string[] = [];
  for (const { label, grid, validBox } of sources) {
    const fp = dataFootprint(grid, validBox, ANALYSIS_CRS);
    if (!fp) throw new InputError(`${label}: grid holds no data (every pixel is nodata)`);
    const next: Box = box
      ? [Math.max(box[0], fp[0]), Math.max(box[1], fp[1]), Math.min(box[2], fp[2]), Math.min(box[3], fp[3])]
      : fp;
    if (next[0] >= next[2] || next[1] >= next[3]) {
      throw new InputError(`${label}: grids do not overlap (no common area with ${seen.join(', ')})`);
    }
    box = next;
    seen.push(label);
  }
  if (!box) throw new InputError('no input grids');
  const west = Math.floor(box[0] / cellSize_m) * cellSize_m;
  const north = Math.ceil(box[3] / cellSize_m) * cellSize_m;
  const east = Math.ceil(box[2] / cellSize_m) * cellSize_m;
  const south = Math.floor(box[1] / cellSize_m) * cellSize_m;
  return {
    crs: ANALYSIS_CRS,
    proj4: CRS_DEFINITIONS[ANALYSIS_CRS],
    width: Math.round((east - west) / cellSize_m),
    height: Math.round((north - south) / cellSize_m),
    cellSize_m,
    geoTransform: [west, cellSize_m, 0, north, 0, -cellSize_m],
  };
}
