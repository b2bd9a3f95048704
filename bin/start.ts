/**
 * `npm start`: build the fictional demo region and its tiles if they are missing, build the web app,
 * serve it and print its URL. It lives in bin/ because it joins the pipeline and the web app, which
 * do not import each other. Environment: PILE_ATLAS_DATA (a pipeline build to serve instead of the
 * demo, default .cache/demo-tiles), PORT (default 5173; the next free port is used if taken).
 */
import { resolve } from 'node:path';
import { ensureDemoTiles } from '../data-pipeline/demo/ensure-demo-tiles';
import { buildWebApp, DEFAULT_DATA_DIR, DEFAULT_INPUTS_DIR, serveWebApp } from '../web/build/web-server';

const log = (line: string) => process.stderr.write(`${line}\n`);

async function main(): Promise<void> {
  const dataDir = process.env.PILE_ATLAS_DATA ? resolve(process.env.PILE_ATLAS_DATA) : DEFAULT_DATA_DIR;
  const port = process.env.PORT ? Number(process.env.PORT) : 5173;
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    throw new RangeError(`PORT must be an integer 0..65535, got ${process.env.PORT}`);
  }
  const t0 = Date.now();
  const built = await ensureDemoTiles({ dataDir, inputsDir: DEFAULT_INPUTS_DIR, log });
  if (built) log(`data ready in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  log('building the web app …');
  await buildWebApp(dataDir);
  const { url } = await serveWebApp({ dataDir, port });
  log(`serving data from ${dataDir}`);
  process.stdout.write(`Pile Atlas is running at ${url}\n`);
  log('press Ctrl+C to stop');
}

main().catch((e: unknown) => {
  log(`pile-atlas start: ${e instanceof Error ? e.message : String(e)}`);
  process.exit(1);
});
