/**
 * `pile-atlas build`: inputs directory -> screened tile pyramid, per-band GeoTIFFs and manifest.json.
 * read + validate inputs (load-inputs.ts) -> analysis grid in EPSG:3413 (analysis-grid.ts) -> screen
 * every cell with a ScreeningModel, in row windows across worker threads, each window's rows written to
 * one raw Float32 file per band in the temporary output (compute-layers.ts, band-files.ts) -> Web
 * Mercator tiles with overviews (write-tile-pyramid.ts) -> one GeoTIFF per band in EPSG:3413
 * (write-band-geotiff.ts) -> manifest (assemble-manifest.ts) -> copy settlements/land GeoJSON.
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
import { dirname, join } from 'node:path';
import { manifestCriteria } from '../../layers/screening/cell-screening-model';
import { scenarioSchema, type Scenario } from '../../layers/screening/scenario';
import {
  differenceText,
  isScenarioSetJson,
  scenarioDifferences,
  scenarioSetSchema,
  scenarioSlug,
} from '../../layers/screening/scenario-set';
import { effectiveHorizonYear } from '../../layers/screening/climate-horizon';
import { BAND } from '../../layers/screening/band-ids';
import { ValidationError } from '../../layers/validation-error';
import { manifestSchema, type Manifest, type ScenarioSetInfo } from '../../layers/screening/manifest';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import type { GridSpread, SpreadRole } from '../../layers/screening/uncertainty-schema';
import type { InputsConfig } from '../inputs-config';
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
import { computeLayers } from './compute-layers';
import { addProximityBands } from './proximity-bands';
import { compareWithFirst, type ScenarioComparison } from './compare-scenarios';
import { loadInputs, type InputReader } from './load-inputs';
import { alignInputs, gdalTransformTo } from './align-inputs';
import { sdGridRoles } from './sd-grids';
import { ANALYSIS_CRS } from '../crs/crs-definitions';
import { createModelFromSpec, type ModelSpec } from './model-spec';
import type { BuildDistributor } from './build-distributor';

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

interface ResolvedModel {
  model: ScreeningModel;
  spec?: ModelSpec;
  name: string;
  /** The parsed scenario (screening model only). */
  scenario?: Scenario;
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

function ensembleMembers(model: ScreeningModel): number {
  return (model as ScreeningModel & { uncertainty?: { members: number } }).uncertainty?.members ?? 1;
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

/** One scenario's screened output, before its manifest is written. */
interface ScenarioOutput {
  resolved: ResolvedModel;
  dir: string;
  slug: string;
  /** Directory from the build's root: '' for the first scenario, else scenarios/<slug>/. */
  sub: string;
  result: Awaited<ReturnType<typeof computeLayers>>;
  bands: Manifest['bands'];
  bounds: [number, number, number, number];
  minZoom: number;
  maxZoom: number;
  tilesByZoom: Record<number, number>;
  tiles: number;
  shares: Record<string, Record<string, number>>;
  geotiffs?: Record<string, string>;
  /** Against the first scenario (null for the first). */
  comparison: ScenarioComparison | null;
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
  const modelName = models[0].name;

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
    for (const m of models) {
      if (m.spec?.kind === 'ensemble') {
        // The grids' own spreads (inputs config) replace the scenario's defaults.
        m.spec = { ...m.spec, gridSpreads: declaredSpreads(config), gridSdRoles: sdGridRoles(config) };
        m.model = createModelFromSpec(m.spec);
      }
    }
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
    const output = await beginAtomicOutput(outDir);
    let stage: FaultStage = 'screen';
    const enter = async (next: FaultStage, target: string) => {
      stage = next;
      await faultPoint(next, target);
    };
    try {
      const alignedDir = join(output.dir, '.inputs');
      if (reader === 'gdal') await alignInputs(inputs, grid, alignedDir, (d, t) => progress('warp', d, t));
      const outputs: ScenarioOutput[] = [];
      const slugs = models.map((m, i) =>
        models.length === 1 ? '' : scenarioSlug(m.scenario?.name ?? `s${i}`),
      );
      for (let si = 0; si < models.length; si++) {
        const resolved = models[si];
        const { model, spec } = resolved;
        const dir = si === 0 ? output.dir : join(output.dir, 'scenarios', slugs[si]);
        const tag = models.length > 1 ? ` ${resolved.scenario?.name ?? si}` : '';
        await mkdir(dir, { recursive: true });
        await enter('screen', dir);
        const bandsDir = join(dir, '.bands');
        const result = await computeLayers({
          grid,
          bandsDir,
          inputs,
          model,
          spec,
          workers: threads,
          // An ensemble costs its member count per cell: worth the workers on N times fewer cells.
          minCellsForWorkers:
            options.minCellsForWorkers ??
            (spec?.kind === 'ensemble' ? Math.ceil(400_000 / ensembleMembers(model)) : undefined),
          onProgress: (d, t) => progress(`screen${tag}`, d, t),
          windowRunner: options.distributor?.windows,
        });
        if (result.cellsScreened === 0) {
          throw new InputError(
            `${inputs.map((i) => i.entry.file).join(', ')}: no cell has every required input (grids share no land)`,
          );
        }
        await addProximityBands({
          grid,
          files: result.files,
          layers: result.layers,
          // Beside the model's band files: on the shared storage when the build runs on a queue.
          bandsDir: dirname(result.files.paths[0]),
          maskBand: 0,
          geojson,
        });
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

        await enter('tiles', join(dir, 'tiles'));
        const tilesByZoom = await writeTilePyramid({
          tilesDir: join(dir, 'tiles'),
          grid,
          files: result.files,
          bands: bands.map((band) => ({ kind: band.kind, quant: band })),
          minZoom,
          maxZoom,
          bounds,
          onTile: (d, t) => progress(`tiles${tag}`, d, t),
          workers: result.workers,
          subtreeRunner: options.distributor?.subtrees,
        });
        let geotiffs: Record<string, string> | undefined;
        if (options.geotiff !== false) {
          await enter('geotiff', join(dir, 'geotiff'));
          geotiffs = {};
          await mkdir(join(dir, 'geotiff'));
          const cautions = [SCREENING_CAUTION, ...GROUND_CAUTIONS].join(' ');
          for (let i = 0; i < bands.length; i++) {
            const file = `geotiff/${bands[i].id}.tif`;
            const band = bands[i];
            await writeBandCog({
              path: join(dir, file),
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
                ...(resolved.scenario && models.length > 1 ? { SCENARIO: resolved.scenario.name } : {}),
              },
            });
            geotiffs[band.id] = file;
            progress(`geotiff${tag}`, i + 1, bands.length);
          }
        }
        const shares: Record<string, Record<string, number>> = {};
        result.layers.forEach((layer, i) => {
          if (layer.classes) shares[layer.id] = classShares(stats[i], layer.classes);
        });
        // The first scenario's bands stay until the others are compared with it (compare-scenarios.ts).
        const comparison = si > 0 ? compareWithFirst(outputs[0].result, result) : null;
        if (si > 0 || models.length === 1) await rm(bandsDir, { recursive: true, force: true });
        const tiles = Object.values(tilesByZoom).reduce((a, c) => a + c, 0);
        outputs.push({
          resolved,
          dir,
          slug: slugs[si],
          sub: si === 0 ? '' : `scenarios/${slugs[si]}/`,
          result,
          bands,
          bounds,
          minZoom,
          maxZoom,
          tilesByZoom,
          tiles,
          shares,
          geotiffs,
          comparison,
        });
      }
      if (models.length > 1) await rm(join(output.dir, '.bands'), { recursive: true, force: true });
      await rm(alignedDir, { recursive: true, force: true });

      await enter('manifest', join(output.dir, 'manifest.json'));
      const setInfo = models.length > 1 ? scenarioSetInfo(outputs) : undefined;
      const seconds = (Date.now() - started) / 1000;
      for (const o of outputs) {
        // The GeoJSON layers as read and validated at load time (never re-read from the inputs).
        if (geojson.settlements !== undefined)
          await writeFile(join(o.dir, 'settlements.geojson'), geojson.settlements);
        if (geojson.land !== undefined) await writeFile(join(o.dir, 'land.geojson'), geojson.land);
        if (geojson.roads !== undefined) await writeFile(join(o.dir, 'roads.geojson'), geojson.roads);
        // The ensemble's effective uncertainty: distributions, grid spreads, members and seed.
        const uncertainty = (o.resolved.model as ScreeningModel & { uncertainty?: unknown }).uncertainty;
        const r = o.result;
        const summary = {
          cellsTotal: r.cellsTotal,
          cellsScreened: r.cellsScreened,
          cellsMissingInput: r.cellsMissingInput,
          cellsModelNodata: r.cellsModelNodata,
          screenedArea_km2: Math.round((r.cellsScreened * cellSize_m * cellSize_m) / 1e6),
          classShares: o.shares,
          tiles: o.tiles,
          workers: r.workers,
          seconds,
        };
        const scenario = o.resolved.scenario;
        const manifest = await assembleManifest({
          config,
          inputs,
          grid,
          bands: o.bands,
          bounds: o.bounds,
          minZoom: o.minZoom,
          maxZoom: o.maxZoom,
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
            model: o.resolved.name,
            ...(options.scenarioFile ? { scenarioFile: options.scenarioFile } : {}),
            ...(uncertainty ? { uncertainty } : {}),
          },
          ...(scenario ? { scenario, criteria: manifestCriteria(scenario) } : {}),
          summary,
          geotiffs: o.geotiffs,
        });
        const withSet = setInfo
          ? {
              ...manifest,
              scenarioSet: {
                ...setInfo,
                current: scenario?.name ?? '',
                root: o.sub ? '../../' : '',
              },
            }
          : manifest;
        const checked = manifestSchema.parse(withSet);
        await writeFile(join(o.dir, 'manifest.json'), JSON.stringify(checked, null, 2) + '\n');
        await validateOutput(o.dir, checked);
      }
      await options.distributor?.cleanup();
      stage = 'swap';
      await output.commit();
      const first = outputs[0];
      const r = first.result;
      return {
        outDir,
        manifest: join(outDir, 'manifest.json'),
        model: modelName,
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
    } catch (err) {
      await options.distributor?.cleanup().catch(() => undefined);
      await output.discard();
      const code = (err as NodeJS.ErrnoException)?.code;
      if (code && DISK_FULL.has(code)) throw diskFullError(outDir, stage, err as NodeJS.ErrnoException);
      throw err;
    }
  }
}

/** The scenario list every manifest of a set carries (current and root filled in per manifest). */
function scenarioSetInfo(outputs: ScenarioOutput[]): Omit<ScenarioSetInfo, 'current' | 'root'> {
  const ref = outputs[0].resolved.scenario as Scenario;
  return {
    scenarios: outputs.map((o) => {
      const s = o.resolved.scenario as Scenario;
      const suit = o.shares[BAND.suitability] ?? {};
      const keyFigures: Record<string, number> = {};
      for (const [label, share] of Object.entries(suit)) keyFigures[`share ${label}`] = share;
      keyFigures.cellsScreened = o.result.cellsScreened;
      for (const [k, v] of Object.entries(o.comparison ?? {})) if (Number.isFinite(v)) keyFigures[k] = v;
      return {
        name: s.name,
        slug: o.slug,
        manifest: `${o.sub}manifest.json`,
        warming: s.warmingPathway ? s.warmingPathway.label : 'linear trend per cell',
        designLife_yr: s.designLife_yr,
        horizonYear: effectiveHorizonYear(s),
        differences: scenarioDifferences(ref, s).map((d) => ({ path: d.path, text: differenceText(d) })),
        keyFigures,
      };
    }),
  };
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
