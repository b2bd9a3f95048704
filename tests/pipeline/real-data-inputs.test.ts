/**
 * Real-data-shaped inputs, made here from the small demo region with GDAL as a GIS team would publish
 * them: bedrock depth as a Homolosine (Interrupted Goode) Cloud Optimized GeoTIFF of Int16 decimetres
 * with scale 0.1 in its metadata, water content on EASE-Grid 2.0 North (EPSG:6931), air temperature as
 * a GDAL virtual mosaic (VRT) of two tiles, the warming rate in a custom PROJ string (an oblique
 * Lambert azimuthal projection no EPSG code names). The build on them must match the build on the
 * plain GeoTIFFs of the same numbers within half a cell of resampling: for nearly every cell the value
 * lies within the range the plain build takes within half a cell of that cell's centre.
 */
import { readFile, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles, type BuildSummary } from '../../data-pipeline/build/build-tiles';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';
import { inputsConfigSchema } from '../../data-pipeline/inputs-config';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import {
  gdalReproject,
  makeTempDir,
  removeTempDirs,
  runCli,
  SMALL_DEMO,
  smallDemo,
} from './pipeline-fixtures';

afterAll(removeTempDirs);

const IGH = '+proj=igh +lon_0=0 +datum=WGS84 +units=m +no_defs';
const CUSTOM_LAEA = '+proj=laea +lat_0=78 +lon_0=-8 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs';
const POINT = ['-wo', 'XSCALE=1', '-wo', 'YSCALE=1'];

let plain: BuildSummary;
let real: BuildSummary;
let plainDir: string;
let realDir: string;
let realIn: string;

async function band(dir: string, id: string) {
  const g = (await readGeoTiffGrid(join(dir, 'geotiff', `${id}.tif`), { label: id })).grid;
  const manifest = JSON.parse(await readFile(join(dir, 'manifest.json'), 'utf8'));
  return { values: g.values, width: g.width, height: g.height, grid: manifest.analysisGrid };
}

/** Make the real-data-shaped copies of the demo inputs in `dir` and point the config at them. */
async function makeRealShaped(dir: string): Promise<void> {
  const gdal = await loadGdal();
  // Bedrock: Homolosine at 2 km, then Int16 decimetres (scale 0.1) as a deflate COG.
  await gdalReproject(join(dir, 'bedrock-depth.tif'), join(dir, 'bedrock-igh.tif'), IGH, 2000, 'continuous', [
    '-of',
    'GTiff',
    ...POINT,
  ]);
  gdal.translate(join(dir, 'bedrock-igh.tif'), join(dir, 'bedrock-igh-int16-cog.tif'), [
    '-of',
    'COG',
    '-ot',
    'Int16',
    '-scale',
    '0',
    '3000',
    '0',
    '30000',
    '-a_scale',
    '0.1',
    '-a_offset',
    '0',
    '-a_nodata',
    '-32768',
    '-co',
    'COMPRESS=DEFLATE',
    '-co',
    'PREDICTOR=2',
    '-co',
    'BLOCKSIZE=128',
  ]);
  await rm(join(dir, 'bedrock-igh.tif'));
  // Water content: EASE-Grid 2.0 North at 3 km.
  await gdalReproject(
    join(dir, 'water-content.tif'),
    join(dir, 'water-ease2.tif'),
    'EPSG:6931',
    3000,
    'continuous',
    ['-of', 'GTiff', '-co', 'COMPRESS=LZW', ...POINT],
  );
  // Air temperature: two tiles (west and east halves) and a VRT mosaic of them.
  const info = gdal.info(join(dir, 'mean-air-temperature.tif'));
  const [w, h] = info.size;
  const half = Math.floor(w / 2);
  gdal.translate(join(dir, 'mean-air-temperature.tif'), join(dir, 'maat-west.tif'), [
    '-srcwin',
    '0',
    '0',
    String(half),
    String(h),
  ]);
  gdal.translate(join(dir, 'mean-air-temperature.tif'), join(dir, 'maat-east.tif'), [
    '-srcwin',
    String(half),
    '0',
    String(w - half),
    String(h),
  ]);
  gdal.buildVrt([join(dir, 'maat-west.tif'), join(dir, 'maat-east.tif')], join(dir, 'maat-mosaic.vrt'), []);
  // Warming rate: a custom PROJ string, written into the GeoTIFF as user-defined GeoKeys with parameters.
  await gdalReproject(
    join(dir, 'warming-rate.tif'),
    join(dir, 'warming-custom.tif'),
    CUSTOM_LAEA,
    5000,
    'continuous',
    ['-of', 'GTiff', ...POINT],
  );
  const configFile = join(dir, 'pile-atlas-inputs.json');
  const config = inputsConfigSchema.parse(JSON.parse(await readFile(configFile, 'utf8')));
  const swap: Record<string, string> = {
    bedrockDepth_m: 'bedrock-igh-int16-cog.tif',
    waterContent_m3m3: 'water-ease2.tif',
    meanAirTemp_C: 'maat-mosaic.vrt',
    warming_C_per_yr: 'warming-custom.tif',
  };
  for (const g of config.grids) {
    g.file = swap[g.role] ?? g.file;
    if (g.role === 'bedrockDepth_m') delete g.nodata;
  }
  await writeFile(configFile, JSON.stringify(config));
}

beforeAll(async () => {
  const plainIn = await smallDemo();
  realIn = await smallDemo();
  await makeRealShaped(realIn);
  const root = await makeTempDir('real');
  plainDir = join(root, 'plain');
  realDir = join(root, 'real');
  const common = { cellSize_m: SMALL_DEMO.cellSize_m, modelKind: 'basic' as const };
  plain = await buildTiles({ inDir: plainIn, outDir: plainDir, ...common });
  real = await buildTiles({ inDir: realIn, outDir: realDir, ...common });
}, 300_000);

/**
 * Share of cells (valid in both builds) whose value in `b` lies within the range `a` takes within half
 * a cell of the cell's centre (the centre, the four edge midpoints and the four corners, each by
 * bilinear interpolation of `a`), widened by `tol`.
 */
function shareWithinHalfCell(
  a: Awaited<ReturnType<typeof band>>,
  b: Awaited<ReturnType<typeof band>>,
  tol: number,
): { share: number; n: number } {
  const dc = Math.round((a.grid.geoTransform[0] - b.grid.geoTransform[0]) / a.grid.cellSize_m);
  const dr = Math.round((b.grid.geoTransform[3] - a.grid.geoTransform[3]) / a.grid.cellSize_m);
  const at = (r: number, c: number) =>
    r < 0 || c < 0 || r >= a.height || c >= a.width ? NaN : a.values[r * a.width + c];
  let inside = 0;
  let n = 0;
  for (let r = 0; r < a.height; r++) {
    for (let c = 0; c < a.width; c++) {
      const rb = r + dr;
      const cb = c + dc;
      if (rb < 0 || cb < 0 || rb >= b.height || cb >= b.width) continue;
      const va = at(r, c);
      const vb = b.values[rb * b.width + cb];
      if (Number.isNaN(va) || Number.isNaN(vb)) continue;
      let lo = va;
      let hi = va;
      for (const [sr, sc] of [
        [-1, -1],
        [-1, 1],
        [1, -1],
        [1, 1],
      ]) {
        const q = [va, at(r + sr, c), at(r, c + sc), at(r + sr, c + sc)];
        const edgeR = (va + q[1]) / 2;
        const edgeC = (va + q[2]) / 2;
        const corner = (q[0] + q[1] + q[2] + q[3]) / 4;
        for (const v of [edgeR, edgeC, corner]) {
          if (Number.isNaN(v)) continue;
          lo = Math.min(lo, v);
          hi = Math.max(hi, v);
        }
      }
      n++;
      if (vb >= lo - tol && vb <= hi + tol) inside++;
    }
  }
  return { share: inside / n, n };
}

describe('real-data-shaped inputs (Homolosine scaled Int16 COG, EASE-Grid 2.0, VRT mosaic, custom PROJ)', () => {
  it('reads every CRS by name and records format, scale and offset in the manifest', async () => {
    const manifest = JSON.parse(await readFile(join(realDir, 'manifest.json'), 'utf8'));
    const by = (role: string) => manifest.sources.find((s: { role: string }) => s.role === role);
    expect(by('waterContent_m3m3').crs).toBe('EPSG:6931');
    expect(by('bedrockDepth_m').crs).toBe('custom CRS (Interrupted Goode Homolosine)');
    expect(by('bedrockDepth_m').reading).toMatchObject({ format: 'GTiff', dataType: 'Int16', scale: 0.1 });
    expect(by('meanAirTemp_C').reading.format).toBe('VRT');
    expect(by('warming_C_per_yr').crs).toBe('custom CRS (Lambert Azimuthal Equal Area)');
    expect(manifest.parameters.resampling.library).toMatch(/GDAL/);
  });

  it('screens the same land and cells as the plain build', () => {
    expect(Math.abs(real.cellsScreened - plain.cellsScreened) / plain.cellsScreened).toBeLessThan(0.03);
    expect(real.cellsTotal).toBeLessThan(1.1 * plain.cellsTotal);
  });

  it('matches the plain build within half a cell of resampling, band by band', async () => {
    // Tolerances: the storage step of each re-encoding (0.1 m for Int16 decimetres) plus a margin for
    // the second resampling at the re-encoded pixel size (2-5 km pixels against 4 km cells).
    const cases: [string, number][] = [
      ['bedrockDepth', 0.06],
      ['waterContent_m3m3', 0.01],
      ['meanAirTemp_C', 1e-4],
      ['warming_C_per_yr', 0.001],
    ];
    for (const [id, tol] of cases) {
      const { share, n } = shareWithinHalfCell(await band(plainDir, id), await band(realDir, id), tol);
      expect(n, id).toBeGreaterThan(0.9 * plain.cellsScreened);
      expect(share, id).toBeGreaterThan(0.95);
    }
  });

  it('applies the scale: mean bedrock depth within 3 % of the plain build (not 10 x too deep)', async () => {
    const a = await band(plainDir, 'bedrockDepth');
    const b = await band(realDir, 'bedrockDepth');
    const meanOf = (v: Float32Array) => {
      let s = 0;
      let n = 0;
      for (const x of v) {
        if (Number.isNaN(x)) continue;
        s += x;
        n++;
      }
      return s / n;
    };
    expect(meanOf(b.values) / meanOf(a.values)).toBeGreaterThan(0.97);
    expect(meanOf(b.values) / meanOf(a.values)).toBeLessThan(1.03);
  });

  it('names the applied scale when a scaled value is out of range', async () => {
    const dir = await smallDemo();
    const gdal = await loadGdal();
    // Wrongly declared scale 10 (instead of 0.1): bedrock becomes 100 x too deep, some beyond 1000 m.
    gdal.translate(join(realIn, 'bedrock-igh-int16-cog.tif'), join(dir, 'bedrock-bad-scale.tif'), [
      '-of',
      'COG',
      '-a_scale',
      '10',
    ]);
    const configFile = join(dir, 'pile-atlas-inputs.json');
    const config = JSON.parse(await readFile(configFile, 'utf8'));
    for (const g of config.grids) {
      if (g.role === 'bedrockDepth_m') {
        g.file = 'bedrock-bad-scale.tif';
        delete g.nodata;
      }
    }
    await writeFile(configFile, JSON.stringify(config));
    const out = join(await makeTempDir('bad-scale'), 'out');
    const r = await runCli(['build', '--in', dir, '--out', out, '--cell-size', '4000', '--model', 'basic']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bedrock-bad-scale\.tif: bedrockDepth_m value/);
    expect(r.stderr).toMatch(/x scale 10 \+ offset 0 from the file's metadata/);
    expect(r.stderr).toMatch(/plausible range 0\.\.1000/);
  });

  it('refuses a VRT whose sources lie outside the inputs directory, naming the file it reads', async () => {
    const dir = await smallDemo();
    const elsewhere = await smallDemo();
    const gdal = await loadGdal();
    gdal.buildVrt([join(elsewhere, 'bedrock-depth.tif')], join(dir, 'bedrock-outside.vrt'), []);
    const configFile = join(dir, 'pile-atlas-inputs.json');
    const config = JSON.parse(await readFile(configFile, 'utf8'));
    for (const g of config.grids) if (g.role === 'bedrockDepth_m') g.file = 'bedrock-outside.vrt';
    await writeFile(configFile, JSON.stringify(config));
    const out = join(await makeTempDir('vrt-outside'), 'out');
    const r = await runCli(['build', '--in', dir, '--out', out, '--cell-size', '4000', '--model', 'basic']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /bedrock-outside\.vrt: reads .*bedrock-depth\.tif, which leaves the inputs directory/,
    );
  });
});
