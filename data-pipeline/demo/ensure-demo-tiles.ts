/**
 * Make sure a demo build exists (for `npm start` and the browser tests): generate the fictional demo
 * inputs into `inputsDir` and build their tiles into `dataDir` (with the per-cell ensemble) unless a
 * manifest is already there, for every scenario of the demo's scenario set (demo-scenarios.ts).
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
  /**
   * Run the per-cell ensemble too (default true): the demo map then shows P10/P50/P90, the probability
   * of success and the robust class (layers/screening/cell-ensemble-model.ts).
   */
  ensemble?: boolean;
}): Promise<boolean> {
  const { dataDir, inputsDir } = options;
  const log = options.log ?? (() => undefined);
  // Demo inputs written before the generator added its roads layer are stale: write them again.
  const staleInputs =
    existsSync(resolve(inputsDir, INPUTS_CONFIG_FILE)) && !existsSync(resolve(inputsDir, 'roads.geojson'));
  if (existsSync(resolve(dataDir, 'manifest.json')) && !staleInputs) return false;
  if (staleInputs || !existsSync(resolve(inputsDir, INPUTS_CONFIG_FILE))) {
    log(`generating the fictional demo region into ${inputsDir} …`);
    await generateDemoData({ outDir: inputsDir });
  }
  log(`building tiles into ${dataDir} …`);
  await buildTiles({
    inDir: inputsDir,
    outDir: dataDir,
    scenario: DEMO_SCENARIO_SET,
    ensemble: options.ensemble ?? true,
  });
  return true;
}
