/**
 * Pipeline benchmark (`npm run bench pipeline`): builds a synthetic region of at least 4 million
 * analysis cells (2100 x 2100 km at 1 km in EPSG:3413) end to end — read + check the grids, resample,
 * screen every cell with the per-cell model on worker threads, write the tile pyramid, the per-band
 * GeoTIFFs and the manifest — and prints wall time per stage, cells per second and peak memory
 * (resident set, maxRSS from process.resourceUsage, which includes the worker threads).
 * The input grids are smooth synthetic fields (not data; not the demo region), written to a temporary
 * directory in three CRSs and resolutions. Nothing is asserted (style.md habit 16).
 */
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildTiles } from '../data-pipeline/build/build-tiles';
import { createTransform } from '../data-pipeline/crs/crs-definitions';
import { writeBandGeoTiff } from '../data-pipeline/export/write-band-geotiff';
import type { InputsConfig } from '../data-pipeline/inputs-config';

const HALF_SPAN_M = 1_050_000;
const CELL_M = 1000;

interface SyntheticGrid {
  role: InputsConfig['grids'][number]['role'];
  file: string;
  crs: string;
  pixel_m: number;
  unit: string;
  kind: 'continuous' | 'class';
  value: (lon: number, lat: number) => number;
}

const GRIDS: SyntheticGrid[] = [
  {
    role: 'meanAirTemp_C',
    file: 'maat.tif',
    crs: 'EPSG:3413',
    pixel_m: 2000,
    unit: 'degC',
    kind: 'continuous',
    value: (lon, lat) => -2 - 0.5 * (lat - 64) + Math.sin(lon / 7),
  },
  {
    role: 'airAmplitude_C',
    file: 'amp.tif',
    crs: 'EPSG:3413',
    pixel_m: 4000,
    unit: 'K',
    kind: 'continuous',
    value: (lon, lat) => 15 + 3 * Math.sin(lon / 5) + 0.1 * (lat - 64),
  },
  {
    role: 'warming_C_per_yr',
    file: 'warming.tif',
    crs: 'EPSG:3995',
    pixel_m: 10_000,
    unit: 'K/yr',
    kind: 'continuous',
    value: (_lon, lat) => 0.03 + 0.002 * (lat - 64),
  },
  {
    role: 'textureClass',
    file: 'texture.tif',
    crs: 'EPSG:3413',
    pixel_m: 1000,
    unit: 'class',
    kind: 'class',
    value: (lon, lat) => 1 + (((Math.floor(lon * 3 + lat * 5) % 6) + 6) % 6),
  },
  {
    role: 'waterContent_m3m3',
    file: 'water.tif',
    crs: 'EPSG:3413',
    pixel_m: 1000,
    unit: 'm3/m3',
    kind: 'continuous',
    value: (lon, lat) => 0.2 + 0.15 * (1 + Math.sin(lon * 2 + lat)),
  },
  {
    role: 'bedrockDepth_m',
    file: 'bedrock.tif',
    crs: 'EPSG:3995',
    pixel_m: 2000,
    unit: 'm',
    kind: 'continuous',
    value: (lon, lat) => 12 + 10 * Math.sin(lon + lat * 3),
  },
];

/** Write the synthetic input grids and their inputs config into `dir` (also used by queue.bench.ts). */
export async function writeSyntheticInputs(dir: string): Promise<void> {
  const [cx, cy] = createTransform('EPSG:4326', 'EPSG:3413')(-3, 73);
  for (const g of GRIDS) {
    const toGrid = createTransform('EPSG:3413', g.crs);
    const toLonLat = createTransform(g.crs, 'EPSG:4326');
    // Bounding box of the 3413 square in the grid's CRS, with a margin of two pixels.
    const corners = [-1, 1].flatMap((sx) =>
      [-1, 1].map((sy) => toGrid(cx + sx * HALF_SPAN_M, cy + sy * HALF_SPAN_M)),
    );
    const pad = 2 * g.pixel_m + (g.crs === 'EPSG:3413' ? 0 : 200_000);
    const west = Math.min(...corners.map((c) => c[0])) - pad;
    const north = Math.max(...corners.map((c) => c[1])) + pad;
    const width = Math.ceil((Math.max(...corners.map((c) => c[0])) + pad - west) / g.pixel_m);
    const height = Math.ceil((north - (Math.min(...corners.map((c) => c[1])) - pad)) / g.pixel_m);
    const values = new Float32Array(width * height);
    for (let r = 0; r < height; r++) {
      for (let c = 0; c < width; c++) {
        const [lon, lat] = toLonLat(west + (c + 0.5) * g.pixel_m, north - (r + 0.5) * g.pixel_m);
        values[r * width + c] = g.value(lon, lat);
      }
    }
    await writeBandGeoTiff({
      path: join(dir, g.file),
      values,
      width,
      height,
      geoTransform: [west, g.pixel_m, 0, north, 0, -g.pixel_m],
      crs: g.crs,
      description: `synthetic benchmark field (not data) ${g.role}`,
    });
  }
  const config: InputsConfig = {
    formatVersion: 1,
    region: { name: 'synthetic benchmark region', fictional: true },
    provenance: 'synthetic smooth fields for benchmarking; not data',
    licence: 'CC0-1.0',
    grids: GRIDS.map((g) => ({ role: g.role, file: g.file, unit: g.unit, kind: g.kind })),
  };
  await writeFile(join(dir, 'pile-atlas-inputs.json'), JSON.stringify(config, null, 2));
}

export async function run(): Promise<void> {
  const root = await mkdtemp(join(tmpdir(), 'pile-atlas-bench-'));
  const inDir = join(root, 'in');
  const outDir = join(root, 'out');
  await mkdir(inDir);
  try {
    let t = Date.now();
    await writeSyntheticInputs(inDir);
    console.log(`synthetic inputs written in ${((Date.now() - t) / 1000).toFixed(1)} s`);
    let peakRss = process.memoryUsage().rss;
    const sampler = setInterval(() => {
      peakRss = Math.max(peakRss, process.memoryUsage().rss);
    }, 200);
    const stageStart: Record<string, number> = {};
    const stageEnd: Record<string, number> = {};
    const workers = availableParallelism();
    t = Date.now();
    const summary = await buildTiles({
      inDir,
      outDir,
      cellSize_m: CELL_M,
      workers,
      onProgress: (p) => {
        stageStart[p.stage] ??= Date.now();
        stageEnd[p.stage] = Date.now();
      },
    });
    const wall = (Date.now() - t) / 1000;
    clearInterval(sampler);
    const maxRss_MB = process.resourceUsage().maxRSS / 1024;
    console.log(`cells in analysis grid: ${summary.cellsTotal} (screened ${summary.cellsScreened})`);
    console.log(
      `workers: ${summary.workers}; bands: ${summary.bands.length}; tiles: ${summary.tiles} (zoom ${summary.minZoom}-${summary.maxZoom})`,
    );
    for (const s of Object.keys(stageStart)) {
      console.log(
        `  stage ${s.padEnd(8)} ${((stageEnd[s] - stageStart[s]) / 1000).toFixed(1)} s (from first to last progress report)`,
      );
    }
    console.log(
      `wall time: ${wall.toFixed(1)} s; ${Math.round(summary.cellsTotal / wall)} cells/s end to end`,
    );
    console.log(
      `peak memory: maxRSS ${maxRss_MB.toFixed(0)} MB; sampled rss peak ${(peakRss / 2 ** 20).toFixed(0)} MB`,
    );
  } finally {
    await rm(root, { recursive: true, force: true });
  }
}
