import { describe, expect, it } from 'vitest';
import {
  createShortlistStore,
  SHORTLIST_STORAGE_KEY,
  type KeyValueStorage,
} from '../../web/src/shortlist/shortlist-store';

function memoryStorage(): KeyValueStorage & { data: Map<string, string> } {
  const data = new Map<string, string>();
  return { data, getItem: (k) => data.get(k) ?? null, setItem: (k, v) => void data.set(k, v) };
}

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

  it('persists across store instances (reload)', () => {
    const storage = memoryStorage();
    const s1 = createShortlistStore(storage);
    s1.add({ lon: -3, lat: 75, name: 'A', metrics: { pileCount: 12 } });
    const s2 = createShortlistStore(storage);
    expect(s2.list().map((i) => [i.name, i.metrics.pileCount])).toEqual([['A', 12]]);
    expect(s2.loadProblem()).toBeNull();
  });

  it('starts empty and says why when the saved list is damaged', () => {
    const storage = memoryStorage();
    storage.setItem(SHORTLIST_STORAGE_KEY, '[{"id": 3}]');
    const s = createShortlistStore(storage);
    expect(s.list()).toHaveLength(0);
    expect(s.loadProblem()).toMatch(/0\.id/);
    storage.setItem(SHORTLIST_STORAGE_KEY, '{not json');
    expect(createShortlistStore(storage).loadProblem()).toMatch(/ignored/);
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
