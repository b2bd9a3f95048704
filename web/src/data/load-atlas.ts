/**
 * Loads one build for the app: the manifest (validated with manifestSchema; the app reads only what
 * it describes), the land and settlement layers it names, and, in the background, the table of
 * analysis-grid cells used by the readout, the cell panel, the filters and the counters.
 */
import proj4 from 'proj4';
import type { FeatureCollection } from 'geojson';
import { manifestSchema, type Manifest } from '../../../layers/screening/manifest';
import { buildCellTable, samplingZoom, type CellTable } from './cell-table';
import { createTileStore, type TileStore } from './tile-store';
import { tilesCovering } from '../map/web-mercator';
import { formatZodIssues } from '../../../layers/validation-error';

export interface Atlas {
  manifest: Manifest;
  dataBase: URL;
  tiles: TileStore;
  land: FeatureCollection | null;
  settlements: FeatureCollection | null;
  /** [lon, lat] -> analysis-CRS [x, y]. */
  toGrid: (lon: number, lat: number) => [number, number];
  toLonLat: (x: number, y: number) => [number, number];
}

export class AtlasLoadError extends Error {
  constructor(
    message: string,
    readonly issues: string[],
  ) {
    super(message);
  }
}

async function fetchJson(url: URL): Promise<unknown> {
  const res = await fetch(url);
  if (!res.ok) throw new AtlasLoadError(`Could not load ${url.pathname} (HTTP ${res.status}).`, []);
  return res.json();
}

async function optionalGeoJson(base: URL, rel: string | undefined): Promise<FeatureCollection | null> {
  if (!rel) return null;
  try {
    const json = (await fetchJson(new URL(rel, base))) as FeatureCollection;
    return json && json.type === 'FeatureCollection' && Array.isArray(json.features) ? json : null;
  } catch {
    return null;
  }
}

export async function loadAtlas(dataBase: URL): Promise<Atlas> {
  const raw = await fetchJson(new URL('manifest.json', dataBase));
  const parsed = manifestSchema.safeParse(raw);
  if (!parsed.success) {
    throw new AtlasLoadError(
      'The data manifest does not match the expected format.',
      formatZodIssues(parsed.error),
    );
  }
  const manifest = parsed.data;
  const [land, settlements] = await Promise.all([
    optionalGeoJson(dataBase, manifest.land),
    optionalGeoJson(dataBase, manifest.settlements),
  ]);
  const conv = proj4('EPSG:4326', manifest.analysisGrid.proj4);
  return {
    manifest,
    dataBase,
    tiles: createTileStore(manifest, dataBase),
    land,
    settlements,
    toGrid: (lon, lat) => conv.forward([lon, lat]) as [number, number],
    toLonLat: (x, y) => conv.inverse([x, y]) as [number, number],
  };
}

/** The tile zoom whose pixels resolve every analysis cell of the region (see samplingZoom). */
export function regionSamplingZoom(atlas: Pick<Atlas, 'manifest'>): number {
  const [, s, , n] = atlas.manifest.region.bounds;
  const equatorward = Math.abs(s) < Math.abs(n) ? s : n;
  return samplingZoom(atlas.manifest, s <= 0 && n >= 0 ? 0 : equatorward);
}

/**
 * Start fetching every tile of the region at the sampling zoom (the cell table needs them, and at
 * the opening view the map usually asks for the same ones), so downloads overlap the map's start-up.
 */
export function prefetchRegionTiles(atlas: Atlas): Promise<unknown> {
  const zoom = regionSamplingZoom(atlas);
  const { x0, x1, y0, y1 } = tilesCovering(atlas.manifest.region.bounds, zoom);
  const jobs: Promise<unknown>[] = [];
  for (let x = x0; x <= x1; x++) for (let y = y0; y <= y1; y++) jobs.push(atlas.tiles.get(zoom, x, y));
  return Promise.all(jobs);
}

/** Fetch every tile at the sampling zoom and build the cell table (see cell-table.ts). */
export async function loadCellTable(atlas: Atlas): Promise<CellTable> {
  const { manifest, tiles } = atlas;
  const zoom = regionSamplingZoom(atlas);
  await prefetchRegionTiles(atlas);
  return buildCellTable({
    manifest,
    zoom,
    getTile: (x, y) => tiles.peek(zoom, x, y) ?? null,
    gridToLonLat: atlas.toLonLat,
  });
}
