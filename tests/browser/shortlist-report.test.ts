/**
 * The shortlist report (print and PDF) with three shortlisted sites: the map of the sites, the
 * comparison table, one sheet per site, the sources and the cautions; the PDF from Chromium's
 * page.pdf; the print view's pages and the dashboard at 1440 × 900 and 1024 × 700 as PNGs in the
 * artifacts directory (copied to docs/ by hand after looking at them).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startSession, type BrowserSession } from './browser-session';
import { SCREENING_CAUTION } from '../../layers/cautions';

let s: BrowserSession;

beforeAll(async () => {
  s = await startSession();
});

afterAll(async () => {
  await s?.close();
});

describe('shortlist report', () => {
  it('lays out the map at 1440 × 900 and 1024 × 700 with the counter in view', async () => {
    for (const [w, h] of [
      [1440, 900],
      [1024, 700],
    ]) {
      await s.page.setViewportSize({ width: w, height: h });
      await s.page.goto(s.url);
      await s.page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
      await s.page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
      await s.page.waitForTimeout(500);
      // Two filters, as in the planner's task; the counter must stay on screen.
      const continuous = s.manifest.bands.filter((b) => b.kind === 'continuous' && b.max > b.min).slice(0, 2);
      for (const b of continuous) {
        await s.page.selectOption('[data-testid=filter-add]', b.id);
        await s.page.fill(`[data-testid=filter-${b.id}-max]`, String(b.max));
      }
      await s.page.waitForTimeout(300);
      await s.page.screenshot({ path: join(s.artifactsDir, `map-${w}x${h}.png`) });
      const box = await s.page.locator('[data-testid=region-count]').boundingBox();
      if (!box) throw new Error('counter not shown');
      console.log(
        `${w} × ${h}: matching-area counter at y ${box.y.toFixed(0)}–${(box.y + box.height).toFixed(0)}`,
      );
      expect(box.y).toBeGreaterThanOrEqual(0);
      expect(box.y + box.height).toBeLessThanOrEqual(h);
    }
  });

  it('prints the map of the sites, the comparison, each site’s sheet, sources and cautions; PDF pages', async () => {
    const page = s.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.goto(s.url);
    await page.waitForSelector('[data-testid=region-count-cells]', { timeout: 60_000 });
    await page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 60_000 });
    const box = await page.locator('[data-testid=map]').boundingBox();
    if (!box) throw new Error('map not visible');
    let added = 0;
    for (const [fx, fy] of [
      [0.45, 0.5],
      [0.55, 0.45],
      [0.5, 0.6],
      [0.4, 0.4],
      [0.6, 0.55],
    ]) {
      if (added === 3) break;
      await page.mouse.click(box.x + fx * box.width, box.y + fy * box.height);
      const add = page.locator('[data-testid=add-to-shortlist]');
      try {
        await add.waitFor({ timeout: 5000 });
      } catch {
        continue; // sea or no data here
      }
      await add.click();
      added++;
      await page.waitForTimeout(200);
    }
    expect(added).toBe(3);
    await page.click('[data-testid=open-report]');
    const report = page.locator('[data-testid=shortlist-report]');
    await report.waitFor();
    expect(await page.locator('[data-testid=report-comparison] tbody tr').count()).toBe(3);
    expect(await page.locator('[data-testid=report-site-sheet]').count()).toBe(3);
    expect(await page.locator('[data-testid=report-map] circle').count()).toBe(3);
    expect(await page.locator('[data-testid=report-sources] tbody tr').count()).toBe(
      s.manifest.sources.length,
    );
    const text = (await report.textContent()) ?? '';
    expect(text).toContain(SCREENING_CAUTION);
    expect(text).toMatch(/frost heave/);
    expect(text).toMatch(/scenario:/);
    // No internal ids on the report. An id that is a plain lowercase word ("suitability") can stand
    // in a title as the word itself ("Robust suitability class"), so only compound ids are checked.
    for (const b of s.manifest.bands)
      if (b.id.length > 6 && b.id !== b.title && !/^[a-z]+$/.test(b.id)) expect(text).not.toContain(b.id);

    const pdfPath = join(s.artifactsDir, 'shortlist-report.pdf');
    await page.emulateMedia({ media: 'print' });
    await page.pdf({ path: pdfPath, format: 'A4', printBackground: true });
    const pdf = readFileSync(pdfPath).toString('latin1');
    expect(pdf.startsWith('%PDF')).toBe(true);
    const pages = (pdf.match(/\/Type\s*\/Page[^s]/g) ?? []).length;
    console.log(`report PDF: ${pages} pages, ${(pdf.length / 1024).toFixed(0)} KiB`);
    // Cover with map and table, three site sheets, sources: at least five pages.
    expect(pages).toBeGreaterThanOrEqual(5);
    // The print view's pages as PNGs (A4 width at 96 dpi).
    await page.setViewportSize({ width: 794, height: 1123 });
    const sections = page.locator('[data-testid=report-page]');
    const n = await sections.count();
    for (let i = 0; i < n; i++)
      await sections.nth(i).screenshot({ path: join(s.artifactsDir, `report-page-${i + 1}.png`) });
    await page.emulateMedia({ media: 'screen' });
  });

  it('studies every shortlisted site in workers, with progress and cancel; the report shows the results', async () => {
    const page = s.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    if (await page.locator('[data-testid=report-close]').count())
      await page.click('[data-testid=report-close]');
    await page.click('[data-testid=study-all-run]');
    await page.waitForSelector('[data-testid=study-all-progress]');
    expect(await page.locator('[data-testid=study-all-status]').textContent()).toMatch(
      /Studying site 1 of 3/,
    );
    await page.click('[data-testid=study-all-cancel]');
    await expect(page.locator('[data-testid=study-all-status]').textContent()).resolves.toMatch(
      /^Cancelled: 0 of 3/,
    );
    const t0 = Date.now();
    await page.click('[data-testid=study-all-run]');
    await page.waitForFunction(
      () =>
        /of 3 site\(s\) studied/.test(
          document.querySelector('[data-testid=study-all-status]')?.textContent ?? '',
        ),
      undefined,
      { timeout: 600_000 },
    );
    const status = (await page.locator('[data-testid=study-all-status]').textContent()) ?? '';
    console.log(`study all: ${status} in ${((Date.now() - t0) / 1000).toFixed(1)} s (shared machine)`);
    expect(status).toMatch(/^3 of 3 site\(s\) studied/);
    // The list shows each site's study figures in the planner's words and the chosen units (issue 18):
    // no stored key (camelCase: two or more lower-case letters before a capital, so "kW" does not
    // count), no underscore, no bare yes/no flag.
    const figures = await page.locator('[data-testid=shortlist-item-figures]').allTextContents();
    expect(figures).toHaveLength(3);
    for (const f of figures) {
      expect(f).toMatch(/Thaw delay at the first probe \(study of all sites\): /);
      expect(f).toMatch(/Lowest fluid temperature \(study of all sites\): -?[\d.]+ °C/);
      expect(f).not.toMatch(/\b[a-z]{2,}[A-Z][a-zA-Z]*\b/);
      expect(f).not.toContain('_');
      expect(f).not.toMatch(/: (yes|no)\b/);
    }
    // The unit switch reaches the list: North American shows the fluid temperatures in °F
    // (°F = °C × 9/5 + 32, the scale's definition).
    await page.check('[data-testid=units-NA]');
    await expect
      .poll(() => page.locator('[data-testid=shortlist-item-figures]').allTextContents())
      .toEqual(
        figures.map(() =>
          expect.stringMatching(/Lowest fluid temperature \(study of all sites\): -?[\d.]+ °F/),
        ),
      );
    await page
      .locator('[data-testid=shortlist-panel]')
      .screenshot({ path: join(s.artifactsDir, 'shortlist-studied-na.png') });
    await page.check('[data-testid=units-SI]');
    await page.click('[data-testid=open-report]');
    const rows = await page.locator('[data-testid=report-comparison] tbody tr').allTextContents();
    expect(rows).toHaveLength(3);
    for (const r of rows) expect(r).not.toMatch(/not studied/);
    for (const r of rows) expect(r).toMatch(/°C/);
    await page.emulateMedia({ media: 'print' });
    await page.setViewportSize({ width: 794, height: 1123 });
    await page
      .locator('[data-testid=report-page]')
      .first()
      .screenshot({ path: join(s.artifactsDir, 'report-page-1-studied.png') });
    await page.emulateMedia({ media: 'screen' });
  }, 900_000);
});
