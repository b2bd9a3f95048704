/**
 * The compare view (issue 17 item 3): a scenario-set build of the small demo region (three scenarios
 * of the demo set) served to Chromium (software WebGL). The header's Compare control splits the map
 * into the scenario shown and a second one, both maps paint, panning one moves the other to the same
 * centre and zoom, each map names its scenario, the link carries `compare=<slug>` and opens the same
 * split, the matching-area counter counts the cells matching the filter under both scenarios (checked
 * against the build's own comparison), and leaving compare restores the single map. Screenshot: docs/compare-view.png (1440 x 900).
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
import { countForegroundPixels, hexRgb, startSession, type BrowserSession } from './browser-session';

const DOCS = fileURLToPath(new URL('../../docs/', import.meta.url));
const SET = {
  scenarios: [DEMO_SCENARIO_SET.scenarios[0], DEMO_SCENARIO_SET.scenarios[2], DEMO_SCENARIO_SET.scenarios[3]],
};
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
    await page.screenshot({ path: join(DOCS, 'compare-view.png') });

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
