/**
 * Path traversal against the preview server's /data/ route (issue 16 item 7): raw requests with
 * `..`, encoded `..`, encoded slashes, absolute paths and backslashes never serve a file outside the
 * data directory, whatever the status (403 or 404; 400 once malformed URLs are refused). A file
 * beside the data directory holds a marker that must never appear in a response.
 */
import { createServer, request, type Server } from 'node:http';
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dataDirMiddleware } from '../../web/build/serve-data-dir';

const SECRET = 'SECRET-MARKER-outside-the-data-directory';
let base: string;
let server: Server;
let port: number;

beforeAll(async () => {
  base = await mkdtemp(join(tmpdir(), 'pile-atlas-traversal-'));
  await mkdir(join(base, 'data', 'tiles'), { recursive: true });
  await writeFile(join(base, 'data', 'manifest.json'), '{"ok":true}');
  await writeFile(join(base, 'secret.txt'), SECRET);
  await writeFile(join(base, 'data-secret.txt'), SECRET);
  const middleware = dataDirMiddleware(join(base, 'data'));
  server = createServer((req, res) =>
    middleware(req as never, res as never, () => {
      res.statusCode = 404;
      res.end('next');
    }),
  );
  await new Promise<void>((done) => server.listen(0, '127.0.0.1', done));
  port = (server.address() as { port: number }).port;
});

afterAll(async () => {
  await new Promise((done) => server.close(done));
  await rm(base, { recursive: true, force: true });
});

/** GET `path` exactly as written (no client-side normalisation). */
function get(path: string): Promise<{ status: number; body: string }> {
  return new Promise((done, fail) => {
    const req = request({ host: '127.0.0.1', port, path, method: 'GET' }, (res) => {
      let body = '';
      res.on('data', (c: Buffer) => (body += c.toString()));
      res.on('end', () => done({ status: res.statusCode ?? 0, body }));
    });
    req.on('error', fail);
    req.end();
  });
}

describe('the /data/ route serves nothing outside the data directory', () => {
  it('serves a file inside (the control case)', async () => {
    const r = await get('/data/manifest.json');
    expect(r.status).toBe(200);
    expect(r.body).toBe('{"ok":true}');
  });

  const attacks = [
    '/data/../secret.txt',
    '/data/../../secret.txt',
    '/data/tiles/../../secret.txt',
    '/data/%2e%2e/secret.txt',
    '/data/%2e%2e%2fsecret.txt',
    '/data/..%2fsecret.txt',
    '/data/%2E%2E%2F%2E%2E%2Fsecret.txt',
    '/data/tiles/%2e%2e/%2e%2e/secret.txt',
    `/data/${encodeURIComponent(join('..', 'secret.txt'))}`,
    '/data//etc/passwd',
    '/data/%2fetc%2fpasswd',
    `/data/${encodeURIComponent('/etc/passwd')}`,
    '/data/..\\secret.txt',
    '/data/%5c..%5csecret.txt',
    '/data/../data-secret.txt',
    '/data/%2e%2e/data-secret.txt',
    '/data/./../secret.txt',
    '/data/.%2e/secret.txt',
  ];
  for (const path of attacks) {
    it(`refuses ${path}`, async () => {
      const r = await get(path);
      expect([400, 403, 404]).toContain(r.status);
      expect(r.body).not.toContain(SECRET);
      expect(r.body).not.toMatch(/root:|\/bin\/(ba)?sh/);
    });
  }
});
