import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { fromFile } from 'geotiff';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';
import { GRID_ROLES, inputsConfigSchema } from '../../data-pipeline/inputs-config';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { resampleAt } from '../../data-pipeline/build/resample-to-grid';
import { TEXTURE_CODES } from '../../layers/screening/screening-model';
import { sha256OfFile, smallDemo, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

let dirA: string;
let dirB: string;
let dirOtherSeed: string;

beforeAll(async () => {
  [dirA, dirB, dirOtherSeed] = await Promise.all([smallDemo(7), smallDemo(7), smallDemo(8)]);
}, 180_000);

async function hashes(dir: string): Promise<Record<string, string>> {
  const files = (await readdir(dir)).sort();
  const out: Record<string, string> = {};
  for (const f of files) out[f] = await sha256OfFile(join(dir, f));
  return out;
}

describe('demo-data generator', () => {
  it('is deterministic: same seed, byte-identical files; another seed, different grids', async () => {
    const a = await hashes(dirA);
    expect(Object.keys(a)).toEqual(
      expect.arrayContaining(['pile-atlas-inputs.json', 'settlements.geojson', 'land.geojson', 'README.md']),
    );
    expect(await hashes(dirB)).toEqual(a);
    const c = await hashes(dirOtherSeed);
    expect(c['soil-texture.tif']).not.toBe(a['soil-texture.tif']);
    expect(c['mean-air-temperature.tif']).not.toBe(a['mean-air-temperature.tif']);
  });

  it('writes a config that passes its schema, with grids in geographic and polar stereographic CRSs', async () => {
    const config = inputsConfigSchema.parse(
      JSON.parse(await readFile(join(dirA, 'pile-atlas-inputs.json'), 'utf8')),
    );
    expect(config.region.fictional).toBe(true);
    const expectedCrs: Record<string, string> = {
      'mean-air-temperature.tif': 'EPSG:4326',
      'air-temperature-amplitude.tif': 'EPSG:4326',
      'warming-rate.tif': 'EPSG:4326',
      'soil-texture.tif': 'EPSG:3413',
      'water-content.tif': 'EPSG:3413',
      'bedrock-depth.tif': 'EPSG:3995',
    };
    for (const g of config.grids) {
      const src = await readGeoTiffGrid(join(dirA, g.file), { label: g.file });
      expect(src.grid.crs, g.file).toBe(expectedCrs[g.file]);
      expect(src.description, g.file).toMatch(/INVENTED DEMO DATA/);
    }
  });

  it('has nodata over the open sea and plausible values on land', async () => {
    const config = inputsConfigSchema.parse(
      JSON.parse(await readFile(join(dirA, 'pile-atlas-inputs.json'), 'utf8')),
    );
    const sea: [number, number] = [-9.5, 73.75]; // far south-west corner: open ocean
    const centre: [number, number] = [-3, 75]; // centre of the landmass
    for (const g of config.grids) {
      const src = await readGeoTiffGrid(join(dirA, g.file), { label: g.file });
      const toGrid = createTransform('EPSG:4326', src.grid.crs);
      const at = (p: [number, number]) =>
        resampleAt(src.grid, Float64Array.from(toGrid(p[0], p[1])), 'nearest')[0];
      expect(at(sea), `${g.file} at sea`).toBeNaN();
      expect(Number.isFinite(at(centre)), `${g.file} on land`).toBe(true);
      const [lo, hi] = GRID_ROLES[g.role].range;
      let finite = 0;
      for (const v of src.grid.values) {
        if (Number.isNaN(v)) continue;
        finite++;
        expect(v).toBeGreaterThanOrEqual(lo);
        expect(v).toBeLessThanOrEqual(hi);
      }
      expect(finite, g.file).toBeGreaterThan(20);
    }
  });

  it('keeps climate and soil values inside the ranges the brief asks for', async () => {
    const ranges: Record<string, [number, number]> = {
      'mean-air-temperature.tif': [-12.5, -3],
      'air-temperature-amplitude.tif': [12, 22],
      'warming-rate.tif': [0.03, 0.08],
      'water-content.tif': [0.019, 0.95],
    };
    for (const [file, [lo, hi]] of Object.entries(ranges)) {
      const src = await readGeoTiffGrid(join(dirA, file), { label: file });
      const finite = Array.from(src.grid.values).filter((v) => !Number.isNaN(v));
      expect(Math.min(...finite), file).toBeGreaterThanOrEqual(lo);
      expect(Math.max(...finite), file).toBeLessThanOrEqual(hi);
    }
    const texture = await readGeoTiffGrid(join(dirA, 'soil-texture.tif'), { label: 'soil-texture.tif' });
    const codes = new Set(Array.from(texture.grid.values).filter((v) => !Number.isNaN(v)));
    expect([...codes].sort()).toEqual(Object.keys(TEXTURE_CODES).map(Number));
  });

  it('marks every GeoJSON as invented and puts settlements on land', async () => {
    const settlements = JSON.parse(await readFile(join(dirA, 'settlements.geojson'), 'utf8'));
    const land = JSON.parse(await readFile(join(dirA, 'land.geojson'), 'utf8'));
    expect(settlements.metadata.fictional).toBe(true);
    expect(land.metadata.fictional).toBe(true);
    expect(land.features.length).toBe(3);
    expect(settlements.features.length).toBeGreaterThanOrEqual(4);
    const texture = await readGeoTiffGrid(join(dirA, 'soil-texture.tif'), { label: 'soil-texture.tif' });
    const toGrid = createTransform('EPSG:4326', 'EPSG:3413');
    for (const f of settlements.features) {
      expect(f.properties.fictional).toBe(true);
      expect(typeof f.properties.name).toBe('string');
      expect(f.properties.population).toBeGreaterThan(0);
      const [lon, lat] = f.geometry.coordinates;
      expect(lon).toBeGreaterThan(-10);
      expect(lon).toBeLessThan(4);
      expect(lat).toBeGreaterThan(73.6);
      expect(lat).toBeLessThan(76.4);
      const code = resampleAt(texture.grid, Float64Array.from(toGrid(lon, lat)), 'nearest')[0];
      expect(Number.isNaN(code), f.properties.name).toBe(false);
    }
    const img = await (await fromFile(join(dirA, 'soil-texture.tif'))).getImage();
    expect(img.getGDALNoData()).toBe(0);
  });
});
