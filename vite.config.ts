/**
 * Vite config for the web app (root `web/`, output `dist/web`). The build output of the data pipeline
 * (manifest.json, tiles/, settlements.geojson, land.geojson) is served at `/data/` in both dev and
 * preview from the directory in env PILE_ATLAS_DATA (default `.cache/demo-tiles`).
 */
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { serveDataDir } from './web/build/serve-data-dir.ts';
import { serveBuiltAssets } from './web/build/serve-built-assets.ts';
import { previewHardening } from './web/build/preview-hardening.ts';

const here = fileURLToPath(new URL('.', import.meta.url));
const outDir = resolve(here, 'dist/web');

export default defineConfig({
  root: resolve(here, 'web'),
  base: './',
  plugins: [
    previewHardening(),
    react(),
    serveDataDir(resolve(here, process.env.PILE_ATLAS_DATA ?? '.cache/demo-tiles')),
    serveBuiltAssets(outDir),
  ],
  build: {
    outDir,
    emptyOutDir: true,
    chunkSizeWarningLimit: 4000,
  },
  logLevel: 'warn',
});
