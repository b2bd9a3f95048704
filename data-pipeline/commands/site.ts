/** `pile-atlas site <input.json | ->`: the single-site transient simulation, JSON in, JSON out. */
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';
import { scenarioSchema } from '../../layers/screening/scenario';
import { runSiteStudy } from '../../layers/screening/run-site-study';
import { ValidationError } from '../../layers/validation-error';
import { InputError } from '../input-error';
import type { Command } from './command';
import { readJsonInput } from './read-json-input';
import { runSiteBatch } from '../site/site-batch';
import type { BatchEnsembleOptions } from '../site/site-batch-ensemble';
import { scenarioUncertaintySchema } from '../../layers/screening/uncertainty-schema';
import { numberOption, parseOptions, type ParsedOptions } from './parse-options';
import { availableParallelism } from 'node:os';

/** Members per site of the batch's ensemble: the site study's 24 (web/src/site/site-ensemble-panel.tsx). */
const DEFAULT_BATCH_MEMBERS = 24;

/** --ensemble, --members, --seed, --workers and the scenario's spreads (--scenario), or undefined. */
async function batchEnsembleOptions(opts: ParsedOptions): Promise<BatchEnsembleOptions | undefined> {
  const on =
    opts.flags.has('ensemble') || opts.values.members !== undefined || opts.values.seed !== undefined;
  if (!on) {
    if (opts.values.scenario !== undefined || opts.values.workers !== undefined)
      throw new InputError('site --batch: --scenario and --workers apply with --ensemble only');
    return undefined;
  }
  const file = opts.values.scenario ?? '(defaults)';
  const json = opts.values.scenario !== undefined ? await readJsonInput(opts.values.scenario) : {};
  const scenario = scenarioSchema.safeParse(json ?? {});
  if (!scenario.success) throw ValidationError.fromZod(file, scenario.error);
  const uncertainty = scenarioUncertaintySchema.parse(scenario.data.uncertainty ?? {});
  return {
    members: numberOption('site', opts, 'members', DEFAULT_BATCH_MEMBERS, 2, 256, true),
    seed: numberOption('site', opts, 'seed', uncertainty.seed, 0, 0xffffffff, true),
    uncertainty,
    workers: numberOption('site', opts, 'workers', availableParallelism(), 1, 64, true),
  };
}

export const siteCommand: Command = {
  name: 'site',
  summary: 'simulate one site over the years, with and without the pile (JSON in, JSON out)',
  help: `pile-atlas site <input.json | -> [--report [--scenario <scenario.json>]] [--compact] [--progress]
pile-atlas site --batch <sites.geojson | sites.csv> --base <input.json> [--full]
    [--ensemble [--members N] [--seed S] [--scenario <scenario.json>] [--workers N]]

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

With --batch --ensemble, each site also runs the site study's simulated ensemble: N members (default
${DEFAULT_BATCH_MEMBERS}) with the uncertain inputs (air temperature, amplitude, warming trend, n-factors,
water + ice content, geothermal flux) varied over the spreads the scenario declares (its uncertainty
field, else the defaults) on a seeded Latin hypercube, coarse mesh, steps of at least a week. Each
site's line then carries "ensemble": P10/P50/P90 of the thaw delay at the first probe and of the lowest
fluid temperature (null where fewer than half the members define it) and the inputs that drive the
spread. All runs share one pool of worker threads; progress counts the members across all sites.

Options:
  --report     the site study's figures and notes (JSON) instead of the raw simulation
  --scenario <file>  scenario JSON for --report (default: the scenario defaults)
  --compact    one-line JSON
  --progress   report progress on stderr
  --ensemble   with --batch: the simulated ensemble of every site too
  --members N  ensemble members per site (2-256, default ${DEFAULT_BATCH_MEMBERS}; implies --ensemble)
  --seed S     seed of the ensemble's Latin hypercube (default: the scenario's, 1; implies --ensemble)
  --workers N  worker threads for --ensemble (default: cores, here ${availableParallelism()})
  --help       this text`,
  async run(argv) {
    const opts = parseOptions('site', argv, {
      values: ['scenario', 'batch', 'base', 'members', 'seed', 'workers'],
      flags: ['compact', 'progress', 'report', 'full', 'ensemble'],
    });
    if (opts.values.batch !== undefined) {
      if (opts.values.base === undefined)
        throw new InputError('site --batch: give the base input as --base <input.json>');
      const { bad } = await runSiteBatch({
        sitesFile: opts.values.batch,
        baseFile: opts.values.base,
        full: opts.flags.has('full'),
        ensemble: await batchEnsembleOptions(opts),
        emit: (line) => process.stdout.write(line + '\n'),
        progress: (t) => process.stderr.write(`site: ${t}\n`),
      });
      return bad > 0 ? 2 : 0;
    }
    if (
      ['members', 'seed', 'workers'].some((k) => opts.values[k] !== undefined) ||
      opts.flags.has('ensemble')
    )
      throw new InputError('site: --ensemble, --members, --seed and --workers need --batch');
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
