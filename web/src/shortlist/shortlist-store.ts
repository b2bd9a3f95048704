/**
 * The shortlist store: the one place candidate sites live, persisted in localStorage so the list
 * survives a reload and a browser restart.
 *
 * How to use it (map panel and site panel alike):
 *   import { shortlistStore } from '../shortlist/shortlist-store';
 *   const item = shortlistStore.add({ lon, lat, name: 'Site A', origin: 'site',
 *                                     values: cellValues, metrics: { pileCount: 12, thawDelay_yr: 14 } });
 *   shortlistStore.update(item.id, { note: 'north slope' });   // name, note, values or metrics
 *   shortlistStore.remove(item.id);
 *   const unsubscribe = shortlistStore.subscribe(() => render(shortlistStore.list()));
 * In React use `useShortlist()` from use-shortlist.ts. `list()` returns a new frozen array after every
 * change (safe for useSyncExternalStore). Metric keys carry their unit in the name, SI values.
 * Inputs are validated with zod: `add` throws a TypeError naming the bad field.
 */
import { z } from 'zod';
import { shortlistItemSchema, type NewShortlistItem, type ShortlistItem } from './shortlist-item';
import { formatZodIssues } from '../../../layers/validation-error';

export const SHORTLIST_STORAGE_KEY = 'pile-atlas.shortlist.v1';

/** The subset of the Web Storage API the store needs (injectable for tests). */
export interface KeyValueStorage {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
}

export interface ShortlistStore {
  list(): readonly ShortlistItem[];
  add(item: NewShortlistItem): ShortlistItem;
  update(id: string, patch: Partial<Pick<ShortlistItem, 'name' | 'note' | 'values' | 'metrics'>>): void;
  remove(id: string): void;
  clear(): void;
  /** Add many items (e.g. a re-imported export); items whose id already exists replace the old ones. */
  importItems(items: ShortlistItem[]): void;
  subscribe(listener: () => void): () => void;
  /** Problem met when reading persisted state (the list then starts empty), or null. */
  loadProblem(): string | null;
}

function issuesText(error: z.ZodError): string {
  return formatZodIssues(error).join('; ');
}

let counter = 0;
function newId(): string {
  counter += 1;
  return `s${Date.now().toString(36)}${counter.toString(36)}${Math.floor(Math.random() * 1e6).toString(36)}`;
}

/** Create a store over `storage` (null = in memory only). */
export function createShortlistStore(storage: KeyValueStorage | null): ShortlistStore {
  let items: readonly ShortlistItem[] = Object.freeze([]);
  let problem: string | null = null;
  const listeners = new Set<() => void>();
  if (storage) {
    const raw = storage.getItem(SHORTLIST_STORAGE_KEY);
    if (raw) {
      try {
        const parsed = z.array(shortlistItemSchema).safeParse(JSON.parse(raw));
        if (parsed.success) items = Object.freeze(parsed.data);
        else problem = `saved shortlist ignored: ${issuesText(parsed.error)}`;
      } catch (e) {
        problem = `saved shortlist ignored: ${(e as Error).message}`;
      }
    }
  }
  const commit = (next: ShortlistItem[]) => {
    items = Object.freeze(next);
    if (storage) storage.setItem(SHORTLIST_STORAGE_KEY, JSON.stringify(items));
    listeners.forEach((l) => l());
  };
  return {
    list: () => items,
    add(input) {
      const candidate = {
        id: newId(),
        name: input.name ?? `Site ${items.length + 1}`,
        note: input.note ?? '',
        lon: input.lon,
        lat: input.lat,
        addedAt: new Date().toISOString(),
        origin: input.origin ?? 'map',
        values: input.values ?? {},
        metrics: input.metrics ?? {},
      };
      const parsed = shortlistItemSchema.safeParse(candidate);
      if (!parsed.success) throw new TypeError(`shortlist add: ${issuesText(parsed.error)}`);
      commit([...items, parsed.data]);
      return parsed.data;
    },
    update(id, patch) {
      commit(items.map((it) => (it.id === id ? { ...it, ...patch } : it)));
    },
    remove(id) {
      commit(items.filter((it) => it.id !== id));
    },
    clear() {
      commit([]);
    },
    importItems(incoming) {
      const ids = new Set(incoming.map((i) => i.id));
      commit([...items.filter((i) => !ids.has(i.id)), ...incoming]);
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    loadProblem: () => problem,
  };
}

function browserStorage(): KeyValueStorage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    return null;
  }
}

/** The app's single store (localStorage-backed in the browser). */
export const shortlistStore: ShortlistStore = createShortlistStore(browserStorage());
