/**
 * The planner's workflow (issue 18) in a real Chromium on the real demo build: the cell panel leads
 * with the five figures a planner decides on and folds the rest; the site-study form shows and takes
 * North American units when that switch is on and stores SI; outside-the-filters, no-data and excluded
 * places read apart in the class, exclusion and a continuous layer (pixels sampled off the screen);
 * thaw years read as calendar years.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { hexRgb, pixelsAt, startSession, type BrowserSession } from './browser-session';
import { LAND_COLOUR, SEA_COLOUR } from '../../web/src/map/base-style';

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
    // The quick estimate reads in the chosen units too: W -> Btu/h, L/yr -> US gal/yr (display-units.ts).
    const quick = s.page.locator('[data-testid=site-quick]');
    if (await quick.count()) {
      const q = (await quick.textContent()) ?? '';
      expect(q).toMatch(/Btu\/h/);
      expect(q).toMatch(/US gal\/yr/);
      expect(q).not.toMatch(/\d W\b|L\/yr/);
    }
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

  it('paints outside-the-filters, no-data and excluded apart in every kind of layer (pixel sampling)', async () => {
    // Filter out the "poor" class: poor places are veiled, excluded ones keep their class colour.
    await s.page.setViewportSize({ width: 1280, height: 720 });
    await s.page.goto(`${s.url}?layer=suitability&x=suitability:1`);
    await s.page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
    await s.page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
    const hatch = s.page.locator('[data-testid=hatch-uncertain]');
    if ((await hatch.count()) > 0) await hatch.uncheck();
    const points = await labelledPoints(s.page);
    const kinds = ['veiled', 'excluded', 'kept', 'no data'] as const;
    const counts = kinds.map((k) => points.filter((p) => p.kind === k).length);
    console.log(`sampled ${points.length} points: ${kinds.map((k, i) => `${k} ${counts[i]}`).join(', ')}`);
    for (const c of counts) expect(c).toBeGreaterThanOrEqual(3);
    const base = [hexRgb(LAND_COLOUR), hexRgb(SEA_COLOUR)];
    for (const layer of ['suitability', 'exclusion', 'suitabilityScore']) {
      if (layer !== 'suitability') {
        await s.page.selectOption('[data-testid=layer-select]', layer);
        await s.page.waitForTimeout(1000);
      }
      await s.page.mouse.move(1, 1);
      const seen = await pixelsAt(s.page, '[data-testid=map]', points);
      const of = (k: (typeof kinds)[number]) => seen.filter((_, i) => points[i].kind === k);
      const veil = median(of('veiled'));
      // No data shows the base map (land or sea) through; the veil is neither.
      expect(share(of('no data'), (c) => base.some((b) => dist(c, b) <= 8))).toBeGreaterThan(0.75);
      for (const b of base) expect(dist(veil, b), `${layer}: veil vs base map`).toBeGreaterThan(30);
      expect(
        share(of('veiled'), (c) => dist(c, veil) <= 12),
        `${layer}: one veil colour`,
      ).toBeGreaterThan(0.75);
      // Places that are not veiled (excluded or kept) never look veiled or empty. On a continuous layer
      // an excluded place shows its value or none, so only the kept ones are checked there.
      for (const k of layer === 'suitabilityScore' ? (['kept'] as const) : (['excluded', 'kept'] as const))
        expect(
          share(of(k), (c) => dist(c, veil) > 30 && base.every((b) => dist(c, b) > 30)),
          `${layer}: ${k} vs veil and base map`,
        ).toBeGreaterThan(0.75);
      if (layer === 'exclusion') {
        // "not excluded" (the kept places) is not the grey of "excluded" on the class layer.
        const kept = median(of('kept'));
        expect(
          share(of('excluded'), (c) => dist(c, kept) > 30),
          'exclusion: reasons vs not excluded',
        ).toBeGreaterThan(0.75);
        expect(dist(kept, excludedGrey), 'exclusion: not excluded vs the class layer’s grey').toBeGreaterThan(
          30,
        );
      }
      if (layer === 'suitability') excludedGrey = median(of('excluded'));
      console.log(`${layer}: veil ${veil.join(',')}, distance to land ${dist(veil, base[0]).toFixed(0)}`);
    }
    // A thaw year reads as a calendar year in the readout: "2094", never "2094 yr".
    await s.page.selectOption('[data-testid=layer-select]', 'thawYear');
    const kept = points.find((p) => p.kind === 'kept');
    const box = await s.page.locator('[data-testid=map]').boundingBox();
    if (!kept || !box) throw new Error('no kept place to hover');
    await s.page.mouse.move(box.x + kept.x, box.y + kept.y);
    const year = (await s.page.locator('[data-testid=hover-value]').textContent()) ?? '';
    expect(year).toMatch(/^(\d{4}|after \d{4}|no data)$/);
    expect(await s.page.locator('[data-testid=legend-unit]').textContent()).toContain('calendar year');
  });

  it('keeps the counter and the active filters in view at 1440 × 900 and 1024 × 700; no word cut at 1024', async () => {
    const f = ['groundTemp::-1', 'thawDelay:5:'].join(';');
    for (const [w, h] of [
      [1440, 900],
      [1024, 700],
    ]) {
      await s.page.setViewportSize({ width: w, height: h });
      // The whole region first (the opening view) for the docs' screenshots, then a place.
      await s.page.goto(`${s.url}?units=NA&f=${f}`);
      await s.page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
      await s.page.waitForSelector('[data-testid=active-filters]', { timeout: 60_000 });
      await s.page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
      await s.page.waitForTimeout(500);
      await s.page.screenshot({ path: join(s.artifactsDir, `planner-map-${w}x${h}.png`) });
      await openAndClickCentre(s.page, `&units=NA&f=${f}`);
      const filters = await s.page.locator('[data-testid=active-filters] li').allTextContents();
      console.log(`${w} × ${h}: active filters ${filters.join(' | ')}`);
      // The filters in words, in the chosen units: −1 °C = 30.2 °F (°F = °C × 9/5 + 32).
      expect(filters).toEqual(['Ground temperature at pile depth ≤ 30.2 °F', 'Thaw delay ≥ 5.00 yr']);
      for (const sel of ['[data-testid=region-count]', '[data-testid=active-filters]']) {
        const box = await s.page.locator(sel).boundingBox();
        if (!box) throw new Error(`${sel} not shown`);
        expect(box.y, `${w}: ${sel} top`).toBeGreaterThanOrEqual(0);
        expect(box.y + box.height, `${w}: ${sel} bottom`).toBeLessThanOrEqual(h);
      }
      await s.page.screenshot({ path: join(s.artifactsDir, `planner-place-${w}x${h}.png`) });
      // "Why this class": the criteria table fits its panel and cuts no word across two lines.
      await s.page.click('[data-testid=class-card] > summary');
      const cut = await s.page.locator('[data-testid=criteria]').evaluate((table) => {
        const words: string[] = [];
        const walker = document.createTreeWalker(table, NodeFilter.SHOW_TEXT);
        for (let n = walker.nextNode(); n; n = walker.nextNode()) {
          const text = n.textContent ?? '';
          for (const m of text.matchAll(/[^\s\-–/]+/g)) {
            const r = document.createRange();
            r.setStart(n, m.index);
            r.setEnd(n, m.index + m[0].length);
            const lines = new Set([...r.getClientRects()].map((x) => Math.round(x.top)));
            if (lines.size > 1) words.push(m[0]);
          }
        }
        const panel = table.parentElement as HTMLElement;
        return { words, overflow: table.scrollWidth - panel.clientWidth };
      });
      console.log(`${w} × ${h}: criteria words cut ${cut.words.length}, overflow ${cut.overflow} px`);
      expect(cut.words).toEqual([]);
      expect(cut.overflow).toBeLessThanOrEqual(1);
      await s.page.locator('[data-testid=cell-panel]').screenshot({
        path: join(s.artifactsDir, `planner-criteria-${w}.png`),
      });
    }
    // The shortlist report follows the unit switch: the comparison reads °F, not °C.
    await s.page.click('[data-testid=add-to-shortlist]');
    // The same place is not listed twice: the button now updates the listed site.
    const add = s.page.locator('[data-testid=add-to-shortlist]');
    await expect.poll(() => add.textContent()).toMatch(/^Update “.+” on the shortlist$/);
    await add.click();
    await expect(s.page.locator('[data-testid=shortlist-item]').count()).resolves.toBe(1);
    await s.page.click('[data-testid=open-report]');
    const comparison = (await s.page.locator('[data-testid=report-comparison]').textContent()) ?? '';
    expect(comparison).toMatch(/°F/);
    expect(comparison).not.toMatch(/°C/);
    await s.page.click('[data-testid=report-close]');
    await s.page.setViewportSize({ width: 1280, height: 720 });
  });
});

let excludedGrey: [number, number, number] = [0, 0, 0];

type Rgb = [number, number, number];
const dist = (a: Rgb, b: Rgb) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
const share = (cs: Rgb[], ok: (c: Rgb) => boolean) => (cs.length ? cs.filter(ok).length / cs.length : 0);
function median(cs: Rgb[]): Rgb {
  const m = (k: number) => {
    const v = cs.map((c) => c[k]).sort((a, b) => a - b);
    return v[Math.floor(v.length / 2)] ?? NaN;
  };
  return [m(0), m(1), m(2)];
}

/**
 * A grid of points over the map, each with what the hover readout says is there on the suitability
 * layer: veiled (class "poor", filtered out), excluded, kept (fair or good) or no data.
 */
async function labelledPoints(page: Page) {
  const box = await page.locator('[data-testid=map]').boundingBox();
  if (!box) throw new Error('map not visible');
  const out: { x: number; y: number; kind: 'veiled' | 'excluded' | 'kept' | 'no data' }[] = [];
  for (let i = 0; i < 14; i++)
    for (let j = 0; j < 9; j++) {
      const x = box.width * (0.08 + (0.84 * i) / 13) + 0.5;
      const y = box.height * (0.1 + (0.8 * j) / 8) + 0.5;
      await page.mouse.move(box.x + x, box.y + y);
      const label = (await page.locator('[data-testid=hover-value]').textContent()) ?? '';
      const kind =
        label === 'poor'
          ? 'veiled'
          : label === 'excluded'
            ? 'excluded'
            : label === 'fair' || label === 'good'
              ? 'kept'
              : /no data/.test(label)
                ? 'no data'
                : null;
      if (kind) out.push({ x, y, kind });
    }
  return out;
}
