/**
 * Where the shortlist store keeps its sites between visits: an interface (IndexedDB in the browser,
 * indexeddb-persistence.ts; anything else in tests). One record per site, written as a diff, so an
 * edit to one note of a list of thousands writes one record, and a failed write (a full disk, a
 * quota) changes nothing that was saved before: each write is one transaction.
 */
import type { ShortlistItem } from './shortlist-item';

export interface SavedSite {
  item: ShortlistItem;
  /** Position in the list (ascending). */
  order: number;
}

export interface LoadedShortlist {
  sites: SavedSite[];
  /** Problems met while loading (a damaged record, an earlier list that could not be moved over). */
  problems: string[];
}

export interface ShortlistChanges {
  put: SavedSite[];
  remove: string[];
}

export interface ShortlistPersistence {
  load(): Promise<LoadedShortlist>;
  /** Apply all changes in one transaction: all of them are saved, or (on rejection) none. */
  write(changes: ShortlistChanges): Promise<void>;
}

/** Whether an error from storage means "out of space" (the DOMException name browsers use). */
export function isQuotaError(e: unknown): boolean {
  const name = (e as { name?: string } | null)?.name;
  return name === 'QuotaExceededError' || name === 'NS_ERROR_DOM_QUOTA_REACHED';
}

/** The message shown when the list in the tab could not be saved. */
export function saveFailureMessage(e: unknown, inTab: number, saved: number): string {
  const why = isQuotaError(e)
    ? "the browser's storage for this page is full"
    : `the browser refused to save (${(e as Error)?.name ?? 'Error'}: ${String((e as Error)?.message ?? e).slice(0, 120)})`;
  return (
    `Not saved: ${why}. The ${inTab.toLocaleString('en-US')} site(s) shown are still in this tab, and the ` +
    `list saved before (${saved.toLocaleString('en-US')} site(s)) is kept. Export GeoJSON to keep your ` +
    'changes, or free space in the browser; saving is tried again with your next change.'
  );
}
