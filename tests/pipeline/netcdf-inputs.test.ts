/**
 * NetCDF-4 / CF input shaped like a gridded climate product: monthly near-surface air temperature in
 * kelvin, stored as Int16 with scale_factor 0.01 and add_offset 273.15, _FillValue -32768 over the sea,
 * on a CF polar_stereographic grid mapping (the CF parameters of NSIDC's EPSG:3413) with a
 * "days since" time axis of ten years. It is written here with h5wasm (HDF5 with dimension scales, as
 * NetCDF-4 stores dimensions) from the demo's own air-temperature fields: each month holds
 * MAAT + warming x (year - middle year) + A x s x sin(2 pi (m + 0.5) / 12), s = sin(pi/12)/(pi/12),
 * i.e. the monthly means of the demo's sinusoidal year. One file then feeds three roles through the
 * inputs config: annualMean -> mean air temperature, annualAmplitude -> amplitude, trend -> warming.
 * The build must match the plain-GeoTIFF build within half a cell of resampling (plus the storage
 * step of 0.01 K).
 */
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import h5wasm from 'h5wasm/node';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles, type BuildSummary } from '../../data-pipeline/build/build-tiles';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';
import { MONTHLY_MEAN_ATTENUATION } from '../../data-pipeline/read/read-netcdf';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { makeTempDir, removeTempDirs, runCli, SMALL_DEMO, smallDemo } from './pipeline-fixtures';

afterAll(removeTempDirs);

const PIXEL = 4000;
const YEARS = 10;
const Y0 = 2001;

/** The demo grid `file` on a north-up EPSG:3413 grid of PIXEL metres (GDAL, point bilinear). */
async function onPolarGrid(dir: string, file: string, te: number[]): Promise<Float32Array> {
  const gdal = await loadGdal();
  const out = join(dir, `${file}.f32`);
  gdal.warp(join(dir, file), out, [
    '-of',
    'ENVI',
    '-ot',
    'Float32',
    '-t_srs',
    'EPSG:3413',
    '-te',
    ...te.map(String),
    '-tr',
    String(PIXEL),
    String(PIXEL),
    '-r',
    'bilinear',
    '-dstnodata',
    'nan',
    '-wo',
    'XSCALE=1',
    '-wo',
    'YSCALE=1',
  ]);
  const b = await readFile(out);
  return new Float32Array(b.buffer, b.byteOffset, b.byteLength / 4);
}

async function writeClimateNetcdf(dir: string, path: string): Promise<void> {
  const gdal = await loadGdal();
  // The demo region's box in EPSG:3413, snapped to the pixel size.
  const info = gdal.info(join(dir, 'mean-air-temperature.tif'));
  const gt = info.geoTransform!;
  const [w, h] = info.size;
  const corners = gdal.transform(
    'EPSG:4326',
    'EPSG:3413',
    Float64Array.from([
      gt[0],
      gt[3],
      gt[0] + w * gt[1],
      gt[3],
      gt[0],
      gt[3] + h * gt[5],
      gt[0] + w * gt[1],
      gt[3] + h * gt[5],
    ]),
  );
  const xs = [corners[0], corners[2], corners[4], corners[6]];
  const ys = [corners[1], corners[3], corners[5], corners[7]];
  const te = [
    Math.floor(Math.min(...xs) / PIXEL) * PIXEL,
    Math.floor(Math.min(...ys) / PIXEL) * PIXEL,
    Math.ceil(Math.max(...xs) / PIXEL) * PIXEL,
    Math.ceil(Math.max(...ys) / PIXEL) * PIXEL,
  ];
  const W = (te[2] - te[0]) / PIXEL;
  const H = (te[3] - te[1]) / PIXEL;
  const maat = await onPolarGrid(dir, 'mean-air-temperature.tif', te);
  const amp = await onPolarGrid(dir, 'air-temperature-amplitude.tif', te);
  const warm = await onPolarGrid(dir, 'warming-rate.tif', te);
  const T = YEARS * 12;
  const tas = new Int16Array(T * W * H);
  const time = new Float64Array(T);
  const mid = Y0 + (YEARS - 1) / 2;
  for (let t = 0; t < T; t++) {
    const year = Y0 + Math.floor(t / 12);
    const m = t % 12;
    // Mid-month, days since 2000-01-01 (standard calendar).
    time[t] = (Date.UTC(year, m, 15) - Date.UTC(2000, 0, 1)) / 86_400_000;
    const wave = MONTHLY_MEAN_ATTENUATION * Math.sin((2 * Math.PI * (m + 0.5)) / 12);
    for (let k = 0; k < W * H; k++) {
      const v = maat[k] + warm[k] * (year - mid) + amp[k] * wave;
      tas[t * W * H + k] = Number.isFinite(v)
        ? Math.round(v / 0.01) /* (v + 273.15 K - add_offset) / scale_factor */
        : -32768;
    }
  }
  await h5wasm.ready;
  const f = new h5wasm.File(path, 'w');
  try {
    const x = f.create_dataset({
      name: 'x',
      data: Float64Array.from({ length: W }, (_, i) => te[0] + (i + 0.5) * PIXEL),
    });
    x.create_attribute('units', 'm');
    x.create_attribute('standard_name', 'projection_x_coordinate');
    x.make_scale('x');
    const y = f.create_dataset({
      name: 'y',
      data: Float64Array.from({ length: H }, (_, j) => te[3] - (j + 0.5) * PIXEL),
    });
    y.create_attribute('units', 'm');
    y.create_attribute('standard_name', 'projection_y_coordinate');
    y.make_scale('y');
    const tv = f.create_dataset({ name: 'time', data: time });
    tv.create_attribute('units', 'days since 2000-01-01 00:00:00');
    tv.create_attribute('calendar', 'standard');
    tv.make_scale('time');
    const crs = f.create_dataset({ name: 'crs', data: new Int32Array([0]) });
    crs.create_attribute('grid_mapping_name', 'polar_stereographic');
    crs.create_attribute('straight_vertical_longitude_from_pole', -45);
    crs.create_attribute('latitude_of_projection_origin', 90);
    crs.create_attribute('standard_parallel', 70);
    crs.create_attribute('false_easting', 0);
    crs.create_attribute('false_northing', 0);
    crs.create_attribute('semi_major_axis', 6378137);
    crs.create_attribute('inverse_flattening', 298.257223563);
    const v = f.create_dataset({
      name: 'tas',
      data: tas,
      shape: [T, H, W],
      chunks: [12, H, W],
      compression: 'gzip',
    });
    v.create_attribute('units', 'K');
    v.create_attribute('standard_name', 'air_temperature');
    v.create_attribute('grid_mapping', 'crs');
    v.create_attribute('scale_factor', 0.01);
    v.create_attribute('add_offset', 273.15);
    v.create_attribute('_FillValue', new Int16Array([-32768]));
    v.attach_scale(0, '/time');
    v.attach_scale(1, '/y');
    v.attach_scale(2, '/x');
  } finally {
    f.close();
  }
}

let plain: BuildSummary;
let nc: BuildSummary;
let plainDir: string;
let ncDir: string;
let ncIn: string;

beforeAll(async () => {
  const plainIn = await smallDemo();
  ncIn = await smallDemo();
  await writeClimateNetcdf(ncIn, join(ncIn, 'tas_monthly.nc'));
  const configFile = join(ncIn, 'pile-atlas-inputs.json');
  const config = JSON.parse(await readFile(configFile, 'utf8'));
  const reduce: Record<string, [string, string]> = {
    meanAirTemp_C: ['annualMean', 'K'],
    airAmplitude_C: ['annualAmplitude', 'K'],
    warming_C_per_yr: ['trend', 'K/yr'],
  };
  for (const g of config.grids) {
    const r = reduce[g.role];
    if (!r) continue;
    g.file = 'tas_monthly.nc';
    g.unit = r[1];
    g.time = { reduce: r[0], from: `${Y0}-01`, to: `${Y0 + YEARS}-01` };
    delete g.nodata;
  }
  await writeFile(configFile, JSON.stringify(config));
  const root = await makeTempDir('netcdf');
  plainDir = join(root, 'plain');
  ncDir = join(root, 'nc');
  const common = { cellSize_m: SMALL_DEMO.cellSize_m, modelKind: 'basic' as const };
  plain = await buildTiles({ inDir: plainIn, outDir: plainDir, ...common });
  nc = await buildTiles({ inDir: ncIn, outDir: ncDir, ...common });
}, 300_000);

async function band(dir: string, id: string): Promise<Float32Array> {
  return (await readGeoTiffGrid(join(dir, 'geotiff', `${id}.tif`), { label: id })).grid.values;
}

describe('NetCDF-4 / CF input on a polar-stereographic grid with a monthly time axis', () => {
  it('records variable, grid mapping, scale/offset and the time reduction in the manifest', async () => {
    const manifest = JSON.parse(await readFile(join(ncDir, 'manifest.json'), 'utf8'));
    const src = manifest.sources.find((s: { role: string }) => s.role === 'airAmplitude_C');
    expect(src.reading.netcdf).toMatchObject({
      variable: 'tas',
      gridMapping: 'crs',
      scale: 0.01,
      offset: 273.15,
      fillValues: [-32768],
      fileUnit: 'K',
      time: { dimension: 'time', reduce: 'annualAmplitude', steps: 120, first: '2001-01', last: '2010-12' },
    });
    expect(src.reading.format).toBe('netCDF');
  });

  it('gives the mean, amplitude and trend of the plain build within half a cell and the storage step', async () => {
    expect(Math.abs(nc.cellsScreened - plain.cellsScreened) / plain.cellsScreened).toBeLessThan(0.03);
    const ga = JSON.parse(await readFile(join(plainDir, 'manifest.json'), 'utf8')).analysisGrid;
    const gb = JSON.parse(await readFile(join(ncDir, 'manifest.json'), 'utf8')).analysisGrid;
    const dc = Math.round((ga.geoTransform[0] - gb.geoTransform[0]) / ga.cellSize_m);
    const dr = Math.round((gb.geoTransform[3] - ga.geoTransform[3]) / ga.cellSize_m);
    // Tolerances: 0.01 K storage step and the second resampling (4 km pixels against 4 km cells).
    for (const [id, tol] of [
      ['meanAirTemp_C', 0.05],
      ['airAmplitude_C', 0.05],
      ['warming_C_per_yr', 0.002],
    ] as const) {
      const a = await band(plainDir, id);
      const b = await band(ncDir, id);
      const at = (r: number, c: number) =>
        r < 0 || c < 0 || r >= ga.height || c >= ga.width ? NaN : a[r * ga.width + c];
      let n = 0;
      let inside = 0;
      for (let r = 0; r < ga.height; r++) {
        for (let c = 0; c < ga.width; c++) {
          const rb = r + dr;
          const cb = c + dc;
          if (rb < 0 || cb < 0 || rb >= gb.height || cb >= gb.width) continue;
          const va = at(r, c);
          const vb = b[rb * gb.width + cb];
          if (Number.isNaN(va) || Number.isNaN(vb)) continue;
          // The range of the plain field within half a cell: centre and the midpoints to each neighbour.
          let lo = va;
          let hi = va;
          for (const [sr, sc] of [
            [-1, 0],
            [1, 0],
            [0, -1],
            [0, 1],
            [-1, -1],
            [-1, 1],
            [1, -1],
            [1, 1],
          ]) {
            const q = at(r + sr, c + sc);
            if (Number.isNaN(q)) continue;
            lo = Math.min(lo, (va + q) / 2);
            hi = Math.max(hi, (va + q) / 2);
          }
          n++;
          if (vb >= lo - tol && vb <= hi + tol) inside++;
        }
      }
      expect(n, id).toBeGreaterThan(0.9 * plain.cellsScreened);
      expect(inside / n, id).toBeGreaterThan(0.95);
    }
  });

  it('refuses a time axis without a reduction, and a missing variable, naming the file', async () => {
    const configFile = join(ncIn, 'pile-atlas-inputs.json');
    const good = await readFile(configFile, 'utf8');
    const out = join(await makeTempDir('nc-bad'), 'out');
    try {
      const config = JSON.parse(good);
      for (const g of config.grids) if (g.role === 'meanAirTemp_C') delete g.time;
      await writeFile(configFile, JSON.stringify(config));
      let r = await runCli(['build', '--in', ncIn, '--out', out, '--cell-size', '4000', '--model', 'basic']);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/tas_monthly\.nc: variable tas has a time axis of 120 steps; set "time"/);
      for (const g of config.grids) if (g.role === 'meanAirTemp_C') g.variable = 'tasmax';
      await writeFile(configFile, JSON.stringify(config));
      r = await runCli(['build', '--in', ncIn, '--out', out, '--cell-size', '4000', '--model', 'basic']);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/tas_monthly\.nc: no variable "tasmax" \(data variables: tas\)/);
    } finally {
      await writeFile(configFile, good);
    }
  });
});
