/**
 * The real preview server (`npm start`'s Vite preview with the project's plugins) and the built app
 * under its Content-Security-Policy in Chromium (issue 21 item 3): malformed escapes get 400 with no
 * stack or path, `/data/` in a query string serves the app, every answer carries the security
 * headers, and the app paints its map, runs its workers and saves its shortlist with no CSP violation.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { request, type IncomingMessage } from 'node:http';
import { readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { countForegroundPixels, hexRgb, startSession, type BrowserSession } from './browser-session';
import { LAND_COLOUR, SEA_COLOUR } from '../../web/src/map/base-style';
import { CONTENT_SECURITY_POLICY } from '../../web/build/preview-hardening';
import { REPO_ROOT, WEB_OUT_DIR } from '../../web/build/web-server';

let s: BrowserSession;
const violations: string[] = [];

beforeAll(async () => {
  s = await startSession();
  s.page.on('console', (m) => {
    if (/Content Security Policy|Refused to/i.test(m.text())) violations.push(m.text());
  });
  await s.context.addInitScript(`
    document.addEventListener('securitypolicyviolation', (e) => {
      (window.__csp ??= []).push(e.violatedDirective + ' ' + e.blockedURI);
    });
  `);
});

afterAll(async () => {
  await s?.close();
});

function get(path: string) {
  const u = new URL(s.url);
  return new Promise<{ status: number; headers: IncomingMessage['headers']; body: string }>(
    (resolve, reject) => {
      const r = request({ host: u.hostname, port: u.port, path }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () =>
          resolve({
            status: res.statusCode ?? 0,
            headers: res.headers,
            body: Buffer.concat(chunks).toString(),
          }),
        );
      });
      r.on('error', reject);
      r.end();
    },
  );
}

describe('preview server', () => {
  it('answers malformed escapes with 400 and no stack or path', async () => {
    const answers: string[] = [];
    for (const path of ['/%', '/%E0%A4%A', '/data/%zz', '/assets/%C0%AF', '/index.html%', '/data/tiles/%']) {
      const r = await get(path);
      answers.push(`${path} -> ${r.status} ${JSON.stringify(r.body)}`);
      expect(r.status, path).toBe(400);
      expect(r.body).not.toContain(REPO_ROOT);
      expect(r.body).not.toMatch(/node_modules|URIError|at [\w.<>]+ \(/);
      expect(r.body.length).toBeLessThan(100);
    }
    console.log(answers.join('\n'));
  });

  it('routes /data/ only as a path prefix; traversal stays refused', async () => {
    const app = await get('/index.html?q=/data/manifest.json');
    expect(app.status).toBe(200);
    expect(app.headers['content-type']).toMatch(/text\/html/);
    expect(app.body).toContain('<div id="root">');
    const manifest = await get('/data/manifest.json');
    expect(manifest.status).toBe(200);
    expect(JSON.parse(manifest.body).bands.length).toBeGreaterThan(0);
    for (const path of [
      '/data/../package.json',
      '/data/%2e%2e/package.json',
      '/data/..%2f..%2fpackage.json',
    ]) {
      const r = await get(path);
      expect(r.status, path).toBe(403);
      expect(r.body).not.toContain('pile-atlas');
    }
  });

  it('sends the security headers on the page, its scripts and its data', async () => {
    const script = readdirSync(join(WEB_OUT_DIR, 'assets')).find((f) => f.endsWith('.js'));
    for (const path of ['/', `/assets/${script}`, '/data/manifest.json', '/nothing-here']) {
      const r = await get(path);
      expect(r.headers['content-security-policy'], path).toBe(CONTENT_SECURITY_POLICY);
      expect(r.headers['x-content-type-options'], path).toBe('nosniff');
      expect(r.headers['referrer-policy'], path).toBe('no-referrer');
    }
  });

  it('the app paints, runs its boundary worker and saves its shortlist under the policy', async () => {
    await s.page.goto(s.url);
    await s.page.waitForSelector('[data-testid=region-count-cells]', { timeout: 120_000 });
    await s.page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 120_000 });
    const map = await countForegroundPixels(s.page, '[data-testid=map]', [
      hexRgb(SEA_COLOUR),
      hexRgb(LAND_COLOUR),
    ]);
    expect(map.foreground / map.total).toBeGreaterThan(0.05);
    const [w, so, e, n] = s.manifest.region.bounds;
    const [x, y] = [(w + e) / 2, (so + n) / 2];
    const file = join(s.artifactsDir, 'csp-boundary.geojson');
    writeFileSync(
      file,
      JSON.stringify({
        type: 'Polygon',
        coordinates: [
          [
            [x - 1, y - 0.3],
            [x + 1, y - 0.3],
            [x + 1, y + 0.3],
            [x - 1, y + 0.3],
            [x - 1, y - 0.3],
          ],
        ],
      }),
    );
    await s.page.setInputFiles('[data-testid=boundary-import]', file);
    await s.page.waitForSelector('[data-testid=zone-count-cells]', { timeout: 60_000 });
    // A click on the map opens the cell panel; adding the cell saves to IndexedDB.
    const box = await s.page.locator('[data-testid=map]').boundingBox();
    if (!box) throw new Error('map not visible');
    await s.page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    const add = s.page.getByRole('button', { name: /add to shortlist/i });
    await add.first().click();
    await s.page.waitForSelector('[data-testid=shortlist-save-state][data-state=saved]');
    await s.page.locator('[data-testid=summary-panel]').scrollIntoViewIfNeeded();
    await s.page.screenshot({ path: join(s.artifactsDir, 'csp-app-1280x720.png') });
    const events = await s.page.evaluate('window.__csp ?? []');
    expect(events).toEqual([]);
    expect(violations).toEqual([]);
    expect(s.pageErrors).toEqual([]);
  });

  it('the policy refuses an injected inline script (and the listener above sees it)', async () => {
    await s.page.evaluate(`
      const el = document.createElement('script');
      el.textContent = 'window.__inlineRan = true';
      document.body.append(el);
    `);
    await s.page.waitForTimeout(200);
    expect(await s.page.evaluate('window.__inlineRan === undefined')).toBe(true);
    expect(await s.page.evaluate('window.__csp')).toEqual([expect.stringMatching(/^script-src/)]);
  });
});
