/**
 * Runs several site studies across a small pool of Web Workers (site-worker.ts, one run at a time per
 * worker) and returns a handle: the results in job order, and `cancel()`, which terminates every worker
 * at once (the promise then rejects with SiteRunCancelled). The study's ensemble members run without
 * pile sizing (runSiteEnsemble); the study under every scenario of a set runs each with its own
 * scenario and sizing (runSitePool).
 */
import type { SiteInputDraft, SiteResult } from '../../../layers/site/site-input-schema';
import type { Scenario } from '../../../layers/screening/scenario';
import type { ProfileColumn } from '../../../layers/site/site-profile';
import type { SiteSizing } from '../../../layers/site/site-sizing';
import { SiteRunCancelled } from './run-site-in-worker';
import type { SiteRunRequest, SiteWorkerMessage } from './site-worker-protocol';

export interface SitePoolHandle<T> {
  result: Promise<T[]>;
  cancel(): void;
  workers: number;
}
export type SiteEnsembleHandle = SitePoolHandle<SiteResult>;

/** One finished job of the pool. */
export interface SitePoolResult {
  result: SiteResult;
  sizing: SiteSizing | null;
  elapsed_ms: number;
}

/** Workers for the ensemble: the page's cores, at most 4 and at most the member count. */
export function ensembleWorkerCount(members: number): number {
  const cores = typeof navigator !== 'undefined' ? navigator.hardwareConcurrency || 2 : 2;
  return Math.max(1, Math.min(4, cores, members));
}

/**
 * Run `jobs` on the pool; `onProgress(done, total, fraction)` after every finished job and on the
 * workers' progress messages (`fraction`: share of all the work done, finished and running).
 */
export function runSitePool(
  jobs: SiteRunRequest[],
  onProgress: (done: number, total: number, fraction: number) => void,
): SitePoolHandle<SitePoolResult> {
  const size = ensembleWorkerCount(jobs.length);
  const workers: Worker[] = [];
  const results: SitePoolResult[] = new Array(jobs.length);
  const running = new Map<number, number>();
  let next = 0;
  let done = 0;
  let failed = false;
  let rejectAll: ((e: Error) => void) | null = null;
  const stop = () => {
    for (const w of workers) w.terminate();
  };
  const report = () => {
    let f = done;
    for (const v of running.values()) f += v;
    onProgress(done, jobs.length, f / jobs.length);
  };
  const result = new Promise<SitePoolResult[]>((resolve, reject) => {
    rejectAll = reject;
    const fail = (message: string) => {
      if (failed) return;
      failed = true;
      stop();
      reject(new Error(message));
    };
    const feed = (w: Worker) => {
      if (next >= jobs.length) return;
      const i = next++;
      running.set(i, 0);
      w.onmessage = (event: MessageEvent<SiteWorkerMessage>) => {
        const m = event.data;
        if (m.type === 'progress') {
          running.set(i, m.fraction);
          report();
        } else if (m.type === 'done') {
          results[i] = { result: m.result, sizing: m.sizing, elapsed_ms: m.elapsed_ms };
          running.delete(i);
          done++;
          report();
          if (done === jobs.length) {
            stop();
            resolve(results);
          } else feed(w);
        } else if (m.type === 'error') fail(`run ${i + 1}: ${m.message}`);
      };
      w.onerror = (event) => fail(event.message || 'a site worker failed to start');
      w.postMessage(jobs[i]);
    };
    for (let k = 0; k < size; k++) {
      const w = new Worker(new URL('./site-worker.ts', import.meta.url), { type: 'module' });
      workers.push(w);
      feed(w);
    }
  });
  return {
    result,
    workers: size,
    cancel() {
      stop();
      rejectAll?.(new SiteRunCancelled());
    },
  };
}

/** The ensemble's members, one scenario and probe column for all, no pile sizing. */
export function runSiteEnsemble(
  members: SiteInputDraft[],
  context: { scenario: Scenario; column: ProfileColumn },
  onProgress: (done: number, total: number) => void,
): SiteEnsembleHandle {
  const jobs = members.map((input): SiteRunRequest => ({ type: 'run', input, ...context, sizing: false }));
  let lastDone = -1;
  const pool = runSitePool(jobs, (done, total) => {
    if (done !== lastDone) onProgress(done, total);
    lastDone = done;
  });
  return {
    workers: pool.workers,
    cancel: pool.cancel,
    result: pool.result.then((all) => all.map((r) => r.result)),
  };
}
