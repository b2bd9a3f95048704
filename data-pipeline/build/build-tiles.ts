/**
 * `pile-atlas build`: inputs directory -> screened tile pyramid, per-band GeoTIFFs and manifest.json.
 * read + validate inputs (load-inputs.ts) -> analysis grid in EPSG:3413 (analysis-grid.ts) -> screen
 * every cell with a ScreeningModel, in row windows across worker threads, each window's rows written to
 * one raw Float32 file per band in the temporary output (compute-layers.ts, band-files.ts) -> Web
 * Mercator tiles with overviews (write-tile-pyramid.ts) -> one Cloud Optimized GeoTIFF per band in
 * EPSG:3413 (write-band-cog.ts) -> manifest (assemble-manifest.ts) -> copy settlements/land GeoJSON.
 * Everything is written into a temporary directory beside `outDir`, validated, then swapped in
 * (atomic-output.ts): on any error the previous output stays untouched.
 * Memory budget, independent of the region's height and of its cell count (W = analysis grid width,
 * B = bands, T = threads, Wi = an input grid's width): no input grid is held whole. Loading scans each
 * input in blocks of about 1 M pixels (4 MB: unit conversion, range check, valid-pixel box) and keeps
 * only its header. While screening, each thread holds per 32-row window B x 32 x W x 4 B of output rows,
 * the cell centres in each input CRS (32 x W x 16 B each) and the resampled inputs (10 x 32 x W x 4 B),
 * and one input's pixel box at a time: the window's footprint in that grid padded by 2 pixels, about
 * Wi x (32 x cell size / pixel size + 5) x 4 B (plus the strips or tiles geotiff.js decodes to read
 * it), larger only where a projection turns the window's rows across the input; a max-zoom tile reads
 * the box of cells under it (about 0.13 M cells x 4 B, one band at a
 * time) and the depth-first pyramid keeps about two tiles of B x 256 KB per level; the main thread keeps
 * the subtree roots from the tile workers (about 16 x T tiles at most); the GeoTIFF writer 2 x 64 rows x
 * W x 4 B; band statistics 1 M cells x 4 B. The output bands are never held whole.
 */
import { availableParallelism } from 'node:os';
import { mkdir, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { manifestCriteria } from '../../layers/screening/cell-screening-model';
import { scenarioSchema } from '../../layers/screening/scenario';
import { ValidationError } from '../../layers/validation-error';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import { TILE_SIZE } from '../../layers/screening/tile-format';
import { writeBandCog } from '../export/write-band-cog';
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../layers/cautions';
import { InputError } from '../input-error';
import type { Progress } from '../progress-bar';
import { writeTilePyramid, zoomRangeFor } from '../tiles/write-tile-pyramid';
import { analysisGridFor, outlineLatitudes } from './analysis-grid';
import { assembleManifest, bandFor, bandStatsOf, classShares } from './assemble-manifest';
import { beginAtomicOutput, recoverOutput } from './atomic-output';
import { checkBuildBudget, checkLatitudeRange, estimateBuild, type BuildBudget } from './build-budget';
import { faultPoint, type FaultStage } from './fault-points';
import { checkOutputTarget } from './output-guard';
import type { BuildDistributor } from './build-distributor';
import { computeLayers } from './compute-layers';
import { loadInputs, type InputReader } from './load-inputs';
import { alignInputs, gdalTransformTo } from './align-inputs';
import { ANALYSIS_CRS } from '../crs/crs-definitions';
import { createModelFromSpec, type ModelSpec } from './model-spec';

export interface BuildOptions {
  inDir: string;
  outDir: string;
  onProgress?: (p: Progress) => void;
  /** Analysis cell size, m (default 1000). */
  cellSize_m?: number;
  /** 'screening' (default): the full per-cell model for `scenario`; 'basic': TTOP + Stefan only. */
  modelKind?: 'screening' | 'basic';
  /** Scenario JSON for the screening model (default: the documented default scenario). */
  scenario?: unknown;
  /** Name of the scenario file, for error messages and the manifest. */
  scenarioFile?: string;
  /** A custom model object (runs on the main thread; overrides modelKind). */
  model?: ScreeningModel;
  /** Worker threads for screening (default: available cores, at most 8; 1 = main thread). */
  workers?: number;
  /** Grids smaller than this are screened on the main thread (default 400 000 cells). */
  minCellsForWorkers?: number;
  /** Also write every band as a GeoTIFF in EPSG:3413 under geotiff/ (default true). */
  geotiff?: boolean;
  /** Limits checked before reading and writing (default: defaultBudget()). */
  budget?: Partial<BuildBudget>;
  /**
   * 'gdal' (default): inputs read and warped by GDAL. 'legacy': the earlier hand-written GeoTIFF reader
   * and resampler, kept only so bench/pipeline.bench.ts can time both in one run.
   */
  reader?: InputReader;
  /**
   * Run the screening windows and tile subtrees elsewhere (e.g. as jobs on a queue,
   * data-pipeline/queue/queue-distributor.ts) instead of this process's worker threads.
   */
  distributor?: BuildDistributor;
}

export interface BuildSummary {
  outDir: string;
  manifest: string;
  model: string;
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
  workers: number;
  seconds: number;
  cellsPerSecond: number;
  /** Queue-backed builds: jobs run, reused from earlier builds, retried (distributor.report()). */
  queue?: Record<string, number>;
}

function resolveModel(options: BuildOptions): { model: ScreeningModel; spec?: ModelSpec; name: string } {
  if (options.model) return { model: options.model, name: 'custom' };
  const spec: ModelSpec =
    options.modelKind === 'basic'
      ? { kind: 'basic' }
      : { kind: 'screening', scenario: options.scenario ?? {} };
  if (spec.kind === 'screening') {
    // Validated here, so that an error the model throws afterwards is a bug (exit 1), not bad input.
    const parsed = scenarioSchema.safeParse(spec.scenario ?? {});
    if (!parsed.success) throw ValidationError.fromZod(options.scenarioFile ?? 'scenario', parsed.error);
  }
  return {
    model: createModelFromSpec(spec),
    spec,
    name: spec.kind === 'basic' ? 'basic (TTOP + Stefan)' : 'per-cell screening model',
  };
}

const DISK_FULL = new Set(['ENOSPC', 'EDQUOT']);

/** A full disk while writing `outDir`: one line naming the output (the previous output is untouched). */
function diskFullError(outDir: string, stage: string, err: NodeJS.ErrnoException): InputError {
  return new InputError(
    `--out ${outDir}: no space left on the device (${err.code} while writing the ${stage}); ` +
      'nothing was replaced, the previous output is untouched; free space or choose another --out',
  );
}

/** Build tiles, GeoTIFFs and manifest from the inputs in `inDir` into `outDir` (atomically). */
export async function buildTiles(options: BuildOptions): Promise<BuildSummary> {
  const started = Date.now();
  const { inDir, outDir, onProgress } = options;
  const cellSize_m = options.cellSize_m ?? 1000;
  const progress = (stage: string, done: number, total: number) => onProgress?.({ stage, done, total });
  // A build killed earlier may have left a swap half done: put the previous output back first.
  recoverOutput(outDir);
  checkOutputTarget(inDir, outDir);
  const { model, spec, name: modelName } = resolveModel(options);
  const scenario = (model as ScreeningModel & { scenario?: Record<string, unknown> }).scenario;

  const reader = options.reader ?? 'gdal';
  const { config, inputs, geojson, budget, derivedDir } = await loadInputs(
    inDir,
    (d, t) => progress('read', d, t),
    options.budget,
    reader,
  );
  try {
    return await buildFromInputs();
  } finally {
    if (derivedDir) await rm(derivedDir, { recursive: true, force: true });
  }

  async function buildFromInputs(): Promise<BuildSummary> {
    await faultPoint('read', inDir);
    const toAnalysis = reader === 'gdal' ? await gdalTransformTo(ANALYSIS_CRS) : undefined;
    const grid = analysisGridFor(
      inputs
        .filter((i) => i.role.required)
        .map((i) => ({
          label: i.entry.file,
          grid: i.source.grid,
          validBox: i.source.validBox,
          ...(toAnalysis && i.source.gdal ? { toAnalysis: toAnalysis(i.source.gdal.srsWkt) } : {}),
        })),
      cellSize_m,
    );
    checkLatitudeRange({ ...grid, latitudes: outlineLatitudes(grid) }, budget);
    const threads = options.workers ?? Math.min(8, availableParallelism());
    checkBuildBudget(
      {
        outDir,
        width: grid.width,
        height: grid.height,
        cellSize_m,
        ...estimateBuild({
          width: grid.width,
          height: grid.height,
          bands: model.layers.length + 8,
          inputs: inputs.length,
          threads,
          inputWidthMax: Math.max(...inputs.map((i) => i.source.grid.width)),
          geotiff: options.geotiff !== false,
          alignedInputs: reader === 'gdal' ? inputs.length : 0,
        }),
      },
      budget,
    );
    const output = await beginAtomicOutput(outDir);
    let stage: FaultStage = 'screen';
    const enter = async (next: FaultStage, target: string) => {
      stage = next;
      await faultPoint(next, target);
    };
    try {
      const alignedDir = join(output.dir, '.inputs');
      if (reader === 'gdal') await alignInputs(inputs, grid, alignedDir, (d, t) => progress('warp', d, t));
      await enter('screen', output.dir);
      const bandsDir = join(output.dir, '.bands');
      const result = await computeLayers({
        grid,
        bandsDir,
        inputs,
        model,
        spec,
        workers: threads,
        minCellsForWorkers: options.minCellsForWorkers,
        onProgress: (d, t) => progress('screen', d, t),
        windowRunner: options.distributor?.windows,
      });
      if (result.cellsScreened === 0) {
        throw new InputError(
          `${inputs.map((i) => i.entry.file).join(', ')}: no cell has every required input (grids share no land)`,
        );
      }
      const stats = result.layers.map((layer, i) => bandStatsOf(result.files, i, layer.kind));
      const bands = result.layers.map((layer, i) => bandFor(layer, stats[i]));
      const margin = (2 * cellSize_m) / 111_000;
      const b = result.bounds;
      const lonMargin = margin / Math.cos((Math.min(85, b[3]) * Math.PI) / 180);
      const bounds: [number, number, number, number] = [
        Math.max(-180, b[0] - lonMargin),
        Math.max(-85, b[1] - margin),
        Math.min(180, b[2] + lonMargin),
        Math.min(85, b[3] + margin),
      ];
      const { minZoom, maxZoom } = zoomRangeFor(cellSize_m, (bounds[1] + bounds[3]) / 2);

      await enter('tiles', join(output.dir, 'tiles'));
      const tilesByZoom = await writeTilePyramid({
        tilesDir: join(output.dir, 'tiles'),
        grid,
        files: result.files,
        bands: bands.map((band) => ({ kind: band.kind, quant: band })),
        minZoom,
        maxZoom,
        bounds,
        onTile: (d, t) => progress('tiles', d, t),
        workers: result.workers,
        subtreeRunner: options.distributor?.subtrees,
      });
      let geotiffs: Record<string, string> | undefined;
      if (options.geotiff !== false) {
        await enter('geotiff', join(output.dir, 'geotiff'));
        geotiffs = {};
        await mkdir(join(output.dir, 'geotiff'));
        const cautions = [SCREENING_CAUTION, ...GROUND_CAUTIONS].join(' ');
        for (let i = 0; i < bands.length; i++) {
          const file = `geotiff/${bands[i].id}.tif`;
          const band = bands[i];
          await writeBandCog({
            path: join(output.dir, file),
            rawPath: result.files.paths[i],
            width: grid.width,
            height: grid.height,
            geoTransform: grid.geoTransform,
            crs: grid.crs,
            band: {
              id: band.id,
              title: band.title,
              unit: band.unit,
              kind: band.kind,
              ...(band.ramp ? { ramp: band.ramp } : {}),
              ...(band.classes ? { classes: band.classes } : {}),
            },
            metadata: {
              TITLE: `Pile Atlas: ${band.title}`,
              CAUTION: cautions,
              ...(config.region.fictional ? { NOTICE: FICTIONAL_DATA_NOTICE } : {}),
              REGION: config.region.name,
            },
          });
          geotiffs[band.id] = file;
          progress('geotiff', i + 1, bands.length);
        }
      }
      await enter('manifest', join(output.dir, 'manifest.json'));
      // The GeoJSON layers as read and validated at load time (never re-read from the inputs).
      if (geojson.settlements !== undefined)
        await writeFile(join(output.dir, 'settlements.geojson'), geojson.settlements);
      if (geojson.land !== undefined) await writeFile(join(output.dir, 'land.geojson'), geojson.land);
      const tiles = Object.values(tilesByZoom).reduce((a, c) => a + c, 0);
      const shares: Record<string, Record<string, number>> = {};
      result.layers.forEach((layer, i) => {
        if (layer.classes) shares[layer.id] = classShares(stats[i], layer.classes);
      });
      await rm(bandsDir, { recursive: true, force: true });
      await rm(alignedDir, { recursive: true, force: true });
      await options.distributor?.cleanup();
      const seconds = (Date.now() - started) / 1000;
      const summary = {
        cellsTotal: result.cellsTotal,
        cellsScreened: result.cellsScreened,
        cellsMissingInput: result.cellsMissingInput,
        cellsModelNodata: result.cellsModelNodata,
        screenedArea_km2: Math.round((result.cellsScreened * cellSize_m * cellSize_m) / 1e6),
        classShares: shares,
        tiles,
        workers: result.workers,
        seconds,
      };
      const manifest = await assembleManifest({
        config,
        inputs,
        grid,
        bands,
        bounds,
        minZoom,
        maxZoom,
        parameters: {
          cellSize_m,
          resampling:
            reader === 'gdal'
              ? {
                  library: 'GDAL gdalwarp (WebAssembly)',
                  class: 'near',
                  continuous: 'bilinear over valid pixels',
                }
              : { class: 'nearest', continuous: 'bilinear over valid neighbours' },
          overviews: { class: 'mode', continuous: 'mean' },
          model: modelName,
          ...(options.scenarioFile ? { scenarioFile: options.scenarioFile } : {}),
        },
        ...(scenario ? { scenario, criteria: manifestCriteria(scenario) } : {}),
        summary,
        geotiffs,
      });
      const checked = manifestSchema.parse(manifest);
      await writeFile(join(output.dir, 'manifest.json'), JSON.stringify(checked, null, 2) + '\n');
      await validateOutput(output.dir, checked);
      stage = 'swap';
      await output.commit();
      return {
        outDir,
        manifest: join(outDir, 'manifest.json'),
        model: modelName,
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
        workers: result.workers,
        seconds: (Date.now() - started) / 1000,
        cellsPerSecond: Math.round(result.cellsTotal / ((Date.now() - started) / 1000)),
        ...(options.distributor ? { queue: options.distributor.report() } : {}),
      };
    } catch (err) {
      await output.discard();
      await options.distributor?.cleanup().catch(() => undefined);
      const code = (err as NodeJS.ErrnoException)?.code;
      if (code && DISK_FULL.has(code)) throw diskFullError(outDir, stage, err as NodeJS.ErrnoException);
      throw err;
    }
  }
}

/** Re-read the manifest and check one tile per zoom for size before swapping the output in. */
async function validateOutput(dir: string, manifest: Manifest): Promise<void> {
  const again = manifestSchema.parse(JSON.parse(await readFile(join(dir, 'manifest.json'), 'utf8')));
  const expected = again.bands.length * TILE_SIZE * TILE_SIZE * 2;
  for (let z = manifest.tiles.minZoom; z <= manifest.tiles.maxZoom; z++) {
    const xs = await readdir(join(dir, 'tiles', String(z))).catch(() => [] as string[]);
    if (xs.length === 0) throw new Error(`build produced no tiles at zoom ${z}`);
    const ys = await readdir(join(dir, 'tiles', String(z), xs[0]));
    const size = (await stat(join(dir, 'tiles', String(z), xs[0], ys[0]))).size;
    if (size !== expected)
      throw new Error(`tile z${z}/${xs[0]}/${ys[0]} has ${size} bytes, expected ${expected}`);
  }
}
