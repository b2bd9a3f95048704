/**
 * The proximity bands a build adds after screening: distance from every screened cell's centre to the
 * nearest settlement (settlements layer) and to the nearest road or track (roads layer), km, by
 * layers/screening/proximity.ts. A band is added only when its layer is given and has features; cells
 * the model left without data (sea, missing inputs) stay nodata. Written row block by row block into
 * new band files beside the screened ones (band-files.ts), so memory stays one block.
 */
import { join } from 'node:path';
import type { ScreeningLayer } from '../../layers/screening/screening-model';
import { BAND, type BandId } from '../../layers/screening/band-ids';
import { BAND_REGISTRY } from '../../layers/screening/band-registry';
import {
  nearestDistance_km,
  proximityFeatures,
  type ProximityFeatures,
} from '../../layers/screening/proximity';
import { createTransform } from '../crs/crs-definitions';
import type { AnalysisGrid } from './analysis-grid';
import {
  closeBandFds,
  createBandFiles,
  openBandFds,
  readBandRows,
  rowsPerChunk,
  writeBandRows,
  type BandFiles,
} from './band-files';

function layerOf(id: BandId): ScreeningLayer {
  const { unitNA: _na, description = '', source = '', ...entry } = BAND_REGISTRY[id];
  return { id, ...entry, description, source };
}

function featuresOf(geojsonText: string | undefined): ProximityFeatures | null {
  if (geojsonText === undefined) return null;
  const fc = JSON.parse(geojsonText) as {
    features: { geometry: { type: string; coordinates?: unknown } | null }[];
  };
  const f = proximityFeatures(fc.features.flatMap((x) => (x.geometry ? [x.geometry] : [])));
  return f.points.length + f.segments.length > 0 ? f : null;
}

/**
 * Append the proximity bands to `files`/`layers` (in place). `maskBand`: a band whose NaN cells get
 * no distance (the model's first band).
 */
export async function addProximityBands(options: {
  grid: AnalysisGrid;
  files: BandFiles;
  layers: ScreeningLayer[];
  bandsDir: string;
  maskBand: number;
  geojson: { settlements?: string; roads?: string };
}): Promise<BandId[]> {
  const { grid, files, layers } = options;
  const wanted: { id: BandId; features: ProximityFeatures }[] = [];
  const settlements = featuresOf(options.geojson.settlements);
  if (settlements) wanted.push({ id: BAND.settlementDistance_km, features: settlements });
  const roads = featuresOf(options.geojson.roads);
  if (roads) wanted.push({ id: BAND.roadDistance_km, features: roads });
  if (wanted.length === 0) return [];
  const extra = await createBandFiles(
    join(options.bandsDir, 'proximity'),
    wanted.length,
    grid.width,
    grid.height,
  );
  const toLonLat = createTransform(grid.crs, 'EPSG:4326');
  const gt = grid.geoTransform;
  const [maskFd] = openBandFds({ ...files, paths: [files.paths[options.maskBand]] }, 'r');
  const outFds = openBandFds(extra, 'r+');
  try {
    const step = rowsPerChunk(grid.width);
    const mask = new Float32Array(step * grid.width);
    const out = wanted.map(() => new Float32Array(step * grid.width));
    for (let r0 = 0; r0 < grid.height; r0 += step) {
      const r1 = Math.min(grid.height, r0 + step);
      const m = readBandRows(maskFd, grid.width, r0, r1, mask);
      for (let r = r0; r < r1; r++)
        for (let c = 0; c < grid.width; c++) {
          const i = (r - r0) * grid.width + c;
          if (m[i] !== m[i]) {
            for (const o of out) o[i] = NaN;
            continue;
          }
          const x = gt[0] + (c + 0.5) * gt[1] + (r + 0.5) * gt[2];
          const y = gt[3] + (c + 0.5) * gt[4] + (r + 0.5) * gt[5];
          const p = toLonLat(x, y);
          wanted.forEach((w, k) => (out[k][i] = nearestDistance_km([p[0], p[1]], w.features)));
        }
      const n = (r1 - r0) * grid.width;
      out.forEach((o, k) => writeBandRows(outFds[k], grid.width, r0, o.subarray(0, n)));
    }
  } finally {
    closeBandFds([maskFd, ...outFds]);
  }
  files.paths.push(...extra.paths);
  layers.push(...wanted.map((w) => layerOf(w.id)));
  return wanted.map((w) => w.id);
}
