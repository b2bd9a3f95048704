/** `pile-atlas shortlist`: filter a build's cells (or settlements) and write RFC 7946 GeoJSON. */
import { writeFile } from 'node:fs/promises';
import { isAbsolute, relative, resolve } from 'node:path';
import { InputError } from '../input-error';
import { shortlist } from '../shortlist/shortlist-cells';
import type { Command } from './command';
import { numberOption, parseOptions, requireOption } from './parse-options';

export const shortlistCommand: Command = {
  name: 'shortlist',
  summary: 'filter built tiles with a --where expression; GeoJSON of matching cells or settlements',
  help: `pile-atlas shortlist --tiles <dir> --where "<conditions>" [--near <settlement> --within <km>]
                   [--settlements] [--out <file>] [--limit N]

Reads a build (<dir>/manifest.json and <dir>/geotiff/*.tif) and writes the cells for which the
conditions hold as RFC 7946 GeoJSON (WGS 84 lon/lat): each cell a polygon with every band's value
(property names carry the unit: groundTemp_C, thawDelay_yr), class bands with their labels, and
the cautions, the expression, the scenario and the data provenance on the collection.
With --settlements, the settlements (points) whose cell matches.

Conditions:
  band op value       op: < <= > >= = == !=   value: a number, or a class label for class bands
  band                true when the band is non-zero
  not X, X and Y, X or Y, ( ... )            (not binds tightest, then and, then or)
  Band names are the manifest's band ids; a unit suffix may be added when it matches the band's
  unit (thawDelay_yr); "excluded" means exclusion != 0.
Examples:
  --where "thawDelay_yr >= 10 and pilesPerTon <= 3 and not excluded"
  --where "suitability = good or (suitability = fair and groundTemp < -3)"
  --where "textureClass = gravel and bedrockDepth_m > 12"

Options:
  --tiles <dir>      output directory of pile-atlas build
  --where "<expr>"   the conditions (quote them)
  --near <name>      keep only places within --within km of this settlement (great-circle distance
                     from the cell centre; the name as in the settlements layer, any letter case)
  --within <km>      the radius for --near, km (0.1 to 5000)
  --settlements      filter settlements instead of cells
  --out <file>       write the GeoJSON here instead of stdout
  --limit N          at most N features (default 10000; the collection reports how many matched)
  --help             this text

Screening estimate, not a design.`,
  async run(argv) {
    const opts = parseOptions('shortlist', argv, {
      values: ['tiles', 'where', 'out', 'limit', 'near', 'within'],
      flags: ['settlements'],
    });
    const tilesDir = requireOption('shortlist', opts, 'tiles');
    const near = opts.values.near;
    if (near !== undefined && opts.values.within === undefined)
      throw new InputError('--near: give the radius too, as --within <km>');
    if (near === undefined && opts.values.within !== undefined)
      throw new InputError('--within: give the settlement too, as --near <name>');
    const where = near === undefined ? requireOption('shortlist', opts, 'where') : opts.values.where;
    const within_km =
      near === undefined ? undefined : numberOption('shortlist', opts, 'within', 0, 0.1, 5000);
    const limit = numberOption('shortlist', opts, 'limit', 10_000, 1, 10_000_000, true);
    const out = opts.values.out;
    const rel = out === undefined ? '..' : relative(resolve(tilesDir), resolve(out));
    if (rel === '' || (!rel.startsWith('..') && !isAbsolute(rel))) {
      throw new InputError(`--out ${out}: lies inside the build (--tiles ${tilesDir}); write it elsewhere`);
    }
    const collection = await shortlist({
      tilesDir,
      where,
      settlements: opts.flags.has('settlements'),
      limit,
      near,
      within_km,
    });
    const text = JSON.stringify(collection) + '\n';
    const summary = collection as unknown as { matched: number; returned: number };
    if (opts.values.out) {
      await writeFile(opts.values.out, text);
      process.stdout.write(
        JSON.stringify({ out: opts.values.out, matched: summary.matched, returned: summary.returned }) + '\n',
      );
    } else {
      process.stdout.write(text);
    }
    process.stderr.write(`shortlist: ${summary.matched} matched, ${summary.returned} written\n`);
    return 0;
  },
};
