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
import { Queue, QueueEvents, type Job } from 'bullmq';
import { toolVersion } from '../build/assemble-manifest';
import type { WindowInput } from '../build/screen-window';
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
import {
  describeJob,
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
import { checkQueueServer, type QueueConnection } from './redis-url';
import { canonicalJson, jobDir, putInput, putObject, sha256Text } from './shared-storage';
import { createReadStream } from 'node:fs';
import { createHash } from 'node:crypto';

async function sha256OfFile(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}
import { TILE_SIZE } from '../../layers/screening/tile-format';

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

interface QueuedJob<D extends BuildJobData> {
  id: string;
  data: D;
}

/** Per-job timings from BullMQ, for the report and the benchmark. */
interface Tally {
  jobs: number;
  reused: number;
  ran: number;
  retried: number;
  processing_ms: number;
  queueWait_ms: number;
}

export async function createQueueDistributor(o: QueueDistributorOptions): Promise<QueueDistributor> {
  await checkQueueServer(o.connection);
  const attempts = o.attempts ?? 3;
  const log = o.log ?? (() => undefined);
  const queue = new Queue<BuildJobData, BuildJobResult>(QUEUE_NAME, { connection: o.connection.options });
  const events = new QueueEvents(QUEUE_NAME, { connection: o.connection.options });
  await Promise.all([queue.waitUntilReady(), events.waitUntilReady()]);
  const tally: Tally = { jobs: 0, reused: 0, ran: 0, retried: 0, processing_ms: 0, queueWait_ms: 0 };
  const workersSeen = new Set<string>();
  let screen: { ctx: ScreenContext; key: string; files: BandFiles; bandsDir: string } | undefined;

  /**
   * Queue `jobs` (reusing finished ones), wait for all, and call `merge` once per job with its result,
   * one merge at a time. Rejects with the first job that failed every attempt.
   */
  async function runJobs<D extends BuildJobData, R extends BuildJobResult>(
    jobs: QueuedJob<D>[],
    merge: (job: QueuedJob<D>, result: R) => Promise<void>,
  ): Promise<void> {
    const pending = new Map(jobs.map((j) => [j.id, j]));
    const merged = new Set<string>();
    let chain = Promise.resolve();
    let failure: Error | undefined;
    let wake: () => void = () => undefined;
    const settle = (job: Job<BuildJobData, BuildJobResult>, reused: boolean) => {
      const id = job.id as string;
      const queued = pending.get(id);
      if (!queued || merged.has(id)) return;
      merged.add(id);
      pending.delete(id);
      tally.jobs++;
      if (reused) tally.reused++;
      else {
        tally.ran++;
        if (job.attemptsMade > 1 || job.stalledCounter > 0) tally.retried++;
        if (job.processedOn && job.finishedOn) tally.processing_ms += job.finishedOn - job.processedOn;
        if (job.processedOn) tally.queueWait_ms += Math.max(0, job.processedOn - job.timestamp);
      }
      const result = job.returnvalue as R;
      if (!reused && result?.worker) workersSeen.add(result.worker);
      chain = chain
        .then(() => merge(queued, result))
        .catch((err: Error) => {
          failure ??= err;
        });
      wake();
    };
    const fail = (job: Job<BuildJobData, BuildJobResult>) => {
      failure ??= new Error(
        `queue job ${describeJob(job.data)} failed ${job.attemptsMade} time${job.attemptsMade === 1 ? '' : 's'}` +
          ` (${attempts} allowed): ${job.failedReason}`,
      );
      wake();
    };
    /** Look at one job in the queue; true when it is still to come. */
    const inspect = async (id: string, reusable: boolean): Promise<boolean> => {
      const job = await queue.getJob(id);
      if (!job) return true;
      const state = await job.getState();
      if (state === 'completed') {
        settle(job, reusable);
        return false;
      }
      if (state === 'failed' && !reusable) fail(job);
      return state !== 'failed';
    };
    const onEvent = ({ jobId }: { jobId: string }) => {
      if (pending.has(jobId)) void inspect(jobId, false).catch((err: Error) => (failure ??= err));
    };
    events.on('completed', onEvent);
    events.on('failed', onEvent);
    try {
      // Reuse what an earlier build finished; queue afresh what failed or lost its output.
      const toAdd: QueuedJob<D>[] = [];
      for (const j of jobs) {
        const job = await queue.getJob(j.id);
        const state = job ? await job.getState() : 'unknown';
        if (job && state === 'completed' && existsSync(jobDir(o.shared, j.id))) settle(job, true);
        else if (job && (state === 'completed' || state === 'failed')) {
          await job.remove();
          toAdd.push(j);
        } else if (!job || state === 'unknown') toAdd.push(j);
      }
      await queue.addBulk(
        toAdd.map((j) => ({
          name: j.data.kind,
          data: j.data,
          opts: {
            jobId: j.id,
            attempts,
            backoff: { type: 'fixed', delay: 200 },
            removeOnComplete: false,
            removeOnFail: false,
          },
        })),
      );
      let lastStatus = Date.now();
      let noWorkerWarned = false;
      while (pending.size > 0 && !failure) {
        await new Promise<void>((resolve) => {
          wake = resolve;
          setTimeout(resolve, 1000);
        });
        // Events can be missed (a reconnect): look at every job still pending now and then.
        if (Date.now() - lastStatus >= 10_000 && pending.size > 0 && !failure) {
          lastStatus = Date.now();
          for (const id of [...pending.keys()]) await inspect(id, false);
          const counts = await queue.getJobCounts('active', 'waiting', 'delayed');
          const workers = await queue.getWorkersCount();
          log(
            `queue: ${workers} worker${workers === 1 ? '' : 's'} connected, ${counts.active} jobs active, ` +
              `${counts.waiting + counts.delayed} waiting; ${pending.size} of this build's ${jobs.length} to come`,
          );
          if (workers === 0 && !noWorkerWarned) {
            noWorkerWarned = true;
            log(`queue: no worker is connected; start \`pile-atlas worker --queue <url> --shared <dir>\``);
          }
        }
      }
      await chain;
      if (failure) throw failure;
    } finally {
      events.off('completed', onEvent);
      events.off('failed', onEvent);
    }
  }

  const windows: BuildDistributor['windows'] = {
    async prepare(c: ScreenJobContext): Promise<BandFiles> {
      const ship = async (input: WindowInput, fileSha256?: string): Promise<SharedInput> => {
        const { path, aligned, sd, ...rest } = input;
        const withSd = sd ? { sd: await ship(sd) } : {};
        if (aligned) {
          // Inputs GDAL warped onto the analysis grid travel as that raw grid, under its own checksum.
          const sha256 = await sha256OfFile(aligned);
          const rel = await putInput(o.shared, aligned, sha256, input.label);
          return { ...rest, sha256, rel, alignedInShared: true, ...withSd };
        }
        const sha256 = fileSha256 ?? (await sha256OfFile(path));
        return { ...rest, sha256, rel: await putInput(o.shared, path, sha256, input.label), ...withSd };
      };
      const inputs: SharedInput[] = [];
      for (const [i, input] of c.inputs.entries()) inputs.push(await ship(input, c.inputSha256[i]));
      const scenarioChecksum = await putObject(o.shared, c.spec);
      const ctx: ScreenContext = {
        format: JOB_FORMAT,
        tool: await toolVersion(),
        grid: c.grid,
        inputs,
        echoRoles: c.echoRoles,
        bandCount: c.bandCount,
        inputsChecksum: sha256Text(
          canonicalJson(
            inputs.map((i) => [i.role, i.sha256, i.unit, i.nodata, ...(i.sd ? [i.sd.sha256] : [])]),
          ),
        ),
        scenarioChecksum,
      };
      const key = await putObject(o.shared, ctx);
      const bandsDir = join(o.shared, 'bands', key);
      const files = await createBandFiles(bandsDir, c.bandCount, c.grid.width, c.grid.height);
      screen = { ctx, key, files, bandsDir };
      return files;
    },
    async run(list, onWindow) {
      if (!screen) throw new Error('queue distributor: prepare() before run()');
      const s = screen;
      const per = Math.max(1, o.windowsPerJob ?? 1);
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
      await runJobs<ScreenJobData, ScreenJobResult>(jobs, async (job, result) => {
        const dir = jobDir(o.shared, job.id);
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
    },
    workers: () => Math.max(1, workersSeen.size),
  };

  const subtrees: BuildDistributor['subtrees'] = {
    minJobs: o.subtreeJobs ?? 16,
    async run(c: SubtreeContext, zoom, roots, onFinest): Promise<SubtreeResults> {
      const ctx: TileContext = {
        format: JOB_FORMAT,
        grid: c.grid,
        bands: c.files.paths.map((p) => relative(o.shared, p)),
        width: c.files.width,
        height: c.files.height,
        pyramid: c.bands,
        maxZoom: c.maxZoom,
        bounds: c.bounds,
      };
      if (ctx.bands.some((b) => b.startsWith('..'))) {
        throw new Error('queue distributor: the band files are not on the shared storage');
      }
      const key = await putObject(o.shared, ctx);
      const jobs = roots.map(([x, y]) => {
        const data: TileJobData = { kind: 'tiles', context: key, z: zoom, x, y };
        return { id: jobIdOf(data), data };
      });
      const planes = new Map<string, Float32Array[] | null>();
      const written: Record<number, number> = {};
      const n = TILE_SIZE * TILE_SIZE;
      await runJobs<TileJobData, TileJobResult>(jobs, async (job, result) => {
        const dir = jobDir(o.shared, job.id);
        const r = result ?? (JSON.parse(await readFile(join(dir, 'result.json'), 'utf8')) as TileJobResult);
        if (existsSync(join(dir, 'tiles'))) await cp(join(dir, 'tiles'), c.tilesDir, { recursive: true });
        let root: Float32Array[] | null = null;
        if (r.hasRoot) {
          const bytes = await readFile(join(dir, ROOT_PLANES_FILE));
          const all = new Float32Array(
            bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength),
          );
          root = c.bands.map((_, b) => all.slice(b * n, (b + 1) * n));
        }
        planes.set(`${job.data.x}/${job.data.y}`, root);
        for (const [z, count] of Object.entries(r.written))
          written[Number(z)] = (written[Number(z)] ?? 0) + count;
        onFinest(r.finest);
      });
      return { planes, written };
    },
  };

  return {
    windows,
    subtrees,
    async cleanup() {
      if (screen) await rm(screen.bandsDir, { recursive: true, force: true });
    },
    report: () => ({ ...tally, workers: workersSeen.size }),
    async close() {
      await events.close();
      await queue.close();
    },
  };
}
