/** React binding of the shortlist store: `const items = useShortlist();` re-renders on every change. */
import { useSyncExternalStore } from 'react';
import { shortlistStore, type ShortlistStore } from './shortlist-store';
import type { ShortlistItem } from './shortlist-item';

export function useShortlist(store: ShortlistStore = shortlistStore): readonly ShortlistItem[] {
  return useSyncExternalStore(store.subscribe, store.list, store.list);
}
