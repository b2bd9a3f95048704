/** `pile-atlas cell <input.json>`: one cell's screening metrics, flags and criteria as JSON. */
import { cellInputSchema, screenCell } from '../../layers/screening/cell-screening-model';
import { scenarioSchema } from '../../layers/screening/scenario';
import { ValidationError } from '../../layers/validation-error';
import { InputError } from '../input-error';
import type { Command } from './command';
import { readJsonInput } from './read-json-input';
import { parseOptions } from './parse-options';

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

export const cellCommand: Command = {
  name: 'cell',
  summary: "screen one cell's inputs (JSON in, metrics, flags and criteria JSON out)",
  help: `pile-atlas cell <input.json | -> [--scenario <scenario.json>] [--compact]

Runs the per-cell screening model (the same one the map uses) on one cell and prints every metric
with its unit, the suitability class with each criterion's raw value, threshold and verdict, the
operating window and its binding limit, and the fuel / CO2 / cost figures with the break-even COPs.
Screening estimate, not a design.

The input is either the cell itself:
  { "meanAirTemp_C": -6, "airAmplitude_C": 18, "warming_C_per_yr": 0.04, "textureClass": "silt",
    "waterContent_m3m3": 0.4, "bedrockDepth_m": 15,
    "groundTemp_C": null, "geothermalFlux_W_m2": null, "nFreeze": null, "latitude_deg": 70 }
or { "cell": { ... }, "scenario": { ... } }. textureClass is a code 1-6 or a name (gravel, sand,
silt, clay, peat, bedrock); the last four fields are optional (null or absent: scenario defaults).
The scenario (standard pile, building, heat pump, fuel figures, design life, reference depth and
radius, class thresholds, weights) defaults field by field; see the README.

Options:
  --scenario <file>   scenario JSON (overrides a "scenario" member of the input)
  --compact           one-line JSON
  --help              this text`,
  async run(argv) {
    const opts = parseOptions('cell', argv, { values: ['scenario'], flags: ['compact'] });
    if (opts.positional.length !== 1) {
      throw new InputError('cell: expected exactly one input file (or - for stdin)');
    }
    const file = opts.positional[0];
    const raw = await readJsonInput(file);
    const wrapped = isRecord(raw) && 'cell' in raw;
    const cellJson = wrapped ? raw.cell : raw;
    let scenarioJson: unknown = wrapped ? (raw.scenario ?? {}) : {};
    let scenarioFile = wrapped ? `${file}: scenario` : '(defaults)';
    if (opts.values.scenario !== undefined) {
      scenarioFile = opts.values.scenario;
      scenarioJson = await readJsonInput(scenarioFile);
    }
    // Both validated here, so that an error the model throws afterwards is a bug (exit 1).
    const cell = cellInputSchema.safeParse(cellJson);
    if (!cell.success) throw ValidationError.fromZod(wrapped ? `${file}: cell` : file, cell.error);
    const scenario = scenarioSchema.safeParse(scenarioJson ?? {});
    if (!scenario.success) throw ValidationError.fromZod(scenarioFile, scenario.error);
    const result = screenCell(cellJson, scenarioJson);
    const text = opts.flags.has('compact') ? JSON.stringify(result) : JSON.stringify(result, null, 2);
    process.stdout.write(text + '\n');
    return 0;
  },
};
