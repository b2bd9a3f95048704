/**
 * The shortlist store (web/src/shortlist/shortlist-store.ts) over a persistence double that keeps
 * records like IndexedDB (one transaction per write: all or nothing) and can be told to fail the way
 * a browser over quota does (DOMException QuotaExceededError). What must hold (issue 21 item 2):
 * nothing saved before is lost, the tab keeps every change, the user is told, the next change retries.
 */
import { describe, expect, it } from 'vitest';
import { createShortlistStore } from '../../web/src/shortlist/shortlist-store';
import type {
  SavedSite,
  ShortlistChanges,
  ShortlistPersistence,
} from '../../web/src/shortlist/shortlist-persistence';

class FakeDb implements ShortlistPersistence {
  records = new Map<string, SavedSite>();
  writes: ShortlistChanges[] = [];
  /** When set, the next writes throw this (after checking, before applying: a rolled-back transaction). */
  failWith: Error | null = null;
  loadDelay = 0;
  async load() {
    await new Promise((r) => setTimeout(r, this.loadDelay));
    return { sites: [...this.records.values()].sort((a, b) => a.order - b.order), problems: [] };
  }
  async write(changes: ShortlistChanges) {
    await Promise.resolve();
    if (this.failWith) throw this.failWith;
    this.writes.push(changes);
    for (const id of changes.remove) this.records.delete(id);
    for (const s of changes.put) this.records.set(s.item.id, structuredClone(s));
  }
  names() {
    return [...this.records.values()].sort((a, b) => a.order - b.order).map((s) => s.item.name);
  }
}

const quota = () => new DOMException('The quota has been exceeded.', 'QuotaExceededError');

describe('shortlist store', () => {
  it('adds, updates, removes and notifies', () => {
    const store = createShortlistStore(null);
    let calls = 0;
    const off = store.subscribe(() => calls++);
    const a = store.add({ lon: -3, lat: 75, values: { groundTemp: -4 } });
    expect(a.name).toBe('Site 1');
    const before = store.list();
    store.update(a.id, { note: 'dry ridge' });
    expect(store.list()).not.toBe(before); // a new array after every change
    expect(store.list()[0].note).toBe('dry ridge');
    store.remove(a.id);
    expect(store.list()).toHaveLength(0);
    off();
    store.add({ lon: 0, lat: 0 });
    expect(calls).toBe(3);
  });

  it('persists across store instances (reload), in order, writing only what changed', async () => {
    const db = new FakeDb();
    const s1 = createShortlistStore(db);
    await s1.settled();
    const a = s1.add({ lon: -3, lat: 75, name: 'A', metrics: { pileCount: 12 } });
    s1.add({ lon: -2, lat: 75, name: 'B' });
    s1.add({ lon: -1, lat: 75, name: 'C' });
    await s1.settled();
    expect(db.writes).toHaveLength(1); // one write for the burst
    s1.update(a.id, { note: 'ridge' });
    await s1.settled();
    expect(db.writes[1]).toEqual({ put: [expect.objectContaining({ order: 0 })], remove: [] });
    const s2 = createShortlistStore(db);
    await s2.settled();
    expect(s2.list().map((i) => [i.name, i.note])).toEqual([
      ['A', 'ridge'],
      ['B', ''],
      ['C', ''],
    ]);
    expect(s2.saveStatus()).toEqual({ state: 'saved', problem: null, savedCount: 3 });
  });

  it('keeps changes made before the saved list has loaded, on top of it', async () => {
    const db = new FakeDb();
    const s0 = createShortlistStore(db);
    await s0.settled();
    s0.add({ lon: 1, lat: 1, name: 'saved' });
    await s0.settled();
    db.loadDelay = 20;
    const s = createShortlistStore(db);
    expect(s.saveStatus().state).toBe('loading');
    s.add({ lon: 2, lat: 2, name: 'early' });
    await s.settled();
    expect(s.list().map((i) => i.name)).toEqual(['saved', 'early']);
    expect(db.names()).toEqual(['saved', 'early']);
  });

  it('over quota: nothing saved before is lost, the tab keeps the change, the user is told, the next change retries', async () => {
    const db = new FakeDb();
    const s = createShortlistStore(db);
    await s.settled();
    s.add({ lon: 1, lat: 1, name: 'kept' });
    await s.settled();
    db.failWith = quota();
    const bulk = Array.from({ length: 3000 }, (_, i) => ({
      id: `imp${i}`,
      name: `Imported ${i}`,
      note: '',
      lon: 0,
      lat: 70,
      addedAt: '2026-01-01T00:00:00.000Z',
      origin: 'import' as const,
      values: {},
      metrics: {},
    }));
    s.importItems(bulk);
    await s.settled();
    expect(s.list()).toHaveLength(3001); // still in the tab
    expect(db.names()).toEqual(['kept']); // saved list untouched
    const st = s.saveStatus();
    expect(st.state).toBe('unsaved');
    expect(st.problem).toMatch(
      /^Not saved: the browser's storage for this page is full\. The 3,001 site\(s\) shown .* \(1 site\(s\)\) is kept\. Export GeoJSON/,
    );
    // Later edits do not throw, and are kept in the tab.
    expect(() => s.update('imp5', { note: 'x' })).not.toThrow();
    await s.settled();
    expect(s.list().find((i) => i.id === 'imp5')?.note).toBe('x');
    // Space freed: the next change saves everything.
    db.failWith = null;
    s.remove('imp0');
    await s.settled();
    expect(s.saveStatus()).toEqual({ state: 'saved', problem: null, savedCount: 3000 });
    expect(db.records.get('imp5')?.item.note).toBe('x');
    expect(db.records.has('imp0')).toBe(false);
  });

  it('names another refusal plainly, and works in memory when storage cannot be opened', async () => {
    const db = new FakeDb();
    const s = createShortlistStore(db);
    await s.settled();
    db.failWith = new DOMException('disk I/O error', 'UnknownError');
    s.add({ lon: 1, lat: 1 });
    await s.settled();
    expect(s.saveStatus().problem).toMatch(/refused to save \(UnknownError: disk I\/O error\)/);
    const broken: ShortlistPersistence = {
      load: () => Promise.reject(new Error('IndexedDB is disabled')),
      write: () => Promise.reject(new Error('unreachable')),
    };
    const m = createShortlistStore(broken);
    await m.settled();
    m.add({ lon: 1, lat: 1 });
    expect(m.list()).toHaveLength(1);
    expect(m.loadProblem()).toMatch(/cannot be saved in this browser \(IndexedDB is disabled\)/);
  });

  it('does not list the same place twice: a second add there updates the listed site (issue 18 item 4)', () => {
    const s = createShortlistStore(null);
    const a = s.add({ lon: -3, lat: 75, name: 'A', values: { groundTemp: -4 }, metrics: { pileCount: 12 } });
    // 10 m further north (1e-4° of latitude ≈ 11 m): the same place, well inside one analysis cell.
    const again = s.add({
      lon: -3,
      lat: 75.0001,
      name: 'A again',
      values: { groundTemp: -3.9 },
      metrics: { thawDelay_yr: 7 },
    });
    expect(s.list()).toHaveLength(1);
    expect(again.id).toBe(a.id);
    expect(again.name).toBe('A'); // the user's name is kept
    expect(again.values).toEqual({ groundTemp: -3.9 }); // newer values
    expect(again.metrics).toEqual({ pileCount: 12, thawDelay_yr: 7 }); // simulated results kept, new added
    expect(s.atPlace(-3, 75.0001)?.id).toBe(a.id);
    // 100 m away (1e-3° of latitude ≈ 111 m) is another place.
    s.add({ lon: -3, lat: 75.001, name: 'B' });
    expect(s.list().map((i) => i.name)).toEqual(['A', 'B']);
    expect(s.atPlace(10, 10)).toBeUndefined();
  });

  it('rejects invalid sites with a TypeError naming the field', () => {
    const s = createShortlistStore(null);
    expect(() => s.add({ lon: 500, lat: 75 })).toThrow(TypeError);
    expect(() => s.add({ lon: 500, lat: 75 })).toThrow(/lon/);
  });

  it('imports replace items with the same id', () => {
    const s = createShortlistStore(null);
    const a = s.add({ lon: 1, lat: 2, name: 'old' });
    s.importItems([{ ...a, name: 'new' }]);
    expect(s.list().map((i) => i.name)).toEqual(['new']);
  });
});
