/**
 * One shortlisted site and its zod schema (used for persisted state and imports alike).
 *
 * Values are SI. `values` holds the screening bands of the cell under the site (key = manifest band
 * id, null = nodata); `metrics` holds any further results, each key carrying its unit in its name
 * (e.g. `pileCount`, `thawDelay_yr`, `peakLoad_kW`) — the site panel fills this after a simulation.
 */
import { z } from 'zod';

export const shortlistItemSchema = z.object({
  id: z.string().min(1),
  name: z.string(),
  note: z.string(),
  lon: z.number().min(-180).max(180),
  lat: z.number().min(-90).max(90),
  addedAt: z.string(),
  origin: z.enum(['map', 'site', 'import']),
  values: z.record(z.string(), z.number().nullable()),
  metrics: z.record(z.string(), z.union([z.number(), z.string(), z.null()])),
});

export type ShortlistItem = z.infer<typeof shortlistItemSchema>;

/** What a caller supplies to add a site; id, addedAt and defaults are filled in. */
export interface NewShortlistItem {
  name?: string;
  note?: string;
  lon: number;
  lat: number;
  origin?: 'map' | 'site' | 'import';
  values?: Record<string, number | null>;
  metrics?: Record<string, number | string | null>;
}
