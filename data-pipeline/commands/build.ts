/** `pile-atlas build`: screen a region and write the tile pyramid, GeoTIFFs and manifest. */
import { availableParallelism } from 'node:os';
import { DEFAULT_MIN_LATITUDE_DEG, defaultBudget, type BuildBudget } from '../build/build-budget';
import { buildTiles, type BuildSummary } from '../build/build-tiles';
import { InputError } from '../input-error';
import { INPUTS_CONFIG_FILE } from '../inputs-config';
import { createProgressBar } from '../progress-bar';
import type { Command } from './command';
import { readJsonFile } from '../read/read-json-file';
import { createQueueDistributor, type QueueDistributor } from '../queue/queue-distributor';
import { parseQueueUrl } from '../queue/redis-url';
import { sharedRoot } from '../queue/shared-storage';
import { numberOption, parseOptions, requireOption, type ParsedOptions } from './parse-options';

const MB = 1024 * 1024;

/** The budget options given (--max-*, --min-latitude); they override the inputs config's budget. */
function budgetOptions(opts: ParsedOptions): Partial<BuildBudget> {
  const given = (name: string) => opts.values[name] !== undefined;
  const mb = (name: string) => Math.round(numberOption('build', opts, name, 0, 0.001, 1e9) * MB);
  return {
    ...(given('max-input-mb') ? { maxInputBytes: mb('max-input-mb') } : {}),
    ...(given('max-cells') ? { maxCells: numberOption('build', opts, 'max-cells', 0, 1, 1e12, true) } : {}),
    ...(given('max-memory-mb') ? { maxMemoryBytes: mb('max-memory-mb') } : {}),
    ...(given('max-disk-mb') ? { maxDiskBytes: mb('max-disk-mb') } : {}),
    ...(given('min-latitude')
      ? { minLatitude_deg: numberOption('build', opts, 'min-latitude', 0, -90, 90) }
      : {}),
  };
}

/** The run summary for stderr: cells, time, and the share of cells in each class of the class bands. */
export function formatRunSummary(s: BuildSummary): string {
  const lines = [
    `screened ${s.cellsScreened} of ${s.cellsTotal} cells in ${s.seconds.toFixed(1)} s ` +
      `(${s.workers} worker${s.workers === 1 ? '' : 's'}, ${s.cellsPerSecond} cells/s); ` +
      `${s.tiles} tiles, zoom ${s.minZoom}-${s.maxZoom}; model: ${s.model}`,
  ];
  if (s.queue) {
    const q = s.queue;
    lines.push(
      `queue: ${q.jobs} jobs, ${q.ran} run by ${q.workers} worker process${q.workers === 1 ? '' : 'es'}, ` +
        `${q.reused} reused from an earlier build, ${q.retried} retried`,
    );
  }
  if (s.cellsMissingInput > 0) lines.push(`warning: ${s.cellsMissingInput} land cells lack a required input`);
  if (s.cellsModelNodata > 0) lines.push(`warning: ${s.cellsModelNodata} cells outside the model's domain`);
  for (const [band, shares] of Object.entries(s.classShares)) {
    const parts = Object.entries(shares).map(([label, f]) => `${label} ${(f * 100).toFixed(1)}%`);
    lines.push(`  ${band}: ${parts.join(', ')}`);
  }
  return lines.join('\n') + '\n';
}

/** The value options and flags `pile-atlas build` takes. */
const BUILD_OPTIONS = {
  values: [
    'in',
    'out',
    'cell-size',
    'scenario',
    'model',
    'workers',
    'max-input-mb',
    'max-cells',
    'max-memory-mb',
    'max-disk-mb',
    'members',
    'seed',
    'min-latitude',
    'queue',
    'shared',
  ],
  flags: ['quiet', 'no-geotiff', 'ensemble'],
};

/** --model (screening or basic) and the --scenario file it applies to, read as JSON. */
async function modelOptions(
  opts: ParsedOptions,
): Promise<{ modelKind: 'screening' | 'basic'; scenarioFile?: string; scenario?: unknown }> {
  const modelKind = opts.values.model ?? 'screening';
  if (modelKind !== 'screening' && modelKind !== 'basic') {
    throw new InputError(`build: --model must be screening or basic, got "${modelKind}"`);
  }
  if (modelKind === 'basic' && opts.values.scenario) {
    throw new InputError('build: --scenario applies to --model screening only');
  }
  const scenarioFile = opts.values.scenario;
  const scenario = scenarioFile ? await readJsonFile(scenarioFile, scenarioFile) : undefined;
  return { modelKind, scenarioFile, scenario };
}

/** --ensemble, --members and --seed (each turns the ensemble on; screening model only). */
function ensembleOption(
  opts: ParsedOptions,
  modelKind: 'screening' | 'basic',
): { members?: number; seed?: number } | undefined {
  const members =
    opts.values.members !== undefined ? numberOption('build', opts, 'members', 32, 1, 1024, true) : undefined;
  const seed =
    opts.values.seed !== undefined ? numberOption('build', opts, 'seed', 1, 0, 0xffffffff, true) : undefined;
  const ensemble =
    opts.flags.has('ensemble') || members !== undefined || seed !== undefined ? { members, seed } : undefined;
  if (ensemble && modelKind === 'basic') {
    throw new InputError('build: --ensemble, --members and --seed apply to --model screening only');
  }
  return ensemble;
}

/** With --queue (and its --shared storage): the distributor that runs the build on queue workers. */
async function queueDistributor(opts: ParsedOptions, quiet: boolean): Promise<QueueDistributor | undefined> {
  if (opts.values.queue === undefined) {
    if (opts.values.shared !== undefined) {
      throw new InputError('build: --shared applies to --queue builds only');
    }
    return undefined;
  }
  const connection = parseQueueUrl(opts.values.queue);
  const shared = sharedRoot(requireOption('build', opts, 'shared'));
  return createQueueDistributor({
    connection,
    shared,
    log: quiet ? undefined : (line) => process.stderr.write(`${line}\n`),
  });
}

export const buildCommand: Command = {
  name: 'build',
  summary: 'screen every cell of a region and write tiles, GeoTIFFs and manifest.json',
  help: `pile-atlas build --in <dir> --out <dir> [--scenario <file>] [options]

Reads <in>/${INPUTS_CONFIG_FILE} and the GeoTIFF grids it lists (EPSG:4326, polar stereographic
3413/3995, Lambert azimuthal 3571-3576, conic 3338/3978, UTM; any resolution and extent), checks them
(file, georeferencing, CRS, nodata, units and plausible ranges), resamples them onto one analysis grid
in EPSG:3413 (nearest for classes, bilinear for continuous values), screens every cell in parallel and
writes:
  <out>/tiles/{z}/{x}/{y}.bin   Web Mercator tile pyramid (overviews: classes by mode, values by mean)
  <out>/geotiff/<band>.tif      every band as a GeoTIFF in EPSG:3413 (nodata -9999)
  <out>/display/<band>.pmtiles  every band as PNG map tiles coloured as the web map (PMTiles v3)
  <out>/manifest.json           bands, units, ranges, sources with sha256, scenario, run summary
  <out>/settlements.geojson, <out>/land.geojson (copied when the config lists them)
The output is replaced atomically: if anything fails or the build is killed, a previous <out> stays
as it was (the next build finishes the recovery and removes what a killed build left behind). --out
may not be --in, lie inside it or contain it, or name a file or a non-empty directory that is not a
previous build. Before reading pixels the build checks each grid's declared size, the analysis grid,
and the memory and disk it needs against a budget.

Options:
  --in <dir>          inputs directory (holding ${INPUTS_CONFIG_FILE})
  --out <dir>         output directory
  --scenario <file>   scenario JSON for the screening model (default: documented defaults), or a
                      scenario set { "scenarios": [ ... ] }: inputs read once, the first scenario
                      written at <out>, each other one under <out>/scenarios/<slug>/, every
                      manifest listing them all with their differences from the first
  --model <name>      screening (default) or basic (TTOP + Stefan only)
  --cell-size M       analysis cell size in metres (default 1000)
  --workers N         worker threads (default: cores, here ${availableParallelism()})
  --ensemble          also run the per-cell ensemble over the declared uncertainties: P10/P50/P90
                      bands, probability of success and robust class (on by itself when the
                      scenario has an "uncertainty" field)
  --members N         ensemble members per cell (default 32, from the convergence study; implies --ensemble)
  --seed N            seed of the ensemble's Latin hypercube (default 1; implies --ensemble)
  --no-geotiff        skip the per-band GeoTIFFs
  --quiet             no progress bar
  --max-input-mb N    decoded size allowed per input grid (default ${defaultBudget().maxInputBytes / MB})
  --max-cells N       analysis grid cells allowed (default ${defaultBudget().maxCells})
  --max-memory-mb N   estimated memory allowed (default 3/4 of RAM, here ${Math.round(defaultBudget().maxMemoryBytes / MB)})
  --max-disk-mb N     disk the build may fill (default: the free space where --out is)
  --min-latitude D    southernmost latitude the analysis grid may reach (default ${DEFAULT_MIN_LATITUDE_DEG}°N)
  --queue <url>       screen and tile on \`pile-atlas worker\` processes through the Redis server at
                      redis://[:password@]host:port[/db]: windows and tile subtrees become queue jobs,
                      a job is tried 3 times, jobs finished by an earlier build of the same inputs are
                      reused; the output is the same, byte for byte, as a local build's
  --shared <dir>      with --queue: shared storage every worker sees (inputs are copied there under
                      their checksums; job outputs are written there)
  --verbose           every issue of a bad input, one per line, and stack traces of internal errors
  --help              this text

Prints a JSON summary on stdout; progress with ETA and the run summary on stderr.`,
  async run(argv) {
    const opts = parseOptions('build', argv, BUILD_OPTIONS);
    const inDir = requireOption('build', opts, 'in');
    const outDir = requireOption('build', opts, 'out');
    const cellSize_m = numberOption('build', opts, 'cell-size', 1000, 50, 50_000);
    const workers = numberOption('build', opts, 'workers', Math.min(8, availableParallelism()), 1, 64, true);
    const { modelKind, scenarioFile, scenario } = await modelOptions(opts);
    const budget = budgetOptions(opts);
    const ensemble = ensembleOption(opts, modelKind);
    const quiet = opts.flags.has('quiet');
    const distributor = await queueDistributor(opts, quiet);
    let summary: BuildSummary;
    try {
      summary = await buildTiles({
        inDir,
        outDir,
        cellSize_m,
        workers,
        modelKind,
        scenario,
        scenarioFile,
        ensemble,
        geotiff: !opts.flags.has('no-geotiff'),
        budget,
        onProgress: quiet ? undefined : createProgressBar(),
        distributor,
      });
    } finally {
      await distributor?.close();
    }
    if (!quiet) process.stderr.write(formatRunSummary(summary));
    process.stdout.write(JSON.stringify(summary, null, 2) + '\n');
    return 0;
  },
};
