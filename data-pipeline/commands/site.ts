/** `pile-atlas site <input.json | ->`: the single-site transient simulation, JSON in, JSON out. */
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';
import { scenarioSchema } from '../../layers/screening/scenario';
import { runSiteStudy } from '../../layers/screening/run-site-study';
import { ValidationError } from '../../layers/validation-error';
import { InputError } from '../input-error';
import type { Command } from './command';
import { readJsonInput } from './read-json-input';
import { parseOptions } from './parse-options';
import { runSiteBatch } from '../site/site-batch';

export const siteCommand: Command = {
  name: 'site',
  summary: 'simulate one site over the years, with and without the pile (JSON in, JSON out)',
  help: `pile-atlas site <input.json | -> [--report [--scenario <scenario.json>]] [--compact] [--progress]
pile-atlas site --batch <sites.geojson | sites.csv> --base <input.json> [--full]

Runs the axisymmetric (r, z) transient ground simulation around one heat-exchanger pile, twice (with
and without the pile), and prints the result as JSON: probe temperature histories, the year each probe
the summer thaw first reaches and the thaw delay the pile buys, the thaw depth by year, monthly
fluid temperatures and heat, the lowest fluid temperature, ground frozen by the pile that was unfrozen
at the start, and the energy balance. Screening estimate, not a design.

The input schema (years, ground.layers, ground.initial, climate, pile, operation, probes, domain,
numerics) is documented in the README; examples/site-demo.json is a complete example.

With --report it prints instead what the dashboard's site study shows after a run, from the same
functions: the quick estimate (the map's model) beside the simulated value and the calibration band for
each shared quantity with the reason they differ, the pile count by design pulse, fuel, CO2, COP, the
operating window and the site notes (the study adds a column of profile probes at the reference radius
and sizes the map's foundation: the scenario's pile spacing and design life).

With --batch, every site of a GeoJSON FeatureCollection of Points (overrides in properties.site) or
a CSV table (columns name, lon, lat and dotted input paths such as climate.meanAirTemp_C) runs on the
--base input with its overrides; one JSON line per site is printed as it finishes (ok: false with
the problems for a bad or repeated site; exit code 2 if any). --full prints each whole result.

Options:
  --report     the site study's figures and notes (JSON) instead of the raw simulation
  --scenario <file>  scenario JSON for --report (default: the scenario defaults)
  --compact    one-line JSON
  --progress   report progress on stderr
  --help       this text`,
  async run(argv) {
    const opts = parseOptions('site', argv, {
      values: ['scenario', 'batch', 'base'],
      flags: ['compact', 'progress', 'report', 'full'],
    });
    if (opts.values.batch !== undefined) {
      if (opts.values.base === undefined)
        throw new InputError('site --batch: give the base input as --base <input.json>');
      const { bad } = await runSiteBatch({
        sitesFile: opts.values.batch,
        baseFile: opts.values.base,
        full: opts.flags.has('full'),
        emit: (line) => process.stdout.write(line + '\n'),
        progress: (t) => process.stderr.write(`site: ${t}\n`),
      });
      return bad > 0 ? 2 : 0;
    }
    if (opts.positional.length !== 1) {
      throw new InputError('site: expected exactly one input file (or - for stdin)');
    }
    const file = opts.positional[0];
    const raw = await readJsonInput(file);
    const parsed = siteInputSchema.safeParse(raw);
    if (!parsed.success) throw ValidationError.fromZod(file, parsed.error);
    let last = -1;
    const onProgress = opts.flags.has('progress')
      ? (f: number) => {
          const pct = Math.floor(f * 10) * 10;
          if (pct !== last) {
            last = pct;
            process.stderr.write(`site: ${pct} %\n`);
          }
        }
      : undefined;
    const indent = opts.flags.has('compact') ? undefined : 2;
    if (opts.flags.has('report')) {
      const scenarioFile = opts.values.scenario ?? '(defaults)';
      const scenarioJson =
        opts.values.scenario !== undefined ? await readJsonInput(opts.values.scenario) : {};
      const scenario = scenarioSchema.safeParse(scenarioJson ?? {});
      if (!scenario.success) throw ValidationError.fromZod(scenarioFile, scenario.error);
      const { report, result } = runSiteStudy(parsed.data, scenario.data, onProgress);
      for (const w of result.warnings) process.stderr.write(`site: warning: ${w}\n`);
      process.stdout.write(JSON.stringify(report, null, indent) + '\n');
      return 0;
    }
    if (opts.values.scenario !== undefined) throw new InputError('site: --scenario needs --report');
    // The input passed its schema: an error the simulator throws now is a bug (exit 1), not bad input.
    const result = simulateSite(parsed.data, { onProgress });
    for (const w of result.warnings) process.stderr.write(`site: warning: ${w}\n`);
    process.stdout.write(JSON.stringify(result, null, indent) + '\n');
    return 0;
  },
};
