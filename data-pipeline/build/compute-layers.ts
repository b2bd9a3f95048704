/**
 * Screens every analysis cell, window by window (blocks of rows), on the main thread or across a pool of
 * worker threads. Inputs are resampled per window and each window's output rows go straight to the band
 * files (band-files.ts); each window reads from the input files only the pixel boxes under it
 * (screen-window.ts), so nothing grows with the region's height: the output costs bands x windowRows x
 * width x 4 bytes per screening thread, the inputs one window's footprint per thread. Output bands: the
 * model's layers, a few input layers echoed for the map (texture, bedrock depth, water content, air
 * temperature, its annual amplitude and warming trend: the site panel prefills from them), then
 * `inputFlags`, a bit mask of the optional inputs that fell back to a default.
 */
import type { ScreeningLayer, ScreeningModel } from '../../layers/screening/screening-model';
import { BAND, INPUT_ECHO_BAND_IDS } from '../../layers/screening/band-ids';
import { BAND_REGISTRY } from '../../layers/screening/band-registry';
import { GRID_ROLES, type GridRoleId } from '../inputs-config';
import type { AnalysisGrid } from './analysis-grid';
import { createBandFiles, type BandFiles } from './band-files';
import type { LoadedInput } from './load-inputs';
import type { ModelSpec } from './model-spec';
import { runWorkerPool } from '../worker-pool';
import type { WindowRunner } from './build-distributor';
import {
  createWindowScreener,
  emptyStats,
  INPUT_FLAG_BITS,
  mergeStats,
  type WindowInput,
  type WindowStats,
} from './screen-window';

export { INPUT_FLAG_BITS };

/**
 * The echo bands with the input grid behind each: the grid role of the same id, except depth to bedrock,
 * echoed under the model's band id (band-ids.ts INPUT_ECHO_BAND_IDS).
 */
const ECHO_LAYERS: { layer: ScreeningLayer; role: GridRoleId }[] = INPUT_ECHO_BAND_IDS.map((id) => {
  const { unitNA: _na, description = '', source = '', ...entry } = BAND_REGISTRY[id];
  const role: GridRoleId = id === BAND.bedrockDepth ? 'bedrockDepth_m' : id;
  return { layer: { id, ...entry, description, source }, role };
});

function flagsLayer(): ScreeningLayer {
  const names = Object.keys(INPUT_FLAG_BITS) as (keyof typeof INPUT_FLAG_BITS)[];
  const classes = [];
  for (let v = 0; v < 8; v++) {
    const missing = names.filter((n) => v & INPUT_FLAG_BITS[n]);
    classes.push({
      value: v,
      // The roles' titles, never their ids: the label is shown on screens and exports.
      label:
        missing.length === 0
          ? 'all optional grids given'
          : `default for ${missing.map((n) => GRID_ROLES[n].title.toLowerCase()).join(', ')}`,
      description:
        missing.length === 0
          ? 'Every optional input came from a grid.'
          : missing.map((n) => `${GRID_ROLES[n].title}: ${GRID_ROLES[n].fallback}`).join('; '),
    });
  }
  const { title, unit, kind } = BAND_REGISTRY.inputFlags;
  return {
    id: BAND.inputFlags,
    title,
    unit,
    kind,
    classes,
    description: 'Which optional inputs were absent in the cell and fell back to a model or default.',
    source: 'pipeline',
  };
}

export interface ComputeResult extends WindowStats {
  layers: ScreeningLayer[];
  /** The output bands, one file each (in the order of `layers`). */
  files: BandFiles;
  cellsTotal: number;
  workers: number;
}

export interface ComputeOptions {
  grid: AnalysisGrid;
  inputs: LoadedInput[];
  model: ScreeningModel;
  /** Directory that receives the band files (created; the caller removes it). */
  bandsDir: string;
  /** When given (and workers > 1), each worker builds its own model from this spec. */
  spec?: ModelSpec;
  workers?: number;
  /** Below this many cells the main thread screens alone (worker start-up costs more). Default 400 000. */
  minCellsForWorkers?: number;
  windowRows?: number;
  onProgress?: (done: number, total: number) => void;
  /** Screens the windows elsewhere (e.g. as jobs on a queue, build/build-distributor.ts); needs `spec`. */
  windowRunner?: WindowRunner;
}

function runPool(
  workers: number,
  data: object,
  windows: [number, number][],
  onWindow: (s: WindowStats, rows: number) => void,
): Promise<void> {
  return runWorkerPool<[number, number], { error?: string; row0: number; row1: number; stats: WindowStats }>({
    script: new URL('./screen-worker.mjs', import.meta.url),
    workerData: data,
    size: workers,
    jobs: windows,
    message: ([row0, row1]) => ({ row0, row1 }),
    onAnswer: (a) => onWindow(a.stats, a.row1 - a.row0),
    label: 'screening worker',
    // Let every worker close its input files, then end it.
    closeMessage: { close: true },
  });
}

/** Screen every cell of the analysis grid. */
export async function computeLayers(options: ComputeOptions): Promise<ComputeResult> {
  const { grid, inputs, model, spec, bandsDir, windowRows = 32, onProgress } = options;
  const present = new Set(inputs.map((i) => i.entry.role));
  const modelIds = new Set(model.layers.map((l) => l.id));
  // Echo an input only when the model has no band of the same id (bedrockDepth: the full model's own).
  const echoes = ECHO_LAYERS.filter((e) => present.has(e.role) && !modelIds.has(e.layer.id));
  const echoLayers = echoes.map((e) => e.layer);
  const layers = [...model.layers, ...echoLayers, flagsLayer()];
  const n = grid.width * grid.height;
  // A companion spread grid is resampled with its input's method (nearest for a class grid).
  const windowInput = (i: LoadedInput, kind = i.role.kind): WindowInput => ({
    role: i.entry.role,
    kind,
    grid: i.source.grid,
    path: i.source.path,
    label: i.source.label,
    nodata: i.source.nodata,
    unit: i.entry.unit,
    scale: i.source.scale,
    offset: i.source.offset,
    ...(i.source.aligned ? { aligned: i.source.aligned } : {}),
    ...(i.companion ? { companion: i.companion } : {}),
    ...(i.sd ? { sd: windowInput(i.sd, i.role.kind) } : {}),
  });
  const windowInputs: WindowInput[] = inputs.map((i) => windowInput(i));
  const echoRoles = echoes.map((e) => e.role);
  const runner = options.windowRunner;
  if (runner && !spec) throw new Error('computeLayers: a window runner needs a model spec');
  const files =
    runner && spec
      ? await runner.prepare({
          spec,
          grid,
          inputs: windowInputs,
          inputSha256: inputs.map((i) => i.source.sha256),
          echoRoles,
          bandCount: layers.length,
        })
      : await createBandFiles(bandsDir, layers.length, grid.width, grid.height);
  const windows: [number, number][] = [];
  for (let r = 0; r < grid.height; r += windowRows) windows.push([r, Math.min(grid.height, r + windowRows)]);

  const stats = emptyStats();
  let rowsDone = 0;
  const onWindow = (s: WindowStats, rows: number) => {
    mergeStats(stats, s);
    rowsDone += rows;
    onProgress?.(rowsDone, grid.height);
  };
  const parallel = spec && n >= (options.minCellsForWorkers ?? 400_000);
  let workers = parallel ? Math.max(1, Math.min(options.workers ?? 1, windows.length)) : 1;
  if (runner) {
    await runner.run(windows, onWindow);
    workers = runner.workers();
  } else if (workers > 1 && spec) {
    await runPool(workers, { spec, grid, inputs: windowInputs, echoRoles, files }, windows, onWindow);
  } else {
    const screener = createWindowScreener({ grid, inputs: windowInputs, model, echoRoles, files });
    try {
      for (const [row0, row1] of windows) onWindow(await screener.screen(row0, row1), row1 - row0);
    } finally {
      await screener.close();
    }
  }
  return { ...stats, layers, files, cellsTotal: n, workers };
}
