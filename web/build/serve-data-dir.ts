/**
 * A small Vite plugin serving a pipeline build directory at `/data/` in dev and preview. Only files
 * inside the directory are served (no path escapes); a missing file is a plain 404 (a missing tile
 * means all-nodata, so the app treats 404 on a tile as empty).
 */
import type { Connect, Plugin } from 'vite';
import { createReadStream, statSync } from 'node:fs';
import { extname, resolve, sep } from 'node:path';

const CONTENT_TYPES: Record<string, string> = {
  '.json': 'application/json',
  '.geojson': 'application/geo+json',
  '.bin': 'application/octet-stream',
};

/** Connect middleware serving `dir` under the `/data/` prefix of the request URL. */
export function dataDirMiddleware(dir: string): Connect.NextHandleFunction {
  const root = resolve(dir);
  return (req, res, next) => {
    const url = req.url ?? '';
    const at = url.indexOf('/data/');
    if (at < 0) return next();
    const rel = decodeURIComponent(url.slice(at + '/data/'.length).split('?')[0]);
    const file = resolve(root, rel);
    if (file !== root && !file.startsWith(root + sep)) {
      res.statusCode = 403;
      res.end('forbidden');
      return;
    }
    let size = -1;
    try {
      const st = statSync(file);
      if (st.isFile()) size = st.size;
    } catch {
      size = -1;
    }
    if (size < 0) {
      res.statusCode = 404;
      res.end('not found');
      return;
    }
    res.setHeader('Content-Type', CONTENT_TYPES[extname(file)] ?? 'application/octet-stream');
    res.setHeader('Cache-Control', 'no-cache');
    res.setHeader('Accept-Ranges', 'bytes');
    // One byte range (RFC 9110 section 14): the map reads single bands of a tile this way.
    const range = /^bytes=(\d+)-(\d+)$/.exec(req.headers.range ?? '');
    if (range) {
      const start = Number(range[1]);
      const end = Math.min(Number(range[2]), size - 1);
      if (start > end) {
        res.statusCode = 416;
        res.setHeader('Content-Range', `bytes */${size}`);
        res.end();
        return;
      }
      res.statusCode = 206;
      res.setHeader('Content-Range', `bytes ${start}-${end}/${size}`);
      res.setHeader('Content-Length', String(end - start + 1));
      createReadStream(file, { start, end }).pipe(res);
      return;
    }
    res.setHeader('Content-Length', String(size));
    createReadStream(file).pipe(res);
  };
}

/** The plugin: same middleware for `vite` (dev) and `vite preview`. */
export function serveDataDir(dir: string): Plugin {
  return {
    name: 'pile-atlas-serve-data',
    configureServer(server) {
      server.middlewares.use(dataDirMiddleware(dir));
    },
    configurePreviewServer(server) {
      server.middlewares.use(dataDirMiddleware(dir));
    },
  };
}
