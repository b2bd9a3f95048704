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
import { ValidationError } from '../../layers/validation-error';
import {
  GRID_ROLES,
  INPUTS_CONFIG_FILE,
  inputsConfigSchema,
  type GridEntry,
  type GridRole,
  type InputsConfig,
} from '../inputs-config';
import { InputError } from '../input-error';
import { validateGeoJsonLayer, type GeoJsonLayer } from '../read/geojson-input';
import { resolveInputFile } from '../read/input-paths';
import { MAX_JSON_BYTES, readJsonFile } from '../read/read-json-file';
import { openGeoTiffGrid, readGridWindow, type GridHeader } from '../read/read-geotiff-grid';
import { defaultBudget, type BuildBudget } from './build-budget';

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
  /** The validated text of each GeoJSON layer the config lists, published as read. */
  geojson: Partial<Record<GeoJsonLayer, string>>;
}

/** Read and validate the inputs config in `inDir`. */
export async function readInputsConfig(inDir: string, file = INPUTS_CONFIG_FILE): Promise<InputsConfig> {
  const path = join(inDir, file);
  let json: unknown;
  try {
    json = await readJsonFile(path, file);
  } catch (err) {
    if (err instanceof InputError && err.message === `${file}: file not found`) {
      throw new InputError(`${file}: file not found in ${inDir}`);
    }
    throw err;
  }
  const parsed = inputsConfigSchema.safeParse(json);
  if (!parsed.success) throw ValidationError.fromZod(file, parsed.error);
  return parsed.data;
}

/** Read a GeoJSON layer the config lists (inside the inputs directory) and validate it as RFC 7946. */
async function readGeoJsonLayer(inDir: string, layer: GeoJsonLayer, file: string): Promise<string> {
  const path = await resolveInputFile(inDir, file, layer, INPUTS_CONFIG_FILE);
  const bytes = await readFile(path);
  if (bytes.byteLength > MAX_JSON_BYTES) {
    throw new InputError(`${file}: ${bytes.byteLength} bytes, over the limit of ${MAX_JSON_BYTES} bytes`);
  }
  const text = bytes.toString('utf8');
  validateGeoJsonLayer(layer, file, text);
  return text;
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
async function scanInput(
  inDir: string,
  entry: GridEntry,
  index: number,
  budget: BuildBudget,
): Promise<LoadedInput> {
  const path = await resolveInputFile(inDir, entry.file, `grids.${index}.file`, INPUTS_CONFIG_FILE);
  const opened = await openGeoTiffGrid(path, { label: entry.file, nodataOverride: entry.nodata, budget });
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
export async function loadInputs(
  inDir: string,
  onGrid?: (done: number, total: number) => void,
  budget: BuildBudget = defaultBudget(),
) {
  const config = await readInputsConfig(inDir);
  const geojson: LoadedInputs['geojson'] = {};
  if (config.settlements)
    geojson.settlements = await readGeoJsonLayer(inDir, 'settlements', config.settlements);
  if (config.land) geojson.land = await readGeoJsonLayer(inDir, 'land', config.land);
  if (config.roads) geojson.roads = await readGeoJsonLayer(inDir, 'roads', config.roads);
  const inputs: LoadedInput[] = [];
  for (const [i, entry] of config.grids.entries()) {
    inputs.push(await scanInput(inDir, entry, i, budget));
    onGrid?.(inputs.length, config.grids.length);
  }
  return { config, configFile: INPUTS_CONFIG_FILE, inputs, geojson } satisfies LoadedInputs;
}
