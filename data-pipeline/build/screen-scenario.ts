/**
 * The screening half of a build (build-tiles.ts): the inputs warped onto the analysis grid once, then
 * per scenario every cell screened into raw band files (compute-layers.ts), the proximity bands added,
 * the Web Mercator tile pyramid written (write-tile-pyramid.ts) and every band as a GeoTIFF
 * (write-band-cog.ts), all inside the build's temporary output.
 */
import { mkdir, rm } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../layers/cautions';
import { scenarioSlug } from '../../layers/screening/scenario-set';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import { writeBandCog } from '../export/write-band-cog';
import { InputError } from '../input-error';
import { writeTilePyramid, zoomRangeFor } from '../tiles/write-tile-pyramid';
import { alignInputs } from './align-inputs';
import { bandFor, bandStatsOf, classShares } from './assemble-manifest';
import type { BuildRun, ResolvedModel, ScenarioOutput } from './build-run';
import { compareWithFirst } from './compare-scenarios';
import { computeLayers, type ComputeResult } from './compute-layers';
import { addProximityBands } from './proximity-bands';

function ensembleMembers(model: ScreeningModel): number {
  return (model as ScreeningModel & { uncertainty?: { members: number } }).uncertainty?.members ?? 1;
}

/**
 * Warp the inputs onto the analysis grid (GDAL reader) under `rootDir`, then screen and write every
 * scenario: the first at `rootDir`, the others under scenarios/<slug>/. The scratch files are removed.
 */
export async function screenScenarios(run: BuildRun, rootDir: string): Promise<ScenarioOutput[]> {
  const { models, progress } = run;
  const alignedDir = join(rootDir, '.inputs');
  if (run.reader === 'gdal') {
    await alignInputs(run.inputs, run.grid, alignedDir, (d, t) => progress('warp', d, t));
  }
  const outputs: ScenarioOutput[] = [];
  const slugs = models.map((m, i) => (models.length === 1 ? '' : scenarioSlug(m.scenario?.name ?? `s${i}`)));
  for (let si = 0; si < models.length; si++) {
    outputs.push(await screenScenario(run, si, rootDir, slugs[si], outputs[0]));
  }
  if (models.length > 1) await rm(join(rootDir, '.bands'), { recursive: true, force: true });
  await rm(alignedDir, { recursive: true, force: true });
  return outputs;
}

/**
 * Scenario `si`: screen it, write its tiles and GeoTIFFs and compare it with the `first` scenario's
 * bands (kept until the others are compared with them: compare-scenarios.ts).
 */
async function screenScenario(
  run: BuildRun,
  si: number,
  rootDir: string,
  slug: string,
  first: ScenarioOutput | undefined,
): Promise<ScenarioOutput> {
  const { models, grid, cellSize_m } = run;
  const resolved = models[si];
  const dir = si === 0 ? rootDir : join(rootDir, 'scenarios', slug);
  const tag = models.length > 1 ? ` ${resolved.scenario?.name ?? si}` : '';
  await mkdir(dir, { recursive: true });
  await run.enter('screen', dir);
  const bandsDir = join(dir, '.bands');
  const result = await screenCells(run, resolved, bandsDir, tag);
  await addProximityBands({
    grid,
    files: result.files,
    layers: result.layers,
    // Beside the model's band files: on the shared storage when the build runs on a queue.
    bandsDir: dirname(result.files.paths[0]),
    maskBand: 0,
    geojson: run.geojson,
  });
  const stats = result.layers.map((layer, i) => bandStatsOf(result.files, i, layer.kind));
  const bands = result.layers.map((layer, i) => bandFor(layer, stats[i]));
  const bounds = paddedBounds(result.bounds, cellSize_m);
  const { minZoom, maxZoom } = zoomRangeFor(cellSize_m, (bounds[1] + bounds[3]) / 2);

  await run.enter('tiles', join(dir, 'tiles'));
  const tilesByZoom = await writeTilePyramid({
    tilesDir: join(dir, 'tiles'),
    grid,
    files: result.files,
    bands: bands.map((band) => ({ kind: band.kind, quant: band })),
    minZoom,
    maxZoom,
    bounds,
    onTile: (d, t) => run.progress(`tiles${tag}`, d, t),
    workers: result.workers,
    subtreeRunner: run.options.distributor?.subtrees,
  });
  const geotiffs =
    run.options.geotiff !== false ? await writeGeoTiffs(run, resolved, dir, result, bands, tag) : undefined;
  const shares: Record<string, Record<string, number>> = {};
  result.layers.forEach((layer, i) => {
    if (layer.classes) shares[layer.id] = classShares(stats[i], layer.classes);
  });
  const comparison = si > 0 ? compareWithFirst((first as ScenarioOutput).result, result) : null;
  if (si > 0 || models.length === 1) await rm(bandsDir, { recursive: true, force: true });
  const tiles = Object.values(tilesByZoom).reduce((a, c) => a + c, 0);
  const sub = si === 0 ? '' : `scenarios/${slug}/`;
  return {
    resolved,
    dir,
    slug,
    sub,
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
  };
}

/** Screen every cell of the grid with the scenario's model into band files under `bandsDir`. */
async function screenCells(
  run: BuildRun,
  resolved: ResolvedModel,
  bandsDir: string,
  tag: string,
): Promise<ComputeResult> {
  const { model, spec } = resolved;
  const result = await computeLayers({
    grid: run.grid,
    bandsDir,
    inputs: run.inputs,
    model,
    spec,
    workers: run.threads,
    // An ensemble costs its member count per cell: worth the workers on N times fewer cells.
    minCellsForWorkers:
      run.options.minCellsForWorkers ??
      (spec?.kind === 'ensemble' ? Math.ceil(400_000 / ensembleMembers(model)) : undefined),
    onProgress: (d, t) => run.progress(`screen${tag}`, d, t),
    windowRunner: run.options.distributor?.windows,
  });
  if (result.cellsScreened === 0) {
    throw new InputError(
      `${run.inputs.map((i) => i.entry.file).join(', ')}: no cell has every required input (grids share no land)`,
    );
  }
  return result;
}

/** The screened cells' lon/lat bounds padded by two cells, within +-180 and +-85 degrees. */
function paddedBounds(b: ComputeResult['bounds'], cellSize_m: number): [number, number, number, number] {
  const margin = (2 * cellSize_m) / 111_000;
  const lonMargin = margin / Math.cos((Math.min(85, b[3]) * Math.PI) / 180);
  return [
    Math.max(-180, b[0] - lonMargin),
    Math.max(-85, b[1] - margin),
    Math.min(180, b[2] + lonMargin),
    Math.min(85, b[3] + margin),
  ];
}

/** Every band as a GeoTIFF under `dir`/geotiff/ with the cautions; returns band id -> file. */
async function writeGeoTiffs(
  run: BuildRun,
  resolved: ResolvedModel,
  dir: string,
  result: ComputeResult,
  bands: ScenarioOutput['bands'],
  tag: string,
): Promise<Record<string, string>> {
  const { grid, config } = run;
  await run.enter('geotiff', join(dir, 'geotiff'));
  const geotiffs: Record<string, string> = {};
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
        ...(resolved.scenario && run.models.length > 1 ? { SCENARIO: resolved.scenario.name } : {}),
      },
    });
    geotiffs[band.id] = file;
    run.progress(`geotiff${tag}`, i + 1, bands.length);
  }
  return geotiffs;
}
