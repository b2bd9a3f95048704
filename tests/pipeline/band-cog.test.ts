/**
 * The per-band outputs are Cloud Optimized GeoTIFFs a desktop GIS opens as they are: read back with
 * GDAL (gdalinfo) for the structure the COG specification requires (tiles, overviews, the layout
 * marker GDAL writes) and the band's metadata, and with geotiff.js (an independent reader) for the
 * values. Sizes: a 700 x 600 band, larger than one 256 px tile, so overviews must exist.
 */
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { asciiDescription, writeBandCog } from '../../data-pipeline/export/write-band-cog';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { makeTempDir, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

const W = 700;
const H = 600;
const GT: [number, number, number, number, number, number] = [100_000, 1000, 0, -900_000, 0, -1000];

async function rawBand(dir: string, name: string, f: (c: number, r: number) => number): Promise<string> {
  const v = new Float32Array(W * H);
  for (let r = 0; r < H; r++) for (let c = 0; c < W; c++) v[r * W + c] = f(c, r);
  const path = join(dir, name);
  await writeFile(path, new Uint8Array(v.buffer));
  return path;
}

describe('band outputs as Cloud Optimized GeoTIFFs', () => {
  it('a continuous band: tiled deflate COG with predictor and overviews, title, unit and -9999 nodata', async () => {
    const dir = await makeTempDir('cog');
    const rawPath = await rawBand(dir, 'thaw.f32', (c, r) => (c + r < 50 ? NaN : 0.01 * c + 0.02 * r));
    const path = join(dir, 'thawDelay.tif');
    await writeBandCog({
      path,
      rawPath,
      width: W,
      height: H,
      geoTransform: GT,
      crs: 'EPSG:3413',
      band: { id: 'thawDelay', title: 'Thaw delay', unit: 'yr', kind: 'continuous' },
      metadata: { CAUTION: 'Screening estimate, not a design.', UNITS_NOTE: 'm³/m³ at 6 °C' },
    });
    const info = (await loadGdal()).info(path);
    expect(info.metadata?.IMAGE_STRUCTURE).toMatchObject({ LAYOUT: 'COG', COMPRESSION: 'DEFLATE' });
    expect(info.metadata?.IMAGE_STRUCTURE?.PREDICTOR).toBe('3');
    const band = info.bands[0] as (typeof info.bands)[0] & { overviews?: unknown[] };
    expect(band.block).toEqual([256, 256]);
    expect(band.overviews?.length).toBeGreaterThanOrEqual(1);
    expect(band.type).toBe('Float32');
    expect(band.description).toBe('Thaw delay');
    expect(band.unit).toBe('yr');
    expect(band.noDataValue).toBe(-9999);
    expect(info.metadata?.['']?.CAUTION).toBe('Screening estimate, not a design.');
    // UTF-8 survives in GDAL's metadata; the TIFF ImageDescription stays 7-bit ASCII.
    expect(info.metadata?.['']?.UNITS_NOTE).toBe('m³/m³ at 6 °C');
    expect(info.coordinateSystem?.wkt).toMatch(/ID\["EPSG",3413\]\]\s*$/);
    expect(info.geoTransform).toEqual(GT);
    const back = await readGeoTiffGrid(path, { label: 'thawDelay.tif' });
    expect(Number.isNaN(back.grid.values[0])).toBe(true);
    expect(back.grid.values[599 * W + 699]).toBeCloseTo(0.01 * 699 + 0.02 * 599, 5);
  });

  it('a class band: 8-bit with 255 nodata, a colour table and category names', async () => {
    const dir = await makeTempDir('cog');
    const rawPath = await rawBand(dir, 'suit.f32', (c, r) => (r < 10 ? NaN : (c + r) % 4));
    const path = join(dir, 'suitability.tif');
    const classes = [
      { value: 0, label: 'excluded' },
      { value: 1, label: 'poor' },
      { value: 2, label: 'fair' },
      { value: 3, label: 'good' },
    ];
    await writeBandCog({
      path,
      rawPath,
      width: W,
      height: H,
      geoTransform: GT,
      crs: 'EPSG:3413',
      band: { id: 'suitability', title: 'Suitability class', unit: '', kind: 'class', classes },
      metadata: {},
    });
    const info = (await loadGdal()).info(path) as ReturnType<Awaited<ReturnType<typeof loadGdal>>['info']> & {
      bands: { categories?: string[]; colorTable?: { entries: number[][] }; colorInterpretation?: string }[];
    };
    const band = info.bands[0];
    expect(band.type).toBe('Byte');
    expect(band.noDataValue).toBe(255);
    expect(band.colorInterpretation).toBe('Palette');
    expect(band.categories).toEqual(['excluded', 'poor', 'fair', 'good']);
    expect(band.colorTable?.entries.length).toBeGreaterThanOrEqual(4);
    // "excluded" is the map's neutral grey (web/src/map/colour-tile.ts).
    expect(band.colorTable?.entries[0].slice(0, 3)).toEqual([120, 120, 120]);
    expect(band.metadata?.['']?.CLASS_3).toBe('good');
    expect(info.metadata?.IMAGE_STRUCTURE?.PREDICTOR).toBe('2');
    const back = await readGeoTiffGrid(path, { label: 'suitability.tif' });
    expect(Number.isNaN(back.grid.values[0])).toBe(true);
    expect(back.grid.values[20 * W + 5]).toBe((5 + 20) % 4);
  });

  it('keeps the TIFF ImageDescription 7-bit ASCII', () => {
    expect(asciiDescription('Ground temperature [°C], water 0.3 m³/m³')).toBe(
      'Ground temperature [degC], water 0.3 m3/m3',
    );
  });
});
