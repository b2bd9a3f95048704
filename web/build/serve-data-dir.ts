/**
 * A small Vite plugin serving a pipeline build directory at `/data/` in dev and preview. Only a path
 * that starts with `/data/` is routed here (a `/data/` in the query string or deeper in the path is
 * not); only files inside the directory are served (no path escapes: 403); a missing file is a plain
 * 404 (a missing tile means all-nodata, so the app treats 404 on a tile as empty); a malformed
 * percent-escape is a 400. No answer carries a stack or a file path.
 */
import type { Connect, Plugin } from 'vite';
import { createReadStream, statSync, type ReadStream } from 'node:fs';
import type { ServerResponse } from 'node:http';
import { extname, resolve, sep } from 'node:path';
import { requestPath } from './preview-hardening.ts';

const PREFIX = '/data/';

const CONTENT_TYPES: Record<string, string> = {
  '.json': 'application/json',
  '.geojson': 'application/geo+json',
  '.bin': 'application/octet-stream',
};

/** Connect middleware serving `dir` under the `/data/` prefix of the request URL. */
export function dataDirMiddleware(dir: string): Connect.NextHandleFunction {
  const root = resolve(dir);
  return (req, res, next) => {
    const path = requestPath(req.url ?? '');
    if (!path.startsWith(PREFIX)) return next();
    let rel: string;
    try {
      rel = decodeURIComponent(path.slice(PREFIX.length));
    } catch {
      res.statusCode = 400;
      res.end('bad request');
      return;
    }
    const file = rel.includes('\0') ? '' : resolve(root, rel);
    if (file === '' || (file !== root && !file.startsWith(root + sep))) {
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
      send(createReadStream(file, { start, end }), res);
      return;
    }
    res.setHeader('Content-Length', String(size));
    send(createReadStream(file), res);
  };
}

/** Pipe a file to the response; a read error ends the response instead of crashing the server. */
function send(stream: ReadStream, res: ServerResponse): void {
  stream.on('error', () => res.destroy());
  stream.pipe(res);
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
