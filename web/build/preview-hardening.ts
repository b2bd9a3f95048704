/**
 * Hardening of the local preview server (`npm start`, the browser tests), issue 21 item 3:
 * - a request whose path holds a malformed percent-escape (RFC 3986 section 2.1: "%" must be followed
 *   by two hex digits, and the decoded bytes must be UTF-8 here) gets 400 with a short plain-text body,
 *   before any other middleware could throw on it;
 * - any error another middleware passes on becomes a 500 with a fixed body: no stack, no file path;
 * - every response carries security headers for a local single-page app: a Content-Security-Policy
 *   that allows only this origin (plus data: images for the icon, and blob: workers, which MapLibre
 *   may use), `X-Content-Type-Options: nosniff`, `Referrer-Policy: no-referrer`, no framing.
 * The dev server (`npx vite`) gets the URL guard and the error handler but not the CSP: Vite's hot
 * reload injects inline scripts.
 */
import type { Connect, Plugin } from 'vite';

/** The policy the built app passes (checked in Chromium by tests/browser/preview-server.test.ts). */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data: blob:",
  "connect-src 'self'",
  "worker-src 'self' blob:",
  "font-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

export const SECURITY_HEADERS: Record<string, string> = {
  'Content-Security-Policy': CONTENT_SECURITY_POLICY,
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'no-referrer',
  'X-Frame-Options': 'DENY',
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Permissions-Policy': 'camera=(), microphone=(), geolocation=()',
};

/** The path part of a request URL (before `?` or `#`). */
export function requestPath(url: string): string {
  const q = url.search(/[?#]/);
  return q < 0 ? url : url.slice(0, q);
}

/** Whether the URL's path decodes (every % escape well formed and the bytes valid UTF-8). */
export function pathDecodes(url: string): boolean {
  try {
    decodeURIComponent(requestPath(url));
    return true;
  } catch {
    return false;
  }
}

function plain(res: Parameters<Connect.NextHandleFunction>[1], status: number, body: string): void {
  res.statusCode = status;
  res.setHeader('Content-Type', 'text/plain; charset=utf-8');
  res.setHeader('Content-Length', String(Buffer.byteLength(body)));
  res.setHeader('Cache-Control', 'no-store');
  res.end(body);
}

/** 400 for a malformed path (before anything else decodes it). */
export function malformedUrlGuard(): Connect.NextHandleFunction {
  return (req, res, next) => {
    if (pathDecodes(req.url ?? '/')) return next();
    plain(res, 400, 'Bad request: the address holds a malformed percent-escape.\n');
  };
}

/** Security headers on every response. */
export function securityHeaders(
  headers: Record<string, string> = SECURITY_HEADERS,
): Connect.NextHandleFunction {
  return (_req, res, next) => {
    for (const [k, v] of Object.entries(headers)) res.setHeader(k, v);
    next();
  };
}

/** Last in the chain: an error becomes a fixed 500 (the real error goes to the server's log only). */
export function opaqueErrors(
  log: (line: string) => void = (l) => process.stderr.write(`${l}\n`),
): Connect.ErrorHandleFunction {
  return (err, _req, res, _next) => {
    log(`preview server: ${err instanceof Error ? err.message : String(err)}`);
    if (res.headersSent) {
      res.destroy();
      return;
    }
    plain(res, 500, 'Internal error.\n');
  };
}

/** The plugin (list it first in vite.config.ts so its guard runs before every other middleware). */
export function previewHardening(): Plugin {
  return {
    name: 'pile-atlas-preview-hardening',
    configureServer(server) {
      server.middlewares.use(malformedUrlGuard());
      return () => server.middlewares.use(opaqueErrors());
    },
    configurePreviewServer(server) {
      server.middlewares.use(malformedUrlGuard());
      server.middlewares.use(securityHeaders());
      return () => server.middlewares.use(opaqueErrors());
    },
  };
}
