/**
 * A real (small) demo build for tests that must read what the pipeline writes, not a hand-made
 * manifest: the demo region generated and built into a temporary directory, the manifest, the
 * settlements and the decoded band values of the finest tile at a point (what the web's cell table holds
 * for that cell, band id -> SI value, null = nodata).
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import { TILE_SIZE, unpackTile } from '../../layers/screening/tile-format';
import { makeTempDir, SMALL_DEMO, smallDemo } from './pipeline-fixtures';

export interface DemoBuild {
  outDir: string;
  manifest: Manifest;
  settlements: { name: string; lon: number; lat: number }[];
  /** Band values of the finest-zoom pixel at (lon, lat); null when the tile is absent. */
  valuesAt(lon: number, lat: number): Promise<Record<string, number | null> | null>;
}

/** Generate and build the small demo region (a few seconds; call in beforeAll, remove with removeTempDirs). */
export async function buildSmallDemo(seed = 7): Promise<DemoBuild> {
  const inDir = await smallDemo(seed);
  const outDir = join(await makeTempDir('build'), 'out');
  await buildTiles({ inDir, outDir, cellSize_m: SMALL_DEMO.cellSize_m });
  const manifest = manifestSchema.parse(JSON.parse(await readFile(join(outDir, 'manifest.json'), 'utf8')));
  const geo = JSON.parse(await readFile(join(outDir, 'settlements.geojson'), 'utf8')) as {
    features: { properties: { name: string }; geometry: { coordinates: [number, number] } }[];
  };
  const settlements = geo.features.map((f) => ({
    name: f.properties.name,
    lon: f.geometry.coordinates[0],
    lat: f.geometry.coordinates[1],
  }));
  const valuesAt = async (lon: number, lat: number) => {
    const z = manifest.tiles.maxZoom;
    const n = 2 ** z;
    const fx = ((lon + 180) / 360) * n;
    const r = (lat * Math.PI) / 180;
    const fy = ((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n;
    const [x, y] = [Math.floor(fx), Math.floor(fy)];
    const px = Math.floor((fx - x) * TILE_SIZE);
    const py = Math.floor((fy - y) * TILE_SIZE);
    let bytes: Buffer;
    try {
      bytes = await readFile(join(outDir, 'tiles', String(z), String(x), `${y}.bin`));
    } catch {
      return null;
    }
    const planes = unpackTile(bytes, manifest.bands);
    return Object.fromEntries(
      manifest.bands.map((b, i) => {
        const v = planes[i][py * TILE_SIZE + px];
        return [b.id, Number.isFinite(v) ? v : null];
      }),
    );
  };
  return { outDir, manifest, settlements, valuesAt };
}
