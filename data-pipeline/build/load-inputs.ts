/**
 * Loads a build's inputs: the inputs config (zod-validated), then opens every grid it lists
 * (read-geotiff-grid.ts) and scans it block by block of rows: values converted to the role's SI unit and
 * checked against the role's plausible range, valid-pixel box found. No grid is held whole. Every problem is an
 * InputError naming the file and the field, role or pixel.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
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
import { openGeoTiffGrid, readGridWindow, type GridHeader } from '../read/read-geotiff-grid';

/** An input grid as screening needs it: where to read it and how (its values stay in the file). */
export interface InputSource {
  grid: GridHeader;
  /** Path of the file, for windowed reads. */
  path: string;
  /** The file as named in messages (the path relative to the inputs directory). */
  label: string;
  nodata: number | null;
  description: string | null;
  sha256: string;
  integerSamples: boolean;
  /** Bounding box of the valid pixels [col0, row0, col1, row1) exclusive, or null if all nodata. */
  validBox: [number, number, number, number] | null;
}

export interface LoadedInput {
  entry: GridEntry;
  role: GridRole;
  source: InputSource;
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

/**
 * Convert a block of rows (starting at raster row `row0`) to SI in place and check every value against
 * the role's plausible range.
 */
export function convertAndCheck(input: LoadedInput, values: Float32Array, row0: number): void {
  const { entry, role, source } = input;
  const convert = role.units[entry.unit];
  const [lo, hi] = role.range;
  const width = source.grid.width;
  for (let i = 0; i < values.length; i++) {
    const raw = values[i];
    if (raw !== raw) continue;
    const v = convert(raw);
    const bad = v < lo || v > hi || (role.kind === 'class' && !Number.isInteger(v));
    if (bad) {
      throw new InputError(
        `${entry.file}: ${entry.role} value ${raw} ${entry.unit} at pixel (col ${i % width}, row ${row0 + Math.floor(i / width)}) ` +
          `outside the plausible range ${lo}..${hi}${role.kind === 'class' ? ' (integer class codes)' : ''} ` +
          `after conversion from "${entry.unit}" (wrong unit declared, or corrupt data?)`,
      );
    }
    values[i] = v;
  }
}

async function sha256Of(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

/** Cells read per block while scanning an input at load time (4 MB of Float32). */
const SCAN_CELLS = 1 << 20;

/**
 * Open one input and scan it block by block of rows: unit conversion + range check and the bounding
 * box of its valid pixels. Nothing of the grid is kept: screening reads windows again from the file.
 */
async function scanInput(inDir: string, entry: GridEntry): Promise<LoadedInput> {
  const path = join(inDir, entry.file);
  const opened = await openGeoTiffGrid(path, { label: entry.file, nodataOverride: entry.nodata });
  try {
    const { width, height } = opened.header;
    const source: InputSource = {
      grid: opened.header,
      path,
      label: entry.file,
      nodata: opened.nodata,
      description: opened.description,
      sha256: '',
      integerSamples: opened.integerSamples,
      validBox: null,
    };
    const input: LoadedInput = { entry, role: GRID_ROLES[entry.role] as GridRole, source };
    const rows = Math.max(1, Math.floor(SCAN_CELLS / width));
    let [c0, r0, c1, r1] = [Infinity, Infinity, -Infinity, -Infinity];
    for (let y0 = 0; y0 < height; y0 += rows) {
      const y1 = Math.min(height, y0 + rows);
      const values = await readGridWindow(opened, [0, y0, width, y1]);
      convertAndCheck(input, values, y0);
      for (let i = 0; i < values.length; i++) {
        if (values[i] !== values[i]) continue;
        const c = i % width;
        const r = y0 + (i - c) / width;
        if (c < c0) c0 = c;
        if (c > c1) c1 = c;
        if (r < r0) r0 = r;
        r1 = r;
      }
    }
    source.validBox = c1 < 0 ? null : [c0, r0, c1 + 1, r1 + 1];
    source.sha256 = await sha256Of(path);
    return input;
  } finally {
    await opened.close();
  }
}

/** Read the config and scan every grid in it (converted and range-checked; values not kept). */
export async function loadInputs(inDir: string, onGrid?: (done: number, total: number) => void) {
  const config = await readInputsConfig(inDir);
  const inputs: LoadedInput[] = [];
  for (const entry of config.grids) {
    inputs.push(await scanInput(inDir, entry));
    onGrid?.(inputs.length, config.grids.length);
  }
  return { config, configFile: INPUTS_CONFIG_FILE, inputs } satisfies LoadedInputs;
}
