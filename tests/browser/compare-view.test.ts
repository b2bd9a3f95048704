/**
 * The compare view (issue 17 item 3): a scenario-set build of the small demo region (three scenarios
 * of the demo set) served to Chromium (software WebGL). The header's Compare control splits the map
 * into the scenario shown and a second one, both maps paint, panning one moves the other to the same
 * centre and zoom, each map names its scenario, the link carries `compare=<slug>` and opens the same
 * split, the matching-area counter counts the cells matching the filter under both scenarios (checked
 * against the build's own comparison), and leaving compare restores the single map. With the filters
 * applied to both scenarios, both maps veil the cells failing under either (one set of cells, the
 * one the counter counts); the right-hand map has its own hover readout (checked against the single
 * map of its scenario); the swipe view shows the first scenario left of a divider and the second
 * right of it (checked against each scenario's single map), the divider moves by keyboard and by
 * drag, and all of it round-trips through the link. Screenshots: docs/compare-view.png and
 * docs/compare-swipe.png (1440 x 900).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { generateDemoData } from '../../data-pipeline/demo/generate-demo-data';
import { DEMO_SCENARIO_SET } from '../../data-pipeline/demo/demo-scenarios';
import { LAND_COLOUR, SEA_COLOUR } from '../../web/src/map/base-style';
import { BAND } from '../../layers/screening/band-ids';
import { classColours } from '../../layers/screening/class-colours';
import { countForegroundPixels, hexRgb, startSession, type BrowserSession } from './browser-session';

const DOCS = fileURLToPath(new URL('../../docs/', import.meta.url));
const SET = {
  scenarios: [DEMO_SCENARIO_SET.scenarios[0], DEMO_SCENARIO_SET.scenarios[2], DEMO_SCENARIO_SET.scenarios[3]],
};
const HIGH = 'high-pathway-50-year-life';
const WRAP = '[data-testid=map-wrap]';
const LEFT = '.compare-left [data-testid=map]';
const RIGHT = '[data-testid=compare-right] [data-testid=map]';
let s: BrowserSession;

beforeAll(async () => {
  const dir = mkdtempSync(join(tmpdir(), 'pile-atlas-compare-'));
  await generateDemoData({ outDir: join(dir, 'in'), resolutionScale: 4 });
  await buildTiles({
    inDir: join(dir, 'in'),
    outDir: join(dir, 'data'),
    cellSize_m: 4000,
    scenario: SET,
    geotiff: false,
  });
  process.env.PILE_ATLAS_DATA = join(dir, 'data');
  s = await startSession();
}, 600_000);

afterAll(async () => {
  await s?.close();
});

/** Both maps' views as [lon, lat, zoom] (written by each map on every move end). */
async function views(): Promise<number[][]> {
  const read = (sel: string) => s.page.locator(sel).getAttribute('data-view');
  const [a, b] = await Promise.all([read(LEFT), read(RIGHT)]);
  return [a, b].map((v) => (v ?? '').split(',').map(Number));
}

/** Non-background pixels of one map (sea and land of the base map left out). */
async function painted(selector: string): Promise<{ total: number; foreground: number }> {
  return countForegroundPixels(s.page, selector, [hexRgb(SEA_COLOUR), hexRgb(LAND_COLOUR)]);
}

async function waitForCompare(): Promise<void> {
  const page = s.page;
  await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
  await page.waitForSelector(`${RIGHT} .maplibregl-canvas`, { timeout: 60_000 });
  await page.waitForSelector(`${RIGHT}[data-view]`, { timeout: 60_000 });
  await page.waitForTimeout(2500); // the right map's tiles (software WebGL)
}

/**
 * Good under both: with the filter "good only", the counter under both scenarios counts the cells
 * good in each; the build's own cell-by-cell comparison (compare-scenarios.ts) counted the same cells.
 */
async function checkGoodUnderBoth(): Promise<void> {
  const page = s.page;
  await page.goto(`${page.url()}&x=${BAND.suitability}:0,1,2`);
  await waitForCompare();
  await page.waitForSelector('[data-testid=both-count-cells]', { timeout: 60_000 });
  const count = async (id: string) =>
    Number(((await page.locator(`[data-testid=${id}]`).textContent()) ?? '').replace(/,/g, ''));
  const both = await count('both-count-cells');
  const goodHere = await count('region-count-cells');
  const fromBuild = s.manifest.scenarioSet?.scenarios[2].keyFigures.goodUnderBoth_cells;
  console.log(`good here ${goodHere}, good under both ${both}, build's count ${fromBuild}`);
  expect(both).toBe(fromBuild);
  expect(both).toBeGreaterThan(0);
  expect(both).toBeLessThanOrEqual(goodHere);
  expect(await page.locator('[data-testid=both-count]').textContent()).toContain(SET.scenarios[2].name);
}

describe('compare view', () => {
  it('splits into two labelled maps that both paint, pan together, round-trip by link and close again', async () => {
    const page = s.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.goto(s.url);
    await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
    await page.click('[data-testid=compare-toggle]');
    await page.selectOption('[data-testid=compare-picker]', 'high-pathway-50-year-life');
    await page.waitForFunction(() => window.location.search.includes('compare=high-pathway-50-year-life'));
    await waitForCompare();
    expect(await page.locator('[data-testid=compare-label-left]').textContent()).toBe(SET.scenarios[0].name);
    expect(await page.locator('[data-testid=compare-label-right]').textContent()).toBe(SET.scenarios[2].name);

    // both maps paint the screening layer (a fifth of each map at least is neither sea nor bare land)
    for (const sel of [LEFT, RIGHT]) {
      const p = await painted(sel);
      console.log(`${sel}: ${p.foreground} of ${p.total} pixels painted`);
      expect(p.foreground).toBeGreaterThan(p.total / 5);
    }
    const [l0, r0] = await views();
    expect(r0).toEqual(l0);

    // pan the right-hand map: the left follows to the same centre and zoom
    const box = await page.locator(RIGHT).boundingBox();
    if (!box) throw new Error('right map not visible');
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 2 - 160, box.y + box.height / 2 + 90, { steps: 8 });
    await page.mouse.up();
    await page.waitForTimeout(800);
    const [l1, r1] = await views();
    console.log(`compare centres after the pan: left ${l1.join(', ')}; right ${r1.join(', ')}`);
    expect(Math.abs(r1[0] - r0[0])).toBeGreaterThan(1e-3); // the right map moved
    expect(l1).toEqual(r1); // and the left one with it
    // zoom the left one (its + button): the right follows
    await page.locator('.compare-left .maplibregl-ctrl-zoom-in').click();
    await page.waitForTimeout(800);
    const [l2, r2] = await views();
    expect(l2[2]).toBeCloseTo(l1[2] + 1, 3);
    expect(r2).toEqual(l2);
    // the link carries the left map's view and the compare scenario
    const url = new URL(page.url());
    expect(url.searchParams.get('compare')).toBe('high-pathway-50-year-life');
    expect(url.searchParams.get('c')).toBe(`${l2[0].toFixed(5)},${l2[1].toFixed(5)}`);
    // the link opens the same split at the same view
    await page.goto(page.url());
    await waitForCompare();
    expect(await page.locator('[data-testid=compare-picker]').inputValue()).toBe('high-pathway-50-year-life');
    expect(await page.locator('[data-testid=compare-label-right]').textContent()).toBe(SET.scenarios[2].name);
    const [l3, r3] = await views();
    expect(r3).toEqual(l3);
    expect(Math.abs(l3[0] - l2[0])).toBeLessThan(1e-4);

    await checkGoodUnderBoth();
    await page.waitForTimeout(1500);
    await hoverOn(RIGHT, 60, -40); // both readouts, each of its own scenario
    await page.screenshot({ path: join(DOCS, 'compare-view.png') });
    await page.mouse.move(5, 5);

    // leaving compare restores the single map, full width, and the link drops the compare scenario
    await page.click('[data-testid=compare-toggle]');
    await page.waitForSelector('[data-testid=compare-right]', { state: 'detached' });
    const wrap = await page.locator('[data-testid=map-wrap]').boundingBox();
    const single = await page.locator('[data-testid=map]').boundingBox();
    expect(Math.abs((single?.width ?? 0) - (wrap?.width ?? -1))).toBeLessThan(2);
    expect(new URL(page.url()).searchParams.get('compare')).toBeNull();
    expect(s.pageErrors).toEqual([]);
  });
});

/** Move the pointer to (dx, dy) pixels from the centre of an element and wait for the readouts. */
async function hoverOn(selector: string, dx: number, dy: number): Promise<void> {
  const box = await s.page.locator(selector).boundingBox();
  if (!box) throw new Error(`${selector} not visible`);
  await s.page.mouse.move(box.x + box.width / 2 + dx - 3, box.y + box.height / 2 + dy - 3);
  await s.page.mouse.move(box.x + box.width / 2 + dx, box.y + box.height / 2 + dy, { steps: 3 });
  await s.page.waitForSelector('[data-testid=hover-readout]', { timeout: 10_000 });
}

/** Pixels of an element in the colour of the suitability class "good" (the map drawn at opacity 1). */
async function goodPixels(selector: string): Promise<number> {
  const band = s.manifest.bands.find((b) => b.id === BAND.suitability);
  const good = band && classColours(band).get(3);
  if (!good) throw new Error('no colour for the class good');
  const p = await countForegroundPixels(s.page, selector, [good], 4);
  return p.total - p.foreground;
}

/** A number shown in the page (thousands separators dropped). */
async function shownNumber(testId: string): Promise<number> {
  return Number(((await s.page.locator(`[data-testid=${testId}]`).textContent()) ?? '').replace(/,/g, ''));
}

/** The dashboard opened on a link (query without "?"), the compare view's both maps drawn. */
async function openCompare(query: string): Promise<void> {
  await s.page.goto(`${s.url}?${query}`);
  await waitForCompare();
}

const GOOD_ONLY = `layer=${BAND.suitability}&opacity=1&x=${BAND.suitability}:0,1,2`;

/** The readout's lines after its scenario and coordinates: the values. */
async function readoutValues(testId: string): Promise<string[]> {
  const text = await s.page.locator(`[data-testid=${testId}]`).innerText();
  const lines = text.split('\n').filter((l) => l.trim() !== '');
  return lines.slice(lines.findIndex((l) => /^\d+\.\d+° [NS], /.test(l)) + 1);
}

describe('compare view: filters on the other scenario, second readout, swipe', () => {
  it('veils on both maps the cells failing the filters under either scenario, as the counter counts them', async () => {
    const page = s.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    await openCompare(`${GOOD_ONLY}&compare=${HIGH}`);
    await page.waitForSelector('[data-testid=both-count-cells]', { timeout: 60_000 });
    const bothCount = await shownNumber('both-count-cells');
    const hereCount = await shownNumber('region-count-cells');
    const eachLeft = await goodPixels(LEFT);
    const eachRight = await goodPixels(RIGHT);
    await page.selectOption('[data-testid=filter-scope]', 'both');
    await page.waitForFunction(() => window.location.search.includes('filtersUnder=both'));
    await page.waitForTimeout(3000); // the maps fetch the other scenario's filter bands and recolour
    // the counter now counts under both (the same cells as the count under both before, and the build's)
    expect(await page.locator('[data-testid=region-count]').textContent()).toContain('under both scenarios');
    expect(await shownNumber('region-count-cells')).toBe(bothCount);
    expect(bothCount).toBe(s.manifest.scenarioSet?.scenarios[2].keyFigures.goodUnderBoth_cells);
    expect(await page.locator('[data-testid=both-count]').count()).toBe(0);
    // both maps leave the same cells unveiled (good under both), fewer than each map alone
    const bothLeft = await goodPixels(LEFT);
    const bothRight = await goodPixels(RIGHT);
    console.log(
      `good pixels, each its own: ${eachLeft} | ${eachRight}; under both: ${bothLeft} | ${bothRight}`,
    );
    expect(bothLeft).toBeGreaterThan(0);
    // Fewer than the left map alone where some of its good cells are not good under the other scenario
    // (the counts say so); the same where every one of them is (the model of the build decides).
    if (bothCount < hereCount) expect(bothLeft).toBeLessThan(eachLeft);
    else expect(Math.abs(bothLeft - eachLeft)).toBeLessThanOrEqual(0.01 * eachLeft);
    expect(bothRight).toBeLessThanOrEqual(eachRight);
    expect(Math.abs(bothLeft - bothRight)).toBeLessThanOrEqual(0.01 * bothLeft);
    // the filters on the other scenario only: the counter says which
    await page.selectOption('[data-testid=filter-scope]', 'compared');
    await page.waitForFunction(() => window.location.search.includes('filtersUnder=compared'));
    expect(await page.locator('[data-testid=region-count]').textContent()).toContain(
      `under ${SET.scenarios[2].name}`,
    );
    // the link opens with the same scope
    await openCompare(new URL(page.url()).search.slice(1));
    expect(await page.locator('[data-testid=filter-scope]').inputValue()).toBe('compared');
    expect(s.pageErrors).toEqual([]);
  });

  it('reads out the right-hand map for its own scenario, in the units chosen', async () => {
    const page = s.page;
    const [w, south, e, n] = s.manifest.region.bounds;
    const view = `c=${((w + e) / 2).toFixed(4)},${((south + n) / 2).toFixed(4)}&z=${s.manifest.tiles.minZoom + 3}`;
    const query = `layer=${BAND.groundTempEnd}&units=NA&${view}`;
    await openCompare(`${query}&compare=${HIGH}`);
    await page.waitForSelector('[data-testid=both-count-cells]', { timeout: 60_000 }); // both tables loaded
    await hoverOn(RIGHT, 40, 30);
    await page.waitForSelector('[data-testid=hover-readout-right]', { timeout: 10_000 });
    const right = page.locator('[data-testid=hover-readout-right]');
    const left = page.locator('[data-testid=hover-readout]');
    expect(await right.locator('[data-testid=readout-scenario]').textContent()).toBe(SET.scenarios[2].name);
    expect(await left.locator('[data-testid=readout-scenario]').textContent()).toBe(SET.scenarios[0].name);
    const value = (await right.locator('[data-testid=hover-value]').textContent()) ?? '';
    expect(value).toMatch(/°F/);
    const rightValues = await readoutValues('hover-readout-right');
    console.log(`right-hand readout: ${rightValues.join(' | ')}`);
    // the single map of that scenario, same view, same place under the pointer: the same readout
    await page.goto(`${s.url}?${query}&scenario=${HIGH}`);
    await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
    await page.waitForFunction(
      () => !document.querySelector('[data-testid=summary-panel]')?.textContent?.includes('Counting cells'),
      undefined,
      { timeout: 60_000 },
    );
    await hoverOn('[data-testid=map]', 40, 30);
    expect(await readoutValues('hover-readout')).toEqual(rightValues);
    expect(s.pageErrors).toEqual([]);
  });

  it('swipes: one map, the first scenario left of a divider moved by keyboard and drag, in the link', async () => {
    const page = s.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    const [w, south, e, n] = s.manifest.region.bounds;
    const view = `c=${((w + e) / 2).toFixed(4)},${((south + n) / 2).toFixed(4)}&z=${s.manifest.tiles.minZoom + 1}`;
    await openCompare(`${GOOD_ONLY}&${view}&compare=${HIGH}`);
    await page.selectOption('[data-testid=compare-mode]', 'swipe');
    await page.waitForFunction(() => window.location.search.includes('compareView=swipe&divider=50'));
    await page.waitForTimeout(2500); // both maps redraw at the full width
    const wrap = await page.locator(WRAP).boundingBox();
    const rightBox = await page.locator(RIGHT).boundingBox();
    expect(Math.abs((rightBox?.width ?? 0) - (wrap?.width ?? -1))).toBeLessThan(2); // one map's place
    const divider = page.locator('[data-testid=swipe-divider]');
    expect(await divider.getAttribute('role')).toBe('separator');
    expect(await divider.getAttribute('aria-valuenow')).toBe('50');
    expect(await divider.getAttribute('aria-valuetext')).toContain(`${SET.scenarios[0].name} left`);
    expect(await page.locator('[data-testid=compare-label-right]').isVisible()).toBe(true);
    // keyboard: two steps left, one fine step right
    await divider.focus();
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('Shift+ArrowRight');
    expect(await divider.getAttribute('aria-valuenow')).toBe('41');
    await page.waitForFunction(() => window.location.search.includes('divider=41'));
    // drag it to 70 % of the width
    const d = await divider.boundingBox();
    if (!d || !wrap) throw new Error('divider not visible');
    await page.mouse.move(d.x + d.width / 2, d.y + d.height / 2);
    await page.mouse.down();
    await page.mouse.move(wrap.x + 0.7 * wrap.width, d.y + d.height / 2, { steps: 10 });
    await page.mouse.up();
    expect(Math.abs(Number(await divider.getAttribute('aria-valuenow')) - 70)).toBeLessThanOrEqual(1);
    await page.waitForFunction(() => /divider=(69|70|71)\b/.test(window.location.search));
    // a drag on the map left of the divider pans both maps together
    await page.mouse.move(wrap.x + 0.3 * wrap.width, wrap.y + wrap.height / 2);
    await page.mouse.down();
    await page.mouse.move(wrap.x + 0.3 * wrap.width + 80, wrap.y + wrap.height / 2 + 40, { steps: 6 });
    await page.mouse.up();
    await page.waitForTimeout(800);
    const [l, r] = await views();
    expect(r).toEqual(l);
    // the link opens the swipe view with the divider where it was
    await openCompare(new URL(page.url()).search.slice(1));
    expect(await page.locator('[data-testid=compare-mode]').inputValue()).toBe('swipe');
    expect(Math.abs(Number(await divider.getAttribute('aria-valuenow')) - 70)).toBeLessThanOrEqual(1);
    await checkSwipeSides();
  });
});

/**
 * The divider at the right edge shows the first scenario over the whole map, at the left edge the
 * second: each the same as that scenario's single map of the same view. Then the picture for the docs.
 */
async function checkSwipeSides(): Promise<void> {
  const page = s.page;
  await page.mouse.move(5, 5);
  const divider = page.locator('[data-testid=swipe-divider]');
  // the scenario labels lie over the map: out of the count (the single maps have none)
  await page.evaluate(() =>
    document.querySelectorAll<HTMLElement>('.compare-label').forEach((e) => (e.style.visibility = 'hidden')),
  );
  await divider.focus();
  await page.keyboard.press('End');
  await page.waitForTimeout(1000);
  const allFirst = await goodPixels(WRAP);
  await page.keyboard.press('Home');
  await page.waitForTimeout(1000);
  const allSecond = await goodPixels(WRAP);
  const query = new URLSearchParams(new URL(page.url()).search);
  const single = async (scenario: string | null): Promise<number> => {
    const q = new URLSearchParams({
      c: query.get('c') ?? '',
      z: query.get('z') ?? '',
      layer: BAND.suitability,
    });
    await page.goto(
      `${s.url}?${q}&opacity=1&x=${BAND.suitability}:0,1,2${scenario ? `&scenario=${scenario}` : ''}`,
    );
    await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
    await page.waitForTimeout(1500);
    return goodPixels(WRAP);
  };
  const singleFirst = await single(null);
  const singleSecond = await single(HIGH);
  console.log(
    `swipe at the right edge ${allFirst} (single map ${singleFirst}); left edge ${allSecond} (${singleSecond})`,
  );
  // each edge matches its own scenario's single map (within 1 %: the divider line at the edge), and, where
  // the two scenarios' single maps differ in this view, not the other's
  expect(Math.abs(allFirst - singleFirst)).toBeLessThanOrEqual(0.01 * singleFirst);
  expect(Math.abs(allSecond - singleSecond)).toBeLessThanOrEqual(0.01 * singleSecond);
  if (Math.abs(singleFirst - singleSecond) > 0.02 * singleFirst) {
    expect(allFirst).not.toBe(allSecond);
    expect(Math.abs(allFirst - singleFirst)).toBeLessThan(Math.abs(allFirst - singleSecond));
    expect(Math.abs(allSecond - singleSecond)).toBeLessThan(Math.abs(allSecond - singleFirst));
  }
  // the picture: ground temperature at the end of the design life, divider in the middle, both readouts
  const [w, south, e, n] = s.manifest.region.bounds;
  const centre = `c=${((w + e) / 2).toFixed(4)},${((south + n) / 2).toFixed(4)}&z=5.5`; // the island across the map
  await page.goto(
    `${s.url}?layer=${BAND.groundTempEnd}&${centre}&compare=${HIGH}&compareView=swipe&divider=50`,
  );
  await waitForCompare();
  await hoverOn(WRAP, 120, 60);
  await page.waitForSelector('[data-testid=hover-readout-right]', { timeout: 30_000 });
  await page.screenshot({ path: join(DOCS, 'compare-swipe.png') });
  expect(s.pageErrors).toEqual([]);
}
