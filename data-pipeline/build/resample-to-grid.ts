/**
 * Resampling a source Grid onto rows of the analysis grid: each analysis cell centre is transformed
 * into the source CRS and looked up there. Classes use nearest neighbour; continuous values bilinear
 * interpolation between the four surrounding pixel centres, over the neighbours that hold data
 * (weights renormalised), so nodata (sea) never bleeds in as a number and a coastal cell takes the
 * land values next to it. A cell outside the source grid, or with no valid neighbour, is NaN.
 */
import type { Grid } from '../../layers/grid';
import { createTransform } from '../crs/crs-definitions';
import type { AnalysisGrid } from './analysis-grid';

export type ResampleMethod = 'nearest' | 'bilinear';

/**
 * Centres of analysis rows [row0, row1) in `crs`, as interleaved x, y. Transforms exactly every
 * `stride`-th cell of each row and interpolates linearly between them (projections are smooth at
 * these scales; stride 1 = every cell exact). Where geographic longitudes wrap across the
 * antimeridian between two exact points, the cells in between are transformed exactly.
 */
export function cellCentresIn(target: AnalysisGrid, row0: number, row1: number, crs: string, stride = 8) {
  const toSource = createTransform(target.crs, crs);
  const gt = target.geoTransform;
  const w = target.width;
  const out = new Float64Array((row1 - row0) * w * 2);
  for (let r = row0; r < row1; r++) {
    const y = gt[3] + (r + 0.5) * gt[5];
    const base = (r - row0) * w * 2;
    let prevCol = -1;
    let prev: [number, number] = [0, 0];
    for (let c = 0; c < w; c = c === w - 1 ? w : Math.min(c + stride, w - 1)) {
      const p = toSource(gt[0] + (c + 0.5) * gt[1], y);
      out[base + 2 * c] = p[0];
      out[base + 2 * c + 1] = p[1];
      if (prevCol >= 0 && Math.abs(p[0] - prev[0]) > 180) {
        // Longitudes wrapping across the antimeridian: transform the cells in between exactly.
        for (let k = prevCol + 1; k < c; k++) {
          const q = toSource(gt[0] + (k + 0.5) * gt[1], y);
          out[base + 2 * k] = q[0];
          out[base + 2 * k + 1] = q[1];
        }
      } else if (prevCol >= 0) {
        for (let k = prevCol + 1; k < c; k++) {
          const t = (k - prevCol) / (c - prevCol);
          out[base + 2 * k] = prev[0] + t * (p[0] - prev[0]);
          out[base + 2 * k + 1] = prev[1] + t * (p[1] - prev[1]);
        }
      }
      prevCol = c;
      prev = p;
    }
  }
  return out;
}

/** Pixel box [x0, y0, x1, y1) (exclusive) of a raster. */
export type PixelBox = [number, number, number, number];

/**
 * The pixel box of `source` that resampling at `coords` (interleaved x, y in the source CRS) touches:
 * the bounding box of the points' pixel positions, padded by 2 pixels (bilinear reads the next pixel
 * centre on each side), clipped to the raster; null when no point falls inside the raster. Taken from
 * the very points resampled, so curved projections and the antimeridian need no special case.
 */
export function footprintBox(source: Omit<Grid, 'values'>, coords: Float64Array): PixelBox | null {
  const [g0, g1, g2, g3, g4, g5] = source.geoTransform;
  const det = g1 * g5 - g2 * g4;
  let c0 = Infinity;
  let r0 = Infinity;
  let c1 = -Infinity;
  let r1 = -Infinity;
  for (let i = 0; i < coords.length; i += 2) {
    const dx = coords[i] - g0;
    const dy = coords[i + 1] - g3;
    const col = (g5 * dx - g2 * dy) / det;
    const row = (-g4 * dx + g1 * dy) / det;
    if (!(col >= 0 && row >= 0 && col < source.width && row < source.height)) continue;
    if (col < c0) c0 = col;
    if (col > c1) c1 = col;
    if (row < r0) r0 = row;
    if (row > r1) r1 = row;
  }
  if (c1 < 0) return null;
  return [
    Math.max(0, Math.floor(c0) - 2),
    Math.max(0, Math.floor(r0) - 2),
    Math.min(source.width, Math.floor(c1) + 3),
    Math.min(source.height, Math.floor(r1) + 3),
  ];
}

/**
 * Sample `source` at the given source-CRS coordinates (interleaved x, y). With `box`, `source.values`
 * holds only that pixel box of the raster (row-major, width x1 - x0), e.g. as read by footprintBox;
 * pixels outside it count as nodata.
 */
export function resampleAt(
  source: Grid,
  coords: Float64Array,
  method: ResampleMethod,
  box: PixelBox = [0, 0, source.width, source.height],
): Float32Array {
  const n = coords.length / 2;
  const out = new Float32Array(n);
  const [g0, g1, g2, g3, g4, g5] = source.geoTransform;
  const det = g1 * g5 - g2 * g4;
  const { width, height, values } = source;
  const [bx0, by0, bx1, by1] = box;
  const bw = bx1 - bx0;
  for (let i = 0; i < n; i++) {
    const dx = coords[2 * i] - g0;
    const dy = coords[2 * i + 1] - g3;
    // Fractional pixel position (col, row) of the point; pixel centres are at k + 0.5.
    const col = (g5 * dx - g2 * dy) / det;
    const row = (-g4 * dx + g1 * dy) / det;
    if (!(col >= 0 && row >= 0 && col < width && row < height)) {
      out[i] = NaN;
      continue;
    }
    if (method === 'nearest') {
      const c = Math.floor(col);
      const r = Math.floor(row);
      out[i] = c >= bx0 && r >= by0 && c < bx1 && r < by1 ? values[(r - by0) * bw + (c - bx0)] : NaN;
      continue;
    }
    const u = col - 0.5;
    const v = row - 0.5;
    const c0 = Math.floor(u);
    const r0 = Math.floor(v);
    const fu = u - c0;
    const fv = v - r0;
    let sum = 0;
    let weight = 0;
    for (let k = 0; k < 4; k++) {
      const c = c0 + (k & 1);
      const r = r0 + (k >> 1);
      if (c < bx0 || r < by0 || c >= bx1 || r >= by1) continue;
      const value = values[(r - by0) * bw + (c - bx0)];
      if (value !== value) continue;
      const wgt = (k & 1 ? fu : 1 - fu) * (k >> 1 ? fv : 1 - fv);
      sum += wgt * value;
      weight += wgt;
    }
    out[i] = weight > 0 ? sum / weight : NaN;
  }
  return out;
}
