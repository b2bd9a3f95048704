/**
 * Node-side helpers shared by `npm start` and the browser tests: build the web app once with Vite and
 * serve it (Vite preview, data at /data/). Making the data build is the pipeline's part
 * (data-pipeline/demo/ensure-demo-tiles.ts): web/ does not import the pipeline.
 */
import { existsSync, readdirSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build, preview, type PreviewServer } from 'vite';

export const REPO_ROOT = resolve(fileURLToPath(new URL('.', import.meta.url)), '../..');
export const DEFAULT_DATA_DIR = resolve(REPO_ROOT, '.cache/demo-tiles');
export const DEFAULT_INPUTS_DIR = resolve(REPO_ROOT, '.cache/demo-data');
export const WEB_OUT_DIR = resolve(REPO_ROOT, 'dist/web');

/** Build the web app (production bundle) with the data directory baked into the preview plugin. */
export async function buildWebApp(dataDir: string): Promise<void> {
  process.env.PILE_ATLAS_DATA = dataDir;
  await build({ configFile: resolve(REPO_ROOT, 'vite.config.ts'), logLevel: 'warn' });
}

/** Newest modification time (ms) of the files under the given paths (recursive). */
function newestMtime(paths: string[]): number {
  let newest = 0;
  const walk = (p: string) => {
    if (!existsSync(p)) return;
    const st = statSync(p);
    if (st.isDirectory()) {
      for (const name of readdirSync(p)) if (name !== 'node_modules') walk(resolve(p, name));
    } else newest = Math.max(newest, st.mtimeMs);
  };
  paths.forEach(walk);
  return newest;
}

/**
 * Build the web app unless dist/web is newer than every source it is built from (web/, layers/,
 * vite.config.ts, package.json). Lets several test files share one build. Returns whether it built.
 */
export async function buildWebAppIfStale(dataDir: string): Promise<boolean> {
  const index = resolve(WEB_OUT_DIR, 'index.html');
  const sources = ['web', 'layers', 'vite.config.ts', 'package.json'].map((p) => resolve(REPO_ROOT, p));
  if (existsSync(index) && statSync(index).mtimeMs > newestMtime(sources)) return false;
  await buildWebApp(dataDir);
  return true;
}

/** Serve the built app (port 0 = any free port); returns the server and its URL. */
export async function serveWebApp(options: {
  dataDir: string;
  port?: number;
  host?: string;
}): Promise<{ server: PreviewServer; url: string }> {
  process.env.PILE_ATLAS_DATA = options.dataDir;
  const server = await preview({
    configFile: resolve(REPO_ROOT, 'vite.config.ts'),
    preview: { port: options.port ?? 0, host: options.host ?? '127.0.0.1', strictPort: false, open: false },
    logLevel: 'warn',
  });
  const url = server.resolvedUrls?.local[0];
  if (!url) throw new Error('vite preview started without a local URL');
  return { server, url };
}
