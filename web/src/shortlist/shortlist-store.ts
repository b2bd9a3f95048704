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
import { greatCircle_m } from '../data/cell-table';
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
  /**
   * Add a site. A site at the same place as one already listed (within SAME_PLACE_M) is not added
   * twice: the listed one is updated (newer values, its metrics merged with the new ones, a study's
   * origin; name, note and position kept) and returned.
   */
  add(item: NewShortlistItem): ShortlistItem;
  /** The listed site at the same place as (lon, lat), if any (within SAME_PLACE_M). */
  atPlace(lon: number, lat: number): ShortlistItem | undefined;
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

/** Everything one store keeps between calls. */
interface StoreState {
  /** null: in memory only (none given, or storage could not be opened). */
  persistence: ShortlistPersistence | null;
  items: readonly ShortlistItem[];
  problem: string | null;
  status: SaveStatus;
  listeners: Set<() => void>;
  // What storage holds: the item objects last written (items are immutable, so identity = content)
  // and their order; and the order of every item in the tab.
  saved: Map<string, { item: ShortlistItem; order: number }>;
  order: Map<string, number>;
  nextOrder: number;
  loaded: boolean;
  /** Changes made before the saved list loaded, replayed on top of it. */
  pending: Op[];
  writing: Promise<void> | null;
  /** A change arrived during a write: write again after it. */
  again: boolean;
  loading: Promise<void>;
  scheduled: boolean;
}

const notify = (st: StoreState) => st.listeners.forEach((l) => l());
const setStatus = (st: StoreState, next: Partial<SaveStatus>) => {
  st.status = Object.freeze({ ...st.status, ...next });
};

function orderOf(st: StoreState, id: string): number {
  let o = st.order.get(id);
  if (o === undefined) {
    o = st.nextOrder++;
    st.order.set(id, o);
  }
  return o;
}

/** What a write must do to make storage hold `snapshot`: the sites new or changed, the ids gone. */
function changesSinceSaved(st: StoreState, snapshot: readonly ShortlistItem[]) {
  const put: SavedSite[] = [];
  const keep = new Set<string>();
  for (const item of snapshot) {
    keep.add(item.id);
    const o = orderOf(st, item.id);
    const s = st.saved.get(item.id);
    if (!s || s.item !== item || s.order !== o) put.push({ item, order: o });
  }
  const remove = [...st.saved.keys()].filter((id) => !keep.has(id));
  return { put, remove };
}

/** Write until storage holds the tab's list; a failure stops (the next change tries again). */
async function writeUntilSaved(st: StoreState, target: ShortlistPersistence): Promise<void> {
  do {
    st.again = false;
    const snapshot = st.items;
    const { put, remove } = changesSinceSaved(st, snapshot);
    if (put.length === 0 && remove.length === 0) {
      if (st.status.state !== 'saved' || st.status.problem) setStatus(st, { state: 'saved', problem: null });
      break;
    }
    setStatus(st, { state: 'saving' });
    try {
      await target.write({ put, remove });
      for (const s of put) st.saved.set(s.item.id, s);
      for (const id of remove) st.saved.delete(id);
      setStatus(st, { state: 'saved', problem: null, savedCount: st.saved.size });
    } catch (e) {
      setStatus(st, { state: 'unsaved', problem: saveFailureMessage(e, snapshot.length, st.saved.size) });
      notify(st);
      break; // the next change tries again
    }
    notify(st);
  } while (st.again);
}

async function flush(st: StoreState): Promise<void> {
  const target = st.persistence;
  if (!target || !st.loaded) return;
  if (st.writing) {
    st.again = true;
    return st.writing;
  }
  st.writing = writeUntilSaved(st, target).finally(() => {
    st.writing = null;
  });
  return st.writing;
}

/** One write for a burst of edits: flush on the next turn of the event loop. */
function scheduleFlush(st: StoreState): void {
  if (st.scheduled) return;
  st.scheduled = true;
  setTimeout(() => {
    st.scheduled = false;
    void flush(st);
  }, 0);
}

function commit(st: StoreState, op: Op): void {
  if (!st.loaded) st.pending.push(op);
  st.items = Object.freeze(op(st.items));
  for (const it of st.items) orderOf(st, it.id);
  if (st.persistence) {
    if (st.loaded && st.status.state !== 'saving') setStatus(st, { state: 'saving' });
    scheduleFlush(st);
  }
  notify(st);
}

/** Read the saved list and replay the changes made meanwhile on top of it; without storage, say so. */
function loadSaved(st: StoreState, persistence: ShortlistPersistence): Promise<void> {
  return persistence.load().then(
    ({ sites, problems }) => {
      for (const s of sites) {
        st.saved.set(s.item.id, s);
        st.order.set(s.item.id, s.order);
        st.nextOrder = Math.max(st.nextOrder, s.order + 1);
      }
      // Changes made while loading go on top of the saved list; their items get orders after it.
      let next: readonly ShortlistItem[] = sites.map((s) => s.item);
      const early = new Set(st.items.map((i) => i.id));
      for (const id of early) if (!st.saved.has(id)) st.order.delete(id);
      for (const op of st.pending.splice(0)) next = op(next);
      st.items = Object.freeze([...next]);
      for (const it of st.items) orderOf(st, it.id);
      st.loaded = true;
      st.problem = problems.length ? problems.join('; ') : null;
      setStatus(st, { state: 'saved', savedCount: st.saved.size });
      notify(st);
      return flush(st);
    },
    (e: unknown) => {
      // Storage cannot be opened at all: keep working in memory and say so.
      st.problem = `the shortlist cannot be saved in this browser (${(e as Error)?.message ?? e}); it lives only in this tab`;
      st.loaded = true;
      st.pending.length = 0;
      setStatus(st, { state: 'unsaved', problem: st.problem });
      st.persistence = null;
      notify(st);
    },
  );
}

/** Two sites closer than this are the same place, m (well inside one analysis cell of ≥ 1 km). */
export const SAME_PLACE_M = 25;

function findAtPlace(items: readonly ShortlistItem[], lon: number, lat: number): ShortlistItem | undefined {
  return items.find((it) => greatCircle_m([it.lon, it.lat], [lon, lat]) < SAME_PLACE_M);
}

/** A new item from `add`'s input, checked against the item schema (TypeError naming the bad field). */
function newItem(input: NewShortlistItem, count: number): ShortlistItem {
  const candidate = {
    id: newId(),
    name: input.name ?? `Site ${count + 1}`,
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
  return parsed.data;
}

/** Create a store over `persistence` (null = in memory only, nothing saved). */
export function createShortlistStore(backend: ShortlistPersistence | null): ShortlistStore {
  const st: StoreState = {
    persistence: backend,
    items: Object.freeze([]),
    problem: null,
    status: Object.freeze({ state: backend ? 'loading' : 'saved', problem: null, savedCount: 0 }),
    listeners: new Set(),
    saved: new Map(),
    order: new Map(),
    nextOrder: 0,
    loaded: !backend,
    pending: [],
    writing: null,
    again: false,
    loading: Promise.resolve(),
    scheduled: false,
  };
  if (backend) st.loading = loadSaved(st, backend);

  return {
    list: () => st.items,
    add(input) {
      const item = newItem(input, st.items.length);
      const same = findAtPlace(st.items, item.lon, item.lat);
      if (same) {
        // A site studied at a listed place becomes a studied site; its name and note stay the user's.
        const origin = item.origin === 'site' ? item.origin : same.origin;
        const merged = {
          ...same,
          origin,
          values: item.values,
          metrics: { ...same.metrics, ...item.metrics },
        };
        commit(st, (list) => list.map((it) => (it.id === same.id ? merged : it)));
        return merged;
      }
      commit(st, (list) => [...list, item]);
      return item;
    },
    atPlace: (lon, lat) => findAtPlace(st.items, lon, lat),
    update(id, patch) {
      commit(st, (list) => list.map((it) => (it.id === id ? { ...it, ...patch } : it)));
    },
    remove(id) {
      commit(st, (list) => list.filter((it) => it.id !== id));
    },
    clear() {
      commit(st, () => []);
    },
    importItems(incoming) {
      const ids = new Set(incoming.map((i) => i.id));
      // A re-imported site goes to the end, as a new one would.
      for (const id of ids) st.order.delete(id);
      commit(st, (list) => [...list.filter((i) => !ids.has(i.id)), ...incoming]);
    },
    subscribe(listener) {
      st.listeners.add(listener);
      return () => st.listeners.delete(listener);
    },
    loadProblem: () => st.problem,
    saveStatus: () => st.status,
    async settled() {
      await st.loading;
      while (st.scheduled || st.writing) {
        if (st.writing) await st.writing;
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
