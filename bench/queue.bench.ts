/**
 * Queue benchmark (`npm run bench -- queue`): the 4.4 M-cell synthetic region of pipeline.bench.ts
 * (2100 x 2100 km at 1 km) built locally (1 thread, then one per core) and as a queue-backed build
 * (`build --queue`) with 1, 2 and 4 `pile-atlas worker` processes on this machine, one after the other
 * in one run, against a throw-away Redis server on a free loopback port. Each queue run starts from an
 * empty queue and empty shared storage (no reuse). GeoTIFFs are skipped in every run (the coordinator
 * writes them the same way in both kinds of build). Prints wall time, jobs, the summed processing
 * time the queue recorded, the overhead per job (queue run with 1 worker minus the local 1-thread build,
 * per job), whether the output is byte-identical to the local build, and a projected scaling
 * T(N) = S + P / N for N workers with a core each (P: job processing time summed, S: the rest).
 * Also prints the load average: the machine is shared, so timings are inflated. Nothing is asserted.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdir, mkdtemp, rm } from 'node:fs/promises';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Queue } from 'bullmq';
import { buildTiles, type BuildSummary } from '../data-pipeline/build/build-tiles';
import { QUEUE_NAME } from '../data-pipeline/queue/queue-jobs';
import { createQueueDistributor } from '../data-pipeline/queue/queue-distributor';
import { parseQueueUrl } from '../data-pipeline/queue/redis-url';
import { hashTree } from '../tests/pipeline/pipeline-fixtures';
import { startRedis } from '../tests/pipeline/redis-fixture';
import { writeSyntheticInputs } from './pipeline.bench';

const ROOT = resolve(fileURLToPath(new URL('.', import.meta.url)), '..');
const BIN = join(ROOT, 'bin/pile-atlas.mjs');

interface Row {
  label: string;
  wall_s: number;
  summary: BuildSummary;
  identical?: boolean;
  /** Median idle time of a worker between finishing one job and starting the next, ms. */
  dispatchGap_ms?: number;
}

/** Median gap between consecutive jobs of each worker, from the queue's own timestamps. */
async function medianDispatchGap(queue: Queue): Promise<number> {
  const jobs = await queue.getJobs(['completed']);
  const byWorker = new Map<string, { start: number; end: number }[]>();
  for (const j of jobs) {
    const worker = (j.returnvalue as { worker?: string } | undefined)?.worker ?? '?';
    if (!j.processedOn || !j.finishedOn) continue;
    const list = byWorker.get(worker) ?? [];
    list.push({ start: j.processedOn, end: j.finishedOn });
    byWorker.set(worker, list);
  }
  const gaps: number[] = [];
  for (const list of byWorker.values()) {
    list.sort((a, b) => a.start - b.start);
    for (let i = 1; i < list.length; i++) gaps.push(Math.max(0, list[i].start - list[i - 1].end));
  }
  gaps.sort((a, b) => a - b);
  return gaps.length ? gaps[Math.floor(gaps.length / 2)] : NaN;
}

const load = () =>
  loadavg()
    .map((l) => l.toFixed(1))
    .join(' / ');

function startWorker(url: string, shared: string): Promise<ChildProcess> {
  const child = spawn(process.execPath, [BIN, 'worker', '--queue', url, '--shared', shared, '--quiet'], {
    cwd: ROOT,
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  return new Promise((done, fail) => {
    let text = '';
    child.stderr!.on('data', (c: Buffer) => {
      text += c.toString();
      if (text.includes('waiting for jobs')) done(child);
    });
    child.once('exit', (code) => fail(new Error(`worker exited (${code}): ${text}`)));
  });
}

async function treeWithoutManifest(dir: string): Promise<Record<string, string>> {
  const t = await hashTree(dir);
  delete t['manifest.json'];
  return t;
}

/** What every build of the benchmark shares. */
interface BenchBase {
  inDir: string;
  cellSize_m: number;
  geotiff: false;
}

export async function run(): Promise<void> {
  const root = await mkdtemp(join(tmpdir(), 'pile-atlas-queue-bench-'));
  const inDir = join(root, 'in');
  await mkdir(inDir);
  const redis = await startRedis();
  try {
    console.log(`cores: ${availableParallelism()}; load average (1/5/15 min) at start: ${load()}`);
    await writeSyntheticInputs(inDir);
    // QUEUE_BENCH_CELL_M: a coarser cell for a quick trial run (default 1000 m: 4.4 M cells).
    const cellSize_m = Number(process.env.QUEUE_BENCH_CELL_M ?? 1000);
    const base: BenchBase = { inDir, cellSize_m, geotiff: false };
    const rows = await runLocalBuilds(root, base);
    const reference = await treeWithoutManifest(join(root, 'local-1'));
    rows[1].identical =
      JSON.stringify(await treeWithoutManifest(join(root, `local-${availableParallelism()}`))) ===
      JSON.stringify(reference);
    for (const n of [1, 2, 4]) rows.push(await runQueueBuild(root, base, redis.url, n, reference));
    printTable(rows);
    printScaling(rows);
    console.log(
      `load average at end: ${load()} (on ${availableParallelism()} shared cores: timings inflated)`,
    );
  } finally {
    await redis.stop();
    await rm(root, { recursive: true, force: true });
  }
}

/** The local builds, 1 thread and then one per core, into `local-<threads>`. */
async function runLocalBuilds(root: string, base: BenchBase): Promise<Row[]> {
  const rows: Row[] = [];
  for (const threads of [1, availableParallelism()]) {
    const outDir = join(root, `local-${threads}`);
    const t = Date.now();
    const summary = await buildTiles({ ...base, outDir, workers: threads });
    rows.push({
      label: `local, ${threads} thread${threads === 1 ? '' : 's'}`,
      wall_s: (Date.now() - t) / 1000,
      summary,
    });
    console.log(`${rows.at(-1)!.label}: ${rows.at(-1)!.wall_s.toFixed(1)} s`);
  }
  return rows;
}

/** A queue-backed build with `n` worker processes, from an empty queue and empty shared storage. */
async function runQueueBuild(
  root: string,
  base: BenchBase,
  url: string,
  n: number,
  reference: Record<string, string>,
): Promise<Row> {
  const connection = parseQueueUrl(url);
  const shared = join(root, `shared-${n}`);
  await mkdir(shared);
  const queue = new Queue(QUEUE_NAME, { connection: connection.options });
  await queue.obliterate({ force: true });
  await queue.close();
  const workers = await Promise.all(Array.from({ length: n }, () => startWorker(url, shared)));
  const distributor = await createQueueDistributor({ connection, shared });
  const outDir = join(root, `queue-${n}`);
  const t = Date.now();
  try {
    const summary = await buildTiles({ ...base, outDir, distributor });
    const wall_s = (Date.now() - t) / 1000;
    const identical = JSON.stringify(await treeWithoutManifest(outDir)) === JSON.stringify(reference);
    const q = new Queue(QUEUE_NAME, { connection: connection.options });
    const dispatchGap_ms = await medianDispatchGap(q);
    await q.close();
    const row: Row = {
      label: `queue, ${n} worker process${n === 1 ? '' : 'es'}`,
      wall_s,
      summary,
      identical,
      dispatchGap_ms,
    };
    console.log(`${row.label}: ${wall_s.toFixed(1)} s`);
    return row;
  } finally {
    await distributor.close();
    for (const w of workers) w.kill('SIGTERM');
    await rm(shared, { recursive: true, force: true });
    await rm(outDir, { recursive: true, force: true });
  }
}

/** One line per run: wall time, cells per second, jobs, summed job processing time, identical or not. */
function printTable(rows: Row[]): void {
  const cells = rows[0].summary.cellsTotal;
  console.log(
    `\n${cells} cells, ${rows[0].summary.bands.length} bands, ${rows[0].summary.tiles} tiles; no GeoTIFFs`,
  );
  console.log(
    'run                          wall s   cells/s   jobs  job processing s (summed)  identical to local',
  );
  for (const r of rows) {
    const q = r.summary.queue;
    console.log(
      `${r.label.padEnd(28)} ${r.wall_s.toFixed(1).padStart(6)} ${String(Math.round(cells / r.wall_s)).padStart(9)}` +
        `${q ? String(q.jobs).padStart(7) : '      -'}  ${q ? (q.processing_ms / 1000).toFixed(1).padStart(25) : ' '.repeat(25)}` +
        `  ${r.identical === undefined ? '(reference)' : r.identical ? 'yes' : 'NO'}`,
    );
  }
}

/** The overhead per job and the projected T(N) = S + P / N from the 1-worker queue run. */
function printScaling(rows: Row[]): void {
  const local1 = rows[0];
  const q1 = rows.find((r) => r.label.startsWith('queue, 1 '))!;
  const jobs = q1.summary.queue!.jobs;
  const P = q1.summary.queue!.processing_ms / 1000;
  const S = Math.max(0, q1.wall_s - P);
  console.log(
    `\noverhead per job: median idle time of a worker between two jobs (queue dispatch) ` +
      rows
        .filter((r) => r.dispatchGap_ms !== undefined)
        .map((r) => `${r.dispatchGap_ms!.toFixed(0)} ms (${r.label.replace('queue, ', '')})`)
        .join(', ') +
      `; all time of the 1-worker run outside its jobs, per job (dispatch + the coordinator's reading, ` +
      `merging, top tiles and manifest): ${(((q1.wall_s - P) / jobs) * 1000).toFixed(0)} ms over ${jobs} jobs; ` +
      `(queue with 1 worker - local 1 thread) / jobs: ${(((q1.wall_s - local1.wall_s) / jobs) * 1000).toFixed(0)} ms ` +
      `(meaningful only when both ran at the same load)`,
  );
  console.log(
    `projected T(N) = S + P/N with S = ${S.toFixed(1)} s (coordinator: read, merge, top tiles, manifest, swap) ` +
      `and P = ${P.toFixed(1)} s (jobs), one core per worker:`,
  );
  for (const n of [1, 2, 4, 8, 16, 32, 64]) {
    console.log(
      `  N = ${String(n).padStart(2)}: ${(S + P / n).toFixed(1)} s (speed-up ${(q1.wall_s / (S + P / n)).toFixed(2)}x)`,
    );
  }
  console.log(
    `  limit (N -> infinity): ${S.toFixed(1)} s; speed-up at most ${(q1.wall_s / Math.max(S, 1e-9)).toFixed(1)}x`,
  );
}
