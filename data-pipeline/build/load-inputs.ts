/**
 * Loads a build's inputs: the inputs config (zod-validated), then opens every grid it lists through
 * GDAL (open-raster.ts) and scans it block by block of rows: the file's scale and offset applied, values
 * converted to the role's SI unit and checked against the role's plausible range, valid-pixel box found.
 * GDAL first writes band 1 as a raw Float32 copy into a scratch directory (removed afterwards), which
 * the scan reads; no grid is held whole. Every problem is an InputError naming the file and the field,
 * role or pixel, and for a scaled file the scale applied.
 *
 * `reader: 'legacy'` keeps the earlier hand-written GeoTIFF reader (read-geotiff-grid.ts, EPSG codes of
 * crs-definitions.ts only) for the side-by-side benchmark (bench/pipeline.bench.ts); builds use GDAL.
 */
import { createHash } from 'node:crypto';
import { closeSync, createReadStream, openSync } from 'node:fs';
import { mkdtemp, readFile, realpath, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
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
import { openRaster, type RasterInput } from '../read/open-raster';
import { isHdf5File, readNetcdf } from '../read/read-netcdf';
import { rasterisePolygons } from '../read/rasterise-polygons';
import { ANALYSIS_CRS } from '../crs/crs-definitions';
import { loadGdal } from '../gdal/gdal-wasm';
import { readBandRows } from './band-files';
import { budgetFromConfig, defaultBudget, type BuildBudget } from './build-budget';
import {
  companionEntryOf,
  companionField,
  companionOf,
  companionRoleOf,
  companionWhat,
  type CompanionKind,
} from './sd-grids';

/** Which reader opens the inputs: GDAL (default) or the earlier hand-written GeoTIFF reader. */
export type InputReader = 'gdal' | 'legacy';

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
  /** physical = stored x scale + offset (from the file's metadata; 1 and 0 when it declares none). */
  scale: number;
  offset: number;
  /** Present when GDAL opened the file: its CRS as WKT, driver, declared unit and data type. */
  gdal?: Pick<RasterInput, 'srsWkt' | 'driver' | 'fileUnit' | 'dataType'>;
  /** For a NetCDF input: variable, grid mapping and time selection (read-netcdf.ts). */
  netcdf?: Record<string, unknown>;
  /** Raw Float32 grid on the analysis grid, written by alignInputs (align-inputs.ts). */
  aligned?: string;
}

export interface LoadedInput {
  entry: GridEntry;
  role: GridRole;
  source: InputSource;
  /** Set for a companion spread grid (sd-grids.ts): what it holds. */
  companion?: CompanionKind;
  /**
   * The companion spread grid of this input, when its entry names `sdFile` (standard deviation) or
   * `confusionFile` (confusion probability of a class grid).
   */
  sd?: LoadedInput;
}

/** A companion grid's pseudo-role and kind (sd-grids.ts). */
interface Companion {
  role: GridRole;
  kind: CompanionKind;
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
  const what = input.companion ? `${companionWhat(input.companion, entry.role)} (band 1)` : entry.role;
  const convert = role.units[entry.unit];
  const [lo, hi] = role.range;
  const width = source.grid.width;
  const scale = source.scale ?? 1;
  const offset = source.offset ?? 0;
  const scaled = scale !== 1 || offset !== 0;
  for (let i = 0; i < values.length; i++) {
    const stored = values[i];
    if (stored !== stored) continue;
    const raw = scaled ? stored * scale + offset : stored;
    const v = convert(raw);
    const bad = v < lo || v > hi || (role.kind === 'class' && !Number.isInteger(v));
    if (bad) {
      const how = scaled
        ? `stored ${stored} x scale ${scale} + offset ${offset} from the file's metadata`
        : 'no scale or offset in the file';
      throw new InputError(
        `${entry.file}: ${what} value ${Number(raw.toPrecision(7))} ${entry.unit} (${how}) at pixel (col ${i % width}, row ${row0 + Math.floor(i / width)}) ` +
          `outside the plausible range ${lo}..${hi}${role.kind === 'class' ? ' (integer class codes)' : ''} ` +
          `after conversion from "${entry.unit}" (wrong unit or scale declared, or corrupt data?)`,
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
async function scanInputLegacy(
  path: string,
  entry: GridEntry,
  budget: BuildBudget,
  companion?: Companion,
): Promise<LoadedInput> {
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
      scale: 1,
      offset: 0,
    };
    const input: LoadedInput = {
      entry,
      role: companion?.role ?? (GRID_ROLES[entry.role] as GridRole),
      source,
      ...(companion ? { companion: companion.kind } : {}),
    };
    const rows = Math.max(1, Math.floor(SCAN_CELLS / width));
    let [c0, r0, c1, r1] = [Infinity, Infinity, -Infinity, -Infinity];
    for (let y0 = 0; y0 < height; y0 += rows) {
      const y1 = Math.min(height, y0 + rows);
      const values = await readGridWindow(opened, [0, y0, width, y1]);
      if (companion) checkFinite(input, values, y0, opened.nodata);
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

/** A companion spread grid: every stored value that is not nodata must be finite. */
function checkFinite(input: LoadedInput, values: Float32Array, row0: number, nodata: number | null): void {
  const width = input.source.grid.width;
  const kind = input.companion ?? 'sd';
  const expected = kind === 'sd' ? `a finite value >= 0 in ${input.entry.unit}` : 'a probability in [0, 1]';
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isFinite(v) || v !== v || (nodata != null && v === Math.fround(nodata))) continue;
    throw new InputError(
      `${input.entry.file}: ${companionWhat(kind, input.entry.role)} (band 1) is ${v} at pixel (col ${i % width}, row ${row0 + Math.floor(i / width)}): expected ${expected}, or the file's nodata`,
    );
  }
}

/** Running valid-pixel box of a scan, [c0, r0, c1, r1] (c1 < 0 while empty). */
function extendBox(box: number[], values: Float32Array, width: number, row0: number): void {
  for (let i = 0; i < values.length; i++) {
    if (values[i] !== values[i]) continue;
    const c = i % width;
    const r = row0 + (i - c) / width;
    if (c < box[0]) box[0] = c;
    if (c > box[2]) box[2] = c;
    if (r < box[1]) box[1] = r;
    box[3] = r;
  }
}

/** A polygon or NetCDF input turned into a raster GDAL opens (or the file itself), with what was read. */
interface DerivedRaster {
  /** The raster to open: the file itself, or the GeoTIFF / VRT derived from it in `derivedDir`. */
  path: string;
  /** For polygon and NetCDF inputs: how the file was read (the manifest's `reading`). */
  reading?: Record<string, unknown>;
  /** The unit a NetCDF variable declares (undefined for other inputs). */
  unit?: string | null;
}

/**
 * Polygons are rasterised and NetCDF-4 variables exposed as a VRT in `derivedDir`; other files are
 * opened as they are. Polygon-only or NetCDF-only fields on another kind of file are an error.
 */
async function deriveRaster(
  path: string,
  entry: GridEntry,
  budget: BuildBudget,
  index: number,
  derivedDir: string,
): Promise<DerivedRaster> {
  if (entry.attribute) {
    const poly = await rasterisePolygons(path, derivedDir, String(index), {
      label: entry.file,
      attribute: entry.attribute,
      values: entry.values,
      layer: entry.layer,
      srs: ANALYSIS_CRS,
    });
    return { path: poly.tif, reading: poly.reading };
  }
  if (entry.values || entry.layer) {
    throw new InputError(
      `${entry.file}: "values" and "layer" apply to polygon inputs (with "attribute") only`,
    );
  }
  if (await isHdf5File(path)) {
    const nc = await readNetcdf(path, derivedDir, String(index), {
      label: entry.file,
      variable: entry.variable,
      time: entry.time,
      budget,
    });
    return { path: nc.vrtPath, reading: nc.reading, unit: nc.unit };
  }
  if (entry.variable || entry.time) {
    throw new InputError(`${entry.file}: "variable" and "time" apply to NetCDF-4 files only`);
  }
  return { path };
}

/** The unit the file declares must be the one the inputs config gives, when it is one the role knows. */
function checkDeclaredUnit(entry: GridEntry, role: GridRole, fileUnit: string | null): void {
  if (fileUnit && fileUnit in role.units && fileUnit !== entry.unit) {
    throw new InputError(
      `${entry.file}: the file declares unit "${fileUnit}" but the inputs config says "${entry.unit}" for ${entry.role}`,
    );
  }
}

/**
 * Copy band 1 of `input` as raw Float32 into `scratch` (GDAL), then read it block by block of rows:
 * nodata and non-finite values -> NaN, unit conversion and range check; returns the valid-pixel box.
 */
async function scanBand(
  input: LoadedInput,
  scratch: string,
  index: number,
): Promise<InputSource['validBox']> {
  const { entry, source } = input;
  const { width, height } = source.grid;
  const raw = join(scratch, `${index}.f32`);
  const gdal = await loadGdal();
  try {
    gdal.translate(source.path, raw, ['-of', 'ENVI', '-ot', 'Float32', '-b', '1']);
  } catch (err) {
    throw new InputError(`${entry.file}: unreadable image data (${(err as Error).message})`);
  }
  const nodata = source.nodata;
  const nodataSingle = nodata == null ? NaN : Math.fround(nodata);
  const rows = Math.max(1, Math.floor(SCAN_CELLS / width));
  const block = new Float32Array(rows * width);
  const box = [Infinity, Infinity, -Infinity, -Infinity];
  const fd = openSync(raw, 'r');
  try {
    for (let y0 = 0; y0 < height; y0 += rows) {
      const y1 = Math.min(height, y0 + rows);
      const values = block.subarray(0, (y1 - y0) * width);
      readBandRows(fd, width, y0, y1, values);
      if (input.companion) checkFinite(input, values, y0, nodata);
      for (let i = 0; i < values.length; i++) {
        const v = values[i];
        if (v === nodata || v === nodataSingle || !Number.isFinite(v)) values[i] = NaN;
      }
      convertAndCheck(input, values, y0);
      extendBox(box, values, width, y0);
    }
  } finally {
    closeSync(fd);
    await rm(raw, { force: true });
  }
  return box[2] < 0 ? null : [box[0], box[1], box[2] + 1, box[3] + 1];
}

/**
 * Open one input through GDAL and scan it: band 1 is copied as raw Float32 into `scratch` by GDAL,
 * then read block by block of rows (nodata and non-finite values -> NaN, scale/offset, unit, range).
 */
async function scanInputGdal(
  path: string,
  entry: GridEntry,
  budget: BuildBudget,
  scratch: string,
  index: number,
  inDir: string,
  derivedDir: string,
  companion?: Companion,
): Promise<LoadedInput> {
  const derived = await deriveRaster(path, entry, budget, index, derivedDir);
  const netcdf = derived.reading;
  const opened = await openRaster(derived.path, {
    label: entry.file,
    nodataOverride: entry.nodata,
    budget,
    insideDirs: [resolve(inDir), await realpath(inDir), resolve(derivedDir)],
  });
  if (derived.unit !== undefined) opened.fileUnit = derived.unit;
  const role = companion?.role ?? (GRID_ROLES[entry.role] as GridRole);
  checkDeclaredUnit(entry, role, opened.fileUnit);
  const source: InputSource = {
    grid: opened.header,
    path: derived.path,
    label: entry.file,
    nodata: opened.nodata,
    description: opened.description,
    sha256: '',
    integerSamples: opened.integerSamples,
    validBox: null,
    scale: opened.scale,
    offset: opened.offset,
    gdal: {
      srsWkt: opened.srsWkt,
      driver: entry.attribute ? 'polygons' : netcdf ? 'netCDF' : opened.driver,
      fileUnit: opened.fileUnit,
      dataType: opened.dataType,
    },
    ...(netcdf ? { netcdf } : {}),
  };
  const input: LoadedInput = { entry, role, source, ...(companion ? { companion: companion.kind } : {}) };
  source.validBox = await scanBand(input, scratch, index);
  source.sha256 = await sha256Of(path);
  return input;
}

/** Read the config and scan every grid in it (converted and range-checked; values not kept). */
export async function loadInputs(
  inDir: string,
  onGrid?: (done: number, total: number) => void,
  overrides: Partial<BuildBudget> = {},
  reader: InputReader = 'gdal',
) {
  const config = await readInputsConfig(inDir);
  // Defaults, then the inputs config's budget, then the caller's (command-line) options.
  const budget: BuildBudget = { ...defaultBudget(), ...budgetFromConfig(config.budget), ...overrides };
  const geojson: LoadedInputs['geojson'] = {};
  if (config.settlements)
    geojson.settlements = await readGeoJsonLayer(inDir, 'settlements', config.settlements);
  if (config.land) geojson.land = await readGeoJsonLayer(inDir, 'land', config.land);
  if (config.roads) geojson.roads = await readGeoJsonLayer(inDir, 'roads', config.roads);
  const inputs: LoadedInput[] = [];
  const scratch = reader === 'gdal' ? await mkdtemp(join(tmpdir(), 'pile-atlas-scan-')) : '';
  // Fields derived from NetCDF inputs live until the build has warped them (the caller removes it).
  const derivedDir = reader === 'gdal' ? await mkdtemp(join(tmpdir(), 'pile-atlas-derived-')) : '';
  try {
    for (const [i, entry] of config.grids.entries()) {
      const path = await resolveInputFile(inDir, entry.file, `grids.${i}.file`, INPUTS_CONFIG_FILE);
      const input =
        reader === 'gdal'
          ? await scanInputGdal(path, entry, budget, scratch, i, inDir, derivedDir)
          : await scanInputLegacy(path, entry, budget);
      const named = companionOf(entry);
      if (named) {
        // The companion spread grid (sd-grids.ts): read like its input, checked against its pseudo-role.
        const sdEntry = companionEntryOf(entry, named);
        const field = `grids.${i}.${companionField(named.kind)}`;
        const sdPath = await resolveInputFile(inDir, named.file, field, INPUTS_CONFIG_FILE);
        const companion = { role: companionRoleOf(entry.role, named.kind), kind: named.kind };
        input.sd =
          reader === 'gdal'
            ? await scanInputGdal(sdPath, sdEntry, budget, scratch, i + 1000, inDir, derivedDir, companion)
            : await scanInputLegacy(sdPath, sdEntry, budget, companion);
      }
      inputs.push(input);
      onGrid?.(inputs.length, config.grids.length);
    }
  } catch (err) {
    if (derivedDir) await rm(derivedDir, { recursive: true, force: true });
    throw err;
  } finally {
    if (scratch) await rm(scratch, { recursive: true, force: true });
  }
  return {
    config,
    configFile: INPUTS_CONFIG_FILE,
    inputs,
    geojson,
    budget,
    derivedDir,
  } satisfies LoadedInputs & {
    budget: BuildBudget;
    derivedDir: string;
  };
}
