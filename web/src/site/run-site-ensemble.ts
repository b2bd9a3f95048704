/**
 * Runs the site study's ensemble members across a small pool of Web Workers (site-worker.ts, one
 * member at a time per worker, no pile sizing) and returns a handle: the results in member order, and
 * `cancel()`, which terminates every worker at once (the promise then rejects with SiteRunCancelled).
 */
import type { SiteInputDraft, SiteResult } from '../../../layers/site/site-input-schema';
import type { Scenario } from '../../../layers/screening/scenario';
import type { ProfileColumn } from '../../../layers/site/site-profile';
import { SiteRunCancelled } from './run-site-in-worker';
import type { SiteRunRequest, SiteWorkerMessage } from './site-worker-protocol';

export interface SiteEnsembleHandle {
  result: Promise<SiteResult[]>;
  cancel(): void;
  workers: number;
}

/** Workers for the ensemble: the page's cores, at most 4 and at most the member count. */
export function ensembleWorkerCount(members: number): number {
  const cores = typeof navigator !== 'undefined' ? navigator.hardwareConcurrency || 2 : 2;
  return Math.max(1, Math.min(4, cores, members));
}

export function runSiteEnsemble(
  members: SiteInputDraft[],
  context: { scenario: Scenario; column: ProfileColumn },
  onProgress: (done: number, total: number) => void,
): SiteEnsembleHandle {
  const size = ensembleWorkerCount(members.length);
  const workers: Worker[] = [];
  const results: SiteResult[] = new Array(members.length);
  let next = 0;
  let done = 0;
  let failed = false;
  let rejectAll: ((e: Error) => void) | null = null;
  const stop = () => {
    for (const w of workers) w.terminate();
  };
  const result = new Promise<SiteResult[]>((resolve, reject) => {
    rejectAll = reject;
    const feed = (w: Worker) => {
      if (next >= members.length) return;
      const i = next++;
      const request: SiteRunRequest = { type: 'run', input: members[i], ...context, sizing: false };
      w.onmessage = (event: MessageEvent<SiteWorkerMessage>) => {
        const m = event.data;
        if (m.type === 'done') {
          results[i] = m.result;
          done++;
          onProgress(done, members.length);
          if (done === members.length) {
            stop();
            resolve(results);
          } else feed(w);
        } else if (m.type === 'error' && !failed) {
          failed = true;
          stop();
          reject(new Error(`member ${i + 1}: ${m.message}`));
        }
      };
      w.onerror = (event) => {
        if (failed) return;
        failed = true;
        stop();
        reject(new Error(event.message || 'a site worker failed to start'));
      };
      w.postMessage(request);
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
