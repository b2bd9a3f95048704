/**
 * A link holds what is on screen: the opening (fitted) view's real zoom, then the layer, units,
 * filter, a drawn boundary, the selected place and the shortlist's sort survive a reload and open the
 * same in a fresh browser profile; "Copy link" puts that URL on the clipboard; a bad link names each
 * bad part in plain words and keeps the rest.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import {
  countForegroundPixels,
  hexRgb,
  launchFreshProfile,
  startSession,
  type BrowserSession,
} from './browser-session';
import { LAND_COLOUR, SEA_COLOUR } from '../../web/src/map/base-style';
import { shortlist } from '../../data-pipeline/shortlist/shortlist-cells';

let s: BrowserSession;

beforeAll(async () => {
  s = await startSession();
});

afterAll(async () => {
  await s?.close();
});

async function ready(page: Page): Promise<void> {
  await page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
  await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
  await page.waitForTimeout(500);
}

/** Everything a planner reads off the screen that the link must carry. */
async function onScreen(page: Page) {
  const text = async (sel: string) =>
    (await page.locator(sel).count()) ? ((await page.locator(sel).first().textContent()) ?? '') : '';
  await page.waitForSelector('[data-testid=zone-count-cells]', { timeout: 60_000 });
  await page.waitForSelector('[data-testid=cell-values]', { state: 'attached', timeout: 60_000 });
  const pixels = await countForegroundPixels(page, '[data-testid=map]', [
    hexRgb(SEA_COLOUR),
    hexRgb(LAND_COLOUR),
  ]);
  return {
    layer: await page.inputValue('[data-testid=layer-select]'),
    na: await page.isChecked('[data-testid=units-NA]'),
    legend: await text('[data-testid=legend]'),
    region: await text('[data-testid=region-count]'),
    zone: await text('[data-testid=zone-count]'),
    cell: await text('[data-testid=cell-panel] .muted.small'),
    sort: await page.inputValue('[data-testid=shortlist-sort]'),
    sortDir: await text('[aria-label="Reverse sort order"]'),
    mapPixels: pixels.foreground,
  };
}

/** MapLibre's fitBounds zoom for the region in a box (512-px world, 20 px padding each side). */
function fittedZoom(bounds: readonly number[], w: number, h: number): number {
  const [west, south, east, north] = bounds;
  const y = (lat: number) => (1 - Math.log(Math.tan(Math.PI / 4 + (lat * Math.PI) / 360)) / Math.PI) / 2;
  const dx = (east - west) / 360;
  const dy = y(south) - y(north);
  return Math.min(Math.log2((w - 40) / (dx * 512)), Math.log2((h - 40) / (dy * 512)));
}

describe('shareable state', () => {
  it('writes the fitted opening view, not the defaults, into the URL', async () => {
    await s.page.goto(s.url);
    await ready(s.page);
    const box = await s.page.locator('[data-testid=map]').boundingBox();
    if (!box) throw new Error('map not visible');
    const z = Number(new URL(s.page.url()).searchParams.get('z'));
    const expected = fittedZoom(s.manifest.region.bounds, box.width, box.height);
    console.log(`opening view: zoom ${z} in the URL, fitted zoom ${expected.toFixed(3)}`);
    expect(Math.abs(z - expected)).toBeLessThan(0.01);
  });

  it('round-trips layer, units, filter, boundary, selection and sort by reload and in a fresh profile', async () => {
    const page = s.page;
    await page.click('.maplibregl-ctrl-zoom-in');
    await page.waitForTimeout(800);
    const band = s.manifest.bands.find((b) => b.unit === '°C' && b.max > b.min) ?? s.manifest.bands[0];
    await page.selectOption('[data-testid=layer-select]', band.id);
    await page.check('[data-testid=units-NA]');
    await page.selectOption('[data-testid=filter-add]', band.id);
    await page.fill(`[data-testid=filter-${band.id}-max]`, '28');
    const box = await page.locator('[data-testid=map]').boundingBox();
    if (!box) throw new Error('map not visible');
    const cx = box.x + box.width / 2;
    const cy = box.y + box.height / 2;
    const d = Math.min(box.width, box.height) * 0.2;
    await page.click('[data-testid=boundary-draw]');
    for (const [dx, dy] of [
      [-d, -d],
      [d, -d],
      [d, d],
      [-d, d],
    ])
      await page.mouse.click(cx + dx, cy + dy);
    await page.click('[data-testid=boundary-finish]');
    await page.waitForSelector('[data-testid=zone-count-cells]', { timeout: 60_000 });
    await page.mouse.click(cx + d / 3, cy - d / 4);
    await page.waitForSelector('[data-testid=cell-values]', { state: 'attached' });
    await page.selectOption('[data-testid=shortlist-sort]', `band:${band.id}`);
    await page.click('[aria-label="Reverse sort order"]');
    await page.waitForTimeout(300);
    const url = page.url();
    const q = new URL(url).searchParams;
    for (const k of ['c', 'z', 'layer', 'units', 'f', 'b', 'sel', 'sort']) expect(q.has(k), k).toBe(true);
    const before = await onScreen(page);
    console.log(`link: ${url.length} characters; on screen: ${JSON.stringify(before)}`);

    await page.reload();
    await ready(page);
    expect(page.url()).toBe(url);
    const afterReload = await onScreen(page);
    expect({ ...afterReload, mapPixels: 0 }).toEqual({ ...before, mapPixels: 0 });
    expect(Math.abs(afterReload.mapPixels - before.mapPixels)).toBeLessThan(0.01 * before.mapPixels + 50);

    const fresh = await launchFreshProfile();
    try {
      const p2 = fresh.context.pages()[0] ?? (await fresh.context.newPage());
      await p2.setViewportSize({ width: 1280, height: 720 });
      await p2.goto(url);
      await ready(p2);
      expect(p2.url()).toBe(url);
      expect(await p2.locator('[data-testid=url-notice]').count()).toBe(0);
      const inFresh = await onScreen(p2);
      expect({ ...inFresh, mapPixels: 0 }).toEqual({ ...before, mapPixels: 0 });
      expect(Math.abs(inFresh.mapPixels - before.mapPixels)).toBeLessThan(0.01 * before.mapPixels + 50);
    } finally {
      await fresh.close();
    }
  });

  it('"Copy link" puts the URL of the screen on the clipboard', async () => {
    await s.context.grantPermissions(['clipboard-read', 'clipboard-write'], {
      origin: new URL(s.url).origin,
    });
    await s.page.click('[data-testid=copy-link]');
    await expect(s.page.locator('[data-testid=copy-link-status]').textContent()).resolves.toMatch(
      /Link copied/,
    );
    const copied = await s.page.evaluate(() => navigator.clipboard.readText());
    expect(copied).toBe(s.page.url());
  });

  it('a bad link names each bad part in plain words and keeps the good ones', async () => {
    await s.page.goto(`${s.url}?z=banana&layer=nope&units=NA&sel=1,2,3&b=__abc`);
    await s.page.waitForSelector('[data-testid=url-notice]');
    const items = await s.page.locator('[data-testid=url-notice] li').allTextContents();
    console.log(`bad-link notice: ${items.join(' | ')}`);
    expect(items).toHaveLength(4);
    expect(items.join('\n')).toMatch(/zoom “banana” should be a number/);
    expect(items.join('\n')).toMatch(/layer “nope” is not in this map's data/);
    expect(items.join('\n')).toMatch(/selected place “1,2,3”/);
    expect(items.join('\n')).toMatch(/boundary in the link is damaged/);
    expect(items.join('\n')).not.toMatch(/Invalid|Expected|\(url\)/);
    expect(await s.page.isChecked('[data-testid=units-NA]')).toBe(true);
  });

  it('counts the cells within a radius of a chosen settlement, as the CLI does', async () => {
    await s.page.goto(s.url);
    await ready(s.page);
    const options = await s.page.locator('[data-testid=layer-select] option').allTextContents();
    expect(options).toContain('Distance to the nearest settlement');
    expect(options).toContain('Distance to the nearest road or track');
    const name = (await s.page.locator('[data-testid=radius-settlement] option').nth(1).textContent()) ?? '';
    await s.page.selectOption('[data-testid=radius-settlement]', name);
    await s.page.fill('[data-testid=radius-km]', '25');
    await s.page.click('[data-testid=radius-apply]');
    await s.page.waitForSelector('[data-testid=zone-count-cells]', { timeout: 60_000 });
    const zone = (await s.page.locator('[data-testid=zone-count]').textContent()) ?? '';
    expect(await s.page.locator('[data-testid=boundary-message]').textContent()).toContain(
      `within 25 km of ${name}`,
    );
    // Area of the 72-gon inscribed in a 25 km circle: (n/2) r² sin(2π/n) = 1961.0 km² (plane geometry).
    const area = Number(/\(([\d,.]+) km² geodesic\)/.exec(zone)?.[1].replace(/,/g, ''));
    expect(Math.abs(area - 1961.0) / 1961.0).toBeLessThan(0.01);
    const total = Number(/of ([\d,]+) cells match/.exec(zone)?.[1].replace(/,/g, ''));
    const cli = (await shortlist({
      tilesDir: s.dataDir,
      near: name,
      within_km: 25,
      limit: 1,
    })) as unknown as {
      matched: number;
    };
    console.log(`within 25 km of ${name}: ${total} cells on the map, ${cli.matched} from the CLI`);
    expect(Math.abs(total - cli.matched)).toBeLessThanOrEqual(Math.max(5, 0.01 * cli.matched));
    expect(new URL(s.page.url()).searchParams.get('bn')).toBe(`within 25 km of ${name}`);
  });
});
