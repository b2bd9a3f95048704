/**
 * Issue 17 item 4 in Chromium, on a three-scenario build of the small demo region (present trend;
 * low pathway; high pathway with a 50-year life): the shortlist's GeoJSON export carries every
 * scenario's key figures at the site (one column group per scenario), the group of the scenario a
 * site was taken under equal to the record's own values; the site study runs under every scenario on
 * the page's workers (progress, cancel), draws each scenario's curves over the probe chart with a
 * legend naming them, and tables each scenario's key figures. Screenshot: artifacts/scenario-study.png.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { generateDemoData } from '../../data-pipeline/demo/generate-demo-data';
import { DEMO_SCENARIO_SET } from '../../data-pipeline/demo/demo-scenarios';
import { scenarioColumnPrefix } from '../../layers/screening/export-schema';
import { startSession, type BrowserSession } from './browser-session';

const SET = {
  scenarios: [DEMO_SCENARIO_SET.scenarios[0], DEMO_SCENARIO_SET.scenarios[1], DEMO_SCENARIO_SET.scenarios[3]],
};
const NAMES = SET.scenarios.map((x) => x.name);
let s: BrowserSession;

beforeAll(async () => {
  const dir = mkdtempSync(join(tmpdir(), 'pile-atlas-set-study-'));
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
  await s.page.waitForTimeout(300);
}

/** Click the middle of the map and shortlist that cell from the cell panel. */
async function addCentreCell(): Promise<void> {
  const box = await s.page.locator('[data-testid=map]').boundingBox();
  if (!box) throw new Error('map not visible');
  await s.page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
  await s.page.locator('[data-testid=cell-values] td').first().waitFor({ state: 'attached' });
  await s.page.click('[data-testid=add-to-shortlist]');
}

async function exportGeoJson(name: string): Promise<{ features: { properties: Record<string, unknown> }[] }> {
  const [download] = await Promise.all([
    s.page.waitForEvent('download', { timeout: 60_000 }),
    s.page.click('[data-testid=export-geojson]'),
  ]);
  const text = readFileSync(await download.path(), 'utf8');
  writeFileSync(join(s.artifactsDir, name), text);
  return JSON.parse(text);
}

/** The key columns of a scenario's group that must equal the record's when the site was taken under it. */
const SAME = ['suitability_class', 'suitability_label', 'thawDelay_yr', 'groundTempEnd_degC', 'loadShare'];

describe('scenario set: study under every scenario, exports with every scenario', () => {
  it('exports every scenario’s key figures per site, the recorded scenario’s equal to the record', async () => {
    const settlements = JSON.parse(
      readFileSync(join(s.dataDir, s.manifest.settlements ?? 'settlements.geojson'), 'utf8'),
    ) as { features: { geometry: { coordinates: [number, number] } }[] };
    const [lon, lat] = settlements.features[0].geometry.coordinates;
    await s.page.goto(`${s.url}?c=${lon},${lat}&z=${Math.min(9, s.manifest.tiles.maxZoom + 1)}`);
    await waitForMap();
    await addCentreCell();
    const first = (await exportGeoJson('set-export-present.geojson')).features[0].properties;
    for (const name of NAMES) expect(first[`${scenarioColumnPrefix(name)}scenario`]).toBe(name);
    const present = scenarioColumnPrefix(NAMES[0]);
    for (const col of SAME) expect(first[`${present}${col}`], col).toEqual(first[col]);
    expect(first.metric_scenario).toBe(NAMES[0]);
    // The high pathway with a 50-year life ends warmer than the present trend at 30 years.
    const high = scenarioColumnPrefix(NAMES[2]);
    expect(first[`${high}groundTempEnd_degC`] as number).toBeGreaterThan(first.groundTempEnd_degC as number);

    // The same place under the high pathway: the record now holds that scenario's values.
    await s.page.selectOption('[data-testid=scenario-picker]', 'high-pathway-50-year-life');
    await s.page.waitForFunction(() => window.location.search.includes('scenario=high-pathway-50-year-life'));
    await waitForMap();
    await addCentreCell();
    const again = (await exportGeoJson('set-export-high.geojson')).features;
    expect(again).toHaveLength(1);
    const p = again[0].properties;
    expect(p.metric_scenario).toBe(NAMES[2]);
    expect(p.scenarioName).toBe(NAMES[2]);
    for (const col of SAME) expect(p[`${high}${col}`], col).toEqual(p[col]);
    for (const name of NAMES) {
      const g = scenarioColumnPrefix(name);
      expect(p[`${g}thawDelay_yr`]).toEqual(first[`${g}thawDelay_yr`]);
    }
    expect(s.pageErrors).toEqual([]);
  }, 300_000);

  it('runs the study under every scenario with progress and cancel, overlay and table', async () => {
    const page = s.page;
    await page.waitForSelector('[data-testid=site-card]', { timeout: 30_000 });
    await page.click('[data-testid=open-site-study]');
    await page.waitForSelector('[data-testid=site-study]');
    // Under the high pathway the study runs that pathway (the form's draft carries it).
    await page.selectOption('#site-numerics-fidelity', 'coarse');
    await page.locator('#site-years').fill('50');
    await page.click('[data-testid=run-site]');
    await page.waitForSelector('[data-testid=site-outcome]', { timeout: 420_000 });
    await page.click('[data-testid=sweep-start]');
    await page
      .waitForSelector('[data-testid=sweep-progress]', { timeout: 30_000 })
      .catch(async (e: unknown) => {
        const text = await page.locator('[data-testid=scenario-sweep]').textContent();
        throw new Error(`no progress; the panel reads: ${text}; ${String(e)}`);
      });
    await page.click('[data-testid=sweep-cancel]');
    await page.getByText('Runs under every scenario cancelled.').waitFor({ timeout: 10_000 });
    await page.click('[data-testid=sweep-start]');
    await page.waitForSelector('[data-testid=sweep-done]', { timeout: 900_000 });
    const rows = page.locator('[data-testid=sweep-table] tbody tr');
    expect(await rows.count()).toBe(3);
    const rowText = await rows.allTextContents();
    NAMES.forEach((name, i) => expect(rowText[i]).toContain(name));
    for (const t of rowText) expect(t).toMatch(/°C/);
    const chart = page.locator('[data-testid=chart-probe]');
    expect(await chart.locator('.scenario-overlay').count()).toBe(3);
    expect(await chart.locator('.scenario-overlay path').count()).toBeGreaterThanOrEqual(3);
    const legend = (await chart.locator('.chart-legend').textContent()) ?? '';
    for (const name of NAMES) expect(legend).toContain(name);
    await page.locator('[data-testid=scenario-sweep]').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(s.artifactsDir, 'scenario-study.png'), fullPage: false });
    await chart.scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(s.artifactsDir, 'scenario-study-chart.png'), fullPage: false });
    expect(s.pageErrors).toEqual([]);
  }, 1_500_000);
});
