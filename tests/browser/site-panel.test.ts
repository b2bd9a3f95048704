/**
 * End-to-end checks of the site panel in a real Chromium against the real demo pipeline output: a site
 * run to completion with its charts, an invalid input showing its message without running, cancel,
 * add to shortlist from the site study, and the print stylesheet of the site sheet.
 * Screenshots (1280x720) go to the artifacts directory (browser-session.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startSession, type BrowserSession } from './browser-session';

let s: BrowserSession;
let site: [number, number];

beforeAll(async () => {
  s = await startSession();
  const settlements = JSON.parse(
    readFileSync(join(s.dataDir, s.manifest.settlements ?? 'settlements.geojson'), 'utf8'),
  ) as { features: { geometry: { coordinates: [number, number] } }[] };
  site = settlements.features[0].geometry.coordinates;
});

afterAll(async () => {
  await s?.close();
});

/** Open the app on the first settlement, click it and open the site study. */
async function openSiteStudy(page: Page): Promise<void> {
  await page.goto(`${s.url}?c=${site[0]},${site[1]}&z=${Math.min(9, s.manifest.tiles.maxZoom + 1)}`);
  await page.waitForSelector('.maplibregl-canvas');
  await page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
  await page.waitForTimeout(300);
  const box = await page.locator('[data-testid=map]').boundingBox();
  if (!box) throw new Error('map not visible');
  await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
  await page.waitForSelector('[data-testid=site-card]', { timeout: 30_000 });
  await page.click('[data-testid=open-site-study]');
  await page.waitForSelector('[data-testid=site-study]');
}

async function setField(page: Page, id: string, value: string): Promise<void> {
  const input = page.locator(`#${id}`);
  await input.fill(value);
}

describe('site panel', () => {
  it('runs a site to completion with charts present', async () => {
    await openSiteStudy(s.page);
    // Prefilled from the tiles: the climate field holds the cell's mean air temperature.
    const maat = Number(await s.page.inputValue('#site-climate-meanAirTemp_C'));
    expect(maat).toBeGreaterThan(-40);
    expect(maat).toBeLessThan(10);
    // The default run length comes from the map's thaw years (or the climate horizon) and its cost is
    // stated before the run; the run below uses that default.
    const years = Number(await s.page.inputValue('#site-years'));
    expect(years).toBeGreaterThanOrEqual(s.manifest.scenario ? 30 : 1);
    const cost = await s.page.locator('[data-testid=run-cost]').textContent();
    expect(cost).toMatch(
      new RegExp(`This run: ${years} simulated years, \\d+ cells × \\d+ steps, about \\d+ s\\.`),
    );
    expect(cost).toMatch(/years: the map has|to the climate horizon/);
    await s.page.click('[data-testid=run-site]');
    await s.page.waitForSelector('[data-testid=site-progress]', { timeout: 10_000 });
    // The page stays responsive while the worker runs: the form still takes input.
    const t0 = Date.now();
    await s.page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
    expect(Date.now() - t0).toBeLessThan(1000);
    await s.page.waitForSelector('[data-testid=site-outcome]', { timeout: 420_000 });
    for (const id of [
      'chart-probe',
      'chart-window',
      'chart-profile',
      'chart-fluid',
      'chart-monthly-heat',
      'chart-pulses',
    ]) {
      const chart = s.page.locator(`[data-testid=${id}]`);
      await expect.poll(() => chart.count(), { timeout: 5000 }).toBe(1);
      const drawn = await chart.locator('svg path, svg rect').count();
      expect(drawn, `${id} draws something`).toBeGreaterThan(0);
    }
    // The probe chart's curves are real paths with many points.
    const d = await s.page.locator('[data-testid=chart-probe] svg .plot path').first().getAttribute('d');
    expect((d ?? '').split('L').length).toBeGreaterThan(50);
    const summary = await s.page.locator('[data-testid=site-summary]').textContent();
    expect(summary).toContain('Quick estimate');
    expect(summary).toContain('Simulated');
    expect(summary).toContain('Calibration band');
    // Columns: map, map one pile's share, simulated, band, agreement and why.
    expect(await s.page.locator('[data-testid=summary-pileCount] td').nth(2).textContent()).toMatch(/^\d+$/);
    expect(await s.page.locator('[data-testid=summary-groundTemp] td').nth(3).textContent()).toMatch(
      /± 0\.12 °C/,
    );
    expect(await s.page.locator('[data-testid=summary-heatPerPile] td').nth(4).textContent()).toMatch(
      /one pile|neighbours/,
    );
    // The window chart's marker sits in the zone the window note names.
    const zone = await s.page.locator('[data-testid=chart-window]').getAttribute('data-marker-zone');
    const notes = (await s.page.locator('[data-testid=site-notes]').textContent()) ?? '';
    const named = {
      'too little': "below the map's lower bound",
      window: "inside the map's window",
      'too much': "above the map's upper bound",
    };
    expect(notes).toContain(named[zone as keyof typeof named]);
    // No internal field names or validator wording in the results.
    const outcome = (await s.page.locator('[data-testid=site-outcome]').textContent()) ?? '';
    expect(outcome).not.toMatch(/\b[a-z][A-Za-z0-9]*_[A-Za-z0-9]+\b|must be in \[/);
    expect(await s.page.locator('[data-testid=site-cautions]').textContent()).toContain('not a design');
    expect(await s.page.locator('[data-testid=run-status]').textContent()).toMatch(/Done in/);
    await s.page.screenshot({ path: join(s.artifactsDir, 'site-panel-run.png') });
    // The study after a run, tall enough for the comparison table and the notes (docs/site-study-after-run.png).
    await s.page.setViewportSize({ width: 1400, height: 1800 });
    await s.page.waitForTimeout(300);
    await s.page.screenshot({ path: join(s.artifactsDir, 'site-study-after-run.png') });
    await s.page.setViewportSize({ width: 1280, height: 720 });
    await s.page.locator('.site-output').evaluate((el) => el.scrollTo(0, 520));
    await s.page.screenshot({ path: join(s.artifactsDir, 'site-panel-charts.png') });
    expect(s.pageErrors).toEqual([]);
  });

  it('prints a site sheet with inputs, results, charts and cautions, and no form', async () => {
    await s.page.emulateMedia({ media: 'print' });
    expect(await s.page.locator('.site-form').isVisible()).toBe(false);
    expect(await s.page.locator('.site-sheet-inputs').isVisible()).toBe(true);
    expect(await s.page.locator('[data-testid=chart-probe]').isVisible()).toBe(true);
    expect(await s.page.locator('[data-testid=site-cautions]').isVisible()).toBe(true);
    expect(await s.page.locator('[data-testid=map]').isVisible()).toBe(false);
    const inputs = await s.page.locator('.site-sheet-inputs').textContent();
    expect(inputs).toContain('Mean annual air temperature');
    await s.page.emulateMedia({ media: 'screen' });
  });

  it('adds the studied site to the shortlist with its simulated results', async () => {
    await s.page.click('[data-testid=site-add-shortlist]');
    // The shortlist is saved in IndexedDB (web/src/shortlist/indexeddb-persistence.ts): one record per site.
    await s.page.waitForSelector('[data-testid=shortlist-save-state][data-state=saved]');
    const items = await s.page.evaluate(
      () =>
        new Promise<{ origin: string; metrics: Record<string, unknown> }[]>((resolve, reject) => {
          const open = indexedDB.open('pile-atlas');
          open.onerror = () => reject(open.error);
          open.onsuccess = () => {
            const all = open.result.transaction('sites', 'readonly').objectStore('sites').getAll();
            all.onerror = () => reject(all.error);
            all.onsuccess = () => {
              const records = all.result as {
                order: number;
                item: { origin: string; metrics: Record<string, unknown> };
              }[];
              resolve(records.sort((a, b) => a.order - b.order).map((r) => r.item));
              open.result.close();
            };
          };
        }),
    );
    const fromSite = items.filter((i) => i.origin === 'site');
    expect(fromSite.length).toBeGreaterThan(0);
    expect(typeof fromSite[fromSite.length - 1].metrics.simulatedYears_yr).toBe('number');
    // The list shows the site's figures in the planner's words and the chosen units (issue 18): no
    // stored key (camelCase: two or more lower-case letters before a capital, so "kW" does not count)
    // and no underscore; the lower-bound flag is folded into its figure, not a row of its own.
    const row =
      (await s.page
        .locator('[data-testid=shortlist-item-figures]', { hasText: 'site study' })
        .last()
        .textContent()) ?? '';
    expect(row).toMatch(/Thaw delay \(quick map estimate\): /);
    expect(row).toMatch(/Piles per kW of peak heating \(quick map estimate\): [\d.]+ piles\/kW/);
    expect(row).toMatch(/Thaw delay at the first probe \(site study\): /);
    expect(row).not.toMatch(/\b[a-z]{2,}[A-Z][a-zA-Z]*\b/);
    expect(row).not.toContain('_');
    expect(row).not.toMatch(/: (yes|no)\b/);
    // Stale results are marked (issue 18 item 4): an edit after the run says the results are for the
    // last run's inputs; an invalid edit says the inputs need attention; undoing the edit clears it.
    const stale = s.page.locator('[data-testid=site-stale]');
    expect(await stale.count()).toBe(0);
    const years = await s.page.inputValue('#site-years');
    await setField(s.page, 'site-years', String(Number(years) + 1));
    await expect.poll(() => stale.textContent()).toMatch(/inputs have changed since\. Run again/);
    await setField(s.page, 'site-years', '0');
    await expect.poll(() => stale.textContent()).toMatch(/some need attention/);
    expect(await s.page.locator('[data-testid=site-outcome]').getAttribute('class')).toContain('stale');
    await setField(s.page, 'site-years', years);
    await expect.poll(() => stale.count()).toBe(0);
  });

  it('does not shortlist the same place twice: a second add updates the listed site (issue 18)', async () => {
    await s.page.click('[data-testid=site-add-shortlist]');
    await expect
      .poll(() => s.page.locator('.site-output [role=status]').allTextContents())
      .toContainEqual(expect.stringMatching(/already on the shortlist at this place: updated/));
  });

  it('shows an invalid input message next to the field and does not run', async () => {
    await openSiteStudy(s.page);
    await setField(s.page, 'site-years', '0');
    const err = s.page.locator('#site-years-err');
    await expect.poll(() => err.textContent()).toMatch(/≥ 1/);
    await setField(s.page, 'site-pile-length_m', '80');
    await expect.poll(() => s.page.locator('#site-pile-length_m-err').textContent()).toMatch(/domain depth/);
    await s.page.click('[data-testid=run-site]');
    expect(await s.page.locator('[data-testid=run-status]').textContent()).toMatch(
      /Not run: 2 inputs need attention/,
    );
    await s.page.waitForTimeout(500);
    expect(await s.page.locator('[data-testid=site-progress]').count()).toBe(0);
    expect(await s.page.locator('[data-testid=site-outcome]').count()).toBe(0);
    // Focus moves to the first invalid field.
    expect(await s.page.evaluate(() => document.activeElement?.id)).toBe('site-years');
    await s.page.screenshot({ path: join(s.artifactsDir, 'site-panel-invalid.png') });
  });

  it('cancels a running simulation', async () => {
    await setField(s.page, 'site-years', '60');
    await setField(s.page, 'site-pile-length_m', '10');
    await s.page.click('[data-testid=run-site]');
    await s.page.waitForSelector('[data-testid=cancel-site]', { timeout: 10_000 });
    await s.page.click('[data-testid=cancel-site]');
    await expect.poll(() => s.page.locator('[data-testid=run-status]').textContent()).toMatch(/cancelled/);
    expect(await s.page.locator('[data-testid=site-progress]').count()).toBe(0);
    // The study is modal: Tab cycles inside it and never reaches the page behind.
    const outside: string[] = [];
    for (let i = 0; i < 60; i++) {
      await s.page.keyboard.press('Tab');
      const where = await s.page.evaluate(() => {
        const a = document.activeElement;
        if (!a || a === document.body) return null;
        return a.closest('[data-testid=site-study]') ? null : `${a.tagName} ${a.textContent?.slice(0, 30)}`;
      });
      if (where) outside.push(where);
    }
    expect(outside).toEqual([]);
    // Escape closes the study; the map is back and the page takes focus again.
    await s.page.keyboard.press('Escape');
    expect(await s.page.locator('[data-testid=site-study]').count()).toBe(0);
    await s.page.locator('[data-testid=layer-select]').focus();
    expect(await s.page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe(
      'layer-select',
    );
  });
});
