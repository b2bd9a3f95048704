/**
 * Queue-backed builds (issue 19): `pile-atlas build --queue` on a real Redis server (Debian's
 * redis-server on a free loopback port, started and stopped here) with `pile-atlas worker` processes.
 * A distributed build with two workers, one of them killed with SIGKILL in the middle of a job, is
 * byte-identical to the local build of the same inputs (the manifest apart from its creation time and
 * run timing); the killed worker's job is run again by the other worker once its lock expires; a
 * second build reuses every finished job; a job that fails three times fails the build with the job's
 * error and leaves the previous output untouched.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join, resolve } from 'node:path';
import { Queue } from 'bullmq';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FAULT_ENV } from '../../data-pipeline/build/fault-points';
import { QUEUE_NAME, type BuildJobResult } from '../../data-pipeline/queue/queue-jobs';
import { hashTree, makeTempDir, removeTempDirs, runCli, SMALL_DEMO, smallDemo } from './pipeline-fixtures';
import { startRedis, type RedisFixture } from './redis-fixture';

const ROOT = resolve(__dirname, '../..');
const BIN = join(ROOT, 'bin/pile-atlas.mjs');
const FLAGS = ['--cell-size', String(SMALL_DEMO.cellSize_m), '--quiet', '--workers', '1'];
// Short lock and stalled-check times so a killed worker's job comes back within seconds.
const WORKER_FLAGS = ['--lock-ms', '1500', '--stalled-check-ms', '500'];

let redis: RedisFixture;
let demoDir: string;
let shared: string;
let localDir: string;
const workers: ChildProcess[] = [];

interface Worker {
  child: ChildProcess;
  /** Resolves when the worker's stderr has printed `text`. */
  printed(text: string): Promise<void>;
  stderr(): string;
}

function startWorker(env: Record<string, string> = {}): Promise<Worker> {
  const child = spawn(
    process.execPath,
    [BIN, 'worker', '--queue', redis.url, '--shared', shared, ...WORKER_FLAGS],
    {
      cwd: ROOT,
      env: { ...process.env, ...env },
      stdio: ['ignore', 'ignore', 'pipe'],
    },
  );
  workers.push(child);
  let text = '';
  const waiters: { needle: string; done: () => void }[] = [];
  child.stderr!.on('data', (chunk: Buffer) => {
    text += chunk.toString();
    for (const w of waiters.splice(0)) {
      if (text.includes(w.needle)) w.done();
      else waiters.push(w);
    }
  });
  const worker: Worker = {
    child,
    stderr: () => text,
    printed: (needle) =>
      new Promise((done, fail) => {
        if (text.includes(needle)) return done();
        waiters.push({ needle, done });
        child.once('exit', (code) => fail(new Error(`worker exited (${code}) before "${needle}": ${text}`)));
      }),
  };
  return worker.printed('waiting for jobs').then(() => worker);
}

/** The manifest without what differs from run to run (creation time, run timing, worker count). */
async function stableManifest(dir: string): Promise<unknown> {
  const m = JSON.parse(await readFile(join(dir, 'manifest.json'), 'utf8'));
  delete m.createdAt;
  delete m.summary.seconds;
  delete m.summary.workers;
  return m;
}

async function treeWithoutManifest(dir: string): Promise<Record<string, string>> {
  const tree = await hashTree(dir);
  delete tree['manifest.json'];
  return tree;
}

beforeAll(async () => {
  redis = await startRedis();
  demoDir = await smallDemo();
  shared = await makeTempDir('queue-shared');
  localDir = join(await makeTempDir('queue-local'), 'out');
  const r = await runCli(['build', '--in', demoDir, '--out', localDir, ...FLAGS]);
  expect(r.code, r.stderr).toBe(0);
}, 120_000);

afterAll(async () => {
  for (const w of workers) if (w.exitCode === null && w.signalCode === null) w.kill('SIGTERM');
  await redis?.stop();
  await removeTempDirs();
});

describe('queue-backed build on Redis with worker processes', () => {
  let firstOut: string;

  it('survives a worker killed mid-job and is byte-identical to the local build', async () => {
    // Worker A stops inside its first job (part of the output written) and is killed there.
    const a = await startWorker({ [FAULT_ENV]: 'job:pause' });
    firstOut = join(await makeTempDir('queue-out'), 'out');
    const build = runCli([
      'build',
      '--in',
      demoDir,
      '--out',
      firstOut,
      ...FLAGS,
      '--queue',
      redis.url,
      '--shared',
      shared,
    ]);
    await a.printed('pile-atlas fault-point job');
    const b = await startWorker();
    a.child.kill('SIGKILL');
    const r = await build;
    expect(r.code, r.stderr).toBe(0);
    const summary = JSON.parse(r.stdout);
    expect(summary.queue.jobs).toBeGreaterThanOrEqual(4);
    expect(summary.queue.ran).toBe(summary.queue.jobs);
    expect(summary.queue.retried).toBeGreaterThanOrEqual(1);

    expect(await treeWithoutManifest(firstOut)).toEqual(await treeWithoutManifest(localDir));
    expect(await stableManifest(firstOut)).toEqual(await stableManifest(localDir));

    // The queue's record: the job A held stalled once and was finished by B; every job completed once.
    const queue = new Queue<unknown, BuildJobResult>(QUEUE_NAME, { connection: { url: redis.url } });
    try {
      const done = await queue.getJobs(['completed']);
      expect(done.length).toBe(summary.queue.jobs);
      const stalled = done.filter((j) => j.stalledCounter > 0);
      expect(stalled.length).toBe(1);
      expect(stalled[0].returnvalue.worker).toBe(`${hostname()}:${b.child.pid}`);
      expect(new Set(done.map((j) => j.id)).size).toBe(done.length);
      expect((await queue.getJobCounts('failed', 'waiting', 'active')).failed).toBe(0);
    } finally {
      await queue.close();
    }
    expect(a.child.signalCode).toBe('SIGKILL');
  }, 90_000);

  it('reuses every finished job in a second build of the same inputs', async () => {
    const out = join(await makeTempDir('queue-again'), 'out');
    const r = await runCli([
      'build',
      '--in',
      demoDir,
      '--out',
      out,
      ...FLAGS.filter((f) => f !== '--quiet'),
      '--queue',
      redis.url,
      '--shared',
      shared,
    ]);
    expect(r.code, r.stderr).toBe(0);
    const q = JSON.parse(r.stdout).queue;
    expect(q.ran).toBe(0);
    expect(q.reused).toBe(q.jobs);
    // Progress with ETA counts the jobs the queue reports done; the run summary names the reuse.
    expect(r.stderr).toMatch(/screen +\[#+\] 100% \d+\/\d+ elapsed \S+ eta 0s/);
    expect(r.stderr).toContain(`queue: ${q.jobs} jobs, 0 run by 0 worker processes, ${q.jobs} reused`);
    expect(await treeWithoutManifest(out)).toEqual(await treeWithoutManifest(localDir));
  }, 60_000);

  it('fails the build with the job error after three failed attempts, the previous output untouched', async () => {
    for (const w of workers) if (w.exitCode === null && w.signalCode === null) w.kill('SIGTERM');
    const c = await startWorker({ [FAULT_ENV]: 'job:error' });
    const before = await hashTree(firstOut);
    // Another cell size: new jobs, none reusable.
    const flags = ['--cell-size', String(2 * SMALL_DEMO.cellSize_m), '--quiet', '--workers', '1'];
    const r = await runCli([
      'build',
      '--in',
      demoDir,
      '--out',
      firstOut,
      ...flags,
      '--queue',
      redis.url,
      '--shared',
      shared,
    ]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/queue job .* failed 3 times \(3 allowed\): injected failure at job/);
    expect(await hashTree(firstOut)).toEqual(before);
    expect(c.stderr()).toContain('injected failure at job');
  }, 60_000);
});
