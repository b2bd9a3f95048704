/** `pile-atlas demo-data`: write the invented demo region's input grids and files. */
import { DEMO_SEED, generateDemoData } from '../demo/generate-demo-data';
import type { Command } from './command';
import { numberOption, parseOptions, requireOption } from './parse-options';
import { readdirSync, statSync } from 'node:fs';
import { InputError } from '../input-error';
import { INPUTS_CONFIG_FILE } from '../inputs-config';

export const demoDataCommand: Command = {
  name: 'demo-data',
  summary: 'write the invented demo region (GeoTIFF grids, GeoJSON, inputs config)',
  help: `pile-atlas demo-data --out <dir> [--seed N] [--resolution-scale F]

Writes an invented landmass ("Skerrowmark", over open ocean in the Greenland Sea near 75 N, 3 W;
no real place) as the inputs a build needs: GeoTIFF grids in EPSG:4326, EPSG:3413 and EPSG:3995
(mean annual air temperature, annual amplitude, warming rate, soil texture class, water + ice
content, depth to bedrock; nodata over the sea), settlements.geojson, land.geojson,
pile-atlas-inputs.json and a provenance README. Deterministic: the same seed gives the same bytes.

Options:
  --out <dir>               output directory (created if needed)
  --seed N                  integer seed (default ${DEMO_SEED})
  --resolution-scale F      pixel-size multiplier, 0.25..64 (default 1; 4 = coarser, faster)
  --help                    this text

Prints a JSON summary on stdout.`,
  async run(argv) {
    const opts = parseOptions('demo-data', argv, { values: ['out', 'seed', 'resolution-scale'] });
    const outDir = requireOption('demo-data', opts, 'out');
    const seed = numberOption('demo-data', opts, 'seed', DEMO_SEED, 0, 2 ** 32 - 1, true);
    const resolutionScale = numberOption('demo-data', opts, 'resolution-scale', 1, 0.25, 64);
    refuseToOverwrite(outDir);
    const started = Date.now();
    await generateDemoData({ outDir, seed, resolutionScale });
    process.stdout.write(
      JSON.stringify({
        outDir,
        seed,
        resolutionScale,
        fictional: true,
        seconds: (Date.now() - started) / 1000,
      }) + '\n',
    );
    return 0;
  },
};

/** demo-data writes into --out: refuse a file, or a non-empty directory that is not a demo region. */
function refuseToOverwrite(outDir: string): void {
  let st;
  try {
    st = statSync(outDir);
  } catch {
    return;
  }
  if (!st.isDirectory()) throw new InputError(`--out ${outDir}: names an existing file, not a directory`);
  const names = readdirSync(outDir);
  if (names.length > 0 && !names.includes(INPUTS_CONFIG_FILE)) {
    throw new InputError(
      `--out ${outDir}: an existing non-empty directory that is not an inputs directory (no ${INPUTS_CONFIG_FILE}); refusing to write into it`,
    );
  }
}
