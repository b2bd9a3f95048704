/**
 * `pile-atlas demo-data`: writes the invented demo region (see demo-region.ts) as the inputs a real
 * deployment would have: GeoTIFF grids in mixed CRSs and resolutions (geographic EPSG:4326 for the
 * climate grids, polar stereographic EPSG:3413 and EPSG:3995 for the soil grids), nodata over the sea,
 * settlements and coastline GeoJSON, the inputs config and a provenance README. Deterministic: the
 * same seed gives byte-identical files.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { writeArrayBuffer, type GeotiffWriterMetadata } from 'geotiff';
import { FICTIONAL_DATA_NOTICE } from '../../layers/cautions';
import { createTransform } from '../crs/crs-definitions';
import { INPUTS_CONFIG_FILE, type GridRoleId, type InputsConfig } from '../inputs-config';
import { createDemoRegion, DEMO_BOUNDS_DEG, DEMO_REGION_NAME, type DemoCell } from './demo-region';

export interface DemoDataOptions {
  outDir: string;
  seed?: number;
  /** Pixel-size multiplier (default 1; 4 = pixels four times coarser, for fast tests). */
  resolutionScale?: number;
}

interface DemoGridSpec {
  role: GridRoleId;
  file: string;
  crs: 'EPSG:4326' | 'EPSG:3413' | 'EPSG:3995';
  /** Pixel size in CRS units at resolutionScale 1: [x, y]. */
  pixel: [number, number];
  unit: string;
  kind: 'continuous' | 'class';
  type: 'float32' | 'uint8';
  value: (cell: DemoCell) => number;
  /** Cells with inland distance below this are nodata (negative keeps a coastal margin). */
  seaCutoff: number;
}

export const DEMO_SEED = 7;
const FLOAT_NODATA = -9999;
const LICENCE = 'CC0-1.0 (invented demo data)';

const DEMO_GRIDS: DemoGridSpec[] = [
  {
    role: 'meanAirTemp_C',
    file: 'mean-air-temperature.tif',
    crs: 'EPSG:4326',
    pixel: [0.05, 0.02],
    unit: 'degC',
    kind: 'continuous',
    type: 'float32',
    value: (c) => c.meanAirTemp_C,
    seaCutoff: -0.05,
  },
  {
    role: 'airAmplitude_C',
    file: 'air-temperature-amplitude.tif',
    crs: 'EPSG:4326',
    pixel: [0.1, 0.04],
    unit: 'K',
    kind: 'continuous',
    type: 'float32',
    value: (c) => c.airAmplitude_C,
    seaCutoff: -0.08,
  },
  {
    role: 'warming_C_per_yr',
    file: 'warming-rate.tif',
    crs: 'EPSG:4326',
    pixel: [0.25, 0.1],
    unit: 'K/yr',
    kind: 'continuous',
    type: 'float32',
    value: (c) => c.warming_C_per_yr,
    seaCutoff: -0.15,
  },
  {
    role: 'textureClass',
    file: 'soil-texture.tif',
    crs: 'EPSG:3413',
    pixel: [1000, 1000],
    unit: 'class',
    kind: 'class',
    type: 'uint8',
    value: (c) => c.textureClass,
    seaCutoff: 0,
  },
  {
    role: 'waterContent_m3m3',
    file: 'water-content.tif',
    crs: 'EPSG:3413',
    pixel: [1000, 1000],
    unit: 'm3/m3',
    kind: 'continuous',
    type: 'float32',
    value: (c) => c.waterContent_m3m3,
    seaCutoff: -0.01,
  },
  {
    role: 'bedrockDepth_m',
    file: 'bedrock-depth.tif',
    crs: 'EPSG:3995',
    pixel: [1500, 1500],
    unit: 'm',
    kind: 'continuous',
    type: 'float32',
    value: (c) => c.bedrockDepth_m,
    seaCutoff: -0.02,
  },
];

/** Grid frame for a spec: origin (west, north), pixel size and shape, covering DEMO_BOUNDS_DEG. */
function gridFrame(spec: DemoGridSpec, scale: number) {
  const px = spec.pixel[0] * scale;
  const py = spec.pixel[1] * scale;
  const [w, s, e, n] = DEMO_BOUNDS_DEG;
  if (spec.crs === 'EPSG:4326') {
    return { west: w, north: n, px, py, width: Math.round((e - w) / px), height: Math.round((n - s) / py) };
  }
  const toGrid = createTransform('EPSG:4326', spec.crs);
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (let i = 0; i <= 50; i++) {
    const t = i / 50;
    for (const [lon, lat] of [
      [w + t * (e - w), s],
      [w + t * (e - w), n],
      [w, s + t * (n - s)],
      [e, s + t * (n - s)],
    ]) {
      const [x, y] = toGrid(lon, lat);
      minX = Math.min(minX, x);
      maxX = Math.max(maxX, x);
      minY = Math.min(minY, y);
      maxY = Math.max(maxY, y);
    }
  }
  const west = Math.floor(minX / px) * px;
  const north = Math.ceil(maxY / py) * py;
  return {
    west,
    north,
    px,
    py,
    width: Math.ceil((maxX - west) / px),
    height: Math.ceil((north - minY) / py),
  };
}

function renderGrid(spec: DemoGridSpec, scale: number, sample: (lon: number, lat: number) => DemoCell) {
  const frame = gridFrame(spec, scale);
  const toLonLat = createTransform(spec.crs, 'EPSG:4326');
  const n = frame.width * frame.height;
  const values = spec.type === 'uint8' ? new Uint8Array(n) : new Float32Array(n);
  for (let row = 0; row < frame.height; row++) {
    for (let col = 0; col < frame.width; col++) {
      const [lon, lat] = toLonLat(frame.west + (col + 0.5) * frame.px, frame.north - (row + 0.5) * frame.py);
      const cell = sample(lon, lat);
      const i = row * frame.width + col;
      if (cell.inland < spec.seaCutoff) values[i] = spec.type === 'uint8' ? 0 : FLOAT_NODATA;
      else values[i] = spec.type === 'uint8' ? cell.textureClass || 2 : spec.value(cell);
    }
  }
  return { frame, values };
}

function geoTiffBytes(spec: DemoGridSpec, scale: number, sample: (lon: number, lat: number) => DemoCell) {
  const { frame, values } = renderGrid(spec, scale, sample);
  const code = Number(spec.crs.slice(5));
  const geoKeys =
    spec.crs === 'EPSG:4326'
      ? { GTModelTypeGeoKey: 2, GTRasterTypeGeoKey: 1, GeographicTypeGeoKey: code }
      : { GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, ProjectedCSTypeGeoKey: code };
  // ImageDescription is a standard TIFF tag the writer accepts but its type does not list.
  const metadata: GeotiffWriterMetadata & { ImageDescription: string } = {
    width: frame.width,
    height: frame.height,
    ModelPixelScale: [frame.px, frame.py, 0],
    ModelTiepoint: [0, 0, 0, frame.west, frame.north, 0],
    ...geoKeys,
    GDAL_NODATA: spec.type === 'uint8' ? '0' : String(FLOAT_NODATA),
    ImageDescription: `INVENTED DEMO DATA (fictional region ${DEMO_REGION_NAME}, not a real place). ${spec.role} [${spec.unit}]`,
  };
  const buffer = writeArrayBuffer(values, metadata);
  return new Uint8Array(buffer);
}

function featureCollection(features: unknown[]) {
  return {
    type: 'FeatureCollection',
    metadata: { fictional: true, notice: FICTIONAL_DATA_NOTICE, region: DEMO_REGION_NAME },
    features,
  };
}

/** Write the demo inputs into `outDir` (created if needed). Deterministic for a given seed. */
export async function generateDemoData({ outDir, seed = DEMO_SEED, resolutionScale = 1 }: DemoDataOptions) {
  if (!Number.isInteger(seed)) throw new RangeError(`seed must be an integer, got ${seed}`);
  if (!(resolutionScale >= 0.25 && resolutionScale <= 64)) {
    throw new RangeError(`resolutionScale must be in [0.25, 64], got ${resolutionScale}`);
  }
  const region = createDemoRegion(seed);
  await mkdir(outDir, { recursive: true });
  for (const spec of DEMO_GRIDS) {
    await writeFile(join(outDir, spec.file), geoTiffBytes(spec, resolutionScale, region.sample));
  }
  const settlements = featureCollection(
    region.settlements.map((s) => ({
      type: 'Feature',
      geometry: { type: 'Point', coordinates: [s.lon, s.lat] },
      properties: { name: s.name, population: s.population, fictional: true },
    })),
  );
  const land = featureCollection(
    region.coastlines().map((ring, i) => ({
      type: 'Feature',
      geometry: {
        type: 'Polygon',
        coordinates: [ring.map(([lon, lat]) => [+lon.toFixed(5), +lat.toFixed(5)])],
      },
      properties: { name: i === 0 ? DEMO_REGION_NAME : `${DEMO_REGION_NAME} island ${i}`, fictional: true },
    })),
  );
  // Invented winter roads: each settlement joined to its nearest neighbour already on the network
  // (a Prim spanning tree from the most populous one), so every settlement is reachable.
  const roads = featureCollection(
    spanningTree(region.settlements).map(([a, b]) => ({
      type: 'Feature',
      geometry: {
        type: 'LineString',
        coordinates: [
          [+a.lon.toFixed(5), +a.lat.toFixed(5)],
          [+b.lon.toFixed(5), +b.lat.toFixed(5)],
        ],
      },
      properties: { name: `winter road ${a.name} – ${b.name}`, fictional: true },
    })),
  );
  const config: InputsConfig = {
    formatVersion: 1,
    region: { name: DEMO_REGION_NAME, fictional: true },
    provenance: `Invented by the pile-atlas demo-data generator (seed ${seed}); ${FICTIONAL_DATA_NOTICE}`,
    licence: LICENCE,
    settlements: 'settlements.geojson',
    land: 'land.geojson',
    roads: 'roads.geojson',
    grids: DEMO_GRIDS.map((g) => ({ role: g.role, file: g.file, unit: g.unit, kind: g.kind })),
  };
  await writeFile(join(outDir, 'settlements.geojson'), JSON.stringify(settlements, null, 1) + '\n');
  await writeFile(join(outDir, 'land.geojson'), JSON.stringify(land) + '\n');
  await writeFile(join(outDir, 'roads.geojson'), JSON.stringify(roads, null, 1) + '\n');
  await writeFile(join(outDir, INPUTS_CONFIG_FILE), JSON.stringify(config, null, 2) + '\n');
  await writeFile(join(outDir, 'README.md'), provenanceText(seed, resolutionScale));
}

function spanningTree<T extends { lon: number; lat: number; population: number }>(places: T[]): [T, T][] {
  if (places.length < 2) return [];
  const d2 = (a: T, b: T) =>
    ((a.lon - b.lon) * Math.cos((a.lat * Math.PI) / 180)) ** 2 + (a.lat - b.lat) ** 2;
  const start = places.reduce((best, p) => (p.population > best.population ? p : best), places[0]);
  const inTree = [start];
  const rest = places.filter((p) => p !== start);
  const edges: [T, T][] = [];
  while (rest.length > 0) {
    let best: [number, number, number] = [Infinity, 0, 0];
    rest.forEach((p, i) =>
      inTree.forEach((q, j) => {
        const d = d2(p, q);
        if (d < best[0]) best = [d, i, j];
      }),
    );
    const [p] = rest.splice(best[1], 1);
    edges.push([inTree[best[2]], p]);
    inTree.push(p);
  }
  return edges;
}

function provenanceText(seed: number, resolutionScale: number): string {
  const rows = DEMO_GRIDS.map(
    (g) =>
      `| ${g.file} | ${g.role} | ${g.unit} | ${g.kind} | ${g.crs} | ${g.pixel.map((p) => p * resolutionScale).join(' x ')} |`,
  );
  return [
    `# ${DEMO_REGION_NAME}: invented demo data`,
    '',
    FICTIONAL_DATA_NOTICE,
    '',
    `Generated by \`pile-atlas demo-data --seed ${seed}\`. The landmass is placed over open ocean in the`,
    'Greenland Sea (about 73.6-76.4 N, 10 W-4 E) where no land exists, so it cannot be mistaken for a real',
    'place. Climate, soil and settlement values are invented, physically plausible patterns.',
    `Licence: ${LICENCE}.`,
    '',
    '| file | role | unit | kind | CRS | pixel size |',
    '|---|---|---|---|---|---|',
    ...rows,
    '',
    'Nodata over the sea: -9999 (float grids), 0 (texture classes). settlements.geojson and land.geojson',
    'are RFC 7946 GeoJSON (WGS 84 lon/lat).',
    '',
  ].join('\n');
}
