/**
 * The analysis CRS keeps one hand-written proj4 definition (EPSG:3413) for the cell centres' latitude
 * and the tile writer; it must agree with GDAL's PROJ database, which places every input. Points over
 * the northern high latitudes, to 1 mm.
 */
import { describe, expect, it } from 'vitest';
import { ANALYSIS_CRS, createTransform } from '../../data-pipeline/crs/crs-definitions';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';

describe('analysis CRS: proj4 definition against GDAL/PROJ', () => {
  it('EPSG:3413 forward transforms agree to 1 mm', async () => {
    const gdal = await loadGdal();
    const lonLat: number[] = [];
    for (let lat = 35; lat <= 89; lat += 6) for (let lon = -180; lon < 180; lon += 37) lonLat.push(lon, lat);
    const ours = createTransform('EPSG:4326', ANALYSIS_CRS);
    const theirs = gdal.transform('EPSG:4326', ANALYSIS_CRS, Float64Array.from(lonLat));
    for (let i = 0; i < lonLat.length; i += 2) {
      const [x, y] = ours(lonLat[i], lonLat[i + 1]);
      expect(Math.hypot(x - theirs[i], y - theirs[i + 1]), `${lonLat[i]}, ${lonLat[i + 1]}`).toBeLessThan(
        1e-3,
      );
    }
  });
});
