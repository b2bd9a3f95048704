/**
 * Running one batch of jobs of a queue-backed build (queue-distributor.ts): reuse what an earlier build
 * finished, queue the rest, wait for every job (events, plus a look at the queue every 10 s in case an
 * event was missed, with a status line), and merge each job's output once, one merge at a time. The
 * first job that fails every attempt, or the first merge that throws, fails the batch.
 */
import { existsSync } from 'node:fs';
import type { Job, Queue, QueueEvents } from 'bullmq';
import { describeJob, type BuildJobData, type BuildJobResult } from './queue-jobs';
import { jobDir } from './shared-storage';

/** A job of this build: its id (the checksum of its work) and data. */
export interface QueuedJob<D extends BuildJobData> {
  id: string;
  data: D;
}

/** Per-job timings from BullMQ, for the report and the benchmark. */
export interface Tally {
  jobs: number;
  reused: number;
  ran: number;
  retried: number;
  processing_ms: number;
  queueWait_ms: number;
}

/** The queue side a distributor shares between its batches of jobs. */
export interface JobQueue {
  queue: Queue<BuildJobData, BuildJobResult>;
  events: QueueEvents;
  /** The coordinator's path of the shared storage. */
  shared: string;
  /** Tries per job before the build fails. */
  attempts: number;
  tally: Tally;
  /** host:pid of every worker that ran a job of this build. */
  workersSeen: Set<string>;
  log: (line: string) => void;
}

/** A finished job's numbers added to the tally (timings only for jobs run by this build). */
function count(tally: Tally, job: Job<BuildJobData, BuildJobResult>, reused: boolean): void {
  tally.jobs++;
  if (reused) {
    tally.reused++;
    return;
  }
  tally.ran++;
  if (job.attemptsMade > 1 || job.stalledCounter > 0) tally.retried++;
  if (job.processedOn && job.finishedOn) tally.processing_ms += job.finishedOn - job.processedOn;
  if (job.processedOn) tally.queueWait_ms += Math.max(0, job.processedOn - job.timestamp);
}

/** One batch's bookkeeping: the jobs still to come, the merge chain and the first failure. */
class JobBatch<D extends BuildJobData, R extends BuildJobResult> {
  readonly pending: Map<string, QueuedJob<D>>;
  private readonly merged = new Set<string>();
  private chain = Promise.resolve();
  failure: Error | undefined;
  /** Wakes the wait loop (replaced by each wait). */
  wake: () => void = () => undefined;

  constructor(
    private readonly q: JobQueue,
    jobs: QueuedJob<D>[],
    private readonly merge: (job: QueuedJob<D>, result: R) => Promise<void>,
  ) {
    this.pending = new Map(jobs.map((j) => [j.id, j]));
  }

  /** A job of the batch finished: count it and chain its merge (once per job, whatever ran it). */
  settle(job: Job<BuildJobData, BuildJobResult>, reused: boolean): void {
    const id = job.id as string;
    const queued = this.pending.get(id);
    if (!queued || this.merged.has(id)) return;
    this.merged.add(id);
    this.pending.delete(id);
    count(this.q.tally, job, reused);
    const result = job.returnvalue as R;
    if (!reused && result?.worker) this.q.workersSeen.add(result.worker);
    this.chain = this.chain
      .then(() => this.merge(queued, result))
      .catch((err: Error) => {
        this.failure ??= err;
      });
    this.wake();
  }

  /** A job of the batch failed every attempt: the batch fails with its error. */
  fail(job: Job<BuildJobData, BuildJobResult>): void {
    this.failure ??= new Error(
      `queue job ${describeJob(job.data)} failed ${job.attemptsMade} time${job.attemptsMade === 1 ? '' : 's'}` +
        ` (${this.q.attempts} allowed): ${job.failedReason}`,
    );
    this.wake();
  }

  /** Look at one job in the queue; true when it is still to come. */
  async inspect(id: string, reusable: boolean): Promise<boolean> {
    const job = await this.q.queue.getJob(id);
    if (!job) return true;
    const state = await job.getState();
    if (state === 'completed') {
      this.settle(job, reusable);
      return false;
    }
    if (state === 'failed' && !reusable) this.fail(job);
    return state !== 'failed';
  }

  /** The queue's `completed` / `failed` event listener. */
  readonly onEvent = ({ jobId }: { jobId: string }): void => {
    if (this.pending.has(jobId))
      void this.inspect(jobId, false).catch((err: Error) => (this.failure ??= err));
  };

  /** Wait for the merges chained so far; throw the batch's failure if any. */
  async finish(): Promise<void> {
    await this.chain;
    if (this.failure) throw this.failure;
  }
}

/**
 * Queue `jobs` (reusing finished ones), wait for all, and call `merge` once per job with its result,
 * one merge at a time. Rejects with the first job that failed every attempt.
 */
export async function runJobs<D extends BuildJobData, R extends BuildJobResult>(
  q: JobQueue,
  jobs: QueuedJob<D>[],
  merge: (job: QueuedJob<D>, result: R) => Promise<void>,
): Promise<void> {
  const batch = new JobBatch<D, R>(q, jobs, merge);
  q.events.on('completed', batch.onEvent);
  q.events.on('failed', batch.onEvent);
  try {
    await queueJobs(q, jobs, batch);
    await waitForJobs(q, batch, jobs.length);
    await batch.finish();
  } finally {
    q.events.off('completed', batch.onEvent);
    q.events.off('failed', batch.onEvent);
  }
}

/** Reuse what an earlier build finished; queue afresh what failed or lost its output, and what is new. */
async function queueJobs<D extends BuildJobData, R extends BuildJobResult>(
  q: JobQueue,
  jobs: QueuedJob<D>[],
  batch: JobBatch<D, R>,
): Promise<void> {
  const toAdd: QueuedJob<D>[] = [];
  for (const j of jobs) {
    const job = await q.queue.getJob(j.id);
    const state = job ? await job.getState() : 'unknown';
    if (job && state === 'completed' && existsSync(jobDir(q.shared, j.id))) batch.settle(job, true);
    else if (job && (state === 'completed' || state === 'failed')) {
      await job.remove();
      toAdd.push(j);
    } else if (!job || state === 'unknown') toAdd.push(j);
  }
  await q.queue.addBulk(
    toAdd.map((j) => ({
      name: j.data.kind,
      data: j.data,
      opts: {
        jobId: j.id,
        attempts: q.attempts,
        backoff: { type: 'fixed', delay: 200 },
        removeOnComplete: false,
        removeOnFail: false,
      },
    })),
  );
}

/** Wait until no job of the batch is to come or one failed; every 10 s look again and log the status. */
async function waitForJobs<D extends BuildJobData, R extends BuildJobResult>(
  q: JobQueue,
  batch: JobBatch<D, R>,
  total: number,
): Promise<void> {
  let lastStatus = Date.now();
  let noWorkerWarned = false;
  while (batch.pending.size > 0 && !batch.failure) {
    await new Promise<void>((resolve) => {
      batch.wake = resolve;
      setTimeout(resolve, 1000);
    });
    // Events can be missed (a reconnect): look at every job still pending now and then.
    if (Date.now() - lastStatus >= 10_000 && batch.pending.size > 0 && !batch.failure) {
      lastStatus = Date.now();
      for (const id of [...batch.pending.keys()]) await batch.inspect(id, false);
      const workers = await logStatus(q, batch.pending.size, total);
      if (workers === 0 && !noWorkerWarned) {
        noWorkerWarned = true;
        q.log(`queue: no worker is connected; start \`pile-atlas worker --queue <url> --shared <dir>\``);
      }
    }
  }
}

/** Log the connected workers and the active and waiting jobs; resolves to the number of workers. */
async function logStatus(q: JobQueue, toCome: number, total: number): Promise<number> {
  const counts = await q.queue.getJobCounts('active', 'waiting', 'delayed');
  const workers = await q.queue.getWorkersCount();
  q.log(
    `queue: ${workers} worker${workers === 1 ? '' : 's'} connected, ${counts.active} jobs active, ` +
      `${counts.waiting + counts.delayed} waiting; ${toCome} of this build's ${total} to come`,
  );
  return workers;
}
