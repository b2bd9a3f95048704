/**
 * Starts one site simulation in a fresh Web Worker and returns a handle: the result promise, and
 * `cancel()`, which terminates the worker at once (the promise then rejects with SiteRunCancelled).
 */
import type { SiteInputDraft, SiteResult } from '../../../layers/site/site-input-schema';
import type { Scenario } from '../../../layers/screening/scenario';
import type { ProfileColumn } from '../../../layers/site/site-profile';
import type { SiteSizing } from '../../../layers/site/site-sizing';
import type { SiteRunRequest, SiteWorkerMessage } from './site-worker-protocol';

export class SiteRunCancelled extends Error {
  constructor() {
    super('site run cancelled');
    this.name = 'SiteRunCancelled';
  }
}

export interface SiteRunHandle {
  result: Promise<{ result: SiteResult; sizing: SiteSizing | null; elapsed_ms: number }>;
  cancel(): void;
}

export function runSiteInWorker(
  input: SiteInputDraft,
  context: { scenario: Scenario; column: ProfileColumn },
  onProgress: (fraction: number, phase: 'simulating' | 'sizing') => void,
): SiteRunHandle {
  const worker = new Worker(new URL('./site-worker.ts', import.meta.url), { type: 'module' });
  let settle: ((e: Error) => void) | null = null;
  const result = new Promise<{ result: SiteResult; sizing: SiteSizing | null; elapsed_ms: number }>(
    (resolve, reject) => {
      settle = reject;
      worker.onmessage = (event: MessageEvent<SiteWorkerMessage>) => {
        const m = event.data;
        if (m.type === 'progress') onProgress(m.fraction, 'simulating');
        else if (m.type === 'sizing') onProgress(1, 'sizing');
        else if (m.type === 'done') {
          worker.terminate();
          resolve({ result: m.result, sizing: m.sizing, elapsed_ms: m.elapsed_ms });
        } else {
          worker.terminate();
          reject(new Error(m.message));
        }
      };
      worker.onerror = (event) => {
        worker.terminate();
        reject(new Error(event.message || 'the site worker failed to start'));
      };
    },
  );
  const request: SiteRunRequest = { type: 'run', input, scenario: context.scenario, column: context.column };
  worker.postMessage(request);
  return {
    result,
    cancel() {
      worker.terminate();
      settle?.(new SiteRunCancelled());
    },
  };
}
