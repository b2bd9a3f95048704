/**
 * Pipeline benchmark (`npm run bench pipeline`): builds a synthetic region of at least 4 million
 * analysis cells (2100 x 2100 km at 1 km in EPSG:3413) end to end — read + check the grids, resample,
 * screen every cell with the per-cell model on worker threads, write the tile pyramid, the per-band
 * GeoTIFFs and the manifest — and prints wall time per stage, cells per second and peak memory
 * (resident set, maxRSS from process.resourceUsage, which includes the worker threads), for the
 * earlier hand-written reader/resampler and for GDAL side by side, each build in its own process.
 * The input grids are smooth synthetic fields (not data; not the demo region), written to a temporary
 * directory in three CRSs and resolutions. Nothing is asserted (style.md habit 16).
 */
import { execFileSync } from 'node:child_process';
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildTiles } from '../data-pipeline/build/build-tiles';
import type { InputReader } from '../data-pipeline/build/load-inputs';
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

/** Write the synthetic input grids and their inputs config into `dir` (also used by queue.bench.ts, ensemble.bench.ts). */
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

interface ReaderRun {
  reader: InputReader;
  cellsTotal: number;
  cellsScreened: number;
  workers: number;
  bands: number;
  tiles: number;
  stages: Record<string, number>;
  wall_s: number;
  maxRss_MB: number;
  sampledRss_MB: number;
}

/** One build with `reader`, in this process (a child of run(), so each reader has its own peak RSS). */
async function buildOnce(reader: InputReader, inDir: string, outDir: string): Promise<ReaderRun> {
  let peakRss = process.memoryUsage().rss;
  const sampler = setInterval(() => {
    peakRss = Math.max(peakRss, process.memoryUsage().rss);
  }, 200);
  const stageStart: Record<string, number> = {};
  const stageEnd: Record<string, number> = {};
  const t = Date.now();
  const summary = await buildTiles({
    inDir,
    outDir,
    cellSize_m: CELL_M,
    workers: availableParallelism(),
    reader,
    onProgress: (p) => {
      stageStart[p.stage] ??= Date.now();
      stageEnd[p.stage] = Date.now();
    },
  });
  const wall_s = (Date.now() - t) / 1000;
  clearInterval(sampler);
  const stages: Record<string, number> = {};
  for (const st of Object.keys(stageStart)) stages[st] = (stageEnd[st] - stageStart[st]) / 1000;
  return {
    reader,
    cellsTotal: summary.cellsTotal,
    cellsScreened: summary.cellsScreened,
    workers: summary.workers,
    bands: summary.bands.length,
    tiles: summary.tiles,
    stages,
    wall_s,
    maxRss_MB: process.resourceUsage().maxRSS / 1024,
    sampledRss_MB: peakRss / 2 ** 20,
  };
}

function runChild(reader: InputReader, inDir: string, outDir: string): ReaderRun {
  const out = execFileSync(
    process.execPath,
    ['--import', 'tsx', fileURLToPath(import.meta.url), reader, inDir, outDir],
    { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'], env: { ...process.env, [CHILD_ENV]: '1' } },
  );
  return JSON.parse(out.trim().split('\n').pop() as string) as ReaderRun;
}

const CHILD_ENV = 'PILE_ATLAS_PIPELINE_BENCH_CHILD';

/**
 * Both readers on the same inputs in one run, each build in its own process (its own peak memory):
 * the earlier hand-written GeoTIFF reader and resampler ('legacy') and GDAL ('gdal', the default).
 */
export async function run(): Promise<void> {
  const root = await mkdtemp(join(tmpdir(), 'pile-atlas-bench-'));
  const inDir = join(root, 'in');
  await mkdir(inDir);
  try {
    const t = Date.now();
    await writeSyntheticInputs(inDir);
    console.log(`synthetic inputs written in ${((Date.now() - t) / 1000).toFixed(1)} s`);
    const load = () =>
      loadavg()
        .map((l) => l.toFixed(1))
        .join(', ');
    console.log(`load average before: ${load()} (${availableParallelism()} cores)`);
    const runs: ReaderRun[] = [];
    for (const reader of ['legacy', 'gdal'] as const) {
      runs.push(runChild(reader, inDir, join(root, `out-${reader}`)));
      console.log(`load average after ${reader}: ${load()}`);
    }
    const r0 = runs[0];
    console.log(`cells in analysis grid: ${r0.cellsTotal} (screened ${r0.cellsScreened})`);
    console.log(`workers: ${r0.workers}; bands: ${r0.bands}; tiles: ${r0.tiles}`);
    const stages = [...new Set(runs.flatMap((r) => Object.keys(r.stages)))];
    const row = (label: string, f: (r: ReaderRun) => string) =>
      console.log(`${label.padEnd(28)} ${runs.map((r) => f(r).padStart(12)).join(' ')}`);
    row('', (r) => r.reader);
    for (const st of stages) row(`  stage ${st} (s)`, (r) => (r.stages[st] ?? 0).toFixed(1));
    row('wall time (s)', (r) => r.wall_s.toFixed(1));
    row('cells/s end to end', (r) => String(Math.round(r.cellsTotal / r.wall_s)));
    row('peak memory maxRSS (MB)', (r) => r.maxRss_MB.toFixed(0));
    row('sampled rss peak (MB)', (r) => r.sampledRss_MB.toFixed(0));
    console.log(`gdal / legacy wall time: ${(runs[1].wall_s / runs[0].wall_s).toFixed(2)}`);
  } finally {
    await rm(root, { recursive: true, force: true });
  }
}

if (process.env[CHILD_ENV]) {
  const [reader, inDir, outDir] = process.argv.slice(2) as [InputReader, string, string];
  const result = await buildOnce(reader, inDir, outDir);
  process.stdout.write(JSON.stringify(result) + '\n');
}
