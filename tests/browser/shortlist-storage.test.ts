/**
 * Shortlist persistence in a real Chromium (issue 21 item 2): a shortlist kept in localStorage by an
 * earlier version moves to IndexedDB; ten thousand sites are saved and survive a reload; over the
 * storage quota the user is told, the tab keeps every site, nothing saved before is lost, the page
 * asks before it is left, and once space is back the next change saves all.
 *
 * The quota failure is simulated the way Chromium reports a real one: the IndexedDB transaction
 * aborts, asynchronously, with error QuotaExceededError (its writes rolled back by IndexedDB itself).
 * (Lowering the origin's quota through the DevTools protocol, Storage.overrideQuotaForOrigin, was
 * tried first: this Chromium reports the lower quota but still commits IndexedDB writes past it.)
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startSession, type BrowserSession } from './browser-session';
import { LEGACY_STORAGE_KEY } from '../../web/src/shortlist/indexeddb-persistence';

let s: BrowserSession;

/** While window.__quotaFull is set, every readwrite transaction that puts a record aborts over quota. */
const SIMULATE_QUOTA = `
  (() => {
    if (window.__quotaPatched) return;
    window.__quotaPatched = true;
    const put = IDBObjectStore.prototype.put;
    IDBObjectStore.prototype.put = function (...args) {
      const tx = this.transaction;
      if (window.__quotaFull && !tx.__overQuota) {
        tx.__overQuota = true;
        Object.defineProperty(tx, 'error', {
          value: new DOMException('The quota has been exceeded.', 'QuotaExceededError'),
        });
        setTimeout(() => tx.abort(), 0);
      }
      return put.apply(this, args);
    };
  })();
`;

beforeAll(async () => {
  s = await startSession();
  await s.context.addInitScript(SIMULATE_QUOTA);
});

afterAll(async () => {
  await s?.close();
});

async function openApp(page: Page): Promise<void> {
  await page.goto(s.url);
  await page.waitForSelector('[data-testid=shortlist-panel]', { timeout: 60_000 });
  await page.waitForSelector('[data-testid=shortlist-save-state]:not([data-state=loading])', {
    timeout: 60_000,
  });
}

async function saveState(page: Page): Promise<string | null> {
  return page.getAttribute('[data-testid=shortlist-save-state]', 'data-state');
}

async function waitSettled(page: Page, timeout_ms = 120_000): Promise<string | null> {
  const t0 = Date.now();
  let state = await saveState(page);
  while ((state === 'saving' || state === 'loading') && Date.now() - t0 < timeout_ms) {
    await page.waitForTimeout(100);
    state = await saveState(page);
  }
  return state;
}

/** Sites saved in IndexedDB, counted in the page. */
async function savedInDb(page: Page): Promise<number> {
  return page.evaluate(
    () =>
      new Promise<number>((resolve, reject) => {
        const r = indexedDB.open('pile-atlas');
        r.onsuccess = () => {
          const c = r.result.transaction('sites', 'readonly').objectStore('sites').count();
          c.onsuccess = () => {
            resolve(c.result);
            r.result.close();
          };
          c.onerror = () => reject(c.error);
        };
        r.onerror = () => reject(r.error);
      }),
  );
}

function siteCollection(prefix: string, n: number): string {
  const note = 'permafrost ridge, gravel over bedrock at 12 m; '.repeat(4);
  return JSON.stringify({
    type: 'FeatureCollection',
    features: Array.from({ length: n }, (_, i) => ({
      type: 'Feature',
      geometry: { type: 'Point', coordinates: [-3 + (i % 100) * 0.01, 75 + Math.floor(i / 100) * 0.001] },
      properties: {
        pileAtlasId: `${prefix}-${i}`,
        name: `${prefix} ${i}`,
        note,
        origin: 'map',
        addedAt: '2026-12-01T00:00:00.000Z',
      },
    })),
  });
}

async function shortlistCount(page: Page): Promise<number> {
  const h = await page.locator('[data-testid=shortlist-panel] h2').textContent();
  return Number(/\(([\d,]+)\)/.exec(h ?? '')?.[1].replace(/,/g, ''));
}

describe('shortlist storage', () => {
  it('moves a localStorage shortlist of an earlier version into IndexedDB', async () => {
    // Same origin, before the app's first start: the data manifest is a plain JSON page.
    await s.page.goto(`${s.url}data/manifest.json`);
    const legacy = [0, 1].map((i) => ({
      id: `legacy-${i}`,
      name: `Legacy ${i}`,
      note: '',
      lon: -3 + i,
      lat: 75,
      addedAt: '2026-01-01T00:00:00.000Z',
      origin: 'map',
      values: {},
      metrics: {},
    }));
    await s.page.evaluate(
      ([k, v]) => localStorage.setItem(k, v),
      [LEGACY_STORAGE_KEY, JSON.stringify(legacy)],
    );
    await openApp(s.page);
    expect(await waitSettled(s.page)).toBe('saved');
    expect(await shortlistCount(s.page)).toBe(2);
    expect(await s.page.inputValue('[data-testid=shortlist-item] input')).toBe('Legacy 0');
    expect(await s.page.evaluate((k) => localStorage.getItem(k), LEGACY_STORAGE_KEY)).toBeNull();
    expect(await savedInDb(s.page)).toBe(2);
  });

  it('saves ten thousand sites and keeps them across a reload', async () => {
    const file = join(s.artifactsDir, 'shortlist-10000.geojson');
    writeFileSync(file, siteCollection('bulk', 10_000));
    const t0 = Date.now();
    await s.page.setInputFiles('[data-testid=import-geojson]', file);
    await s.page.waitForSelector('[data-testid=shortlist-panel] [role=status]');
    expect(await waitSettled(s.page)).toBe('saved');
    console.log(`10,002 sites imported and saved in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
    expect(await savedInDb(s.page)).toBe(10_002);
    // Only the first 200 rows are drawn until asked.
    expect(await s.page.locator('[data-testid=shortlist-item]').count()).toBe(200);
    await openApp(s.page);
    expect(await shortlistCount(s.page)).toBe(10_002);
    expect(await s.page.locator('[data-testid=shortlist-save-state]').textContent()).toContain(
      '10,002 site(s)',
    );
  });

  it('over quota: tells the user, keeps the tab and the saved list, asks before leaving, saves once space is back', async () => {
    await s.page.evaluate(SIMULATE_QUOTA);
    await s.page.evaluate('window.__quotaFull = true');
    const file = join(s.artifactsDir, 'shortlist-more-10000.geojson');
    writeFileSync(file, siteCollection('more', 10_000));
    await s.page.setInputFiles('[data-testid=import-geojson]', file);
    await s.page.waitForSelector('[data-testid=shortlist-panel] h2:has-text("20,002")', { timeout: 60_000 });
    expect(await waitSettled(s.page)).toBe('unsaved');
    const alert = await s.page.locator('[data-testid=shortlist-save-problem]').textContent();
    console.log(`over quota the user reads: ${alert}`);
    expect(alert).toMatch(
      /^Not saved: the browser's storage for this page is full\. The 20,002 site\(s\) shown are still in this tab, and the list saved before \(10,002 site\(s\)\) is kept/,
    );
    expect(await shortlistCount(s.page)).toBe(20_002);
    expect(await savedInDb(s.page)).toBe(10_002);
    // Later edits neither throw nor get lost in the tab.
    await s.page.fill('[data-testid=shortlist-item] input', 'edited while full');
    expect(await waitSettled(s.page)).toBe('unsaved');
    await s.page.screenshot({ path: join(s.artifactsDir, 'shortlist-over-quota-1280x720.png') });
    expect(s.pageErrors).toEqual([]);

    // Leaving asks first (beforeunload); staying keeps everything.
    const dialogs: string[] = [];
    s.page.once('dialog', (d) => {
      dialogs.push(d.type());
      void d.dismiss();
    });
    await s.page.reload({ timeout: 5_000 }).catch(() => undefined);
    expect(dialogs).toEqual(['beforeunload']);
    expect(await shortlistCount(s.page)).toBe(20_002);

    // Space is back: the next change saves all of it.
    await s.page.evaluate('window.__quotaFull = false');
    await s.page.fill('[data-testid=shortlist-item] input', 'edited after space came back');
    expect(await waitSettled(s.page)).toBe('saved');
    expect(await savedInDb(s.page)).toBe(20_002);
    s.page.once('dialog', (d) => void d.accept());
    await openApp(s.page);
    expect(await shortlistCount(s.page)).toBe(20_002);
    expect(await s.page.locator('[data-testid=shortlist-save-problem]').count()).toBe(0);
    expect(s.pageErrors).toEqual([]);
  });
});
