/** Messages between the site panel and its Web Worker (site-worker.ts). Plain JSON-cloneable data. */
import type { SiteInputDraft, SiteResult } from '../../../layers/site/site-input-schema';

export interface SiteRunRequest {
  type: 'run';
  input: SiteInputDraft;
}

export type SiteWorkerMessage =
  | { type: 'progress'; fraction: number }
  | { type: 'done'; result: SiteResult; elapsed_ms: number }
  | { type: 'error'; message: string };
