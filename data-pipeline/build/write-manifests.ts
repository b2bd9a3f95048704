/**
 * The last stage of a build (build-tiles.ts) before the swap: each scenario's GeoJSON layers and
 * manifest.json (assemble-manifest.ts; with a scenario set, every manifest lists all scenarios), each
 * manifest re-read and the tiles spot-checked before the output may be swapped in.
 */
import { readdir, readFile, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { manifestCriteria } from '../../layers/screening/cell-screening-model';
import { effectiveHorizonYear } from '../../layers/screening/climate-horizon';
import { BAND } from '../../layers/screening/band-ids';
import { manifestSchema, type Manifest, type ScenarioSetInfo } from '../../layers/screening/manifest';
import type { Scenario } from '../../layers/screening/scenario';
import { differenceText, scenarioDifferences } from '../../layers/screening/scenario-set';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import { TILE_SIZE } from '../../layers/screening/tile-format';
import { writeDisplayPackage } from '../export/write-display-package';
import { assembleManifest } from './assemble-manifest';
import type { BuildRun, ScenarioOutput } from './build-run';

/** Write every scenario's GeoJSON layers and checked manifest, and validate what was written. */
export async function writeManifests(
  run: BuildRun,
  outputs: ScenarioOutput[],
  rootDir: string,
): Promise<void> {
  await run.enter('manifest', join(rootDir, 'manifest.json'));
  const setInfo = run.models.length > 1 ? scenarioSetInfo(outputs) : undefined;
  const seconds = (Date.now() - run.started) / 1000;
  for (const o of outputs) {
    await writeGeoJsonLayers(run, o.dir);
    const manifest = await manifestOf(run, o, seconds);
    const withSet = setInfo
      ? {
          ...manifest,
          scenarioSet: {
            ...setInfo,
            current: o.resolved.scenario?.name ?? '',
            root: o.sub ? '../../' : '',
          },
        }
      : manifest;
    const checked = manifestSchema.parse(withSet);
    // The display package (PMTiles of PNG tiles per band) from the tiles just written.
    checked.parameters.display = await writeDisplayPackage(o.dir, checked, (d, t) =>
      run.progress('display', d, t),
    );
    await writeFile(join(o.dir, 'manifest.json'), JSON.stringify(checked, null, 2) + '\n');
    await validateOutput(o.dir, checked);
  }
}

/** The GeoJSON layers as read and validated at load time (never re-read from the inputs). */
async function writeGeoJsonLayers(run: BuildRun, dir: string): Promise<void> {
  const { geojson } = run;
  if (geojson.settlements !== undefined)
    await writeFile(join(dir, 'settlements.geojson'), geojson.settlements);
  if (geojson.land !== undefined) await writeFile(join(dir, 'land.geojson'), geojson.land);
  if (geojson.roads !== undefined) await writeFile(join(dir, 'roads.geojson'), geojson.roads);
}

/** One scenario's manifest: inputs, grid, bands, parameters, scenario and criteria, run summary. */
async function manifestOf(run: BuildRun, o: ScenarioOutput, seconds: number) {
  const { cellSize_m, options } = run;
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
  return assembleManifest({
    config: run.config,
    inputs: run.inputs,
    grid: run.grid,
    bands: o.bands,
    bounds: o.bounds,
    minZoom: o.minZoom,
    maxZoom: o.maxZoom,
    parameters: {
      cellSize_m,
      resampling:
        run.reader === 'gdal'
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
