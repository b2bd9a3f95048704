/** React bindings of the shortlist store: `const items = useShortlist();` re-renders on every change. */
import { useSyncExternalStore } from 'react';
import { shortlistStore, type SaveStatus, type ShortlistStore } from './shortlist-store';
import type { ShortlistItem } from './shortlist-item';

export function useShortlist(store: ShortlistStore = shortlistStore): readonly ShortlistItem[] {
  return useSyncExternalStore(store.subscribe, store.list, store.list);
}

/** Whether the list is saved, and why not when it is not. */
export function useShortlistSaveStatus(store: ShortlistStore = shortlistStore): SaveStatus {
  return useSyncExternalStore(store.subscribe, store.saveStatus, store.saveStatus);
}
