/**
 * How large a shortlist the browser store keeps (issue 21 item 2: "room for thousands of sites"), in
 * headless Chromium on a fresh profile as in the browser tests. For each size a GeoJSON file of that
 * many sites (each with a 188-character note) is picked in "Import GeoJSON"; the clock stops when the
 * save state reads "saved". Then the sites in IndexedDB are counted in the page, the origin's usage
 * and quota read from navigator.storage.estimate(), and the page reloaded to count what it shows.
 * SHORTLIST_SITES (comma separated, default "10000,50000,100000") picks the sizes, cumulative: each
 * import adds to the list before it.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startSession } from '../tests/browser/browser-session';

function siteCollection(prefix: string, n: number): string {
  const note = 'permafrost ridge, gravel over bedrock at 12 m; '.repeat(4);
  return JSON.stringify({
    type: 'FeatureCollection',
    features: Array.from({ length: n }, (_, i) => ({
      type: 'Feature',
      // 1 km apart or more: no two sites within the 25 m at which an add updates a listed site.
      geometry: { type: 'Point', coordinates: [-3 + (i % 300) * 0.03, 70 + Math.floor(i / 300) * 0.01] },
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

async function state(page: Page): Promise<string | null> {
  return page.getAttribute('[data-testid=shortlist-save-state]', 'data-state');
}

async function waitSettled(page: Page, timeout_ms: number): Promise<string | null> {
  const t0 = Date.now();
  let st = await state(page);
  while ((st === 'saving' || st === 'loading') && Date.now() - t0 < timeout_ms) {
    await page.waitForTimeout(200);
    st = await state(page);
  }
  return st;
}

async function stored(page: Page): Promise<{ sites: number; usage_MB: number; quota_MB: number }> {
  return page.evaluate(async () => {
    const sites = await new Promise<number>((resolve, reject) => {
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
    });
    const e = await navigator.storage.estimate();
    return { sites, usage_MB: (e.usage ?? 0) / 1e6, quota_MB: (e.quota ?? 0) / 1e6 };
  });
}

async function shown(page: Page): Promise<number> {
  const h = await page.locator('[data-testid=shortlist-panel] h2').textContent();
  return Number(/\(([\d,]+)\)/.exec(h ?? '')?.[1].replace(/,/g, ''));
}

async function openApp(page: Page, url: string): Promise<void> {
  await page.goto(url);
  await page.waitForSelector('[data-testid=shortlist-panel]', { timeout: 120_000 });
  await page.waitForSelector('[data-testid=shortlist-save-state]:not([data-state=loading])', {
    timeout: 300_000,
  });
}

export async function run(): Promise<void> {
  const sizes = (process.env.SHORTLIST_SITES ?? '10000,50000,100000').split(',').map(Number);
  const s = await startSession();
  try {
    await openApp(s.page, s.url);
    let before = 0;
    for (const size of sizes) {
      const add = size - before;
      const file = join(s.artifactsDir, `shortlist-bench-${size}.geojson`);
      writeFileSync(file, siteCollection(`b${size}`, add));
      const t0 = Date.now();
      await s.page.setInputFiles('[data-testid=import-geojson]', file);
      await s.page.waitForSelector(
        `[data-testid=shortlist-panel] h2:has-text("${size.toLocaleString('en-US')}")`,
        {
          timeout: 300_000,
        },
      );
      const st = await waitSettled(s.page, 600_000);
      const saved_s = (Date.now() - t0) / 1000;
      const db = await stored(s.page);
      const t1 = Date.now();
      await openApp(s.page, s.url);
      const reload_s = (Date.now() - t1) / 1000;
      const after = await shown(s.page);
      console.log(
        `${size.toLocaleString('en-US')} sites (${add.toLocaleString('en-US')} imported): ${st} after ` +
          `${saved_s.toFixed(1)} s; in IndexedDB ${db.sites.toLocaleString('en-US')}; origin usage ` +
          `${db.usage_MB.toFixed(1)} MB of a ${db.quota_MB.toFixed(0)} MB quota; after a reload ` +
          `${after.toLocaleString('en-US')} shown (loaded in ${reload_s.toFixed(1)} s)`,
      );
      if (st !== 'saved' || db.sites !== size || after !== size) break;
      before = size;
    }
    if (s.pageErrors.length > 0) console.log(`page errors: ${s.pageErrors.join(' | ')}`);
  } finally {
    await s.close();
  }
}
