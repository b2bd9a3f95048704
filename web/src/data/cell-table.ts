/**
 * The analysis-grid cells of a build, recovered from the tiles: one row per screened cell with its
 * centre (lon/lat), its grid position and every band's value. Filters, zonal summaries, hover and the
 * cell panel read this table, so the counter counts analysis cells (area = cells x cellSize_m², never
 * Web Mercator pixels) and the panel shows one cell's values, not a resampled pixel's.
 *
 * Method: for each cell (col, row) of the analysis grid, its centre is taken through the manifest's
 * geotransform (layers/grid.ts convention, row 0 north) and inverse-projected to lon/lat with the
 * supplied function (proj4 in the app); the tile pixel containing that point at `zoom` holds the cell's
 * value (the pipeline samples cells nearest-neighbour into pixels finer than the cells). Cells whose
 * bands are all nodata (sea, outside the data) are left out.
 *
 * Cell area on the ground: the analysis CRS need not be equal-area (the default polar stereographic
 * is conformal), so each cell's area is cellSize_m² times the squared local scale of the projection,
 * measured numerically: the ground lengths of two half-cell steps east and north of the centre,
 * divided by the half-cell size (for a conformal grid this is 1/k², k the projection's scale factor).
 * Ground lengths use the WGS 84 ellipsoid's local radii of curvature (meridian M, prime vertical N;
 * e.g. Snyder 1987, Map Projections—A Working Manual, eqs. 4-18, 4-20), exact to ~1e-8 over
 * half a kilometre; a mean-sphere haversine would be 0.3 % short per direction at 75° N.
 */
import type { Manifest } from '../../../layers/screening/manifest';
import { TILE_SIZE } from '../../../layers/screening/tile-format';
import { lonLatToTileXY } from '../map/web-mercator';

export interface CellTable {
  /** Number of screened cells. */
  count: number;
  /** Band-planar values (manifest band order), SI, NaN = nodata; length `count` each. */
  planes: Float32Array[];
  lon: Float64Array;
  lat: Float64Array;
  /** Ground area of each cell, m² (see the module comment). */
  area_m2: Float64Array;
  col: Int32Array;
  row: Int32Array;
  /** Grid width, to map (col, row) to the lookup below. */
  gridWidth: number;
  gridHeight: number;
  /** (row * gridWidth + col) -> table index, or -1 for unscreened cells. */
  lookup: Int32Array;
  /** Nominal cell area in the analysis CRS, cellSize_m². */
  cellArea_m2: number;
}

export interface CellTableInput {
  manifest: Manifest;
  /** Tile zoom to sample (its pixels should be no larger than a cell). */
  zoom: number;
  /** Decoded planes of tile (zoom, x, y), or null when the tile is absent (all nodata). */
  getTile: (x: number, y: number) => Float32Array[] | null;
  /** Analysis-CRS coordinates -> [lon, lat] in degrees. */
  gridToLonLat: (x: number, y: number) => [number, number];
}

/** Build the table (see the module comment). */
export function buildCellTable(input: CellTableInput): CellTable {
  const { manifest, zoom, getTile, gridToLonLat } = input;
  const { width, height, geoTransform: gt, cellSize_m } = manifest.analysisGrid;
  const nb = manifest.bands.length;
  const lookup = new Int32Array(width * height).fill(-1);
  const cap = width * height;
  let planes: Float32Array[] = manifest.bands.map(() => new Float32Array(Math.min(cap, 65536)));
  let lon: Float64Array = new Float64Array(planes[0].length);
  let lat: Float64Array = new Float64Array(planes[0].length);
  let area: Float64Array = new Float64Array(planes[0].length);
  const half = cellSize_m / 2;
  let colA: Int32Array = new Int32Array(planes[0].length);
  let rowA: Int32Array = new Int32Array(planes[0].length);
  let count = 0;
  const values = new Float32Array(nb);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const x = gt[0] + (c + 0.5) * gt[1] + (r + 0.5) * gt[2];
      const y = gt[3] + (c + 0.5) * gt[4] + (r + 0.5) * gt[5];
      const [lo, la] = gridToLonLat(x, y);
      if (!Number.isFinite(lo) || !Number.isFinite(la)) continue;
      const [tx, ty] = lonLatToTileXY(lo, la, zoom);
      const tile = getTile(Math.floor(tx), Math.floor(ty));
      if (!tile) continue;
      const px = Math.min(TILE_SIZE - 1, Math.floor((tx - Math.floor(tx)) * TILE_SIZE));
      const py = Math.min(TILE_SIZE - 1, Math.floor((ty - Math.floor(ty)) * TILE_SIZE));
      const k = py * TILE_SIZE + px;
      let any = false;
      for (let b = 0; b < nb; b++) {
        values[b] = tile[b][k];
        if (!Number.isNaN(values[b])) any = true;
      }
      if (!any) continue;
      if (count === lon.length) {
        const grow = Math.min(cap, lon.length * 2);
        planes = planes.map((p) => growF32(p, grow));
        lon = growF64(lon, grow);
        lat = growF64(lat, grow);
        area = growF64(area, grow);
        colA = growI32(colA, grow);
        rowA = growI32(rowA, grow);
      }
      for (let b = 0; b < nb; b++) planes[b][count] = values[b];
      lon[count] = lo;
      lat[count] = la;
      const [lonE, latE] = gridToLonLat(x + (half * gt[1]) / cellSize_m, y + (half * gt[4]) / cellSize_m);
      const [lonN, latN] = gridToLonLat(x - (half * gt[2]) / cellSize_m, y - (half * gt[5]) / cellSize_m);
      area[count] =
        cellSize_m *
        cellSize_m *
        (localDistance_m([lo, la], [lonE, latE]) / half) *
        (localDistance_m([lo, la], [lonN, latN]) / half);
      colA[count] = c;
      rowA[count] = r;
      lookup[r * width + c] = count;
      count++;
    }
  }
  return {
    count,
    planes: planes.map((p) => p.slice(0, count)),
    lon: lon.slice(0, count),
    lat: lat.slice(0, count),
    area_m2: area.slice(0, count),
    col: colA.slice(0, count),
    row: rowA.slice(0, count),
    gridWidth: width,
    gridHeight: height,
    lookup,
    cellArea_m2: cellSize_m * cellSize_m,
  };
}

/** Table index of the cell containing analysis-CRS point (x, y), or -1. */
export function cellIndexAt(table: CellTable, manifest: Manifest, x: number, y: number): number {
  const gt = manifest.analysisGrid.geoTransform;
  // Invert the affine transform (general case, rotation terms allowed).
  const det = gt[1] * gt[5] - gt[2] * gt[4];
  if (det === 0) return -1;
  const dx = x - gt[0];
  const dy = y - gt[3];
  const c = Math.floor((gt[5] * dx - gt[2] * dy) / det);
  const r = Math.floor((-gt[4] * dx + gt[1] * dy) / det);
  if (c < 0 || r < 0 || c >= table.gridWidth || r >= table.gridHeight) return -1;
  return table.lookup[r * table.gridWidth + c];
}

/** The smallest zoom in [minZoom, maxZoom] whose pixels at latitude lat are no larger than a cell. */
export function samplingZoom(manifest: Manifest, lat: number): number {
  const { minZoom, maxZoom, tileSize } = manifest.tiles;
  const cell = manifest.analysisGrid.cellSize_m;
  for (let z = minZoom; z <= maxZoom; z++) {
    if ((2 * Math.PI * 6378137 * Math.cos((lat * Math.PI) / 180)) / (tileSize * 2 ** z) <= cell) return z;
  }
  return maxZoom;
}

/** A position [longitude, latitude] in degrees (GeoJSON order). */
export type LonLat = [number, number];

const WGS84_A = 6378137;
const WGS84_E2 = 0.00669437999014;

/** Distance between two nearby points (< a few km) from the WGS 84 local radii of curvature, m. */
export function localDistance_m([lon1, lat1]: LonLat, [lon2, lat2]: LonLat): number {
  const d = Math.PI / 180;
  const phi = ((lat1 + lat2) / 2) * d;
  const w = 1 - WGS84_E2 * Math.sin(phi) ** 2;
  const N = WGS84_A / Math.sqrt(w);
  const M = (WGS84_A * (1 - WGS84_E2)) / (w * Math.sqrt(w));
  const dx = N * Math.cos(phi) * (lon2 - lon1) * d;
  const dy = M * (lat2 - lat1) * d;
  return Math.hypot(dx, dy);
}

/** Haversine distance on the sphere of mean radius 6371008.8 m. */
export function greatCircle_m([lon1, lat1]: LonLat, [lon2, lat2]: LonLat): number {
  const d = Math.PI / 180;
  const s1 = Math.sin(((lat2 - lat1) * d) / 2);
  const s2 = Math.sin(((lon2 - lon1) * d) / 2);
  const h = s1 * s1 + Math.cos(lat1 * d) * Math.cos(lat2 * d) * s2 * s2;
  return 2 * 6371008.8 * Math.asin(Math.min(1, Math.sqrt(h)));
}

function growF32(a: Float32Array, n: number): Float32Array {
  const b = new Float32Array(n);
  b.set(a);
  return b;
}
function growF64(a: Float64Array, n: number): Float64Array {
  const b = new Float64Array(n);
  b.set(a);
  return b;
}
function growI32(a: Int32Array, n: number): Int32Array {
  const b = new Int32Array(n);
  b.set(a);
  return b;
}
