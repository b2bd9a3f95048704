/**
 * Make sure a demo build exists (for `npm start` and the browser tests): generate the fictional demo
 * inputs into `inputsDir` and build their tiles into `dataDir` unless a manifest is already there, for
 * every scenario of the demo's scenario set (demo-scenarios.ts).
 */
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { buildTiles } from '../build/build-tiles';
import { INPUTS_CONFIG_FILE } from '../inputs-config';
import { generateDemoData } from './generate-demo-data';
import { DEMO_SCENARIO_SET } from './demo-scenarios';

/** Returns whether anything was built. */
export async function ensureDemoTiles(options: {
  dataDir: string;
  inputsDir: string;
  log?: (line: string) => void;
}): Promise<boolean> {
  const { dataDir, inputsDir } = options;
  const log = options.log ?? (() => undefined);
  if (existsSync(resolve(dataDir, 'manifest.json'))) return false;
  if (!existsSync(resolve(inputsDir, INPUTS_CONFIG_FILE))) {
    log(`generating the fictional demo region into ${inputsDir} …`);
    await generateDemoData({ outDir: inputsDir });
  }
  log(`building tiles into ${dataDir} …`);
  await buildTiles({ inDir: inputsDir, outDir: dataDir, scenario: DEMO_SCENARIO_SET });
  return true;
}
