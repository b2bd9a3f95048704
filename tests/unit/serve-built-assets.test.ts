/**
 * The preview server's asset middleware (web/build/serve-built-assets.ts): loopback clients get the
 * built file as it is, network clients gzip (decompressing to the same bytes), hashed assets are
 * cached as immutable, and nothing outside the assets folder is served.
 */
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { builtAssetsMiddleware, wantsGzip } from '../../web/build/serve-built-assets';

interface Served {
  passed: boolean;
  status: number;
  headers: Record<string, string>;
  body: Buffer | undefined;
}

function serve(
  outDir: string,
  url: string,
  remoteAddress: string,
  acceptEncoding = 'gzip, deflate, br',
): Served {
  const out: Served = { passed: false, status: 0, headers: {}, body: undefined };
  const req = {
    method: 'GET',
    url,
    headers: { 'accept-encoding': acceptEncoding },
    socket: { remoteAddress },
  };
  const res = {
    statusCode: 0,
    setHeader(k: string, v: string) {
      out.headers[k.toLowerCase()] = v;
    },
    end(b?: Buffer) {
      out.status = this.statusCode;
      out.body = b;
    },
  };
  builtAssetsMiddleware(outDir)(req as never, res as never, () => {
    out.passed = true;
  });
  return out;
}

const outDir = mkdtempSync(join(tmpdir(), 'pile-atlas-assets-'));
mkdirSync(join(outDir, 'assets'));
const script = Buffer.from('export const answer = 42;\n'.repeat(200));
writeFileSync(join(outDir, 'assets', 'index-abc123.js'), script);
writeFileSync(join(outDir, 'secret.txt'), 'not an asset');

describe('built-asset middleware', () => {
  it('sends the file uncompressed to a loopback client, cached as immutable', () => {
    for (const addr of ['127.0.0.1', '::1', '::ffff:127.0.0.1']) {
      const r = serve(outDir, '/assets/index-abc123.js', addr);
      expect(r.passed).toBe(false);
      expect(r.status).toBe(200);
      expect(r.headers['content-encoding']).toBeUndefined();
      expect(r.headers['content-type']).toMatch(/^text\/javascript/);
      expect(r.headers['cache-control']).toContain('immutable');
      expect(r.body?.equals(script)).toBe(true);
    }
  });

  it('gzips for a client over the network, to the same bytes', () => {
    const r = serve(outDir, '/some/base/assets/index-abc123.js?v=1', '192.0.2.7');
    expect(r.headers['content-encoding']).toBe('gzip');
    expect(r.body && r.body.length).toBeLessThan(script.length);
    expect(gunzipSync(r.body as Buffer).equals(script)).toBe(true);
    expect(Number(r.headers['content-length'])).toBe(r.body?.length);
    expect(
      serve(outDir, '/assets/index-abc123.js', '192.0.2.7', 'identity').headers['content-encoding'],
    ).toBe(undefined);
  });

  it('passes on anything that is not a built asset (and never escapes the folder)', () => {
    expect(serve(outDir, '/index.html', '127.0.0.1').passed).toBe(true);
    expect(serve(outDir, '/assets/missing.js', '127.0.0.1').passed).toBe(true);
    expect(serve(outDir, '/assets/..%2Fsecret.txt', '127.0.0.1').passed).toBe(true);
    expect(serve(outDir, '/assets/../secret.txt', '127.0.0.1').passed).toBe(true);
  });

  it('decides on compression by client address and Accept-Encoding', () => {
    expect(wantsGzip('127.0.0.1', 'gzip')).toBe(false);
    expect(wantsGzip('10.1.2.3', 'gzip, br')).toBe(true);
    expect(wantsGzip('10.1.2.3', 'br')).toBe(false);
    expect(wantsGzip(undefined, undefined)).toBe(false);
  });
});
