/**
 * The coordinating side of a queue-backed build (`pile-atlas build --queue redis://...`): a
 * BuildDistributor (build/build-distributor.ts) that copies the inputs into shared storage under their
 * checksums, stores the job contexts there, queues the screening windows and then the tile subtrees as
 * BullMQ jobs (queue-jobs.ts), waits for them and merges their outputs into the build's band files and
 * tiles directory; the build itself (statistics, top tile levels, GeoTIFFs, manifest, the atomic swap)
 * runs here as in a local build, so the output is byte-identical.
 * Each job id is the checksum of its work: a job already completed (an earlier build of the same
 * inputs) whose output is in shared storage is reused, not queued; a job that failed earlier is queued
 * afresh; one waiting or running (another build's) is waited for. A job is merged once, whatever runs
 * it. Jobs get `attempts` tries (default 3); the first job to fail them all fails the build with its
 * error. Progress counts the jobs the queue reports finished; a status line every 10 s gives the
 * connected workers and the active and waiting jobs.
 */
import { cp, readFile, rm } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { join, relative } from 'node:path';
import { Queue, QueueEvents } from 'bullmq';
import { toolVersion } from '../build/assemble-manifest';
import {
  closeBandFds,
  createBandFiles,
  openBandFds,
  readBandRows,
  writeBandRows,
  type BandFiles,
} from '../build/band-files';
import type {
  BuildDistributor,
  ScreenJobContext,
  SubtreeContext,
  SubtreeResults,
} from '../build/build-distributor';
import type { WindowInput, WindowStats } from '../build/screen-window';
import {
  JOB_FORMAT,
  jobIdOf,
  QUEUE_NAME,
  ROOT_PLANES_FILE,
  STATS_FILE,
  WINDOW_ROWS,
  type BuildJobData,
  type BuildJobResult,
  type ScreenContext,
  type SharedInput,
  type ScreenJobData,
  type ScreenJobResult,
  type TileContext,
  type TileJobData,
  type TileJobResult,
} from './queue-jobs';
import { runJobs, type JobQueue, type QueuedJob, type Tally } from './queue-run-jobs';
import { checkQueueServer, type QueueConnection } from './redis-url';
import { canonicalJson, jobDir, putInput, putObject, sha256Text } from './shared-storage';
import { createReadStream } from 'node:fs';
import { createHash } from 'node:crypto';
import { TILE_SIZE } from '../../layers/screening/tile-format';

/** sha256 of a file, read as a stream. */
async function sha256OfFile(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

export interface QueueDistributorOptions {
  connection: QueueConnection;
  /** The coordinator's path of the shared storage. */
  shared: string;
  /** Tries per job before the build fails (default 3). */
  attempts?: number;
  /** Windows of 32 rows per screening job (default 1). */
  windowsPerJob?: number;
  /** Fewest tile subtree jobs (default 16). */
  subtreeJobs?: number;
  /** Status lines (stderr in the CLI). */
  log?: (line: string) => void;
}

export interface QueueDistributor extends BuildDistributor {
  close(): Promise<void>;
}

/** The screening jobs' shared state, made by `windows.prepare`. */
interface ScreenState {
  ctx: ScreenContext;
  /** Checksum of `ctx` in shared storage. */
  key: string;
  files: BandFiles;
  bandsDir: string;
}

export async function createQueueDistributor(o: QueueDistributorOptions): Promise<QueueDistributor> {
  await checkQueueServer(o.connection);
  const attempts = o.attempts ?? 3;
  const log = o.log ?? (() => undefined);
  const queue = new Queue<BuildJobData, BuildJobResult>(QUEUE_NAME, { connection: o.connection.options });
  const events = new QueueEvents(QUEUE_NAME, { connection: o.connection.options });
  await Promise.all([queue.waitUntilReady(), events.waitUntilReady()]);
  const tally: Tally = { jobs: 0, reused: 0, ran: 0, retried: 0, processing_ms: 0, queueWait_ms: 0 };
  const q: JobQueue = { queue, events, shared: o.shared, attempts, tally, workersSeen: new Set(), log };
  let screen: ScreenState | undefined;

  const windows: BuildDistributor['windows'] = {
    async prepare(c: ScreenJobContext): Promise<BandFiles> {
      screen = await prepareScreen(o.shared, c);
      return screen.files;
    },
    async run(list, onWindow) {
      if (!screen) throw new Error('queue distributor: prepare() before run()');
      await runScreenJobs(q, screen, list, Math.max(1, o.windowsPerJob ?? 1), onWindow);
    },
    workers: () => Math.max(1, q.workersSeen.size),
  };

  const subtrees: BuildDistributor['subtrees'] = {
    minJobs: o.subtreeJobs ?? 16,
    run: (c, zoom, roots, onFinest) => runSubtreeJobs(q, c, zoom, roots, onFinest),
  };

  return {
    windows,
    subtrees,
    async cleanup() {
      if (screen) await rm(screen.bandsDir, { recursive: true, force: true });
    },
    report: () => ({ ...tally, workers: q.workersSeen.size }),
    async close() {
      await events.close();
      await queue.close();
    },
  };
}

/** Copy the inputs into shared storage under their checksums and store the screening context there. */
async function prepareScreen(shared: string, c: ScreenJobContext): Promise<ScreenState> {
  // A companion standard-deviation grid (sd-grids.ts) travels with its input, under its own checksum.
  const ship = async (input: WindowInput, fileSha256?: string): Promise<SharedInput> => {
    const { path, aligned, sd, ...rest } = input;
    const withSd = sd ? { sd: await ship(sd) } : {};
    if (aligned) {
      // Inputs GDAL warped onto the analysis grid travel as that raw grid, under its own checksum.
      const sha256 = await sha256OfFile(aligned);
      const rel = await putInput(shared, aligned, sha256, input.label);
      return { ...rest, sha256, rel, alignedInShared: true, ...withSd };
    }
    const sha256 = fileSha256 ?? (await sha256OfFile(path));
    return { ...rest, sha256, rel: await putInput(shared, path, sha256, input.label), ...withSd };
  };
  const inputs: SharedInput[] = [];
  for (const [i, input] of c.inputs.entries()) inputs.push(await ship(input, c.inputSha256[i]));
  const scenarioChecksum = await putObject(shared, c.spec);
  const ctx: ScreenContext = {
    format: JOB_FORMAT,
    tool: await toolVersion(),
    grid: c.grid,
    inputs,
    echoRoles: c.echoRoles,
    bandCount: c.bandCount,
    inputsChecksum: sha256Text(
      canonicalJson(inputs.map((i) => [i.role, i.sha256, i.unit, i.nodata, ...(i.sd ? [i.sd.sha256] : [])])),
    ),
    scenarioChecksum,
  };
  const key = await putObject(shared, ctx);
  const bandsDir = join(shared, 'bands', key);
  const files = await createBandFiles(bandsDir, c.bandCount, c.grid.width, c.grid.height);
  return { ctx, key, files, bandsDir };
}

/** Queue the windows, `per` to a job, and copy each job's rows into the build's band files. */
async function runScreenJobs(
  q: JobQueue,
  s: ScreenState,
  list: [number, number][],
  per: number,
  onWindow: (stats: WindowStats, rows: number) => void,
): Promise<void> {
  const jobs: QueuedJob<ScreenJobData>[] = [];
  for (let i = 0; i < list.length; i += per) {
    const data: ScreenJobData = {
      kind: 'screen',
      context: s.key,
      inputsChecksum: s.ctx.inputsChecksum,
      scenarioChecksum: s.ctx.scenarioChecksum,
      row0: list[i][0],
      row1: list[Math.min(list.length, i + per) - 1][1],
    };
    jobs.push({ id: jobIdOf(data), data });
  }
  const width = s.ctx.grid.width;
  const buffer = new Float32Array(WINDOW_ROWS * per * width);
  await runJobs<ScreenJobData, ScreenJobResult>(q, jobs, async (job, result) => {
    const dir = jobDir(q.shared, job.id);
    const rows = job.data.row1 - job.data.row0;
    const stats = result?.stats ?? JSON.parse(await readFile(join(dir, STATS_FILE), 'utf8'));
    const from = openBandFds(
      { paths: s.files.paths.map((_, b) => join(dir, `band-${b}.f32`)), width, height: rows },
      'r',
    );
    const to = openBandFds(s.files, 'r+');
    try {
      for (let b = 0; b < from.length; b++) {
        writeBandRows(to[b], width, job.data.row0, readBandRows(from[b], width, 0, rows, buffer));
      }
    } finally {
      closeBandFds(from);
      closeBandFds(to);
    }
    onWindow(stats, rows);
  });
}

/** Store the tile context, queue one job per subtree root and merge their tiles and root planes. */
async function runSubtreeJobs(
  q: JobQueue,
  c: SubtreeContext,
  zoom: number,
  roots: [number, number][],
  onFinest: (count: number) => void,
): Promise<SubtreeResults> {
  const ctx: TileContext = {
    format: JOB_FORMAT,
    grid: c.grid,
    bands: c.files.paths.map((p) => relative(q.shared, p)),
    width: c.files.width,
    height: c.files.height,
    pyramid: c.bands,
    maxZoom: c.maxZoom,
    bounds: c.bounds,
  };
  if (ctx.bands.some((b) => b.startsWith('..'))) {
    throw new Error('queue distributor: the band files are not on the shared storage');
  }
  const key = await putObject(q.shared, ctx);
  const jobs = roots.map(([x, y]) => {
    const data: TileJobData = { kind: 'tiles', context: key, z: zoom, x, y };
    return { id: jobIdOf(data), data };
  });
  const planes = new Map<string, Float32Array[] | null>();
  const written: Record<number, number> = {};
  await runJobs<TileJobData, TileJobResult>(q, jobs, async (job, result) => {
    const dir = jobDir(q.shared, job.id);
    const r = result ?? (JSON.parse(await readFile(join(dir, 'result.json'), 'utf8')) as TileJobResult);
    if (existsSync(join(dir, 'tiles'))) await cp(join(dir, 'tiles'), c.tilesDir, { recursive: true });
    planes.set(`${job.data.x}/${job.data.y}`, r.hasRoot ? await readRootPlanes(dir, c.bands.length) : null);
    for (const [z, count] of Object.entries(r.written))
      written[Number(z)] = (written[Number(z)] ?? 0) + count;
    onFinest(r.finest);
  });
  return { planes, written };
}

/** A tile job's root planes, one TILE_SIZE x TILE_SIZE plane per band. */
async function readRootPlanes(dir: string, bands: number): Promise<Float32Array[]> {
  const n = TILE_SIZE * TILE_SIZE;
  const bytes = await readFile(join(dir, ROOT_PLANES_FILE));
  const all = new Float32Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength));
  return Array.from({ length: bands }, (_, b) => all.slice(b * n, (b + 1) * n));
}
