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

/** Transforms interleaved x, y pairs from a grid's CRS into the analysis CRS (GDAL, or proj4 for legacy). */
export type BatchTransform = (xy: Float64Array) => Float64Array;

/** A BatchTransform through the hand-written proj4 definitions (the legacy reader's CRSs only). */
export function legacyTransform(fromCrs: string, toCrs: string): BatchTransform {
  const t = createTransform(fromCrs, toCrs);
  return (xy) => {
    const out = new Float64Array(xy.length);
    for (let i = 0; i < xy.length; i += 2) [out[i], out[i + 1]] = t(xy[i], xy[i + 1]);
    return out;
  };
}

/**
 * Footprint of a grid's valid pixels in `targetCrs`: [minX, minY, maxX, maxY], or null if all nodata.
 * `box` is the bounding box of the valid pixels [col0, row0, col1, row1) (load-inputs.ts finds it):
 * its outline, 64 points a side, plus an 8 x 8 lattice inside it (a curved or interrupted projection's
 * extreme need not lie on the outline).
 */
export function dataFootprint(
  grid: GridHeader,
  box: Box | null,
  targetCrs: string,
  transform: BatchTransform = legacyTransform(grid.crs, targetCrs),
): Box | null {
  if (!box) return null;
  const gt = grid.geoTransform;
  const [c0, r0, c1, r1] = box;
  const pts: number[] = [];
  const add = (c: number, r: number) =>
    pts.push(gt[0] + c * gt[1] + r * gt[2], gt[3] + c * gt[4] + r * gt[5]);
  const steps = 64;
  for (let i = 0; i <= steps; i++) {
    const t = i / steps;
    add(c0 + t * (c1 - c0), r0);
    add(c0 + t * (c1 - c0), r1);
    add(c0, r0 + t * (r1 - r0));
    add(c1, r0 + t * (r1 - r0));
  }
  for (let i = 1; i < 8; i++)
    for (let j = 1; j < 8; j++) add(c0 + (i / 8) * (c1 - c0), r0 + (j / 8) * (r1 - r0));
  const xy = transform(Float64Array.from(pts));
  const out: Box = [Infinity, Infinity, -Infinity, -Infinity];
  for (let i = 0; i < xy.length; i += 2) {
    const x = xy[i];
    const y = xy[i + 1];
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
    out[0] = Math.min(out[0], x);
    out[1] = Math.min(out[1], y);
    out[2] = Math.max(out[2], x);
    out[3] = Math.max(out[3], y);
  }
  return out[0] <= out[2] ? out : null;
}

/** Analysis grid covering the intersection of the given grids' data footprints. */
export function analysisGridFor(
  sources: { label: string; grid: GridHeader; validBox: Box | null; toAnalysis?: BatchTransform }[],
  cellSize_m: number,
): AnalysisGrid {
  if (!(cellSize_m >= 10 && cellSize_m <= 100_000)) {
    throw new RangeError(`cellSize_m must be in [10, 100000] m, got ${cellSize_m}`);
  }
  let box: Box | null = null;
  const seen: string[] = [];
  for (const { label, grid, validBox, toAnalysis } of sources) {
    const fp = dataFootprint(grid, validBox, ANALYSIS_CRS, toAnalysis);
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

/** Latitudes of 64 points along each side of the grid's outline (degrees; NaN where off the Earth). */
export function outlineLatitudes(
  grid: AnalysisGrid,
  toLonLat: BatchTransform = legacyTransform(grid.crs, 'EPSG:4326'),
): number[] {
  const [x0, dx, , y0, , dy] = grid.geoTransform;
  const pts: number[] = [];
  const steps = 64;
  for (let i = 0; i <= steps; i++) {
    const t = i / steps;
    const x = x0 + t * grid.width * dx;
    const y = y0 + t * grid.height * dy;
    pts.push(x, y0, x, y0 + grid.height * dy, x0, y, x0 + grid.width * dx, y);
  }
  const ll = toLonLat(Float64Array.from(pts));
  const out: number[] = [];
  for (let i = 1; i < ll.length; i += 2) out.push(Math.abs(ll[i]) <= 90 ? ll[i] : NaN);
  return out;
}
