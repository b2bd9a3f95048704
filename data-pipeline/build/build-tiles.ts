/**
 * `pile-atlas build`: inputs directory -> screened tile pyramid, per-band GeoTIFFs and manifest.json.
 * read + validate inputs (load-inputs.ts) -> analysis grid in EPSG:3413 (analysis-grid.ts) -> screen
 * every cell with a ScreeningModel, in row windows across worker threads, each window's rows written to
 * one raw Float32 file per band in the temporary output (compute-layers.ts, band-files.ts) -> Web
 * Mercator tiles with overviews (write-tile-pyramid.ts) -> one GeoTIFF per band in EPSG:3413
 * (write-band-geotiff.ts) -> manifest (assemble-manifest.ts) -> copy settlements/land GeoJSON.
 * Everything is written into a temporary directory beside `outDir`, validated, then swapped in
 * (atomic-output.ts): on any error the previous output stays untouched.
 * This file checks the grid and the budget and runs the stages; each scenario's screening, tiles and
 * GeoTIFFs are in screen-scenario.ts, the manifests in write-manifests.ts (shared state: build-run.ts).
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
import { rm } from 'node:fs/promises';
import { join } from 'node:path';
import { scenarioSchema, type Scenario } from '../../layers/screening/scenario';
import { isScenarioSetJson, scenarioSetSchema } from '../../layers/screening/scenario-set';
import { ValidationError } from '../../layers/validation-error';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import type { GridSpread, SpreadRole } from '../../layers/screening/uncertainty-schema';
import type { InputsConfig } from '../inputs-config';
import { InputError } from '../input-error';
import type { Progress } from '../progress-bar';
import { analysisGridFor, outlineLatitudes, type AnalysisGrid } from './analysis-grid';
import { beginAtomicOutput, recoverOutput } from './atomic-output';
import { checkBuildBudget, checkLatitudeRange, estimateBuild, type BuildBudget } from './build-budget';
import type { BuildRun, BuildSetup, ResolvedModel, ScenarioOutput } from './build-run';
import { faultPoint, type FaultStage } from './fault-points';
import { checkOutputTarget } from './output-guard';
import { loadInputs, type InputReader, type LoadedInput } from './load-inputs';
import { gdalTransformTo } from './align-inputs';
import { sdGridRoles } from './sd-grids';
import { ANALYSIS_CRS } from '../crs/crs-definitions';
import { createModelFromSpec, type ModelSpec } from './model-spec';
import type { BuildDistributor } from './build-distributor';
import { screenScenarios } from './screen-scenario';
import { writeManifests } from './write-manifests';

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
  /**
   * Run the per-cell ensemble (layers/screening/cell-ensemble-model.ts): `true` for the scenario's
   * uncertainty settings (defaults when it has none), or members/seed overriding them. Also on when
   * the scenario has an `uncertainty` field.
   */
  ensemble?: boolean | { members?: number; seed?: number };
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
  /** A scenario-set build: each scenario's name and output directory (relative to outDir). */
  scenarios?: { name: string; dir: string }[];
}

function resolveModel(options: BuildOptions, scenarioJson: unknown): ResolvedModel {
  if (options.model) return { model: options.model, name: 'custom' };
  const base = (scenarioJson ?? {}) as Record<string, unknown>;
  const wantsEnsemble =
    options.modelKind !== 'basic' &&
    (options.ensemble !== undefined && options.ensemble !== false ? true : base.uncertainty !== undefined);
  const overrides = typeof options.ensemble === 'object' ? options.ensemble : {};
  const scenario = wantsEnsemble
    ? {
        ...base,
        uncertainty: {
          ...((base.uncertainty as Record<string, unknown> | undefined) ?? {}),
          ...(overrides.members !== undefined ? { members: overrides.members } : {}),
          ...(overrides.seed !== undefined ? { seed: overrides.seed } : {}),
        },
      }
    : base;
  const spec: ModelSpec =
    options.modelKind === 'basic'
      ? { kind: 'basic' }
      : wantsEnsemble
        ? { kind: 'ensemble', scenario }
        : { kind: 'screening', scenario };
  let parsedScenario: Scenario | undefined;
  if (spec.kind !== 'basic') {
    // Validated here, so that an error the model throws afterwards is a bug (exit 1), not bad input.
    const parsed = scenarioSchema.safeParse(spec.scenario ?? {});
    if (!parsed.success) throw ValidationError.fromZod(options.scenarioFile ?? 'scenario', parsed.error);
    parsedScenario = parsed.data;
  }
  return {
    model: createModelFromSpec(spec),
    spec,
    name:
      spec.kind === 'basic'
        ? 'basic (TTOP + Stefan)'
        : spec.kind === 'ensemble'
          ? 'per-cell screening model, ensemble'
          : 'per-cell screening model',
    scenario: parsedScenario,
  };
}

/** The spreads the inputs config declares, per grid role. */
function declaredSpreads(config: InputsConfig): Partial<Record<SpreadRole, GridSpread>> {
  const out: Partial<Record<SpreadRole, GridSpread>> = {};
  for (const g of config.grids) if (g.uncertainty) out[g.role] = g.uncertainty;
  return out;
}

/**
 * The models of a build: one, or one per scenario of a scenario set (`{ scenarios: [...] }`,
 * scenario-set.ts), validated all at once before any input is read.
 */
function resolveModels(options: BuildOptions): ResolvedModel[] {
  if (options.model || options.modelKind === 'basic' || !isScenarioSetJson(options.scenario)) {
    return [resolveModel(options, options.scenario)];
  }
  const parsed = scenarioSetSchema.safeParse(options.scenario);
  if (!parsed.success) throw ValidationError.fromZod(options.scenarioFile ?? 'scenario set', parsed.error);
  const raw = (options.scenario as { scenarios: unknown[] }).scenarios;
  return raw.map((json) => resolveModel(options, json));
}

const DISK_FULL = new Set(['ENOSPC', 'EDQUOT']);

/** A full disk while writing `outDir`: one line naming the output (the previous output is untouched). */
function diskFullError(outDir: string, stage: string, err: NodeJS.ErrnoException): InputError {
  return new InputError(
    `--out ${outDir}: no space left on the device (${err.code} while writing the ${stage}); ` +
      'nothing was replaced, the previous output is untouched; free space or choose another --out',
  );
}

/**
 * Build tiles, GeoTIFFs and manifest from the inputs in `inDir` into `outDir` (atomically). With a
 * scenario set the inputs are read, validated and checksummed once and the analysis grid built once;
 * each scenario is screened and written: the first at the root of `outDir` (as a one-scenario build),
 * the others under scenarios/<slug>/ with their own tiles, GeoTIFFs and manifest, every manifest
 * listing all scenarios (scenarioSet). The summary describes the first scenario.
 */
export async function buildTiles(options: BuildOptions): Promise<BuildSummary> {
  const started = Date.now();
  const { inDir, outDir, onProgress } = options;
  const cellSize_m = options.cellSize_m ?? 1000;
  const progress = (stage: string, done: number, total: number) => onProgress?.({ stage, done, total });
  // A build killed earlier may have left a swap half done: put the previous output back first.
  recoverOutput(outDir);
  checkOutputTarget(inDir, outDir);
  const models = resolveModels(options);

  const reader = options.reader ?? 'gdal';
  const loaded = await loadInputs(inDir, (d, t) => progress('read', d, t), options.budget, reader);
  try {
    return await buildFromInputs({ options, started, cellSize_m, reader, models, progress }, loaded);
  } finally {
    if (loaded.derivedDir) await rm(loaded.derivedDir, { recursive: true, force: true });
  }
}

/** What loadInputs hands the build. */
type Loaded = Awaited<ReturnType<typeof loadInputs>>;

/**
 * Check the analysis grid and the budget, then screen, tile and write every scenario into a temporary
 * output and swap it in; on any error the temporary output is discarded (a full disk named as such).
 */
async function buildFromInputs(setup: BuildSetup, loaded: Loaded): Promise<BuildSummary> {
  const { options, models } = setup;
  const { config, inputs, budget } = loaded;
  useDeclaredSpreads(models, config);
  await faultPoint('read', options.inDir);
  const grid = await analysisGridOf(setup, inputs);
  checkLatitudeRange({ ...grid, latitudes: outlineLatitudes(grid) }, budget);
  const threads = options.workers ?? Math.min(8, availableParallelism());
  checkBudgetOf(setup, inputs, grid, threads, budget);
  const output = await beginAtomicOutput(options.outDir);
  let stage: FaultStage = 'screen';
  const enter = async (next: FaultStage, target: string) => {
    stage = next;
    await faultPoint(next, target);
  };
  const run: BuildRun = { ...setup, config, inputs, geojson: loaded.geojson, grid, threads, enter };
  try {
    const outputs = await screenScenarios(run, output.dir);
    await writeManifests(run, outputs, output.dir);
    await options.distributor?.cleanup();
    stage = 'swap';
    await output.commit();
    return buildSummary(run, outputs);
  } catch (err) {
    await options.distributor?.cleanup().catch(() => undefined);
    await output.discard();
    const code = (err as NodeJS.ErrnoException)?.code;
    if (code && DISK_FULL.has(code)) throw diskFullError(options.outDir, stage, err as NodeJS.ErrnoException);
    throw err;
  }
}

/** Ensemble models take the grids' own spreads (inputs config) in place of the scenario's defaults. */
function useDeclaredSpreads(models: ResolvedModel[], config: InputsConfig): void {
  for (const m of models) {
    if (m.spec?.kind === 'ensemble') {
      m.spec = { ...m.spec, gridSpreads: declaredSpreads(config), gridSdRoles: sdGridRoles(config) };
      m.model = createModelFromSpec(m.spec);
    }
  }
}

/** The analysis grid in EPSG:3413 over the required inputs' valid pixels (GDAL transforms with GDAL). */
async function analysisGridOf(setup: BuildSetup, inputs: LoadedInput[]): Promise<AnalysisGrid> {
  const toAnalysis = setup.reader === 'gdal' ? await gdalTransformTo(ANALYSIS_CRS) : undefined;
  return analysisGridFor(
    inputs
      .filter((i) => i.role.required)
      .map((i) => ({
        label: i.entry.file,
        grid: i.source.grid,
        validBox: i.source.validBox,
        ...(toAnalysis && i.source.gdal ? { toAnalysis: toAnalysis(i.source.gdal.srsWkt) } : {}),
      })),
    setup.cellSize_m,
  );
}

/** The grid's cells and the build's estimated memory and disk against the budget, before any pixel. */
function checkBudgetOf(
  setup: BuildSetup,
  inputs: LoadedInput[],
  grid: AnalysisGrid,
  threads: number,
  budget: BuildBudget,
): void {
  const { options, models, reader } = setup;
  checkBuildBudget(
    {
      outDir: options.outDir,
      width: grid.width,
      height: grid.height,
      cellSize_m: setup.cellSize_m,
      ...estimateBuild({
        width: grid.width,
        height: grid.height,
        bands: models.reduce((n, m) => n + m.model.layers.length + 8, 0),
        inputs: inputs.length,
        threads,
        inputWidthMax: Math.max(...inputs.map((i) => i.source.grid.width)),
        geotiff: options.geotiff !== false,
        alignedInputs: reader === 'gdal' ? inputs.length : 0,
      }),
    },
    budget,
  );
}

/** The run summary (first scenario; with a set, every scenario's name and directory). */
function buildSummary(run: BuildRun, outputs: ScenarioOutput[]): BuildSummary {
  const { options, started, models } = run;
  const first = outputs[0];
  const r = first.result;
  return {
    outDir: options.outDir,
    manifest: join(options.outDir, 'manifest.json'),
    model: models[0].name,
    cellsTotal: r.cellsTotal,
    cellsScreened: r.cellsScreened,
    cellsMissingInput: r.cellsMissingInput,
    cellsModelNodata: r.cellsModelNodata,
    tiles: first.tiles,
    tilesByZoom: first.tilesByZoom,
    minZoom: first.minZoom,
    maxZoom: first.maxZoom,
    bands: first.bands.map((x) => x.id),
    classShares: first.shares,
    workers: r.workers,
    seconds: (Date.now() - started) / 1000,
    cellsPerSecond: Math.round(r.cellsTotal / ((Date.now() - started) / 1000)),
    ...(options.distributor ? { queue: options.distributor.report() } : {}),
    ...(models.length > 1
      ? {
          scenarios: outputs.map((o) => ({
            name: o.resolved.scenario?.name ?? '',
            dir: o.sub ? o.sub.slice(0, -1) : '.',
          })),
        }
      : {}),
  };
}
