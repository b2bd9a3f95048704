/** Messages between the site panel and its Web Worker (site-worker.ts). Plain JSON-cloneable data. */
import type { SiteInputDraft, SiteResult } from '../../../layers/site/site-input-schema';
import type { Scenario } from '../../../layers/screening/scenario';
import type { ProfileColumn } from '../../../layers/site/site-profile';
import type { SiteSizing } from '../../../layers/site/site-sizing';

export interface SiteRunRequest {
  type: 'run';
  input: SiteInputDraft;
  /** For the pile sizing after the run. */
  scenario: Scenario;
  column: ProfileColumn;
}

export type SiteWorkerMessage =
  | { type: 'progress'; fraction: number }
  | { type: 'sizing' }
  | { type: 'done'; result: SiteResult; sizing: SiteSizing | null; elapsed_ms: number }
  | { type: 'error'; message: string };
