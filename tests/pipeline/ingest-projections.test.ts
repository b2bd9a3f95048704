import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles, type BuildSummary } from '../../data-pipeline/build/build-tiles';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';
import { writeBandGeoTiff } from '../../data-pipeline/export/write-band-geotiff';
import { inputsConfigSchema } from '../../data-pipeline/inputs-config';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { gdalReproject, makeTempDir, SMALL_DEMO, smallDemo, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

/**
 * Reproject a demo grid into `crs` at `pixel_m` with GDAL (as a GIS team re-encodes a product), point
 * bilinear at each pixel centre (XSCALE = YSCALE = 1, as the build samples), so the check below measures
 * double resampling and not GDAL's area averaging on downsampling.
 */
async function reproject(
  dir: string,
  file: string,
  outFile: string,
  crs: string,
  pixel_m: number,
  kind: string,
) {
  await gdalReproject(join(dir, file), join(dir, outFile), crs, pixel_m, kind, [
    '-of',
    'GTiff',
    '-co',
    'COMPRESS=DEFLATE',
    '-wo',
    'XSCALE=1',
    '-wo',
    'YSCALE=1',
  ]);
}

let original: BuildSummary;
let mixed: BuildSummary;
let originalDir: string;
let mixedDir: string;

beforeAll(async () => {
  const inDir = await smallDemo();
  const mixedIn = await smallDemo();
  // Conic (Canada Atlas Lambert, Alaska Albers) and azimuthal inputs at other resolutions and extents.
  await reproject(mixedIn, 'water-content.tif', 'water-lcc.tif', 'EPSG:3978', 3000, 'continuous');
  await reproject(mixedIn, 'bedrock-depth.tif', 'bedrock-aea.tif', 'EPSG:3338', 5000, 'continuous');
  await reproject(mixedIn, 'soil-texture.tif', 'texture-laea.tif', 'EPSG:3575', 4000, 'class');
  // Optional inputs: a ground-temperature grid over the western half only, geothermal flux in mW/m².
  const gt = await readGeoTiffGrid(join(mixedIn, 'mean-air-temperature.tif'), { label: 'maat' });
  const half = new Float32Array(gt.grid.values.length);
  const flux = new Float32Array(gt.grid.values.length);
  for (let i = 0; i < half.length; i++) {
    const col = i % gt.grid.width;
    half[i] = col < gt.grid.width / 2 && !Number.isNaN(gt.grid.values[i]) ? -1.5 : NaN;
    flux[i] = Number.isNaN(gt.grid.values[i]) ? NaN : 60;
  }
  for (const [file, values] of [
    ['ground-temperature.tif', half],
    ['geothermal-flux.tif', flux],
  ] as const) {
    await writeBandGeoTiff({
      path: join(mixedIn, file),
      values,
      width: gt.grid.width,
      height: gt.grid.height,
      geoTransform: gt.grid.geoTransform,
      crs: 'EPSG:4326',
      description: 'INVENTED DEMO DATA',
    });
  }
  const configFile = join(mixedIn, 'pile-atlas-inputs.json');
  const config = inputsConfigSchema.parse(JSON.parse(await readFile(configFile, 'utf8')));
  const swap: Record<string, string> = {
    waterContent_m3m3: 'water-lcc.tif',
    bedrockDepth_m: 'bedrock-aea.tif',
    textureClass: 'texture-laea.tif',
  };
  for (const g of config.grids) g.file = swap[g.role] ?? g.file;
  config.grids.push({
    role: 'groundTemp_C',
    file: 'ground-temperature.tif',
    unit: 'degC',
    kind: 'continuous',
  });
  config.grids.push({
    role: 'geothermalFlux_W_m2',
    file: 'geothermal-flux.tif',
    unit: 'mW/m2',
    kind: 'continuous',
  });
  await writeFile(configFile, JSON.stringify(config));

  const root = await makeTempDir('ingest');
  originalDir = join(root, 'original');
  mixedDir = join(root, 'mixed');
  const common = { cellSize_m: SMALL_DEMO.cellSize_m, modelKind: 'basic' as const };
  original = await buildTiles({ inDir, outDir: originalDir, ...common });
  mixed = await buildTiles({ inDir: mixedIn, outDir: mixedDir, ...common });
}, 240_000);

async function band(dir: string, id: string): Promise<Float32Array> {
  return (await readGeoTiffGrid(join(dir, 'geotiff', `${id}.tif`), { label: id })).grid.values;
}

describe('ingest of mixed projections, resolutions and optional inputs', () => {
  it('reads conic and azimuthal grids and records their CRSs', async () => {
    const manifest = JSON.parse(await readFile(join(mixedDir, 'manifest.json'), 'utf8'));
    const crs = new Set(manifest.sources.map((s: { crs: string }) => s.crs));
    expect(crs).toEqual(new Set(['EPSG:4326', 'EPSG:3978', 'EPSG:3338', 'EPSG:3575']));
    expect(manifest.sources.find((s: { role: string }) => s.role === 'geothermalFlux_W_m2').unit).toBe(
      'mW/m2',
    );
  });

  it('screens the same land as the original grids and agrees after double resampling', async () => {
    expect(Math.abs(mixed.cellsScreened - original.cellsScreened) / original.cellsScreened).toBeLessThan(
      0.08,
    );
    const a = await band(originalDir, 'waterContent_m3m3');
    const b = await band(mixedDir, 'waterContent_m3m3');
    // Both analysis grids are snapped to multiples of the cell size in EPSG:3413: match cells by offset.
    const ga = JSON.parse(await readFile(join(originalDir, 'manifest.json'), 'utf8')).analysisGrid;
    const gb = JSON.parse(await readFile(join(mixedDir, 'manifest.json'), 'utf8')).analysisGrid;
    const dc = Math.round((ga.geoTransform[0] - gb.geoTransform[0]) / ga.cellSize_m);
    const dr = Math.round((gb.geoTransform[3] - ga.geoTransform[3]) / ga.cellSize_m);
    const diffs: number[] = [];
    for (let r = 0; r < ga.height; r++) {
      for (let c = 0; c < ga.width; c++) {
        const rb = r + dr;
        const cb = c + dc;
        if (rb < 0 || cb < 0 || rb >= gb.height || cb >= gb.width) continue;
        const va = a[r * ga.width + c];
        const vb = b[rb * gb.width + cb];
        if (!Number.isNaN(va) && !Number.isNaN(vb)) diffs.push(Math.abs(va - vb));
      }
    }
    diffs.sort((x, y) => x - y);
    expect(diffs.length).toBeGreaterThan(0.9 * original.cellsScreened);
    // Median difference from resampling twice (1 km -> 3 km Lambert -> 4 km polar): a few hundredths.
    expect(diffs[Math.floor(diffs.length / 2)]).toBeLessThan(0.03);
  });

  it('uses the optional ground-temperature grid where it exists and flags the fallback elsewhere', async () => {
    const magt = await band(mixedDir, 'magt_C');
    const flags = await band(mixedDir, 'inputFlags');
    let fromGrid = 0;
    let fromModel = 0;
    for (let i = 0; i < magt.length; i++) {
      if (Number.isNaN(flags[i])) continue;
      // Bit 1: no ground-temperature grid; bit 2: no flux grid (given here); bit 4: no snow n-factor grid.
      expect(flags[i] & 2).toBe(0);
      expect(flags[i] & 4).toBe(4);
      if ((flags[i] & 1) === 0) {
        fromGrid++;
        expect(magt[i]).toBeCloseTo(-1.5, 5);
      } else fromModel++;
    }
    expect(fromGrid).toBeGreaterThan(100);
    expect(fromModel).toBeGreaterThan(100);
  });
});

describe('CRS definitions', () => {
  it('put each projection origin where its definition says (latitude of origin, central meridian)', () => {
    const cases: [string, number, number][] = [
      ['EPSG:3413', -45, 90],
      ['EPSG:3995', 0, 90],
      ['EPSG:3575', 10, 90],
      ['EPSG:3338', -154, 50],
      ['EPSG:3978', -95, 49],
    ];
    for (const [crs, lon, lat] of cases) {
      const [x, y] = createTransform('EPSG:4326', crs)(lon, lat);
      expect(Math.hypot(x, y), crs).toBeLessThan(1e-3);
      const [lon2, lat2] = createTransform(crs, 'EPSG:4326')(250_000, -400_000);
      const [x2, y2] = createTransform('EPSG:4326', crs)(lon2, lat2);
      expect(Math.hypot(x2 - 250_000, y2 + 400_000), `${crs} round trip`).toBeLessThan(1e-3);
    }
  });

  it('scales correctly on the true-scale parallel of polar stereographic EPSG:3413 (70°N)', () => {
    const t = createTransform('EPSG:4326', 'EPSG:3413');
    const [x1, y1] = t(-45, 70);
    const [x2, y2] = t(-44.99, 70);
    // 0.01° of longitude at 70°N on the WGS 84 ellipsoid: N(φ)·cos φ·Δλ = 381.47 m (computed).
    const N = 6378137 / Math.sqrt(1 - 0.00669437999014 * Math.sin((70 * Math.PI) / 180) ** 2);
    const expected = N * Math.cos((70 * Math.PI) / 180) * ((0.01 * Math.PI) / 180);
    expect(Math.hypot(x2 - x1, y2 - y1)).toBeCloseTo(expected, 2);
  });
});
