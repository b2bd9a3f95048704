/**
 * The preview server's own middleware over real HTTP on the loopback interface: the URL guard, the
 * security headers and the opaque error handler (web/build/preview-hardening.ts) in front of the
 * `/data/` middleware (web/build/serve-data-dir.ts), chained as Vite chains them. Issue 21 item 3:
 * malformed escapes get 400 with no stack and no path, `/data/` routes only as a path prefix, ranges
 * and path escapes behave as before.
 */
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { createServer, request, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Connect } from 'vite';
import {
  CONTENT_SECURITY_POLICY,
  malformedUrlGuard,
  opaqueErrors,
  pathDecodes,
  securityHeaders,
} from '../../web/build/preview-hardening';
import { dataDirMiddleware } from '../../web/build/serve-data-dir';

const dir = mkdtempSync(join(tmpdir(), 'pile-atlas-preview-'));
mkdirSync(join(dir, 'data', 'tiles'), { recursive: true });
writeFileSync(join(dir, 'data', 'manifest.json'), '{"ok":true}');
writeFileSync(join(dir, 'data', 'tiles', 't.bin'), Buffer.from([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]));
writeFileSync(join(dir, 'secret.txt'), 'outside the data directory');

const APP = '<!doctype html><title>app</title>';
const logged: string[] = [];

/** The chain: guard, headers, data, a middleware that throws on /boom, then the app (index.html). */
function chain(req: IncomingMessage, res: ServerResponse): void {
  const steps: Connect.NextHandleFunction[] = [
    malformedUrlGuard(),
    securityHeaders(),
    dataDirMiddleware(join(dir, 'data')),
    (r, _s, next) => (r.url?.startsWith('/boom') ? next(new Error(`ENOENT: ${dir}/x`)) : next()),
    (_r, s) => {
      s.setHeader('Content-Type', 'text/html');
      s.end(APP);
    },
  ];
  const onError = opaqueErrors((l) => logged.push(l));
  let i = 0;
  const next = (err?: unknown) => {
    if (err) return onError(err, req as Connect.IncomingMessage, res, () => undefined);
    const step = steps[i++];
    try {
      step(req as Connect.IncomingMessage, res, next);
    } catch (e) {
      next(e);
    }
  };
  next();
}

let server: Server;
let port = 0;
beforeAll(async () => {
  server = createServer(chain);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  port = (server.address() as AddressInfo).port;
});
afterAll(() => new Promise<void>((r) => server.close(() => r())));

/** A raw GET (fetch would normalise the URL before sending it). */
function get(path: string, headers: Record<string, string> = {}) {
  return new Promise<{ status: number; headers: IncomingMessage['headers']; body: string }>(
    (resolve, reject) => {
      const r = request({ host: '127.0.0.1', port, path, headers }, (res) => {
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

describe('preview server hardening', () => {
  it('answers malformed percent-escapes with 400, no stack and no path', async () => {
    for (const path of ['/%', '/%E0%A4%A', '/data/%zz', '/data/tiles/%C0%AF', '/assets/%', '/index.html%']) {
      const r = await get(path);
      expect(r.status, path).toBe(400);
      expect(r.body).toBe('Bad request: the address holds a malformed percent-escape.\n');
      expect(r.headers['content-type']).toBe('text/plain; charset=utf-8');
    }
    // A bad escape in the query string is the app's business (it reads its own parameters).
    expect((await get('/?q=%zz')).status).toBe(200);
    expect(pathDecodes('/a%20b?x=%')).toBe(true);
  });

  it('routes /data/ only as a path prefix', async () => {
    const app = await get('/index.html?q=/data/manifest.json');
    expect(app.status).toBe(200);
    expect(app.body).toBe(APP);
    expect((await get('/x/data/manifest.json')).body).toBe(APP);
    const m = await get('/data/manifest.json');
    expect(m.body).toBe('{"ok":true}');
    expect(m.headers['content-type']).toBe('application/json');
  });

  it('keeps ranges, 404s and path escapes as they were', async () => {
    const r = await get('/data/tiles/t.bin', { Range: 'bytes=2-5' });
    expect(r.status).toBe(206);
    expect(r.headers['content-range']).toBe('bytes 2-5/10');
    expect(Buffer.from(r.body, 'latin1')).toEqual(Buffer.from([2, 3, 4, 5]));
    expect((await get('/data/tiles/none.bin')).status).toBe(404);
    for (const path of [
      '/data/../secret.txt',
      '/data/%2e%2e/secret.txt',
      '/data/..%2fsecret.txt',
      '/data/%2e%2e%2fsecret.txt',
    ]) {
      const e = await get(path);
      expect(e.status, path).toBe(403);
      expect(e.body).not.toContain('outside');
    }
    const nul = await get('/data/manifest.json%00.bin');
    expect(nul.status).toBe(403);
  });

  it('turns an error into a fixed 500 without stack or path (the log keeps the message)', async () => {
    const r = await get('/boom');
    expect(r.status).toBe(500);
    expect(r.body).toBe('Internal error.\n');
    expect(r.body).not.toContain(dir);
    expect(logged.at(-1)).toContain('ENOENT');
  });

  it('sends security headers on every answer', async () => {
    for (const path of ['/', '/data/manifest.json', '/data/none.bin']) {
      const r = await get(path);
      expect(r.headers['x-content-type-options'], path).toBe('nosniff');
      expect(r.headers['content-security-policy']).toBe(CONTENT_SECURITY_POLICY);
      expect(r.headers['referrer-policy']).toBe('no-referrer');
      expect(r.headers['x-frame-options']).toBe('DENY');
    }
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/unsafe-(inline|eval)/);
    expect(CONTENT_SECURITY_POLICY).toContain("frame-ancestors 'none'");
  });
});
