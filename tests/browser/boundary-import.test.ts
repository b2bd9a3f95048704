/**
 * Boundary import and drawing in a real Chromium against the demo build (issue 21 item 1): a large
 * boundary is read, checked and counted in the boundary worker while the page stays responsive; its
 * outline is drawn above the screening tiles; faulty files (ring not closed, self-crossing, another
 * crs) and a self-crossing drawn shape are refused with a message and leave the previous boundary in
 * place; a file name carrying markup is shown as text. While a 1,000,000-vertex boundary is imported,
 * no main-thread task of the page's own work reaches 100 ms (issue 21 item 1: input answered within
 * 100 ms), read from a Chrome trace. The whole gap an input could wait is asserted only loosely: with
 * the software WebGL of these tests every map frame is read back on the main thread, and one frame
 * alone takes 60-170 ms on a busy 2-core machine (bench/boundary-freeze.bench.ts, whose reference
 * redraw measures it), so it cannot be held under 100 ms here.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { countForegroundPixels, hexRgb, startSession, type BrowserSession } from './browser-session';
import { traceMainThread, wigglyCircle } from '../../bench/boundary-freeze.bench';
import { BOUNDARY_COLOUR } from '../../web/src/map/base-style';

let s: BrowserSession;
let centre: [number, number];
let radius_deg = 0;

beforeAll(async () => {
  s = await startSession();
  const [w, so, e, n] = s.manifest.region.bounds;
  centre = [(w + e) / 2, (so + n) / 2];
  radius_deg = Math.min(n - so, (e - w) * Math.cos((centre[1] * Math.PI) / 180)) / 4;
  await s.page.goto(s.url);
  await s.page.waitForSelector('[data-testid=region-count-cells]', { timeout: 120_000 });
  await s.page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 120_000 });
});

afterAll(async () => {
  await s?.close();
});

function writeJson(name: string, json: unknown): string {
  const file = join(s.artifactsDir, name);
  writeFileSync(file, JSON.stringify(json));
  return file;
}

/** Pick a file in the "Import boundary" input; wait until the worker is done; return the message. */
async function importFile(page: Page, file: string): Promise<string> {
  const before = await page
    .locator('[data-testid=boundary-message]')
    .textContent()
    .catch(() => null);
  await page.setInputFiles('[data-testid=boundary-import]', file);
  for (let i = 0; i < 1200; i++) {
    const busy = await page.locator('[data-testid=boundary-busy]').count();
    const text = await page
      .locator('[data-testid=boundary-message]')
      .textContent()
      .catch(() => null);
    if (busy === 0 && text !== null && text !== before) return text;
    await page.waitForTimeout(100);
  }
  throw new Error('no boundary message within 120 s');
}

const outlinePixels = async (page: Page) =>
  (await countForegroundPixels(page, '[data-testid=map]', [], 0)).total -
  (await countForegroundPixels(page, '[data-testid=map]', [hexRgb(BOUNDARY_COLOUR)], 40)).foreground;

describe('boundary import', () => {
  it('reads a 300,000-vertex boundary off the main thread, counts its cells and draws its outline', async () => {
    const file = writeJson('boundary-300000.geojson', {
      type: 'Feature',
      properties: {},
      geometry: { type: 'Polygon', coordinates: [wigglyCircle(centre, radius_deg, 300_000)] },
    });
    await s.page.evaluate(`
      window.__gap = { max: 0, last: performance.now() };
      window.__gapTimer = setInterval(() => {
        const now = performance.now();
        window.__gap.max = Math.max(window.__gap.max, now - window.__gap.last);
        window.__gap.last = now;
      }, 10);
    `);
    const message = await importFile(s.page, file);
    const gap = await s.page.evaluate('clearInterval(window.__gapTimer), Math.round(window.__gap.max)');
    console.log(`${message} Longest main-thread gap while it ran: ${gap} ms`);
    expect(message).toMatch(
      /^Boundary from boundary-300000\.geojson: 300,000 vertices in 1 polygon\(s\), drawn with [\d,]+/,
    );
    const zone = Number(
      (await s.page.locator('[data-testid=zone-count-cells]').textContent())?.replace(/,/g, ''),
    );
    const region = Number(
      (await s.page.locator('[data-testid=region-count-cells]').textContent())?.replace(/,/g, ''),
    );
    expect(zone).toBeGreaterThan(0);
    expect(zone).toBeLessThan(region);
    await s.page.waitForTimeout(1500);
    expect(await outlinePixels(s.page)).toBeGreaterThan(500);
    await s.page.screenshot({ path: join(s.artifactsDir, 'boundary-imported-1280x720.png') });
    // Another layer redraws the tiles; the outline stays above them.
    const other = s.manifest.bands.find((b) => b.kind === 'continuous');
    if (!other) throw new Error('no continuous band in the demo manifest');
    await s.page.selectOption('[data-testid=layer-select]', other.id);
    await s.page.waitForTimeout(1500);
    expect(await outlinePixels(s.page)).toBeGreaterThan(500);
  });

  it('keeps its own main-thread work under 100 ms while a 1,000,000-vertex boundary is imported', async () => {
    const file = writeJson('boundary-1000000.geojson', {
      type: 'Feature',
      properties: {},
      geometry: { type: 'Polygon', coordinates: [wigglyCircle(centre, radius_deg, 1_000_000)] },
    });
    await s.page.evaluate(`
      window.__gap = { max: 0, last: performance.now() };
      window.__gapTimer = setInterval(() => {
        const now = performance.now();
        window.__gap.max = Math.max(window.__gap.max, now - window.__gap.last);
        window.__gap.last = now;
      }, 10);
    `);
    const stopTrace = await traceMainThread(s.context, s.page);
    const message = await importFile(s.page, file);
    await s.page.waitForTimeout(1500); // the map frames that draw the outline
    const trace = await stopTrace();
    const gap = Number(
      await s.page.evaluate('clearInterval(window.__gapTimer), Math.round(window.__gap.max)'),
    );
    console.log(
      `${message} Longest main-thread gap ${gap} ms; longest task ${trace.longestTask_ms.toFixed(0)} ms, ` +
        `of the page's own work ${trace.longestWork_ms.toFixed(0)} ms (the rest waits for map frames)`,
    );
    expect(message).toMatch(/^Boundary from boundary-1000000\.geojson: 1,000,000 vertices in 1 polygon\(s\)/);
    // The trace saw the tasks (a trace that recorded nothing would pass the bound below).
    expect(trace.longestTask_ms).toBeGreaterThan(0);
    // Issue 21 item 1: input answered within 100 ms, for the page's own work.
    expect(trace.longestWork_ms).toBeLessThan(100);
    // Loose bound on the whole gap (map frames included): the page never stops for a second.
    expect(gap).toBeLessThan(1000);
  });

  it('refuses faulty files with a reason and keeps the boundary it had', async () => {
    const zoneBefore = await s.page.locator('[data-testid=zone-count-cells]').textContent();
    const [x, y] = centre;
    const open = writeJson('open-ring.geojson', {
      type: 'Polygon',
      coordinates: [
        [
          [x, y],
          [x + 1, y],
          [x + 1, y + 0.5],
          [x, y + 0.5],
        ],
      ],
    });
    expect(await importFile(s.page, open)).toMatch(
      /^open-ring\.geojson was not used: \(root\)\.coordinates\.0: the ring is not closed/,
    );
    const bowTie = writeJson('bow-tie.geojson', {
      type: 'Polygon',
      coordinates: [
        [
          [x, y],
          [x + 1, y + 0.5],
          [x + 1, y],
          [x, y + 0.5],
          [x, y],
        ],
      ],
    });
    expect(await importFile(s.page, bowTie)).toMatch(/was not used: .*the ring crosses itself near lon/);
    const polar = writeJson('polar.geojson', {
      type: 'FeatureCollection',
      crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::3413' } },
      features: [],
    });
    expect(await importFile(s.page, polar)).toMatch(
      /crs: coordinate reference system "urn:ogc:def:crs:EPSG::3413" is not supported/,
    );
    const marked = writeJson('<img src=x onerror="window.__pwned=1">.geojson', {
      type: 'Polygon',
      coordinates: [],
    });
    expect(await importFile(s.page, marked)).toContain(
      '<img src=x onerror="window.__pwned=1">.geojson was not used',
    );
    expect(await s.page.evaluate('window.__pwned === undefined')).toBe(true);
    expect(await s.page.locator('[data-testid=zone-count-cells]').textContent()).toBe(zoneBefore);
  });

  it('refuses a self-crossing drawn shape, accepts a square, and clears', async () => {
    const box = await s.page.locator('[data-testid=map]').boundingBox();
    if (!box) throw new Error('map not visible');
    const cx = box.x + box.width / 2;
    const cy = box.y + box.height / 2;
    const d = Math.min(box.width, box.height) * 0.15;
    const draw = async (corners: number[][]) => {
      await s.page.click('[data-testid=boundary-draw]');
      for (const [dx, dy] of corners) await s.page.mouse.click(cx + dx * d, cy + dy * d);
      const before = await s.page.locator('[data-testid=boundary-message]').textContent();
      await s.page.click('[data-testid=boundary-finish]');
      for (let i = 0; i < 300; i++) {
        const t = await s.page.locator('[data-testid=boundary-message]').textContent();
        if (t !== before && (await s.page.locator('[data-testid=boundary-busy]').count()) === 0) return t;
        await s.page.waitForTimeout(100);
      }
      throw new Error('no message');
    };
    expect(
      await draw([
        [-1, -1],
        [1, 1],
        [1, -1],
        [-1, 1],
      ]),
    ).toMatch(/^The drawn shape was not used: .*crosses itself/);
    expect(
      await draw([
        [-1, -1],
        [1, -1],
        [1, 1],
        [-1, 1],
      ]),
    ).toMatch(/^Boundary from the drawn shape: 4 vertices/);
    await s.page.click('[data-testid=boundary-clear]');
    await expect(s.page.locator('[data-testid=zone-count-cells]').count()).resolves.toBe(0);
    expect(s.pageErrors).toEqual([]);
  });
});
