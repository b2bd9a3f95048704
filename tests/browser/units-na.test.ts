/**
 * The unit switch on North American reaches the shortlist exports and the site study (issue 18, item 3):
 * the dashboard's GeoJSON and CSV carry North American column names and values and read back to the
 * SI values; after a run for a demo settlement the study's charts (axis titles, tick labels, legends),
 * its notes and its table show °F and ft, and no SI unit string appears in the rendered text.
 * Conversions checked here are the unit definitions (°F = °C × 9/5 + 32; 1 ft = 0.3048 m exactly).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startSession, type BrowserSession } from './browser-session';
import { bandColumnName, exportStep, importBandValue } from '../../layers/screening/export-schema';
import { displayConversion } from '../../web/src/units/display-units';

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

/** The app on the first settlement in the given unit system, its cell clicked. */
async function openOnSettlement(page: Page, units: 'SI' | 'NA'): Promise<void> {
  const z = Math.min(9, s.manifest.tiles.maxZoom + 1);
  await page.goto(`${s.url}?c=${site[0]},${site[1]}&z=${z}&units=${units}`);
  await page.waitForSelector('.maplibregl-canvas');
  await page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
  await page.waitForTimeout(300);
  const box = await page.locator('[data-testid=map]').boundingBox();
  if (!box) throw new Error('map not visible');
  await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
}

async function download(page: Page, testId: string, name: string): Promise<string> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.click(`[data-testid=${testId}]`)]);
  const text = readFileSync(await file.path(), 'utf8');
  writeFileSync(join(s.artifactsDir, name), text);
  return text;
}

type Props = Record<string, unknown>;
const firstProps = (text: string): Props =>
  (JSON.parse(text) as { features: { properties: Props }[] }).features[0].properties;

/** SI unit labels that must not appear as a unit in North American text (kWh and yr are both systems'). */
const SI_UNIT =
  /°C|(?<![\w°·/])(?:m|cm|mm|km|m²|m³|W|kW|W\/m|W\/m²|L|L\/min|L\/yr|kN|kPa|K|m·K\/W)(?![\w²³/·])/;

describe('North American units', () => {
  it('exports the shortlist in North American units and reads it back to the SI values', async () => {
    await openOnSettlement(s.page, 'NA');
    await s.page.click('[data-testid=add-to-shortlist]');
    await expect.poll(() => s.page.locator('[data-testid=shortlist-item]').count()).toBe(1);
    await expect(s.page.locator('[data-testid=export-units]').textContent()).resolves.toMatch(
      /North American units/,
    );
    const naText = await download(s.page, 'export-geojson', 'shortlist-na.geojson');
    const naCsv = await download(s.page, 'export-csv', 'shortlist-na.csv');
    await s.page.check('[data-testid=units-SI]');
    const siText = await download(s.page, 'export-geojson', 'shortlist-si.geojson');
    expect(JSON.parse(naText).unitSystem).toBe('North American');
    expect(JSON.parse(siText).unitSystem).toBe('SI');
    const na = firstProps(naText);
    const si = firstProps(siText);
    expect(na.unitSystem).toBe('North American');
    const header = naCsv.split('\r\n')[0];
    let converted = 0;
    for (const band of s.manifest.bands) {
      const naName = bandColumnName(band, 'NA');
      const siName = bandColumnName(band, 'SI');
      expect(na, naName).toHaveProperty(naName);
      expect(header.split(',')).toContain(naName);
      const c = displayConversion(band.unit, 'NA');
      if (band.kind !== 'class' && c.unit !== band.unit) {
        converted++;
        expect(na, siName).not.toHaveProperty(siName);
      }
      // Read back to SI within one SI step of the SI export (both files round to their own step).
      const siValue = si[siName];
      const back = importBandValue(band, na, 'NA');
      if (typeof siValue !== 'number') expect([naName, back]).toEqual([naName, null]);
      else expect(Math.abs(back! - siValue), naName).toBeLessThanOrEqual((exportStep(band) ?? 0.001) + 1e-9);
    }
    expect(converted).toBeGreaterThan(5);
    // A ground temperature in °F: °F = °C × 9/5 + 32 (definition), within the two files' rounding.
    const temp = s.manifest.bands.find((b) => b.unit === '°C' && typeof si[bandColumnName(b)] === 'number')!;
    const f = na[bandColumnName(temp, 'NA')] as number;
    expect(f).toBeCloseTo((si[bandColumnName(temp)] as number) * 1.8 + 32, 1);
    expect(bandColumnName(temp, 'NA')).toMatch(/degF$/);
    expect(naCsv.split('\r\n')[1]).toContain('North American');

    // The re-import of the North American file gives the site back with the same SI values.
    await s.page.click('[aria-label^="Remove"]');
    await expect.poll(() => s.page.locator('[data-testid=shortlist-item]').count()).toBe(0);
    await s.page.setInputFiles('[data-testid=import-geojson]', join(s.artifactsDir, 'shortlist-na.geojson'));
    await expect.poll(() => s.page.locator('[data-testid=shortlist-item]').count()).toBe(1);
    const again = firstProps(await download(s.page, 'export-geojson', 'shortlist-si-again.geojson'));
    for (const band of s.manifest.bands) {
      const name = bandColumnName(band);
      if (typeof si[name] !== 'number') continue;
      const tol = (exportStep(band) ?? 0.001) + 1e-9;
      expect(Math.abs((again[name] as number) - (si[name] as number)), name).toBeLessThanOrEqual(tol);
    }
    expect(s.pageErrors).toEqual([]);
  });

  it('shows the site study after a run in North American units, charts and notes included', async () => {
    await openOnSettlement(s.page, 'NA');
    await s.page.waitForSelector('[data-testid=site-card]', { timeout: 30_000 });
    await s.page.click('[data-testid=open-site-study]');
    await s.page.waitForSelector('[data-testid=site-study]');
    // A short run keeps the test quick; every chart, note and table row is drawn for any run length.
    await s.page.fill('#site-years', '12');
    await s.page.click('[data-testid=run-site]');
    await s.page.waitForSelector('[data-testid=site-outcome]', { timeout: 420_000 });
    const charts = s.page.locator('[data-testid=site-outcome] svg');
    await expect.poll(() => charts.count(), { timeout: 5000 }).toBeGreaterThanOrEqual(5);
    const svgText = (await s.page.locator('[data-testid=site-outcome] svg text').allTextContents()).join(
      ' | ',
    );
    const outcome = (await s.page.locator('[data-testid=site-outcome]').textContent()) ?? '';
    const notes = (await s.page.locator('[data-testid=site-notes]').textContent()) ?? '';
    // The form's notes (its fields' units and the stored SI value beside each are the form's own tests).
    const form = (await s.page.locator('[data-testid=site-study] form .notice').allTextContents()).join(' ');
    writeFileSync(join(s.artifactsDir, 'site-study-na.txt'), `${svgText}\n\n${outcome}\n\n${form}\n`);
    // Axis titles in °F and ft (ground temperature against depth: depth in ft, temperature in °F).
    expect(svgText).toMatch(/temperature \(°F\)/);
    expect(svgText).toMatch(/depth \(ft\)/);
    expect(notes).toMatch(/Btu\/h·ft/); // the operating-window note's bounds per length of pile
    for (const [where, text] of [
      ['chart text', svgText],
      ['results', outcome],
      ['notes', notes],
      ['form notes', form],
    ] as const) {
      const leak = text.match(SI_UNIT);
      expect(
        leak ? `${where}: "${text.slice(Math.max(0, leak.index! - 60), leak.index! + 20)}"` : null,
      ).toBeNull();
    }
    await s.page.setViewportSize({ width: 1400, height: 1800 });
    await s.page.waitForTimeout(300);
    await s.page.screenshot({ path: join(s.artifactsDir, 'site-study-na.png') });
    await s.page.locator('.site-output').evaluate((el) => el.scrollTo(0, 1400));
    await s.page.screenshot({ path: join(s.artifactsDir, 'site-study-na-charts.png') });
    await s.page.setViewportSize({ width: 1280, height: 720 });
    expect(s.pageErrors).toEqual([]);
  });
});
