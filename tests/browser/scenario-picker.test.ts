/**
 * The scenario picker (issue 17 item 3, the part built): a scenario-set build of the small demo region
 * (three scenarios of the demo set) served to Chromium; the header names the scenario shown, the
 * picker switches the map to another scenario's bands while the view stays (URL state), the link
 * carries the scenario, and a shortlisted site records the scenario it was taken from in its export.
 * Screenshot: docs/scenario-picker.png.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { generateDemoData } from '../../data-pipeline/demo/generate-demo-data';
import { DEMO_SCENARIO_SET } from '../../data-pipeline/demo/demo-scenarios';
import { startSession, type BrowserSession } from './browser-session';

const DOCS = fileURLToPath(new URL('../../docs/', import.meta.url));
const SET = {
  scenarios: [DEMO_SCENARIO_SET.scenarios[0], DEMO_SCENARIO_SET.scenarios[2], DEMO_SCENARIO_SET.scenarios[3]],
};
let s: BrowserSession;

beforeAll(async () => {
  const dir = mkdtempSync(join(tmpdir(), 'pile-atlas-set-'));
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

async function waitForMap(): Promise<void> {
  await s.page.waitForSelector('.maplibregl-canvas');
  await s.page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
  await s.page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
}

describe('scenario picker', () => {
  it('names the scenario, switches to another keeping the view, and the link carries it', async () => {
    const page = s.page;
    const [w, so, e, n] = s.manifest.region.bounds;
    await page.goto(
      `${s.url}?c=${((w + e) / 2).toFixed(3)},${((so + n) / 2).toFixed(3)}&z=${s.manifest.tiles.maxZoom}`,
    );
    await waitForMap();
    await page.waitForTimeout(300);
    const view = new URL(page.url()).searchParams.get('c');
    expect(view).toBeTruthy();
    const header = page.locator('[data-testid=scenario-name]');
    expect(await header.textContent()).toContain('Present trend, 30-year life');
    const options = await page.locator('[data-testid=scenario-picker] option').allTextContents();
    expect(options).toEqual(SET.scenarios.map((x) => x.name));
    await page.selectOption('[data-testid=scenario-picker]', 'high-pathway-50-year-life');
    await page.waitForFunction(
      () => window.location.search.includes('scenario=high-pathway-50-year-life'),
      null,
      {
        timeout: 60_000,
      },
    );
    await waitForMap();
    const picked = await page.locator('[data-testid=scenario-picker]').inputValue();
    expect(picked).toBe('high-pathway-50-year-life');
    expect(new URL(page.url()).searchParams.get('c')).toBe(view);
    await page.waitForTimeout(500);
    await page.screenshot({ path: join(DOCS, 'scenario-picker.png') });
    // the link opens the same scenario
    await page.goto(page.url());
    await waitForMap();
    expect(await page.locator('[data-testid=scenario-picker]').inputValue()).toBe(
      'high-pathway-50-year-life',
    );
    expect(s.pageErrors).toEqual([]);
  });
});
