/**
 * Shortlist persistence in IndexedDB: database `pile-atlas`, object store `sites` (one record per
 * site: { id, order, item }) and `meta`. IndexedDB gives a page a share of the disk (hundreds of MB
 * and more in current browsers, against about 5 MB for localStorage), so thousands of sites fit.
 *
 * The first load moves a shortlist kept by earlier versions in localStorage (key
 * `pile-atlas.shortlist.v1`) into IndexedDB in one transaction, marks it done in `meta`, and only then
 * removes the old key; a damaged old list is left where it is and reported, never overwritten.
 */
import { z } from 'zod';
import { shortlistItemSchema } from './shortlist-item';
import type {
  LoadedShortlist,
  SavedSite,
  ShortlistChanges,
  ShortlistPersistence,
} from './shortlist-persistence';

export const LEGACY_STORAGE_KEY = 'pile-atlas.shortlist.v1';
export const DB_NAME = 'pile-atlas';
const DB_VERSION = 1;
const SITES = 'sites';
const META = 'meta';
const MIGRATED = 'migratedFromLocalStorage';

interface SiteRecord {
  id: string;
  order: number;
  item: unknown;
}

function request<T>(r: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    r.onsuccess = () => resolve(r.result);
    r.onerror = () => reject(r.error);
  });
}

/** Resolves when the transaction commits; rejects with its error when it aborts (e.g. over quota). */
function done(tx: IDBTransaction): Promise<void> {
  return new Promise((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onabort = () => reject(tx.error ?? new DOMException('transaction aborted', 'AbortError'));
    tx.onerror = (ev) => ev.preventDefault(); // the abort handler reports it
  });
}

function openDb(factory: IDBFactory): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const r = factory.open(DB_NAME, DB_VERSION);
    r.onupgradeneeded = () => {
      const db = r.result;
      if (!db.objectStoreNames.contains(SITES)) db.createObjectStore(SITES, { keyPath: 'id' });
      if (!db.objectStoreNames.contains(META)) db.createObjectStore(META);
    };
    r.onsuccess = () => resolve(r.result);
    r.onerror = () => reject(r.error);
    r.onblocked = () => reject(new Error('the database is held open by another tab of an older version'));
  });
}

function issuesText(error: z.ZodError): string {
  return error.issues
    .slice(0, 3)
    .map((i) => `${i.path.join('.') || '(root)'}: ${i.message}`)
    .join('; ');
}

/** Write all changes in one readwrite transaction (a throw inside rolls the whole of it back). */
async function writeChanges(
  db: IDBDatabase,
  changes: ShortlistChanges,
  meta?: [string, unknown],
): Promise<void> {
  const tx = db.transaction(meta ? [SITES, META] : [SITES], 'readwrite');
  const finished = done(tx);
  try {
    const sites = tx.objectStore(SITES);
    for (const id of changes.remove) sites.delete(id);
    for (const s of changes.put)
      sites.put({ id: s.item.id, order: s.order, item: s.item } satisfies SiteRecord);
    if (meta) tx.objectStore(META).put(meta[1], meta[0]);
  } catch (e) {
    try {
      tx.abort();
    } catch {
      // already finished
    }
    await finished.catch(() => undefined);
    throw e;
  }
  await finished;
}

/** Move a localStorage shortlist of earlier versions over (see the module comment). */
async function migrate(db: IDBDatabase, storage: Storage | null, problems: string[]): Promise<void> {
  const tx = db.transaction(META, 'readonly');
  const migrated = await request(tx.objectStore(META).get(MIGRATED));
  if (migrated || !storage) return;
  const raw = storage.getItem(LEGACY_STORAGE_KEY);
  if (raw === null) {
    await writeChanges(db, { put: [], remove: [] }, [MIGRATED, new Date().toISOString()]);
    return;
  }
  let parsed: z.ZodSafeParseResult<z.infer<typeof shortlistItemSchema>[]>;
  try {
    parsed = z.array(shortlistItemSchema).safeParse(JSON.parse(raw));
  } catch (e) {
    problems.push(
      `the shortlist saved by an earlier version could not be read and is left as it was: ${(e as Error).message}`,
    );
    return;
  }
  if (!parsed.success) {
    problems.push(
      `the shortlist saved by an earlier version is damaged and left as it was: ${issuesText(parsed.error)}`,
    );
    return;
  }
  const put: SavedSite[] = parsed.data.map((item, order) => ({ item, order }));
  await writeChanges(db, { put, remove: [] }, [MIGRATED, new Date().toISOString()]);
  storage.removeItem(LEGACY_STORAGE_KEY);
}

export function indexedDbPersistence(
  factory: IDBFactory = indexedDB,
  storage: Storage | null = typeof localStorage === 'undefined' ? null : localStorage,
): ShortlistPersistence {
  let dbPromise: Promise<IDBDatabase> | null = null;
  const db = () => (dbPromise ??= openDb(factory));
  return {
    async load(): Promise<LoadedShortlist> {
      const d = await db();
      const problems: string[] = [];
      try {
        await migrate(d, storage, problems);
      } catch (e) {
        problems.push(
          `the shortlist saved by an earlier version could not be moved over (it is kept): ${(e as Error).message}`,
        );
      }
      const tx = d.transaction(SITES, 'readonly');
      const records = (await request(tx.objectStore(SITES).getAll())) as SiteRecord[];
      const sites: SavedSite[] = [];
      let damaged = 0;
      for (const r of records) {
        const p = shortlistItemSchema.safeParse(r.item);
        if (p.success && typeof r.order === 'number') sites.push({ item: p.data, order: r.order });
        else damaged++;
      }
      if (damaged > 0)
        problems.push(
          `${damaged} saved site(s) could not be read and are not shown (they stay saved, untouched)`,
        );
      sites.sort((a, b) => a.order - b.order);
      return { sites, problems };
    },
    async write(changes) {
      await writeChanges(await db(), changes);
    },
  };
}
