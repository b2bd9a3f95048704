/**
 * `pile-atlas worker`: takes build jobs from the BullMQ queue (queue-jobs.ts) and runs them with the
 * local build's own code: a screening job screens its rows window by window with createWindowScreener
 * into band files of its own; a tile job renders its subtree with createTileRenderer from the assembled
 * bands. Each output is written to a temporary directory in shared storage and published by one rename
 * (publishJobOutput): a job run twice (its worker presumed dead by the stalled-job check, yet alive)
 * publishes once, and a job whose output is already published is answered from it without work.
 * A worker that dies mid-job (kill -9, power loss) stops renewing its job's lock; after the lock
 * duration BullMQ's stalled-job check (run by every worker every stalled interval) puts the job back
 * in the queue for another worker. Contexts (the model, open input files) are cached per build.
 */
import { existsSync } from 'node:fs';
import { readFile, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import { Worker, type Job } from 'bullmq';
import { createBandFiles, type BandFiles } from '../build/band-files';
import { faultPoint } from '../build/fault-points';
import { createModelFromSpec, type ModelSpec } from '../build/model-spec';
import {
  createWindowScreener,
  emptyStats,
  mergeStats,
  type WindowInput,
  type WindowScreener,
} from '../build/screen-window';
import { createTileRenderer } from '../tiles/write-tile-pyramid';
import {
  describeJob,
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
import type { QueueConnection } from './redis-url';
import { getObject, jobDir, publishJobOutput, verifiedInput } from './shared-storage';

export interface QueueWorkerOptions {
  connection: QueueConnection;
  /** This machine's path of the shared storage. */
  shared: string;
  /** BullMQ lock duration, ms: a job whose worker stops renewing its lock this long is stalled. */
  lockDuration_ms?: number;
  /** BullMQ stalled-job check interval, ms. */
  stalledInterval_ms?: number;
  /** One line per job (stderr in the CLI). */
  log?: (line: string) => void;
}

export interface QueueWorkerHandle {
  worker: Worker<BuildJobData, BuildJobResult>;
  name: string;
  close(): Promise<void>;
}

/** Times a stalled job is put back before it fails (BullMQ's default is 1). */
const MAX_STALLED = 3;

/** A build's screening context and the screener made from it. */
interface ScreenEntry {
  ctx: ScreenContext;
  screener: WindowScreener;
}

export async function startQueueWorker(o: QueueWorkerOptions): Promise<QueueWorkerHandle> {
  const name = `${hostname()}:${process.pid}`;
  const screeners = new Map<string, Promise<ScreenEntry>>();
  const log = o.log ?? (() => undefined);

  const screenContext = (key: string) => {
    let entry = screeners.get(key);
    if (!entry) {
      entry = loadScreenContext(o.shared, key);
      entry.catch(() => screeners.delete(key));
      screeners.set(key, entry);
    }
    return entry;
  };

  const worker = new Worker<BuildJobData, BuildJobResult>(
    QUEUE_NAME,
    async (job: Job<BuildJobData, BuildJobResult>) => {
      const started = Date.now();
      const id = job.id as string;
      const result =
        job.data.kind === 'screen'
          ? await runScreen(o.shared, name, screenContext, id, job.data)
          : await runTiles(o.shared, name, id, job.data);
      log(
        `pile-atlas worker ${name}: ${describeJob(job.data)} done in ${((Date.now() - started) / 1000).toFixed(2)} s` +
          (job.attemptsMade > 0 || job.stalledCounter > 0 ? ' (retried)' : ''),
      );
      return result;
    },
    {
      connection: o.connection.options,
      name,
      // One job at a time: screening is CPU-bound and a screener's buffers serve one window at a time.
      // Start one worker process per core.
      concurrency: 1,
      lockDuration: o.lockDuration_ms ?? 30_000,
      stalledInterval: o.stalledInterval_ms ?? 30_000,
      maxStalledCount: MAX_STALLED,
      autorun: true,
    },
  );
  worker.on('failed', (job, err) => {
    if (job) log(`pile-atlas worker ${name}: ${describeJob(job.data)} failed: ${err.message}`);
  });
  worker.on('error', (err) => log(`pile-atlas worker ${name}: queue error: ${err.message}`));
  await worker.waitUntilReady();
  return {
    worker,
    name,
    async close() {
      await worker.close();
      for (const entry of screeners.values()) await (await entry).screener.close().catch(() => undefined);
    },
  };
}

/** A build's screening context from shared storage, its inputs verified, and a screener over them. */
async function loadScreenContext(shared: string, key: string): Promise<ScreenEntry> {
  const ctx = await getObject<ScreenContext>(shared, key);
  const spec = await getObject<ModelSpec>(shared, ctx.scenarioChecksum);
  const local = async (i: SharedInput): Promise<WindowInput> => {
    const { rel, sha256, alignedInShared, sd, ...input } = i;
    const path = await verifiedInput(shared, rel, sha256);
    return {
      ...input,
      path,
      ...(alignedInShared ? { aligned: path } : {}),
      ...(sd ? { sd: await local(sd) } : {}),
    };
  };
  const inputs: WindowInput[] = [];
  for (const i of ctx.inputs) inputs.push(await local(i));
  const unused: BandFiles = { paths: [], width: ctx.grid.width, height: 0 };
  const screener = createWindowScreener({
    grid: ctx.grid,
    inputs,
    model: createModelFromSpec(spec),
    echoRoles: ctx.echoRoles,
    files: unused,
  });
  return { ctx, screener };
}

/** Screen a job's rows window by window into band files of its own, published with its statistics. */
async function runScreen(
  shared: string,
  name: string,
  screenContext: (key: string) => Promise<ScreenEntry>,
  id: string,
  data: ScreenJobData,
): Promise<ScreenJobResult> {
  const done = join(jobDir(shared, id), STATS_FILE);
  if (existsSync(done)) return { stats: JSON.parse(await readFile(done, 'utf8')), worker: name };
  const { ctx, screener } = await screenContext(data.context);
  if (ctx.inputsChecksum !== data.inputsChecksum || ctx.scenarioChecksum !== data.scenarioChecksum) {
    throw new Error(`${describeJob(data)}: its context does not match the job's input/scenario checksums`);
  }
  const stats = emptyStats();
  await publishJobOutput(shared, id, async (dir) => {
    const files = await createBandFiles(dir, ctx.bandCount, ctx.grid.width, data.row1 - data.row0);
    const into = { ...files, row0: data.row0 };
    for (let r = data.row0; r < data.row1; r += WINDOW_ROWS) {
      mergeStats(stats, await screener.screen(r, Math.min(data.row1, r + WINDOW_ROWS), into));
      await faultPoint('job', dir);
      // Let BullMQ renew the job's lock between windows.
      await yieldToEventLoop();
    }
    await writeFile(join(dir, STATS_FILE), JSON.stringify(stats));
  });
  return { stats, worker: name };
}

/** Render a job's tile subtree and publish its tiles, root planes and result. */
async function runTiles(shared: string, name: string, id: string, data: TileJobData): Promise<TileJobResult> {
  const resultFile = join(jobDir(shared, id), 'result.json');
  if (existsSync(resultFile)) {
    return { ...(JSON.parse(await readFile(resultFile, 'utf8')) as TileJobResult), worker: name };
  }
  const ctx = await getObject<TileContext>(shared, data.context);
  let result: TileJobResult | undefined;
  await publishJobOutput(shared, id, async (dir) => {
    let finest = 0;
    const renderer = createTileRenderer({
      tilesDir: join(dir, 'tiles'),
      grid: ctx.grid,
      files: { paths: ctx.bands.map((b) => join(shared, b)), width: ctx.width, height: ctx.height },
      bands: ctx.pyramid,
      maxZoom: ctx.maxZoom,
      bounds: ctx.bounds,
      onFinest: () => finest++,
    });
    const planes = await renderer.render(data.z, data.x, data.y);
    await faultPoint('job', dir);
    if (planes) {
      const all = new Float32Array(planes.length * planes[0].length);
      planes.forEach((p, i) => all.set(p, i * p.length));
      await writeFile(join(dir, ROOT_PLANES_FILE), new Uint8Array(all.buffer));
    }
    result = { written: renderer.written, finest, hasRoot: planes !== null, worker: name };
    await writeFile(join(dir, 'result.json'), JSON.stringify(result));
  });
  return result ?? (JSON.parse(await readFile(resultFile, 'utf8')) as TileJobResult);
}
