/**
 * Loads a build's inputs: the inputs config (zod-validated), then every grid it lists (read-geotiff-grid.ts),
 * converted to the role's SI unit and checked against the role's plausible range. Every problem is an
 * InputError naming the file and the field, role or pixel.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { formatZodIssues, InputError } from '../input-error';
import {
  GRID_ROLES,
  INPUTS_CONFIG_FILE,
  inputsConfigSchema,
  type GridEntry,
  type GridRole,
  type InputsConfig,
} from '../inputs-config';
import { readGeoTiffGrid, type SourceGrid } from '../read/read-geotiff-grid';

export interface LoadedInput {
  entry: GridEntry;
  role: GridRole;
  source: SourceGrid;
}

export interface LoadedInputs {
  config: InputsConfig;
  configFile: string;
  inputs: LoadedInput[];
}

/** Read and validate the inputs config in `inDir`. */
export async function readInputsConfig(inDir: string, file = INPUTS_CONFIG_FILE): Promise<InputsConfig> {
  let text: string;
  try {
    text = await readFile(join(inDir, file), 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new InputError(
      code === 'ENOENT'
        ? `${file}: file not found in ${inDir}`
        : `${file}: cannot read (${code ?? String(err)})`,
    );
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new InputError(`${file}: not valid JSON (${(err as Error).message})`);
  }
  const parsed = inputsConfigSchema.safeParse(json);
  if (!parsed.success) throw new InputError(formatZodIssues(file, parsed.error));
  return parsed.data;
}

/** Convert a grid to SI in place and check every value against the role's plausible range. */
export function convertAndCheck(input: LoadedInput): void {
  const { entry, role, source } = input;
  const convert = role.units[entry.unit];
  const [lo, hi] = role.range;
  const values = source.grid.values;
  const width = source.grid.width;
  for (let i = 0; i < values.length; i++) {
    const raw = values[i];
    if (raw !== raw) continue;
    const v = convert(raw);
    const bad = v < lo || v > hi || (role.kind === 'class' && !Number.isInteger(v));
    if (bad) {
      throw new InputError(
        `${entry.file}: ${entry.role} value ${raw} ${entry.unit} at pixel (col ${i % width}, row ${Math.floor(i / width)}) ` +
          `outside the plausible range ${lo}..${hi}${role.kind === 'class' ? ' (integer class codes)' : ''} ` +
          `after conversion from "${entry.unit}" (wrong unit declared, or corrupt data?)`,
      );
    }
    values[i] = v;
  }
}

/** Read the config and every grid in it, converted and range-checked. */
export async function loadInputs(inDir: string, onGrid?: (done: number, total: number) => void) {
  const config = await readInputsConfig(inDir);
  const inputs: LoadedInput[] = [];
  for (const entry of config.grids) {
    const source = await readGeoTiffGrid(join(inDir, entry.file), {
      label: entry.file,
      nodataOverride: entry.nodata,
    });
    const input = { entry, role: GRID_ROLES[entry.role] as GridRole, source };
    convertAndCheck(input);
    inputs.push(input);
    onGrid?.(inputs.length, config.grids.length);
  }
  return { config, configFile: INPUTS_CONFIG_FILE, inputs } satisfies LoadedInputs;
}
