/**
 * NetCDF-4 / CF inputs, read with HDF5 compiled to WebAssembly (h5wasm; NetCDF-4 files are HDF5 files
 * with dimension scales). One data variable (named by `variable`, or the only one in the file) on a
 * regular Y, X grid, with an optional leading time dimension, is reduced to one 2-D field in physical
 * units and handed on as a raw Float32 grid with a GDAL VRT that carries its CRS and geotransform, so
 * the rest of the pipeline (GDAL warp, range checks) treats it like any other raster.
 *
 * CF conventions used (CF 1.10): `scale_factor`, `add_offset` (physical = stored x scale + offset),
 * `_FillValue` and `missing_value` (as stored values), `units`; the `grid_mapping` variable's
 * `crs_wkt` / `spatial_ref` (WKT, preferred) or its CF parameters for `polar_stereographic`,
 * `lambert_azimuthal_equal_area` and `latitude_longitude` (Appendix F); coordinate variables in m, km
 * or degrees; time as "<unit> since <date>" in the standard / gregorian / proleptic_gregorian or
 * noleap / 365_day calendars.
 *
 * Time reductions (inputs config `time.reduce`), over the months of [`from`, `to`) when given:
 * - `mean`: per-pixel mean of every valid step;
 * - `annualMean`: mean of the complete calendar years (12 monthly values each);
 * - `annualAmplitude`: first harmonic of the mean annual cycle of monthly means,
 *   A = sqrt(a^2 + b^2), a = (2/12) sum T_m cos(2 pi m / 12), b likewise with sin, divided by
 *   sin(pi/12) / (pi/12) = 0.98862 because a monthly mean of a sinusoid of amplitude A has amplitude
 *   A sin(pi/12) / (pi/12) (the mean of sin over one twelfth of its period); exact for a sinusoid;
 * - `trend`: ordinary least-squares slope of the complete years' annual means against the year, per
 *   year (the unit gains "/yr").
 * A pixel lacking any month of a year used drops that year; a pixel left with no year is nodata.
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { open, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import h5wasm from 'h5wasm/node';
import type { BuildBudget } from '../build/build-budget';
import { gdalPath } from '../gdal/gdal-wasm';
import { InputError } from '../input-error';
import { reduceSteps, type StepReader, type TimeStep } from './netcdf-time-reduce';

export { MONTHLY_MEAN_ATTENUATION } from './netcdf-time-reduce';

export type TimeReduce = 'mean' | 'annualMean' | 'annualAmplitude' | 'trend';

export interface NetcdfOptions {
  label: string;
  variable?: string;
  time?: { reduce: TimeReduce; from?: string; to?: string };
  budget: BuildBudget;
}

export interface NetcdfResult {
  /** VRT over the derived raw Float32 field (physical units, NaN nodata, scale 1). */
  vrtPath: string;
  /** What was read, for the manifest. */
  reading: Record<string, unknown>;
  /** The unit of the derived field (CF `units`, "/yr" appended for a trend), or null. */
  unit: string | null;
}

const HDF5_SIGNATURE = [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];

/** True when the file starts with the HDF5 signature (NetCDF-4 files do). */
export async function isHdf5File(path: string): Promise<boolean> {
  const fh = await open(path, 'r');
  try {
    const b = new Uint8Array(8);
    const { bytesRead } = await fh.read(b, 0, 8, 0);
    return bytesRead === 8 && HDF5_SIGNATURE.every((v, i) => b[i] === v);
  } finally {
    await fh.close();
  }
}

type H5Dataset = InstanceType<typeof h5wasm.Dataset>;
type H5File = InstanceType<typeof h5wasm.File>;

function attr(ds: H5Dataset, name: string): unknown {
  if (!(name in ds.attrs)) return undefined;
  const v = ds.get_attribute(name, true) as unknown;
  return Array.isArray(v) && v.length === 1 ? v[0] : v;
}
const num = (v: unknown): number | undefined =>
  typeof v === 'number' ? v : typeof v === 'bigint' ? Number(v) : undefined;
const str = (v: unknown): string | undefined => (typeof v === 'string' ? v : undefined);

function datasets(f: H5File): { name: string; ds: H5Dataset }[] {
  const out: { name: string; ds: H5Dataset }[] = [];
  for (const name of f.keys()) {
    const obj = f.get(name);
    if (obj instanceof h5wasm.Dataset) out.push({ name, ds: obj });
  }
  return out;
}

function numbers(ds: H5Dataset): number[] {
  const v = ds.value as unknown;
  return Array.from(v as ArrayLike<number | bigint>, Number);
}

/** The CF grid mapping as a CRS GDAL takes (WKT, or a PROJ string built from the CF parameters). */
function crsOfGridMapping(label: string, gm: H5Dataset | undefined, xUnits: string): string {
  if (!gm) {
    if (/degree/i.test(xUnits)) return 'EPSG:4326';
    throw new InputError(
      `${label}: CRS cannot be read (the variable has no grid_mapping and its x coordinate is in "${xUnits}", not degrees)`,
    );
  }
  const wkt = str(attr(gm, 'crs_wkt')) ?? str(attr(gm, 'spatial_ref'));
  if (wkt) return wkt;
  const name = str(attr(gm, 'grid_mapping_name')) ?? '';
  const p = (k: string) => num(attr(gm, k));
  const a = p('semi_major_axis');
  const invF = p('inverse_flattening');
  const earth =
    a !== undefined
      ? ` +a=${a} ${invF ? `+rf=${invF}` : `+b=${p('semi_minor_axis') ?? a}`}`
      : ' +datum=WGS84';
  const fe = ` +x_0=${p('false_easting') ?? 0} +y_0=${p('false_northing') ?? 0}`;
  if (name === 'latitude_longitude') return `+proj=longlat${earth} +no_defs`;
  if (name === 'polar_stereographic') {
    const lat0 = p('latitude_of_projection_origin');
    const lon0 = p('straight_vertical_longitude_from_pole') ?? p('longitude_of_projection_origin');
    const ts = p('standard_parallel');
    const k0 = p('scale_factor_at_projection_origin');
    if (lat0 === undefined || lon0 === undefined || (ts === undefined && k0 === undefined)) {
      throw new InputError(`${label}: grid mapping polar_stereographic lacks its CF parameters`);
    }
    const scale = ts !== undefined ? ` +lat_ts=${ts}` : ` +k_0=${k0}`;
    return `+proj=stere +lat_0=${lat0} +lon_0=${lon0}${scale}${fe}${earth} +units=m +no_defs`;
  }
  if (name === 'lambert_azimuthal_equal_area') {
    const lat0 = p('latitude_of_projection_origin');
    const lon0 = p('longitude_of_projection_origin');
    if (lat0 === undefined || lon0 === undefined) {
      throw new InputError(`${label}: grid mapping lambert_azimuthal_equal_area lacks its CF parameters`);
    }
    return `+proj=laea +lat_0=${lat0} +lon_0=${lon0}${fe}${earth} +units=m +no_defs`;
  }
  throw new InputError(
    `${label}: CRS cannot be read (grid mapping "${name || 'unnamed'}" without crs_wkt; supported by parameters: ` +
      'polar_stereographic, lambert_azimuthal_equal_area, latitude_longitude)',
  );
}

/** Start, step and count of a regular coordinate axis, or an InputError naming it. */
function regularAxis(label: string, name: string, v: number[]): { first: number; step: number } {
  if (v.length < 2)
    throw new InputError(`${label}: coordinate ${name} has ${v.length} value(s), need 2 or more`);
  const step = (v[v.length - 1] - v[0]) / (v.length - 1);
  for (let i = 1; i < v.length; i++) {
    if (Math.abs(v[i] - v[i - 1] - step) > 1e-6 * Math.abs(step) + 1e-9) {
      throw new InputError(`${label}: coordinate ${name} is not regularly spaced (at index ${i})`);
    }
  }
  if (step === 0) throw new InputError(`${label}: coordinate ${name} has zero spacing`);
  return { first: v[0], step };
}

const DAY_MS = 86_400_000;
const UNIT_DAYS: Record<string, number> = {
  days: 1,
  day: 1,
  hours: 1 / 24,
  hour: 1 / 24,
  seconds: 1 / 86400,
};

/** Calendar year and month (1-12) of each time value. */
function monthsOf(
  label: string,
  time: number[],
  units: string,
  calendar: string,
): { y: number; m: number }[] {
  const m = /^\s*(\w+)\s+since\s+(\d{1,4})-(\d{1,2})-(\d{1,2})/.exec(units);
  if (!m || UNIT_DAYS[m[1]] === undefined) {
    throw new InputError(`${label}: time units "${units}" not understood (expected "days since YYYY-MM-DD")`);
  }
  const perDay = UNIT_DAYS[m[1]];
  const [y0, mo0, d0] = [Number(m[2]), Number(m[3]), Number(m[4])];
  if (/^(noleap|365_day)$/.test(calendar)) {
    const cum = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334, 365];
    const start = cum[mo0 - 1] + d0 - 1;
    return time.map((t) => {
      const days = Math.floor(start + t * perDay);
      const y = y0 + Math.floor(days / 365);
      const doy = ((days % 365) + 365) % 365;
      let mo = 0;
      while (cum[mo + 1] <= doy) mo++;
      return { y, m: mo + 1 };
    });
  }
  if (!/^(standard|gregorian|proleptic_gregorian)$/.test(calendar)) {
    throw new InputError(`${label}: time calendar "${calendar}" not supported (standard, gregorian, noleap)`);
  }
  const origin = Date.UTC(y0, mo0 - 1, d0);
  return time.map((t) => {
    const d = new Date(origin + t * perDay * DAY_MS);
    return { y: d.getUTCFullYear(), m: d.getUTCMonth() + 1 };
  });
}

/** 'YYYY-MM' (or YYYY-MM-DD) to a month index y * 12 + m - 1. */
function monthIndex(label: string, s: string): number {
  const m = /^(\d{4})-(\d{2})/.exec(s);
  if (!m) throw new InputError(`${label}: time.from / time.to "${s}" is not YYYY-MM`);
  return Number(m[1]) * 12 + Number(m[2]) - 1;
}

/** A named dataset of the file. */
interface NamedDataset {
  name: string;
  ds: H5Dataset;
}

/** The chosen variable's regular Y, X grid (coordinates in m or degrees) and CRS. */
interface NetcdfGrid {
  /** Number of dimensions: 2 (y, x) or 3 (time, y, x). */
  nd: number;
  width: number;
  height: number;
  /** Time steps (1 without a time axis). */
  steps: number;
  x: { first: number; step: number };
  y: { first: number; step: number };
  gmName: string | undefined;
  srs: string;
}

/** CF packing and unit attributes of the chosen variable. */
interface CfPacking {
  scale: number;
  offset: number;
  fills: number[];
  units: string | null;
}

/** The time steps to reduce, and how. */
interface TimeSelection {
  timeName: string | undefined;
  used: TimeStep[];
  r: TimeReduce;
}

/** Read and reduce the NetCDF-4 file at `path`; writes `<name>.f32` + `<name>.vrt` into `outDir`. */
export async function readNetcdf(
  path: string,
  outDir: string,
  name: string,
  o: NetcdfOptions,
): Promise<NetcdfResult> {
  const { label } = o;
  const f = await openNetcdf(path, label);
  try {
    const all = datasets(f);
    const chosen = chooseVariable(label, all, o.variable);
    const grid = readGrid(label, all, chosen, o.budget);
    const packing = readPacking(chosen.ds);
    const sel = selectTimeSteps(label, all, chosen, grid, o.time);
    const step = stepReader(chosen.ds, grid, packing);
    const result = reduceSteps(label, sel.r, grid.nd, grid.width * grid.height, sel.used, step);
    const vrtPath = await writeFieldVrt(outDir, name, result, grid, chosen.name);
    const { units } = packing;
    const unit = units
      ? sel.r === 'trend' && grid.nd === 3 && grid.steps > 1
        ? `${units}/yr`
        : units
      : null;
    return { vrtPath, unit, reading: readingOf(chosen.name, grid, packing, sel) };
  } finally {
    f.close();
  }
}

/** The file opened with h5wasm, or an InputError saying it is not a NetCDF-4 file h5wasm can read. */
async function openNetcdf(path: string, label: string): Promise<H5File> {
  await h5wasm.ready;
  try {
    return new h5wasm.File(path, 'r');
  } catch (err) {
    throw new InputError(`${label}: not a NetCDF-4 file h5wasm can read (${(err as Error).message})`);
  }
}

/** The data variable named by `variable`, or the only one in the file. */
function chooseVariable(label: string, all: NamedDataset[], variable: string | undefined): NamedDataset {
  const isCoord = (d: H5Dataset) => d.get_scale_name() !== null;
  const isMapping = (d: H5Dataset) => attr(d, 'grid_mapping_name') !== undefined || d.shape?.length === 0;
  const dataVars = all.filter(({ ds }) => !isCoord(ds) && !isMapping(ds) && (ds.shape?.length ?? 0) >= 2);
  const chosen = variable ? all.find((d) => d.name === variable) : undefined;
  if (variable && !chosen) {
    throw new InputError(
      `${label}: no variable "${variable}" (data variables: ${dataVars.map((d) => d.name).join(', ') || 'none'})`,
    );
  }
  if (chosen) return chosen;
  if (dataVars.length !== 1) {
    throw new InputError(
      `${label}: ${dataVars.length} data variables (${dataVars.map((d) => d.name).join(', ')}); name one with "variable"`,
    );
  }
  return dataVars[0];
}

/** The coordinate variable attached to dimension `i` of the chosen variable. */
function coordinateVariable(
  label: string,
  all: NamedDataset[],
  chosen: NamedDataset,
  i: number,
): NamedDataset {
  const scales = chosen.ds.get_attached_scales(i) as string[] | undefined;
  const n = scales && scales.length ? scales[0].replace(/^\//, '') : undefined;
  const d = n ? all.find((x) => x.name === n) : undefined;
  if (!d) throw new InputError(`${label}: dimension ${i} of ${chosen.name} has no coordinate variable`);
  return d;
}

/** The chosen variable's shape, regular axes and CRS, checked against the input budget. */
function readGrid(label: string, all: NamedDataset[], chosen: NamedDataset, budget: BuildBudget): NetcdfGrid {
  const v = chosen.ds;
  const shape = (v.shape ?? []).map(Number);
  if (shape.length < 2 || shape.length > 3) {
    throw new InputError(
      `${label}: variable ${chosen.name} has ${shape.length} dimensions, expected (time,) y, x`,
    );
  }
  const nd = shape.length;
  const xVar = coordinateVariable(label, all, chosen, nd - 1);
  const yVar = coordinateVariable(label, all, chosen, nd - 2);
  const height = shape[nd - 2];
  const width = shape[nd - 1];
  const steps = nd === 3 ? shape[0] : 1;
  const bytes = steps * width * height * (v.metadata.size ?? 4);
  if (bytes > budget.maxInputBytes) {
    throw new InputError(
      `${label}: variable ${chosen.name} declares ${steps} x ${height} x ${width} values (${bytes} bytes), over the ` +
        'budget per input; raise --max-input-mb if the file is genuine',
    );
  }
  const xUnits = str(attr(xVar.ds, 'units')) ?? '';
  const yUnits = str(attr(yVar.ds, 'units')) ?? '';
  const toM = (u: string) => (/^km$/i.test(u) ? 1000 : 1);
  const x = regularAxis(
    label,
    xVar.name,
    numbers(xVar.ds).map((c) => c * toM(xUnits)),
  );
  const y = regularAxis(
    label,
    yVar.name,
    numbers(yVar.ds).map((c) => c * toM(yUnits)),
  );
  const gmName = str(attr(v, 'grid_mapping'));
  const gm = gmName ? all.find((d) => d.name === gmName)?.ds : undefined;
  if (gmName && !gm) throw new InputError(`${label}: grid_mapping variable "${gmName}" not found`);
  const srs = crsOfGridMapping(label, gm, xUnits);
  return { nd, width, height, steps, x, y, gmName, srs };
}

/** `scale_factor`, `add_offset`, `_FillValue` / `missing_value` and `units` of a variable. */
function readPacking(v: H5Dataset): CfPacking {
  const scale = num(attr(v, 'scale_factor')) ?? 1;
  const offset = num(attr(v, 'add_offset')) ?? 0;
  const fills = [num(attr(v, '_FillValue')), num(attr(v, 'missing_value'))].filter(
    (q): q is number => q !== undefined,
  );
  const units = str(attr(v, 'units')) ?? null;
  return { scale, offset, fills, units };
}

/** The time steps within [`from`, `to`) and the reduction (required when there are several steps). */
function selectTimeSteps(
  label: string,
  all: NamedDataset[],
  chosen: NamedDataset,
  grid: NetcdfGrid,
  time: NetcdfOptions['time'],
): TimeSelection {
  const { nd, steps } = grid;
  let months: { y: number; m: number }[] = [];
  let timeName: string | undefined;
  if (nd === 3) {
    const t = coordinateVariable(label, all, chosen, 0);
    timeName = t.name;
    months = monthsOf(
      label,
      numbers(t.ds),
      str(attr(t.ds, 'units')) ?? '',
      (str(attr(t.ds, 'calendar')) ?? 'standard').toLowerCase(),
    );
  }
  const reduce: TimeReduce | undefined = time?.reduce;
  if (nd === 3 && steps > 1 && !reduce) {
    throw new InputError(
      `${label}: variable ${chosen.name} has a time axis of ${steps} steps; set "time": { "reduce": ... } in the inputs config`,
    );
  }
  const from = time?.from ? monthIndex(label, time.from) : -Infinity;
  const to = time?.to ? monthIndex(label, time.to) : Infinity;
  const used = months.length
    ? months
        .map((mo, i) => ({ ...mo, i }))
        .filter((mo) => {
          const k = mo.y * 12 + mo.m - 1;
          return k >= from && k < to;
        })
    : [{ y: 0, m: 0, i: 0 }];
  if (used.length === 0)
    throw new InputError(`${label}: no time step of ${chosen.name} falls in [${time?.from}, ${time?.to})`);
  return { timeName, used, r: reduce ?? 'mean' };
}

/** Reads one time step (the whole field of a 2-D variable) in physical units, NaN for fill values. */
function stepReader(v: H5Dataset, grid: NetcdfGrid, packing: CfPacking): StepReader {
  const { nd } = grid;
  const { fills, scale, offset } = packing;
  const n = grid.width * grid.height;
  const physical = (stored: number) =>
    fills.includes(stored) || !Number.isFinite(stored) ? NaN : stored * scale + offset;
  return (i: number): Float64Array => {
    const raw = (nd === 3 ? v.slice([[i, i + 1], [], []]) : v.value) as ArrayLike<number | bigint>;
    const out = new Float64Array(n);
    for (let k = 0; k < n; k++) out[k] = physical(Number(raw[k]));
    return out;
  };
}

/** Write the field as `<name>.f32` plus a VRT carrying its CRS and geotransform; returns the VRT path. */
async function writeFieldVrt(
  outDir: string,
  name: string,
  result: Float32Array,
  grid: NetcdfGrid,
  description: string,
): Promise<string> {
  const { x, y, width, height, srs } = grid;
  // CF rows run along y as stored; the geotransform takes the first row's edge.
  const gt = [x.first - x.step / 2, x.step, 0, y.first - y.step / 2, 0, y.step];
  const raw = join(outDir, `${name}.f32`);
  const fd = openSync(raw, 'w');
  try {
    writeSync(fd, new Uint8Array(result.buffer));
  } finally {
    closeSync(fd);
  }
  const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
  const vrtPath = join(outDir, `${name}.vrt`);
  await writeFile(
    vrtPath,
    `<VRTDataset rasterXSize="${width}" rasterYSize="${height}">` +
      `<SRS dataAxisToSRSAxisMapping="1,2">${esc(srs)}</SRS><GeoTransform>${gt.join(', ')}</GeoTransform>` +
      `<VRTRasterBand dataType="Float32" band="1" subClass="VRTRawRasterBand">` +
      `<SourceFilename relativeToVRT="0">${esc(gdalPath(raw))}</SourceFilename>` +
      `<ImageOffset>0</ImageOffset><PixelOffset>4</PixelOffset><LineOffset>${4 * width}</LineOffset>` +
      `<ByteOrder>LSB</ByteOrder><NoDataValue>nan</NoDataValue>` +
      `<Description>${esc(description)}</Description>` +
      `</VRTRasterBand></VRTDataset>`,
  );
  return vrtPath;
}

/** What was read, for the manifest. */
function readingOf(
  variable: string,
  grid: NetcdfGrid,
  packing: CfPacking,
  sel: TimeSelection,
): Record<string, unknown> {
  const { srs } = grid;
  const { used } = sel;
  return {
    format: 'NetCDF-4 (h5wasm)',
    variable,
    gridMapping: grid.gmName ?? null,
    crs: srs.length > 200 ? `${srs.slice(0, 200)}...` : srs,
    scale: packing.scale,
    offset: packing.offset,
    fillValues: packing.fills,
    fileUnit: packing.units,
    ...(sel.timeName
      ? {
          time: {
            dimension: sel.timeName,
            reduce: sel.r,
            steps: used.length,
            first: `${used[0].y}-${String(used[0].m).padStart(2, '0')}`,
            last: `${used[used.length - 1].y}-${String(used[used.length - 1].m).padStart(2, '0')}`,
          },
        }
      : {}),
  };
}
