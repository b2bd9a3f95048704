/**
 * `pile-atlas build`: inputs directory -> screened tile pyramid + manifest.json.
 * read + validate inputs (load-inputs.ts) -> analysis grid in EPSG:3413 (analysis-grid.ts) -> screen every
 * cell with a ScreeningModel (compute-layers.ts) -> Web Mercator tiles (write-tile-pyramid.ts) ->
 * manifest (layers/screening/manifest.ts) -> copy settlements/land GeoJSON. Everything is written into a
 * temporary directory beside `outDir`, validated, then swapped in (atomic-output.ts): on any error the
 * previous output stays untouched.
 */
import { copyFile, readFile, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../layers/cautions';
import { createBasicScreeningModel } from '../../layers/screening/basic-screening-model';
import { manifestSchema, type Band, type Manifest } from '../../layers/screening/manifest';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import { NODATA_CODE, quantisationFor, TILE_SIZE } from '../../layers/screening/tile-format';
import { InputError } from '../input-error';
import type { Progress } from '../progress-bar';
import { writeTilePyramid, zoomRangeFor } from '../tiles/write-tile-pyramid';
import { analysisGridFor } from './analysis-grid';
import { beginAtomicOutput } from './atomic-output';
import { computeLayers } from './compute-layers';
import { loadInputs } from './load-inputs';

export interface BuildOptions {
  inDir: string;
  outDir: string;
  onProgress?: (p: Progress) => void;
  /** Analysis cell size, m (default 1000). */
  cellSize_m?: number;
  /** Screening model (default: the basic TTOP + Stefan model). */
  model?: ScreeningModel;
  /** Name and parameters of the model, recorded in the manifest. */
  modelInfo?: { name: string; parameters?: Record<string, unknown> };
  /** Scenario recorded in the manifest, if any. */
  scenario?: Record<string, unknown>;
}

export interface BuildSummary {
  outDir: string;
  manifest: string;
  cellsTotal: number;
  cellsScreened: number;
  cellsMissingInput: number;
  cellsModelNodata: number;
  tiles: number;
  tilesByZoom: Record<number, number>;
  minZoom: number;
  maxZoom: number;
  bands: string[];
  /** Share of screened cells in each class, per class band: bandId -> label -> fraction. */
  classShares: Record<string, Record<string, number>>;
  seconds: number;
}

async function toolVersion(): Promise<string> {
  const text = await readFile(new URL('../../package.json', import.meta.url), 'utf8');
  return (JSON.parse(text) as { version: string }).version;
}

function bandRange(values: Float32Array): [number, number] {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return min <= max ? [min, max] : [0, 0];
}

function classShares(values: Float32Array, classes: { value: number; label: string }[]) {
  const counts = new Map<number, number>();
  let total = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== v) continue;
    counts.set(v, (counts.get(v) ?? 0) + 1);
    total++;
  }
  const shares: Record<string, number> = {};
  for (const c of classes) {
    const n = counts.get(c.value) ?? 0;
    if (n > 0) shares[c.label] = +(n / total).toFixed(4);
  }
  return shares;
}

/** Build tiles and manifest from the inputs in `inDir` into `outDir` (atomically). */
export async function buildTiles(options: BuildOptions): Promise<BuildSummary> {
  const started = Date.now();
  const { inDir, outDir, onProgress } = options;
  const cellSize_m = options.cellSize_m ?? 1000;
  const model = options.model ?? createBasicScreeningModel();
  const modelInfo = options.modelInfo ?? {
    name: 'basic (TTOP + Stefan)',
    parameters: { nFreeze: 0.5, nThaw: 1 },
  };
  const progress = (stage: string, done: number, total: number) => onProgress?.({ stage, done, total });

  const { config, inputs } = await loadInputs(inDir, (d, t) => progress('read', d, t));
  const required = inputs.filter((i) => i.role.required);
  const grid = analysisGridFor(
    required.map((i) => ({ label: i.entry.file, grid: i.source.grid })),
    cellSize_m,
  );
  const result = computeLayers({ grid, inputs, model, onProgress: (d, t) => progress('screen', d, t) });
  if (result.cellsScreened === 0) {
    throw new InputError(
      `${inputs.map((i) => i.entry.file).join(', ')}: no cell has every required input (grids share no land)`,
    );
  }

  const bands: Band[] = result.layers.map((layer, b) => {
    const [min, max] = bandRange(result.bands[b]);
    const q = layer.kind === 'class' ? { scale: 1, offset: 0 } : quantisationFor(min, max);
    return {
      id: layer.id,
      title: layer.title,
      unit: layer.unit,
      kind: layer.kind,
      scale: q.scale,
      offset: q.offset,
      min,
      max,
      ...(layer.ramp ? { ramp: layer.ramp } : {}),
      ...(layer.legendMin !== undefined ? { legendMin: layer.legendMin } : {}),
      ...(layer.legendMax !== undefined ? { legendMax: layer.legendMax } : {}),
      ...(layer.classes ? { classes: layer.classes } : {}),
      description: layer.description,
      source: layer.source,
    };
  });

  const margin = (2 * cellSize_m) / 111_000;
  const b = result.bounds;
  const bounds: [number, number, number, number] = [
    b[0] - margin / Math.cos((b[3] * Math.PI) / 180),
    b[1] - margin,
    b[2] + margin / Math.cos((b[3] * Math.PI) / 180),
    Math.min(85, b[3] + margin),
  ];
  const { minZoom, maxZoom } = zoomRangeFor(cellSize_m, (bounds[1] + bounds[3]) / 2);

  const output = await beginAtomicOutput(outDir);
  try {
    const tilesByZoom = await writeTilePyramid({
      tilesDir: join(output.dir, 'tiles'),
      grid,
      bands: bands.map((band, i) => ({ values: result.bands[i], kind: band.kind, quant: band })),
      minZoom,
      maxZoom,
      bounds,
      onTile: (d, t) => progress('tiles', d, t),
    });
    if (config.settlements)
      await copyFile(join(inDir, config.settlements), join(output.dir, 'settlements.geojson'));
    if (config.land) await copyFile(join(inDir, config.land), join(output.dir, 'land.geojson'));
    const tiles = Object.values(tilesByZoom).reduce((a, c) => a + c, 0);
    const shares: Record<string, Record<string, number>> = {};
    result.layers.forEach((layer, i) => {
      if (layer.classes) shares[layer.id] = classShares(result.bands[i], layer.classes);
    });
    const seconds = (Date.now() - started) / 1000;
    const summary = {
      cellsTotal: result.cellsTotal,
      cellsScreened: result.cellsScreened,
      cellsMissingInput: result.cellsMissingInput,
      cellsModelNodata: result.cellsModelNodata,
      screenedArea_km2: +((result.cellsScreened * cellSize_m * cellSize_m) / 1e6).toFixed(0),
      classShares: shares,
      tiles,
      seconds,
    };
    const manifest: Manifest = {
      formatVersion: 1,
      tool: { name: 'pile-atlas', version: await toolVersion() },
      createdAt: new Date().toISOString(),
      fictional: config.region.fictional,
      notice: [
        SCREENING_CAUTION,
        ...GROUND_CAUTIONS,
        ...(config.region.fictional ? [FICTIONAL_DATA_NOTICE] : []),
      ].join(' '),
      region: { name: config.region.name, bounds },
      tiles: {
        urlTemplate: 'tiles/{z}/{x}/{y}.bin',
        tileSize: TILE_SIZE,
        minZoom,
        maxZoom,
        encoding: 'uint16-planar-le',
        nodataCode: NODATA_CODE,
      },
      analysisGrid: grid,
      bands,
      sources: inputs.map((i) => ({
        file: i.entry.file,
        role: i.entry.role,
        crs: i.source.grid.crs,
        width: i.source.grid.width,
        height: i.source.grid.height,
        unit: i.entry.unit,
        sha256: i.source.sha256,
        provenance: i.entry.provenance ?? config.provenance,
        licence: i.entry.licence ?? config.licence,
      })),
      ...(config.settlements ? { settlements: 'settlements.geojson' } : {}),
      ...(config.land ? { land: 'land.geojson' } : {}),
      parameters: {
        cellSize_m,
        resampling: { class: 'nearest', continuous: 'bilinear (valid neighbours)' },
        model: modelInfo.name,
        modelParameters: modelInfo.parameters ?? {},
        overviews: { class: 'mode', continuous: 'mean' },
      },
      ...(options.scenario ? { scenario: options.scenario } : {}),
      summary,
    };
    const checked = manifestSchema.parse(manifest);
    await writeFile(join(output.dir, 'manifest.json'), JSON.stringify(checked, null, 2) + '\n');
    await validateOutput(output.dir, checked);
    await output.commit();
    return {
      outDir,
      manifest: join(outDir, 'manifest.json'),
      cellsTotal: result.cellsTotal,
      cellsScreened: result.cellsScreened,
      cellsMissingInput: result.cellsMissingInput,
      cellsModelNodata: result.cellsModelNodata,
      tiles,
      tilesByZoom,
      minZoom,
      maxZoom,
      bands: bands.map((x) => x.id),
      classShares: shares,
      seconds: (Date.now() - started) / 1000,
    };
  } catch (err) {
    await output.discard();
    throw err;
  }
}

/** Re-read the manifest and check one tile per zoom for size before swapping the output in. */
async function validateOutput(dir: string, manifest: Manifest): Promise<void> {
  const again = manifestSchema.parse(JSON.parse(await readFile(join(dir, 'manifest.json'), 'utf8')));
  const expected = again.bands.length * TILE_SIZE * TILE_SIZE * 2;
  const { readdir } = await import('node:fs/promises');
  for (let z = manifest.tiles.minZoom; z <= manifest.tiles.maxZoom; z++) {
    const xs = await readdir(join(dir, 'tiles', String(z))).catch(() => [] as string[]);
    if (xs.length === 0) throw new Error(`build produced no tiles at zoom ${z}`);
    const ys = await readdir(join(dir, 'tiles', String(z), xs[0]));
    const size = (await stat(join(dir, 'tiles', String(z), xs[0], ys[0]))).size;
    if (size !== expected)
      throw new Error(`tile z${z}/${xs[0]}/${ys[0]} has ${size} bytes, expected ${expected}`);
  }
}
