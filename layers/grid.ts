/**
 * One raster type for the whole product (style.md habit 8).
 *
 * `values` is row-major Float32, `width` columns by `height` rows; row 0 is the NORTH (top) edge and
 * column 0 the WEST (left) edge, as in GeoTIFF. Nodata is always mapped to NaN on read.
 * `geoTransform` is the GDAL-style affine transform in the grid's own CRS:
 *   x = gt[0] + col * gt[1] + row * gt[2];  y = gt[3] + col * gt[4] + row * gt[5]
 * for the outer corner of the cell (col, row); cell centres are at col + 0.5, row + 0.5.
 */
export interface Grid {
  values: Float32Array;
  width: number;
  height: number;
  geoTransform: [number, number, number, number, number, number];
  /** CRS as an EPSG code string, e.g. 'EPSG:4326' or 'EPSG:3413', or a proj4 string. */
  crs: string;
}

/** Map coordinates of the centre of cell (col, row). */
export function cellCentre(grid: Grid, col: number, row: number): [number, number] {
  const gt = grid.geoTransform;
  const c = col + 0.5;
  const r = row + 0.5;
  return [gt[0] + c * gt[1] + r * gt[2], gt[3] + c * gt[4] + r * gt[5]];
}
