/**
 * Worker thread of `pile-atlas site --batch --ensemble`: runs one site simulation per message (a site's
 * own run or one ensemble member) and answers with the result, or with the simulator's message when the
 * run failed (answered as `failure`, not `error`: one failed member must not end the other sites).
 */
import { parentPort } from 'node:worker_threads';
import { simulateSite } from '../../layers/site/simulate-site';
import type { SiteInput } from '../../layers/site/site-input-schema';

export interface SiteRunJobMessage {
  job: number;
  input: SiteInput;
}

parentPort?.on('message', (msg: SiteRunJobMessage) => {
  const t0 = performance.now();
  try {
    const result = simulateSite(msg.input);
    parentPort?.postMessage({ job: msg.job, result, elapsed_ms: performance.now() - t0 });
  } catch (e) {
    parentPort?.postMessage({ job: msg.job, failure: e instanceof Error ? e.message : String(e) });
  }
});
