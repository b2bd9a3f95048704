/**
 * The ensemble on the map, in Chromium against a real ensemble build of the demo region: the
 * P10/P50/P90 and probability-of-success layers, the hatching of places whose class is uncertain with
 * its legend, the P10–P90 range in the hover readout and the class card, and a filter on the
 * probability of success.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startSession, type BrowserSession } from './browser-session';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { generateDemoData } from '../../data-pipeline/demo/generate-demo-data';

let s: BrowserSession;
let site: [number, number];

beforeAll(async () => {
  const root = mkdtempSync(join(tmpdir(), 'pile-atlas-ensemble-map-'));
  await generateDemoData({ outDir: join(root, 'in') });
  await buildTiles({ inDir: join(root, 'in'), outDir: join(root, 'data'), ensemble: true, geotiff: false });
  process.env.PILE_ATLAS_DATA = join(root, 'data');
  s = await startSession();
  const settlements = JSON.parse(readFileSync(join(s.dataDir, 'settlements.geojson'), 'utf8')) as {
    features: { geometry: { coordinates: [number, number] } }[];
  };
  site = settlements.features[0].geometry.coordinates;
}, 900_000);

afterAll(async () => {
  await s?.close();
});

async function openApp(page: Page, query = ''): Promise<void> {
  await page.goto(`${s.url}${query}`);
  await page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
  await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
  await page.waitForTimeout(300);
}

const regionCells = async (page: Page) =>
  Number((await page.locator('[data-testid=region-count-cells]').textContent())?.replace(/,/g, ''));

async function mapCentre(page: Page) {
  const box = await page.locator('[data-testid=map]').boundingBox();
  if (!box) throw new Error('map not visible');
  return { x: box.x + box.width / 2, y: box.y + box.height / 2 };
}

describe('uncertainty on the map', () => {
  it('offers the percentile and probability layers and hatches uncertain places with a legend', async () => {
    await openApp(s.page, '?layer=suitability');
    const options = await s.page.locator('[data-testid=layer-select] option').allTextContents();
    expect(options).toContain('Probability of success');
    expect(options).toContain('Robust suitability class');
    expect(options.some((o) => /Piles per ton.*P10/.test(o))).toBe(true);
    const hatch = s.page.locator('[data-testid=hatch-uncertain]');
    await expect(hatch.isChecked()).resolves.toBe(true);
    await expect(s.page.locator('[data-testid=legend-uncertain]').textContent()).resolves.toMatch(
      /class uncertain: Fewer than 80 % of the members agree/,
    );
    const hatched = await s.page.locator('[data-testid=map]').screenshot();
    await s.page.screenshot({ path: join(s.artifactsDir, 'map-uncertain-hatched-1280x720.png') });
    await hatch.uncheck();
    await s.page.waitForTimeout(500);
    await expect(s.page.locator('[data-testid=legend-uncertain]').count()).resolves.toBe(0);
    const plain = await s.page.locator('[data-testid=map]').screenshot();
    expect(Buffer.compare(hatched, plain)).not.toBe(0);
    await hatch.check();
    expect(s.pageErrors).toEqual([]);
  });

  it('shows P10–P90 in the hover readout and the class card', async () => {
    await openApp(
      s.page,
      `?c=${site[0]},${site[1]}&z=${Math.min(9, s.manifest.tiles.maxZoom + 1)}&layer=pilesPerTon`,
    );
    const c = await mapCentre(s.page);
    await s.page.mouse.move(c.x + 3, c.y + 3);
    await s.page.mouse.move(c.x, c.y);
    await expect(s.page.locator('[data-testid=hover-range]').textContent()).resolves.toMatch(
      /^P10–P90: (not defined|[\d.]+ piles\/(kW|ton) – [\d.]+ piles\/(kW|ton))$/,
    );
    await s.page.mouse.click(c.x, c.y);
    const ranges = s.page.locator('[data-testid=class-card-ranges]');
    await ranges.waitFor({ state: 'attached' });
    const text = (await ranges.textContent()) ?? '';
    expect(text).toMatch(/Probability of success: \d+ % of the ensemble members succeed/);
    expect(text).toMatch(/P10–P90/);
    // The thaw delay's range: an end past the climate horizon (2100) reads "≥ value" and says why.
    const item = ranges.locator('li', { hasText: /^Thaw delay/ }).first();
    const delay = ((await item.textContent()) ?? '').replace(/^Thaw delay[^:]*: /, '');
    expect(delay).toMatch(
      /^P10–P90: (not defined|(≥ )?[\d.]+ yr – (≥ )?[\d.]+ yr( \(lower bound: thaw with piles after 2100\))?)$/,
    );
    expect(delay.includes('≥')).toBe(delay.includes('lower bound: thaw with piles after 2100'));
    await s.page.click('[data-testid=class-card] > summary');
    await s.page.screenshot({ path: join(s.artifactsDir, 'class-card-ranges-1280x720.png') });
  });

  it('filters on the probability of success', async () => {
    await openApp(s.page, '?layer=successProbability');
    const before = await regionCells(s.page);
    await s.page.selectOption('[data-testid=filter-add]', 'successProbability');
    await s.page.fill('[data-testid=filter-successProbability-min]', '0.9');
    await s.page.waitForTimeout(400);
    const after = await regionCells(s.page);
    console.log(`probability of success >= 0.9: ${after} of ${before} cells`);
    expect(after).toBeLessThan(before);
    expect(s.page.url()).toContain('f=');
  });
});

describe('uncertainty in the site study', () => {
  it('runs an ensemble across the page workers with progress and cancel, then a fan chart and a ranking', async () => {
    await openApp(s.page, `?c=${site[0]},${site[1]}&z=${Math.min(9, s.manifest.tiles.maxZoom + 1)}`);
    const c = await mapCentre(s.page);
    await s.page.mouse.click(c.x, c.y);
    await s.page.waitForSelector('[data-testid=site-card]', { timeout: 30_000 });
    await s.page.click('[data-testid=open-site-study]');
    await s.page.waitForSelector('[data-testid=site-study]');
    await s.page.click('[data-testid=run-site]');
    await s.page.waitForSelector('[data-testid=site-outcome]', { timeout: 180_000 });
    // Cancel: the run stops and the button comes back.
    await s.page.click('[data-testid=ensemble-run]');
    await s.page.waitForSelector('[data-testid=ensemble-progress]', { timeout: 10_000 });
    await s.page.click('[data-testid=ensemble-cancel]');
    await s.page.waitForSelector('[data-testid=ensemble-run]', { timeout: 10_000 });
    await expect(s.page.locator('[data-testid=ensemble-result]').count()).resolves.toBe(0);
    // The full ensemble: the page stays responsive while it runs.
    const t0 = Date.now();
    await s.page.click('[data-testid=ensemble-run]');
    await s.page.waitForSelector('[data-testid=ensemble-progress]', { timeout: 10_000 });
    const f0 = Date.now();
    await s.page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
    expect(Date.now() - f0).toBeLessThan(1000);
    await s.page.waitForSelector('[data-testid=ensemble-result]', { timeout: 300_000 });
    const seconds = (Date.now() - t0) / 1000;
    const timing = await s.page.locator('[data-testid=ensemble-timing]').textContent();
    console.log(`site ensemble: ${timing} (${seconds.toFixed(1)} s from the click)`);
    const band = await s.page.locator('[data-testid=chart-probe-fan] path').first().getAttribute('d');
    expect((band ?? '').split('L').length).toBeGreaterThan(20);
    const rows = await s.page.locator('[data-testid=ensemble-sensitivity] tbody tr').allTextContents();
    expect(rows).toHaveLength(7);
    const shares = rows.map((r) => Number(/(\d+) %/.exec(r)?.[1]));
    expect([...shares].sort((a, b) => b - a)).toEqual(shares);
    await expect(s.page.locator('[data-testid=ensemble-thaw-delay]').textContent()).resolves.toMatch(
      /Thaw delay at the probe/,
    );
    // The thaw timing: two stairs (without and with the piles), labelled, each rising with time (SVG y
    // falls). Not compared with each other: in some members the piles bring the thaw forward.
    const thaw = s.page.locator('[data-testid=ensemble-thaw-chart]');
    await expect(thaw.locator('.chart-legend li').allTextContents()).resolves.toEqual([
      'without piles',
      'with piles',
    ]);
    const stairs = await thaw
      .locator('path.thaw-share')
      .evaluateAll((ps) => ps.map((p) => p.getAttribute('d') ?? ''));
    expect(stairs).toHaveLength(2);
    const levels = stairs.map((d) => [...d.matchAll(/(?:M[\d.]+,|V)([\d.]+)/g)].map((m) => Number(m[1])));
    for (const l of levels) {
      expect(l.length).toBeGreaterThan(20);
      for (let i = 1; i < l.length; i++) expect(l[i]).toBeLessThanOrEqual(l[i - 1]);
    }
    await expect(thaw.textContent()).resolves.toMatch(
      /horizontal gap between the two curves is the thaw delay/,
    );
    await s.page.locator('[data-testid=site-ensemble]').scrollIntoViewIfNeeded();
    await s.page.screenshot({ path: join(s.artifactsDir, 'site-ensemble-1280x720.png') });
    await thaw.scrollIntoViewIfNeeded();
    await thaw.screenshot({ path: join(s.artifactsDir, 'site-ensemble-thaw.png') });
    expect(s.pageErrors).toEqual([]);
  }, 600_000);
});
