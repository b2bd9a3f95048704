/** `pile-atlas build`: screen a region and write the tile pyramid and manifest. */
import { buildTiles } from '../build/build-tiles';
import { INPUTS_CONFIG_FILE } from '../inputs-config';
import { createProgressBar } from '../progress-bar';
import type { Command } from './command';
import { numberOption, parseOptions, requireOption } from './parse-options';

export const buildCommand: Command = {
  name: 'build',
  summary: 'screen every cell of a region and write tiles + manifest.json',
  help: `pile-atlas build --in <dir> --out <dir> [--cell-size M] [--quiet]

Reads <in>/${INPUTS_CONFIG_FILE} and the GeoTIFF grids it lists (any supported CRS, any resolution),
checks them (file, georeferencing, CRS, nodata, units and plausible ranges), resamples them onto one
analysis grid in EPSG:3413 (nearest for classes, bilinear for continuous values), screens every cell
and writes <out>/tiles/{z}/{x}/{y}.bin, <out>/manifest.json and copies of the settlements and land
GeoJSON. The output is replaced atomically: if anything fails, a previous <out> stays as it was.

Options:
  --in <dir>        inputs directory (holding ${INPUTS_CONFIG_FILE})
  --out <dir>       output directory
  --cell-size M     analysis cell size in metres (default 1000)
  --quiet           no progress bar
  --help            this text

Prints a JSON summary on stdout; progress and ETA on stderr.`,
  async run(argv) {
    const opts = parseOptions('build', argv, { values: ['in', 'out', 'cell-size'], flags: ['quiet'] });
    const inDir = requireOption('build', opts, 'in');
    const outDir = requireOption('build', opts, 'out');
    const cellSize_m = numberOption('build', opts, 'cell-size', 1000, 50, 50_000);
    const summary = await buildTiles({
      inDir,
      outDir,
      cellSize_m,
      onProgress: opts.flags.has('quiet') ? undefined : createProgressBar(),
    });
    process.stderr.write(
      `screened ${summary.cellsScreened} cells of ${summary.cellsTotal} in ${summary.seconds.toFixed(1)} s; ` +
        `${summary.tiles} tiles (zoom ${summary.minZoom}-${summary.maxZoom})\n`,
    );
    process.stdout.write(JSON.stringify(summary, null, 2) + '\n');
    return 0;
  },
};
