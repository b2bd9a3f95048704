/**
 * The shortlist store: the one place candidate sites live, kept in IndexedDB so the list survives a
 * reload and a browser restart (indexeddb-persistence.ts; room for thousands of sites).
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
 *
 * Saving cannot lose work: every change applies at once in memory and is then written (coalesced:
 * one write for a burst of edits, only the sites that changed). Changes made before the saved list
 * has loaded are applied on top of it. When a write fails (quota, a refusing browser), nothing saved
 * before is touched (one transaction), the list in the tab stays as it is, `saveStatus()` carries a
 * message for the user, the page asks before it is closed, and the next change tries again.
 */
import { z } from 'zod';
import { shortlistItemSchema, type NewShortlistItem, type ShortlistItem } from './shortlist-item';
import { saveFailureMessage, type SavedSite, type ShortlistPersistence } from './shortlist-persistence';
import { indexedDbPersistence } from './indexeddb-persistence';
import { formatZodIssues } from '../../../layers/validation-error';

export interface SaveStatus {
  /** 'loading' until the saved list is read; 'saved' when the tab and the storage agree. */
  state: 'loading' | 'saving' | 'saved' | 'unsaved';
  /** Why the last write failed (shown to the user), or null. */
  problem: string | null;
  /** Sites in the saved list. */
  savedCount: number;
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
  /** Problems met when reading persisted state, or null. */
  loadProblem(): string | null;
  /** Saving state; a new object whenever it changes (safe for useSyncExternalStore). */
  saveStatus(): SaveStatus;
  /** Resolves once the saved list is loaded and every change so far has been written or has failed. */
  settled(): Promise<void>;
}

function issuesText(error: z.ZodError): string {
  return formatZodIssues(error).join('; ');
}

let counter = 0;
function newId(): string {
  counter += 1;
  return `s${Date.now().toString(36)}${counter.toString(36)}${Math.floor(Math.random() * 1e6).toString(36)}`;
}

type Op = (items: readonly ShortlistItem[]) => ShortlistItem[];

/** Create a store over `persistence` (null = in memory only, nothing saved). */
export function createShortlistStore(backend: ShortlistPersistence | null): ShortlistStore {
  let persistence = backend;
  let items: readonly ShortlistItem[] = Object.freeze([]);
  let problem: string | null = null;
  let status: SaveStatus = Object.freeze({
    state: persistence ? 'loading' : 'saved',
    problem: null,
    savedCount: 0,
  });
  const listeners = new Set<() => void>();
  const notify = () => listeners.forEach((l) => l());
  const setStatus = (next: Partial<SaveStatus>) => {
    status = Object.freeze({ ...status, ...next });
  };

  // What storage holds: the item objects last written (items are immutable, so identity = content)
  // and their order; and the order of every item in the tab.
  const saved = new Map<string, { item: ShortlistItem; order: number }>();
  const order = new Map<string, number>();
  let nextOrder = 0;
  let loaded = !persistence;
  const pending: Op[] = [];
  let writing: Promise<void> | null = null;
  let again = false;
  let loading: Promise<void> = Promise.resolve();

  const orderOf = (id: string) => {
    let o = order.get(id);
    if (o === undefined) {
      o = nextOrder++;
      order.set(id, o);
    }
    return o;
  };

  const flush = async (): Promise<void> => {
    const target = persistence;
    if (!target || !loaded) return;
    if (writing) {
      again = true;
      return writing;
    }
    const run = async () => {
      do {
        again = false;
        const snapshot = items;
        const put: SavedSite[] = [];
        const keep = new Set<string>();
        for (const item of snapshot) {
          keep.add(item.id);
          const o = orderOf(item.id);
          const s = saved.get(item.id);
          if (!s || s.item !== item || s.order !== o) put.push({ item, order: o });
        }
        const remove = [...saved.keys()].filter((id) => !keep.has(id));
        if (put.length === 0 && remove.length === 0) {
          if (status.state !== 'saved' || status.problem) setStatus({ state: 'saved', problem: null });
          break;
        }
        setStatus({ state: 'saving' });
        try {
          await target.write({ put, remove });
          for (const s of put) saved.set(s.item.id, s);
          for (const id of remove) saved.delete(id);
          setStatus({ state: 'saved', problem: null, savedCount: saved.size });
        } catch (e) {
          setStatus({ state: 'unsaved', problem: saveFailureMessage(e, snapshot.length, saved.size) });
          notify();
          break; // the next change tries again
        }
        notify();
      } while (again);
    };
    writing = run().finally(() => {
      writing = null;
    });
    return writing;
  };

  let scheduled = false;
  const scheduleFlush = () => {
    if (scheduled) return;
    scheduled = true;
    setTimeout(() => {
      scheduled = false;
      void flush();
    }, 0);
  };

  const commit = (op: Op) => {
    if (!loaded) pending.push(op);
    items = Object.freeze(op(items));
    for (const it of items) orderOf(it.id);
    if (persistence) {
      if (loaded && status.state !== 'saving') setStatus({ state: 'saving' });
      scheduleFlush();
    }
    notify();
  };

  if (persistence) {
    loading = persistence.load().then(
      ({ sites, problems }) => {
        for (const s of sites) {
          saved.set(s.item.id, s);
          order.set(s.item.id, s.order);
          nextOrder = Math.max(nextOrder, s.order + 1);
        }
        // Changes made while loading go on top of the saved list; their items get orders after it.
        let next: readonly ShortlistItem[] = sites.map((s) => s.item);
        const early = new Set(items.map((i) => i.id));
        for (const id of early) if (!saved.has(id)) order.delete(id);
        for (const op of pending.splice(0)) next = op(next);
        items = Object.freeze([...next]);
        for (const it of items) orderOf(it.id);
        loaded = true;
        problem = problems.length ? problems.join('; ') : null;
        setStatus({ state: 'saved', savedCount: saved.size });
        notify();
        return flush();
      },
      (e: unknown) => {
        // Storage cannot be opened at all: keep working in memory and say so.
        problem = `the shortlist cannot be saved in this browser (${(e as Error)?.message ?? e}); it lives only in this tab`;
        loaded = true;
        pending.length = 0;
        setStatus({ state: 'unsaved', problem });
        persistence = null;
        notify();
      },
    );
  }

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
      commit((list) => [...list, parsed.data]);
      return parsed.data;
    },
    update(id, patch) {
      commit((list) => list.map((it) => (it.id === id ? { ...it, ...patch } : it)));
    },
    remove(id) {
      commit((list) => list.filter((it) => it.id !== id));
    },
    clear() {
      commit(() => []);
    },
    importItems(incoming) {
      const ids = new Set(incoming.map((i) => i.id));
      // A re-imported site goes to the end, as a new one would.
      for (const id of ids) order.delete(id);
      commit((list) => [...list.filter((i) => !ids.has(i.id)), ...incoming]);
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    loadProblem: () => problem,
    saveStatus: () => status,
    async settled() {
      await loading;
      while (scheduled || writing) {
        if (writing) await writing;
        else await new Promise((r) => setTimeout(r, 0));
      }
    },
  };
}

function browserPersistence(): ShortlistPersistence | null {
  try {
    return typeof indexedDB === 'undefined' ? null : indexedDbPersistence();
  } catch {
    return null;
  }
}

/** The app's single store (IndexedDB-backed in the browser). */
export const shortlistStore: ShortlistStore = createShortlistStore(browserPersistence());

// Closing the tab with changes not saved: let the browser ask first.
if (typeof window !== 'undefined' && typeof window.addEventListener === 'function') {
  window.addEventListener('beforeunload', (ev) => {
    const s = shortlistStore.saveStatus().state;
    if (s === 'unsaved' || s === 'saving') {
      ev.preventDefault();
      ev.returnValue = '';
    }
  });
}
