/**
 * Web Mercator XYZ tile arithmetic (spherical Mercator, EPSG:3857, as used by the tile contract in
 * layers/screening/tile-format.ts). Pure functions; used only to address tiles and their pixels,
 * never to measure areas (areas come from the analysis grid, see cell-table.ts).
 *   x = (lon + 180) / 360 * 2^z,  y = (1 - ln(tan φ + sec φ) / π) / 2 * 2^z  (Snyder 1987, eq. 7-2).
 */
export const MAX_MERCATOR_LAT = 85.0511287798066;

/** Fractional tile coordinates of a lon/lat at zoom z. */
export function lonLatToTileXY(lon: number, lat: number, z: number): [number, number] {
  const n = 2 ** z;
  const phi = (Math.max(-MAX_MERCATOR_LAT, Math.min(MAX_MERCATOR_LAT, lat)) * Math.PI) / 180;
  const x = ((lon + 180) / 360) * n;
  const y = ((1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) / 2) * n;
  return [x, y];
}

/** Longitude/latitude of fractional tile coordinates (inverse of lonLatToTileXY). */
export function tileXYToLonLat(x: number, y: number, z: number): [number, number] {
  const n = 2 ** z;
  const lon = (x / n) * 360 - 180;
  const lat = (Math.atan(Math.sinh(Math.PI * (1 - (2 * y) / n))) * 180) / Math.PI;
  return [lon, lat];
}

/** Range of tile indices covering [west, south, east, north] at zoom z (inclusive). */
export function tilesCovering(
  bounds: [number, number, number, number],
  z: number,
): { x0: number; x1: number; y0: number; y1: number } {
  const [w, s, e, n] = bounds;
  const max = 2 ** z - 1;
  const [x0f, y0f] = lonLatToTileXY(w, n, z);
  const [x1f, y1f] = lonLatToTileXY(e, s, z);
  const clamp = (v: number) => Math.max(0, Math.min(max, Math.floor(v)));
  return { x0: clamp(x0f), x1: clamp(x1f - 1e-9), y0: clamp(y0f), y1: clamp(y1f - 1e-9) };
}

/** Ground size of one pixel of a 256-pixel tile at latitude lat and zoom z, m (sphere R = 6378137 m). */
export function pixelSize_m(lat: number, z: number, tileSize = 256): number {
  return (2 * Math.PI * 6378137 * Math.cos((lat * Math.PI) / 180)) / (tileSize * 2 ** z);
}
