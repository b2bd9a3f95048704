/**
 * `pile-atlas shortlist`: filter a build's cells (or settlements) and write RFC 7946 GeoJSON (every
 * match, streamed; a limit only with --limit) and a GeoPackage of the same features beside it.
 */
import { isAbsolute, relative, resolve } from 'node:path';
import { InputError } from '../input-error';
import { openShortlist } from '../shortlist/shortlist-cells';
import { gpkgBeside, streamShortlist, streamSink, writeShortlistFiles } from '../shortlist/write-shortlist';
import type { UnitSystem } from '../../layers/unit-systems';
import type { Command } from './command';
import { numberOption, parseOptions, requireOption } from './parse-options';

/** The --units value: si (default) or na, any letter case. */
function unitsOption(value: string | undefined): UnitSystem {
  if (value === undefined) return 'SI';
  const v = value.toLowerCase();
  if (v === 'si') return 'SI';
  if (v === 'na') return 'NA';
  throw new InputError(`--units ${value}: expected si (the stored units) or na (North American units)`);
}

/** The GeoPackage to write (or null), after checking that neither file lies inside the build. */
function outputFiles(
  tilesDir: string,
  out: string | undefined,
  gpkgOption: string | undefined,
  noGpkg: boolean,
): string | null {
  if (noGpkg && gpkgOption !== undefined)
    throw new InputError('--no-gpkg: leave out --gpkg too, or drop --no-gpkg');
  const gpkg = noGpkg ? null : (gpkgOption ?? (out === undefined ? null : gpkgBeside(out)));
  for (const [option, file] of [
    ['--out', out],
    ['--gpkg', gpkg],
  ] as const) {
    if (file === undefined || file === null) continue;
    const rel = relative(resolve(tilesDir), resolve(file));
    if (rel === '' || (!rel.startsWith('..') && !isAbsolute(rel))) {
      throw new InputError(
        `${option} ${file}: lies inside the build (--tiles ${tilesDir}); write it elsewhere`,
      );
    }
  }
  if (out !== undefined && gpkg !== null && resolve(out) === resolve(gpkg))
    throw new InputError(`--gpkg ${gpkg}: is the --out file too; give the GeoPackage its own name`);
  return gpkg;
}

export const shortlistCommand: Command = {
  name: 'shortlist',
  summary: 'filter built tiles with a --where expression; GeoJSON of matching cells or settlements',
  help: `pile-atlas shortlist --tiles <dir> --where "<conditions>" [--near <settlement> --within <km>]
                   [--settlements] [--units si|na] [--out <file>] [--gpkg <file> | --no-gpkg]
                   [--limit N]

Reads a build (<dir>/manifest.json and <dir>/geotiff/*.tif) and writes every cell for which the
conditions hold as RFC 7946 GeoJSON (WGS 84 lon/lat): each cell a polygon with its position and every
band's value, rounded to a meaningful step, in the columns the web's shortlist export uses too (names
carry the unit: groundTemp_degC, thawDelay_yr; class bands suitability_class with suitability_label),
the cautions in every feature, and the expression, the counts, the units, the scenario and the data
provenance on the collection. With --out, a GeoPackage of the same features is written beside the
GeoJSON (picks.geojson -> picks.gpkg: layer shortlist, typed columns, a units table, the cautions
and units in its metadata). With --settlements, the settlements (points) whose cell matches.

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
  --units si|na      the units of the values and column names: si (default) the stored units (°C, m,
                     km, W, piles per ton); na North American, as the map's unit switch shows them
                     (groundTemp_degF, alt_ft, settlementDistance_mi, W in Btu/h; yr, kWh/yr and
                     piles per ton stay). The files record it (unitSystem); the map's re-import reads
                     both. --where always takes the stored units (thawDelay_yr, groundTemp in °C).
  --out <file>       write the GeoJSON here instead of stdout (atomically: a temporary file, renamed)
  --gpkg <file>      write the GeoPackage here (default: beside --out; none when writing to stdout)
  --no-gpkg          no GeoPackage
  --limit N          at most N features (default: all of them; the collection reports how many matched
                     and sets "truncated" when the limit cut the list)
  --help             this text

Screening estimate, not a design.`,
  async run(argv) {
    const opts = parseOptions('shortlist', argv, {
      values: ['tiles', 'where', 'out', 'gpkg', 'limit', 'near', 'within', 'units'],
      flags: ['settlements', 'no-gpkg'],
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
    const limit =
      opts.values.limit === undefined
        ? undefined
        : numberOption('shortlist', opts, 'limit', 0, 1, Number.MAX_SAFE_INTEGER, true);
    const out = opts.values.out;
    const gpkg = outputFiles(tilesDir, out, opts.values.gpkg, opts.flags.has('no-gpkg'));
    const run = await openShortlist({
      tilesDir,
      where,
      settlements: opts.flags.has('settlements'),
      limit,
      near,
      within_km,
      units: unitsOption(opts.values.units),
    });
    let summary: { matched: number; returned: number };
    if (out !== undefined) {
      summary = await writeShortlistFiles(run, { geojson: out, gpkg });
      process.stdout.write(JSON.stringify({ out, gpkg, ...summary }) + '\n');
    } else if (gpkg !== null) {
      throw new InputError('--gpkg: give --out too (the GeoPackage is written beside the GeoJSON file)');
    } else {
      await streamShortlist(run, streamSink(process.stdout));
      summary = run.members() as { matched: number; returned: number };
    }
    const cut = summary.matched > summary.returned ? ` (--limit ${limit})` : '';
    process.stderr.write(`shortlist: ${summary.matched} matched, ${summary.returned} written${cut}\n`);
    return 0;
  },
};
