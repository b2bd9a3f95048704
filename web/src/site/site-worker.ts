/**
 * Web Worker that runs the single-site simulator (layers/site/simulate-site.ts) off the main thread so
 * the map and the form stay responsive. One run per worker: the panel cancels by terminating the worker
 * (a busy worker cannot read a cancel message until the run returns) and starts a new one for each run.
 * After the run the worker also sizes the pile field by design pulse (layers/site/site-sizing.ts, for the map's foundation: layers/screening/run-site-study.ts), which takes
 * seconds of its own; a failed sizing is reported with the result rather than failing the run.
 */
import '../zod-jitless';
import { simulateSite } from '../../../layers/site/simulate-site';
import { siteInputSchema } from '../../../layers/site/site-input-schema';
import type { SiteSizing } from '../../../layers/site/site-sizing';
import { sizeStudy } from '../../../layers/screening/run-site-study';
import type { SiteRunRequest, SiteWorkerMessage } from './site-worker-protocol';

const post = (m: SiteWorkerMessage) => (self as unknown as Worker).postMessage(m);

self.onmessage = (event: MessageEvent<SiteRunRequest>) => {
  if (event.data?.type !== 'run') return;
  const t0 = performance.now();
  try {
    const result = simulateSite(event.data.input, {
      onProgress: (fraction) => post({ type: 'progress', fraction }),
    });
    post({ type: 'sizing' });
    const sizing: SiteSizing | null = sizeStudy(
      siteInputSchema.parse(event.data.input),
      result,
      event.data.column,
      event.data.scenario,
    );
    post({ type: 'done', result, sizing, elapsed_ms: performance.now() - t0 });
  } catch (e) {
    post({ type: 'error', message: e instanceof Error ? e.message : String(e) });
  }
};
