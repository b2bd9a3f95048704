/**
 * One shared setup for the browser tests: the data build (real pipeline, demo region), one Vite
 * build, one preview server and one Chromium (software WebGL2, no network) for all tests.
 * Artifacts (screenshots, exports) go to PILE_ATLAS_ARTIFACTS or <tmp>/pile-atlas-artifacts.
 */
import { mkdirSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import type { PreviewServer } from 'vite';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import { ensureDemoTiles } from '../../data-pipeline/demo/ensure-demo-tiles';
import {
  buildWebAppIfStale,
  DEFAULT_DATA_DIR,
  DEFAULT_INPUTS_DIR,
  serveWebApp,
} from '../../web/build/web-server';

const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--use-angle=swiftshader',
  '--enable-unsafe-swiftshader',
];

export interface BrowserSession {
  url: string;
  manifest: Manifest;
  dataDir: string;
  artifactsDir: string;
  profileDir: string;
  context: BrowserContext;
  page: Page;
  /** Errors thrown in the page (uncaught) since the session started. */
  pageErrors: string[];
  /** Close the browser and open it again on the same profile (a browser restart). */
  restartBrowser(): Promise<void>;
  close(): Promise<void>;
}

async function launch(profileDir: string): Promise<BrowserContext> {
  return chromium.launchPersistentContext(profileDir, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 720 },
    acceptDownloads: true,
    args: CHROMIUM_ARGS,
  });
}

/** A second browser on a new, empty profile (no stored shortlist, no history): for shared links. */
export async function launchFreshProfile(): Promise<{ context: BrowserContext; close(): Promise<void> }> {
  const dir = mkdtempSync(join(tmpdir(), 'pile-atlas-fresh-profile-'));
  const context = await launch(dir);
  return { context, close: () => context.close() };
}

export async function startSession(): Promise<BrowserSession> {
  const dataDir = process.env.PILE_ATLAS_DATA ? resolve(process.env.PILE_ATLAS_DATA) : DEFAULT_DATA_DIR;
  await ensureDemoTiles({ dataDir, inputsDir: DEFAULT_INPUTS_DIR });
  const manifest = manifestSchema.parse(JSON.parse(readFileSync(join(dataDir, 'manifest.json'), 'utf8')));
  await buildWebAppIfStale(dataDir);
  const { server, url } = await serveWebApp({ dataDir, port: 0 });
  const artifactsDir = process.env.PILE_ATLAS_ARTIFACTS ?? join(tmpdir(), 'pile-atlas-artifacts');
  mkdirSync(artifactsDir, { recursive: true });
  const profileDir = mkdtempSync(join(tmpdir(), 'pile-atlas-profile-'));
  const pageErrors: string[] = [];
  const session: BrowserSession = {
    url,
    manifest,
    dataDir,
    artifactsDir,
    profileDir,
    pageErrors,
    context: await launch(profileDir),
    page: undefined as unknown as Page,
    async restartBrowser() {
      await session.context.close();
      session.context = await launch(profileDir);
      session.page = await newPage(session.context, pageErrors);
    },
    async close() {
      await session.context.close();
      await closeServer(server);
    },
  };
  session.page = await newPage(session.context, pageErrors);
  return session;
}

async function newPage(context: BrowserContext, pageErrors: string[]): Promise<Page> {
  const page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => pageErrors.push(e.message));
  return page;
}

async function closeServer(server: PreviewServer): Promise<void> {
  await server.close();
}

interface ScreenshotJob {
  /** Colours to leave out of the count, and the tolerance per channel. */
  backgrounds: [number, number, number][];
  tolerance: number;
  /** Points (element pixels from the top left) whose colours to return. */
  points: { x: number; y: number }[];
}

interface ScreenshotFindings {
  total: number;
  foreground: number;
  distinct: number;
  colours: [number, number, number][];
}

/** Screenshot an element and read its pixels in the page itself (no image library needed). */
async function readScreenshot(page: Page, selector: string, job: ScreenshotJob): Promise<ScreenshotFindings> {
  const png = await page.locator(selector).screenshot();
  return page.evaluate(
    async ({ b64, job }) => {
      const img = new Image();
      img.src = `data:image/png;base64,${b64}`;
      await img.decode();
      const c = document.createElement('canvas');
      c.width = img.width;
      c.height = img.height;
      const ctx = c.getContext('2d');
      if (!ctx) throw new Error('no 2d context');
      ctx.drawImage(img, 0, 0);
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      let foreground = 0;
      const distinct = new Set<number>();
      for (let i = 0; i < d.length; i += 4) {
        const isBg = job.backgrounds.some(
          (bg) =>
            Math.abs(d[i] - bg[0]) <= job.tolerance &&
            Math.abs(d[i + 1] - bg[1]) <= job.tolerance &&
            Math.abs(d[i + 2] - bg[2]) <= job.tolerance,
        );
        if (!isBg) {
          foreground++;
          distinct.add((d[i] << 16) | (d[i + 1] << 8) | d[i + 2]);
        }
      }
      const colours = job.points.map(({ x, y }) => {
        const k = (Math.round(y) * c.width + Math.round(x)) * 4;
        return [d[k], d[k + 1], d[k + 2]] as [number, number, number];
      });
      return { total: d.length / 4, foreground, distinct: distinct.size, colours };
    },
    { b64: png.toString('base64'), job },
  );
}

/**
 * Count the pixels of an element's screenshot that are neither of the given background colours
 * (within a tolerance per channel).
 */
export async function countForegroundPixels(
  page: Page,
  selector: string,
  backgrounds: [number, number, number][],
  tolerance = 6,
): Promise<{ total: number; foreground: number; distinct: number }> {
  const { total, foreground, distinct } = await readScreenshot(page, selector, {
    backgrounds,
    tolerance,
    points: [],
  });
  return { total, foreground, distinct };
}

/** The RGB colour of an element's screenshot at points given relative to the element's top left. */
export async function pixelsAt(
  page: Page,
  selector: string,
  points: { x: number; y: number }[],
): Promise<[number, number, number][]> {
  return (await readScreenshot(page, selector, { backgrounds: [], tolerance: 0, points })).colours;
}

/** Hex colour '#rrggbb' -> [r, g, b]. */
export function hexRgb(hex: string): [number, number, number] {
  const v = parseInt(hex.slice(1), 16);
  return [(v >> 16) & 255, (v >> 8) & 255, v & 255];
}
