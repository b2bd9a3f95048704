/**
 * A small pool of worker threads for the build: each worker takes the next job when it answers the
 * previous one, so fast and slow jobs balance out. The first error (a worker's `{ error }` answer or a
 * thread error) ends every worker and rejects. On success the workers are ended; with `closeMessage`
 * each is sent that message first and ended when it answers (so it can close its input files).
 */
import { Worker } from 'node:worker_threads';

export interface WorkerPoolOptions<Job, Answer> {
  /** The worker script. */
  script: URL;
  /** Passed to every worker as `workerData`. */
  workerData: unknown;
  /** Most workers to start (never more than there are jobs). */
  size: number;
  jobs: readonly Job[];
  /** The message that hands a job to a worker. */
  message: (job: Job) => unknown;
  /** Called with each successful answer, in the order they arrive. */
  onAnswer: (answer: Answer) => void;
  /** Names the worker in the error message, e.g. "tile worker". */
  label: string;
  closeMessage?: unknown;
}

export function runWorkerPool<Job, Answer extends { error?: string }>(
  o: WorkerPoolOptions<Job, Answer>,
): Promise<void> {
  return new Promise((resolve, reject) => {
    const pool: Worker[] = [];
    let next = 0;
    let pending = o.jobs.length;
    let failed = false;
    const fail = (err: Error) => {
      if (failed) return;
      failed = true;
      for (const w of pool) void w.terminate();
      reject(err);
    };
    const succeed = () => {
      if (o.closeMessage === undefined) {
        for (const w of pool) void w.terminate();
        resolve();
        return;
      }
      let open = pool.length;
      for (const w of pool) {
        w.removeAllListeners('message');
        w.on('message', () => {
          void w.terminate();
          if (--open === 0) resolve();
        });
        w.postMessage(o.closeMessage);
      }
    };
    const feed = (w: Worker) => {
      if (next < o.jobs.length) w.postMessage(o.message(o.jobs[next++]));
    };
    if (o.jobs.length === 0) {
      resolve();
      return;
    }
    const count = Math.max(1, Math.min(o.size, o.jobs.length));
    for (let i = 0; i < count; i++) {
      const w = new Worker(o.script, { workerData: o.workerData });
      pool.push(w);
      w.on('message', (answer: Answer) => {
        if (failed) return;
        if (answer.error) {
          fail(new Error(`${o.label} failed: ${answer.error}`));
          return;
        }
        o.onAnswer(answer);
        if (--pending === 0) succeed();
        else feed(w);
      });
      w.on('error', fail);
      feed(w);
    }
  });
}
