/**
 * Screens one window of analysis rows [row0, row1): for every input grid, reads from its file only the
 * pixel box under the window's cell centres (footprintBox, padded 2 pixels for bilinear), converts it
 * to SI and resamples it (nearest for classes, bilinear for continuous values); fills CellInputs and runs
 * the model into window-sized buffers, then writes the window's rows into the band files (band-files.ts).
 * Memory per screener: bands x windowRows x width x 4 bytes, the resampled inputs of one window, and one
 * input's pixel box at a time (the window's footprint in that grid, whatever the region's height). Used identically
 * by the main thread and the worker threads, so a build gives the same numbers whatever the worker count.
 */
import { closeSync, openSync } from 'node:fs';
import { fromFile, type GeoTIFF, type GeoTIFFImage } from 'geotiff';
import {
  emptyCellInputs,
  type CellInputs,
  type ScreeningModel,
} from '../../layers/screening/screening-model';
import { SPREAD_ROLES } from '../../layers/screening/uncertainty-schema';
import { GRID_ROLES, type GridRoleId } from '../inputs-config';
import { readGridWindow, type GridHeader } from '../read/read-geotiff-grid';
import type { AnalysisGrid } from './analysis-grid';
import { closeBandFds, openBandFds, readBandRows, writeBandRows, type BandFiles } from './band-files';
import { cellCentresIn, footprintBox, resampleAt } from './resample-to-grid';
import { unitConversion, type CompanionKind } from './sd-grids';

/** Flag bits of the inputFlags band: which optional input was absent in the cell. */
export const INPUT_FLAG_BITS = { groundTemp_C: 1, geothermalFlux_W_m2: 2, nFreeze: 4 } as const;

/** An input grid as a screener reads it: file, georeferencing, nodata and declared unit. */
export interface WindowInput {
  role: GridRoleId;
  kind: 'continuous' | 'class';
  grid: GridHeader;
  path: string;
  /** The file as named in messages. */
  label: string;
  nodata: number | null;
  /** The unit declared in the inputs config (converted to the role's SI unit on read). */
  unit: string;
  /** physical = stored x scale + offset, before the unit conversion. */
  scale: number;
  offset: number;
  /** Raw Float32 file already on the analysis grid (align-inputs.ts); else `path` is resampled here. */
  aligned?: string;
  /**
   * Set for a companion spread grid (sd-grids.ts): a standard deviation (converted with the unit's
   * linear part) or a confusion probability (a fraction, not converted).
   */
  companion?: CompanionKind;
  /** The input's companion spread grid (standard deviation or confusion), if its entry names one. */
  sd?: WindowInput;
}

/** Images opened by a screener, one per input file, kept open across its windows (closed by `close`). */
type ImageCache = Map<string, { tiff: GeoTIFF; image: GeoTIFFImage }>;

/** Rows [row0, row1) of an aligned input, in SI; file descriptors cached across windows. */
function readAligned(
  input: WindowInput & { aligned: string },
  width: number,
  row0: number,
  row1: number,
  fds: Map<string, number>,
): Float32Array {
  let fd = fds.get(input.aligned);
  if (fd === undefined) {
    fd = openSync(input.aligned, 'r');
    fds.set(input.aligned, fd);
  }
  const values = readBandRows(fd, width, row0, row1);
  const convert = unitConversion(input.role, input.unit, input.companion);
  const { scale, offset } = input;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v === v) values[i] = convert(v * scale + offset);
  }
  return values;
}

/**
 * Read the part of `input` that resampling at `coords` touches (footprintBox), converted to SI, and
 * resample it; all NaN when the points miss the raster.
 */
async function sampleInput(
  input: WindowInput,
  coords: Float64Array,
  cache: ImageCache,
): Promise<Float32Array> {
  const box = footprintBox(input.grid, coords);
  if (!box) return new Float32Array(coords.length / 2).fill(NaN);
  const convert = unitConversion(input.role, input.unit, input.companion);
  let opened = cache.get(input.path);
  if (!opened) {
    const tiff = await fromFile(input.path);
    opened = { tiff, image: await tiff.getImage() };
    cache.set(input.path, opened);
  }
  const values = await readGridWindow({ image: opened.image, label: input.label, nodata: input.nodata }, box);
  for (let i = 0; i < values.length; i++) if (values[i] === values[i]) values[i] = convert(values[i]);
  const method = input.kind === 'class' ? 'nearest' : 'bilinear';
  return resampleAt({ ...input.grid, values }, coords, method, box);
}

export interface WindowContext {
  grid: AnalysisGrid;
  inputs: WindowInput[];
  model: ScreeningModel;
  /** Roles echoed as bands right after the model's layers, in order. */
  echoRoles: GridRoleId[];
  /** Output band files: model layers, echo bands, then the flags band (opened per window). */
  files: BandFiles;
}

export interface WindowStats {
  cellsScreened: number;
  cellsMissingInput: number;
  cellsModelNodata: number;
  /** [west, south, east, north] of the screened cell centres, degrees. */
  bounds: [number, number, number, number];
}

export function emptyStats(): WindowStats {
  return {
    cellsScreened: 0,
    cellsMissingInput: 0,
    cellsModelNodata: 0,
    bounds: [Infinity, Infinity, -Infinity, -Infinity],
  };
}

export function mergeStats(into: WindowStats, s: WindowStats): void {
  into.cellsScreened += s.cellsScreened;
  into.cellsMissingInput += s.cellsMissingInput;
  into.cellsModelNodata += s.cellsModelNodata;
  into.bounds[0] = Math.min(into.bounds[0], s.bounds[0]);
  into.bounds[1] = Math.min(into.bounds[1], s.bounds[1]);
  into.bounds[2] = Math.max(into.bounds[2], s.bounds[2]);
  into.bounds[3] = Math.max(into.bounds[3], s.bounds[3]);
}

const ROLES = Object.keys(GRID_ROLES) as GridRoleId[];
const REQUIRED = ROLES.filter((r) => GRID_ROLES[r].required);

export interface WindowScreener {
  /**
   * Screen analysis rows [row0, row1) and write them into the band files (the context's, or `into`:
   * files holding grid rows from `into.row0`, e.g. one queue job's output).
   */
  screen: (row0: number, row1: number, into?: BandFiles) => Promise<WindowStats>;
  /** Close the input files the screener opened. */
  close: () => Promise<void>;
}

/**
 * Every grid role's values over rows [row0, row1) (all NaN for a role without an input), and the
 * standard deviations of the roles with a companion grid.
 */
async function sampleWindow(
  ctx: WindowContext,
  row0: number,
  row1: number,
  coordsFor: (crs: string) => Float64Array,
  cache: ImageCache,
  inputFds: Map<string, number>,
): Promise<{ sampled: Map<GridRoleId, Float32Array>; sds: [number, Float32Array][] }> {
  const count = (row1 - row0) * ctx.grid.width;
  const empty = new Float32Array(count).fill(NaN);
  const sampled = new Map<GridRoleId, Float32Array>();
  const sds: [number, Float32Array][] = [];
  const read = (input: WindowInput) =>
    input.aligned
      ? readAligned({ ...input, aligned: input.aligned }, ctx.grid.width, row0, row1, inputFds)
      : sampleInput(input, coordsFor(input.grid.crs), cache);
  for (const r of ROLES) sampled.set(r, empty);
  for (const input of ctx.inputs) {
    sampled.set(input.role, await read(input));
    if (input.sd) sds.push([SPREAD_ROLES.indexOf(input.role), await read(input.sd)]);
  }
  return { sampled, sds };
}

/** Writes the window's bands into `into` (files holding grid rows from `into.row0`). */
function writeWindow(into: BandFiles, width: number, row0: number, bands: Float32Array[]): void {
  const fds = openBandFds(into, 'r+');
  try {
    const at = row0 - (into.row0 ?? 0);
    for (let b = 0; b < bands.length; b++) writeBandRows(fds[b], width, at, bands[b]);
  } finally {
    closeBandFds(fds);
  }
}

/** Create a screener for the context; call `screen` for each window, then `close`. */
export function createWindowScreener(ctx: WindowContext): WindowScreener {
  const cache: ImageCache = new Map();
  const inputFds = new Map<string, number>();
  const close = async () => {
    const open = [...cache.values()];
    cache.clear();
    for (const { tiff } of open) await tiff.close();
    for (const fd of inputFds.values()) closeSync(fd);
    inputFds.clear();
  };
  const { grid, model, echoRoles, files } = ctx;
  const nModel = model.layers.length;
  const out = new Float32Array(nModel);
  let bands: Float32Array[] = [];
  const cell: CellInputs = emptyCellInputs();
  const cellRecord = cell as unknown as Record<string, number>;
  // Per-cell standard deviations from companion grids, indexed as SPREAD_ROLES (NaN: none).
  const cellSd = new Float64Array(SPREAD_ROLES.length).fill(NaN);

  const screen = async (row0: number, row1: number, into: BandFiles = files) => {
    const stats = emptyStats();
    const coordsByCrs = new Map<string, Float64Array>();
    const coordsFor = (crs: string) => {
      let c = coordsByCrs.get(crs);
      if (!c) {
        c = cellCentresIn(grid, row0, row1, crs);
        coordsByCrs.set(crs, c);
      }
      return c;
    };
    const lonLat = coordsFor('EPSG:4326');
    const count = (row1 - row0) * grid.width;
    if (bands.length === 0 || bands[0].length !== count) {
      bands = into.paths.map(() => new Float32Array(count));
    }
    for (const band of bands) band.fill(NaN);
    const flagsBand = bands[bands.length - 1];
    const { sampled, sds } = await sampleWindow(ctx, row0, row1, coordsFor, cache, inputFds);
    const required = REQUIRED.map((r) => sampled.get(r) as Float32Array);
    const all = ROLES.map((r) => sampled.get(r) as Float32Array);
    const texture = sampled.get('textureClass') as Float32Array;
    const echo = echoRoles.map((r) => sampled.get(r) as Float32Array);
    const bounds = stats.bounds;

    for (let k = 0; k < count; k++) {
      let missing = 0;
      for (const values of required) if (values[k] !== values[k]) missing++;
      if (missing > 0) {
        // Land (texture known) lacking another required input: a gap between the grids.
        if (texture[k] === texture[k]) stats.cellsMissingInput++;
        continue;
      }
      let flags = 0;
      for (let r = 0; r < ROLES.length; r++) {
        const v = all[r][k];
        cellRecord[ROLES[r]] = v;
        if (v !== v) flags |= INPUT_FLAG_BITS[ROLES[r] as keyof typeof INPUT_FLAG_BITS] ?? 0;
      }
      const lon = lonLat[2 * k];
      const lat = lonLat[2 * k + 1];
      cell.latitude_deg = lat;
      for (const [r, values] of sds) cellSd[r] = values[k];
      model.evaluate(cell, out, row0 * grid.width + k, sds.length > 0 ? cellSd : undefined);
      const index = k;
      let anyFinite = false;
      for (let b = 0; b < nModel; b++) {
        bands[b][index] = out[b];
        if (out[b] === out[b]) anyFinite = true;
      }
      if (!anyFinite) stats.cellsModelNodata++;
      for (let j = 0; j < echo.length; j++) bands[nModel + j][index] = echo[j][k];
      flagsBand[index] = flags;
      stats.cellsScreened++;
      if (lon < bounds[0]) bounds[0] = lon;
      if (lat < bounds[1]) bounds[1] = lat;
      if (lon > bounds[2]) bounds[2] = lon;
      if (lat > bounds[3]) bounds[3] = lat;
    }
    writeWindow(into, grid.width, row0, bands);
    return stats;
  };
  return { screen, close };
}
