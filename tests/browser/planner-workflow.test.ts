/**
 * The planner's workflow (issue 18) in a real Chromium on the real demo build: the cell panel leads
 * with the five figures a planner decides on and folds the rest; the site-study form shows and takes
 * North American units when that switch is on and stores SI.
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

const siteQuery = (extra = '') =>
  `?c=${site[0]},${site[1]}&z=${Math.min(9, s.manifest.tiles.maxZoom + 1)}${extra}`;

async function openAndClickCentre(page: Page, extra = ''): Promise<void> {
  await page.goto(`${s.url}${siteQuery(extra)}`);
  await page.waitForSelector('.maplibregl-canvas');
  await page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
  await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
  await page.waitForTimeout(300);
  const box = await page.locator('[data-testid=map]').boundingBox();
  if (!box) throw new Error('map not visible');
  await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
  await page.waitForSelector('[data-testid=key-figures]', { timeout: 60_000 });
}

describe('planner workflow', () => {
  it('leads the cell panel with five key figures and folds the rest', async () => {
    await openAndClickCentre(s.page, '&units=NA');
    const figures = s.page.locator('[data-testid=key-figures] > div');
    await expect(figures.count()).resolves.toBe(5);
    const keys = await figures.evaluateAll((els) => els.map((e) => e.getAttribute('data-testid')));
    expect(keys).toEqual(['key-class', 'key-delay', 'key-piles', 'key-share', 'key-governs']);
    for (let i = 0; i < 5; i++) expect(await figures.nth(i).isVisible()).toBe(true);
    // The rest is folded: the full table and the class card are closed until opened.
    expect(await s.page.locator('[data-testid=cell-values]').isVisible()).toBe(false);
    expect(await s.page.locator('[data-testid=class-card]').getAttribute('open')).toBeNull();
    // The key figures read the same as the full table (same band values, same units).
    const rowText = async (title: RegExp) => {
      const rows = await s.page.locator('[data-testid=cell-values] tr').allTextContents();
      return rows.find((r) => title.test(r)) ?? '';
    };
    const piles = (await s.page.locator('[data-testid=key-piles] strong').textContent()) ?? '';
    const pilesRow = await rowText(/^Piles per ton of peak heating/);
    expect(pilesRow).not.toBe('');
    if (/\d/.test(piles)) {
      expect(piles).toMatch(/piles\/ton$/); // North American units: per ton, not per kW
      expect(pilesRow.endsWith(piles)).toBe(true);
    }
    const cls = (await s.page.locator('[data-testid=key-class] strong').textContent()) ?? '';
    expect(await rowText(/^Suitability class/)).toBe(`Suitability class${cls}`);
    const governs = (await s.page.locator('[data-testid=key-governs]').textContent()) ?? '';
    expect(governs).toMatch(/foundation check fails: |foundation checks pass; limit on the extraction: /);
    // Trade words, not band ids; the caution stays on screen.
    const panel = (await s.page.locator('[data-testid=key-figures]').textContent()) ?? '';
    for (const id of ['thawDelay', 'pilesPerTon', 'loadShare', 'bindingLimit', 'classRobust']) {
      expect(panel).not.toContain(id);
    }
    expect(await s.page.locator('[data-testid=cell-panel] [data-testid=screening-caution]').isVisible()).toBe(
      true,
    );
    // Opening the fold shows every band.
    await s.page.click('[data-testid=all-values] > summary');
    expect(await s.page.locator('[data-testid=cell-values]').isVisible()).toBe(true);
    await s.page.setViewportSize({ width: 1280, height: 720 });
    await s.page.click('[data-testid=all-values] > summary');
    await s.page.locator('[data-testid=cell-panel]').screenshot({
      path: join(s.artifactsDir, 'cell-panel-key-figures.png'),
    });
  });

  it('site-study fields show and take North American units and store SI', async () => {
    await s.page.waitForSelector('[data-testid=site-card]', { timeout: 30_000 });
    await s.page.click('[data-testid=open-site-study]');
    await s.page.waitForSelector('[data-testid=site-study]');
    const unitOf = (id: string) => s.page.locator(`#${id} + .unit`).textContent();
    const stored = async (id: string) => Number(await s.page.getAttribute(`#${id}`, 'data-stored-si'));
    const shown = async (id: string) => Number(await s.page.inputValue(`#${id}`));
    // The prefilled air temperature (SI in the stored input) reads in °F: °F = °C × 9/5 + 32 (definition).
    const air = 'site-climate-meanAirTemp_C';
    await expect(unitOf(air)).resolves.toBe('°F');
    expect(await shown(air)).toBeCloseTo((await stored(air)) * 1.8 + 32, 3);
    // Typed in feet, stored in metres: 40 ft = 12.192 m (1 ft = 0.3048 m exactly, 1959 agreement).
    const length = 'site-pile-length_m';
    await expect(unitOf(length)).resolves.toBe('ft');
    await s.page.fill(`#${length}`, '40');
    await expect.poll(() => stored(length)).toBe(12.192);
    // Typed in °F, stored in °C: 14 °F = -10 °C.
    await s.page.fill(`#${air}`, '14');
    await expect.poll(() => stored(air)).toBeCloseTo(-10, 9);
    // Flow in US gal/min: 10 US gal/min = 37.85411784 L/min (definition of the US gallon).
    const flow = 'site-pile-flow_L_min';
    if (await s.page.locator(`#${flow}`).count()) {
      await expect(unitOf(flow)).resolves.toBe('US gal/min');
      await s.page.fill(`#${flow}`, '10');
      await expect.poll(() => stored(flow)).toBeCloseTo(37.85411784, 6);
    }
    // A range message states its limit in the field's unit (1 m minimum = 3.28084 ft).
    await s.page.fill(`#${length}`, '2');
    await expect.poll(() => s.page.locator(`#${length}-err`).textContent()).toMatch(/must be ≥ 3\.28084 ft/);
    await s.page.fill(`#${length}`, '40');
    // The fluid names read in words, not ids.
    const options = await s.page.locator('select option').allTextContents();
    expect(options.join(' ')).not.toMatch(/propyleneGlycol/);
    await s.page.keyboard.press('Escape');
  });
});
