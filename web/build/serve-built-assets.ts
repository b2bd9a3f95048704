/**
 * `vite preview` serves the app's hashed build assets (`/assets/*`) through this middleware instead of
 * Vite's own, for two reasons that matter for the first map paint:
 * - Vite's preview gzips every response on the fly. For the 2.4 MB main bundle that costs ~150 ms of
 *   server CPU on each page load, on the same machine as the browser, and saves nothing over the
 *   loopback interface. Here a loopback client gets the file as it is; a client over the network gets
 *   gzip, compressed once per file and kept in memory.
 * - The file names carry a content hash, so they are cached by the browser for a year (immutable).
 * Anything else (index.html, other paths) falls through to Vite.
 */
import type { Connect, Plugin } from 'vite';
import { readFileSync, statSync } from 'node:fs';
import { extname, resolve, sep } from 'node:path';
import { gzipSync } from 'node:zlib';

const CONTENT_TYPES: Record<string, string> = {
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json',
  '.wasm': 'application/wasm',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
};

const LOOPBACK = new Set(['127.0.0.1', '::1', '::ffff:127.0.0.1']);

/** Whether a gzip body is worth sending: not to a loopback client, and only if it accepts gzip. */
export function wantsGzip(remoteAddress: string | undefined, acceptEncoding: string | undefined): boolean {
  if (remoteAddress && LOOPBACK.has(remoteAddress)) return false;
  return /\bgzip\b/.test(acceptEncoding ?? '');
}

/** Connect middleware serving `<outDir>/assets/*` at any URL ending in `/assets/<file>`. */
export function builtAssetsMiddleware(outDir: string): Connect.NextHandleFunction {
  const root = resolve(outDir, 'assets');
  const gzipped = new Map<string, { mtimeMs: number; body: Buffer }>();
  return (req, res, next) => {
    if (req.method !== 'GET' && req.method !== 'HEAD') return next();
    const path = (req.url ?? '').split('?')[0];
    const at = path.lastIndexOf('/assets/');
    if (at < 0) return next();
    let name: string;
    try {
      name = decodeURIComponent(path.slice(at + '/assets/'.length));
    } catch {
      return next();
    }
    const file = resolve(root, name);
    if (!file.startsWith(root + sep)) return next();
    let mtimeMs: number;
    try {
      const st = statSync(file);
      if (!st.isFile()) return next();
      mtimeMs = st.mtimeMs;
    } catch {
      return next();
    }
    const type = CONTENT_TYPES[extname(file)];
    if (!type) return next();
    let body: Buffer = readFileSync(file);
    res.setHeader('Content-Type', type);
    res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
    res.setHeader('Vary', 'Accept-Encoding');
    if (wantsGzip(req.socket.remoteAddress, req.headers['accept-encoding'])) {
      let cached = gzipped.get(file);
      if (!cached || cached.mtimeMs !== mtimeMs) {
        cached = { mtimeMs, body: gzipSync(body) };
        gzipped.set(file, cached);
      }
      body = cached.body;
      res.setHeader('Content-Encoding', 'gzip');
    }
    res.setHeader('Content-Length', String(body.length));
    res.statusCode = 200;
    res.end(req.method === 'HEAD' ? undefined : body);
  };
}

/** The plugin: preview only (the dev server serves sources, not built assets). */
export function serveBuiltAssets(outDir: string): Plugin {
  return {
    name: 'pile-atlas-serve-built-assets',
    configurePreviewServer(server) {
      server.middlewares.use(builtAssetsMiddleware(outDir));
    },
  };
}
