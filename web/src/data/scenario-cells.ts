/**
 * Every scenario of a scenario-set build at a few places (issue 17 item 4): each scenario's manifest
 * (its bands and its scenario) and its band values at the cell under each place, read from that
 * scenario's own tiles exactly as the cell table reads them (cell-table.ts: the cell's centre through
 * the geotransform, inverse-projected, the tile pixel holding it at the region's sampling zoom), so a
 * value here equals the one the map shows for that scenario. Only the tiles under the places are
 * fetched. The shortlist's exports and the site study's run over all scenarios use it.
 */
import proj4 from 'proj4';
import { manifestSchema, type Manifest } from '../../../layers/screening/manifest';
import { TILE_SIZE } from '../../../layers/screening/tile-format';
import { formatZodIssues } from '../../../layers/validation-error';
import { lonLatToTileXY } from '../map/web-mercator';
import { regionSamplingZoom } from './load-atlas';
import { scenarioBase } from './scenario-urls';
import { createTileStore } from './tile-store';

/** One scenario of the set: its name, slug and manifest. */
export interface SetScenario {
  name: string;
  slug: string;
  manifest: Manifest;
  dataBase: URL;
}

/** Band values of one cell (band id -> SI value, null = nodata); null when the place is off the grid. */
export type PlaceValues = Record<string, number | null> | null;

/** The scenarios of the build's set, each manifest loaded and checked (none for a one-scenario build). */
export async function loadSetScenarios(manifest: Manifest, dataBase: URL): Promise<SetScenario[]> {
  const set = manifest.scenarioSet;
  if (!set || set.scenarios.length < 2) return [];
  return Promise.all(
    set.scenarios.map(async (entry) => {
      const base = scenarioBase(manifest, dataBase, entry.slug);
      if (!base) throw new Error(`scenario ${entry.name}: not found in the set`);
      const url = new URL('manifest.json', base);
      const res = await fetch(url);
      if (!res.ok) throw new Error(`scenario ${entry.name}: ${url.pathname} HTTP ${res.status}`);
      const parsed = manifestSchema.safeParse(await res.json());
      if (!parsed.success)
        throw new Error(`scenario ${entry.name}: ${url.pathname}: ${formatZodIssues(parsed.error)[0]}`);
      return { name: entry.name, slug: entry.slug, manifest: parsed.data, dataBase: base };
    }),
  );
}

/** The band values of one scenario at each place (see the module comment). */
export async function valuesAtPlaces(
  scenario: SetScenario,
  places: readonly { lon: number; lat: number }[],
): Promise<PlaceValues[]> {
  const { manifest } = scenario;
  const tiles = createTileStore(manifest, scenario.dataBase);
  const conv = proj4('EPSG:4326', manifest.analysisGrid.proj4);
  const zoom = regionSamplingZoom({ manifest });
  const { width, height, geoTransform: gt } = manifest.analysisGrid;
  const det = gt[1] * gt[5] - gt[2] * gt[4];
  return Promise.all(
    places.map(async ({ lon, lat }) => {
      const [x, y] = conv.forward([lon, lat]) as [number, number];
      const dx = x - gt[0];
      const dy = y - gt[3];
      const c = Math.floor((gt[5] * dx - gt[2] * dy) / det);
      const r = Math.floor((-gt[4] * dx + gt[1] * dy) / det);
      if (det === 0 || c < 0 || r < 0 || c >= width || r >= height) return null;
      const cx = gt[0] + (c + 0.5) * gt[1] + (r + 0.5) * gt[2];
      const cy = gt[3] + (c + 0.5) * gt[4] + (r + 0.5) * gt[5];
      const [lo, la] = conv.inverse([cx, cy]) as [number, number];
      const [tx, ty] = lonLatToTileXY(lo, la, zoom);
      const tile = await tiles.get(zoom, Math.floor(tx), Math.floor(ty));
      if (!tile) return null;
      const px = Math.min(TILE_SIZE - 1, Math.floor((tx - Math.floor(tx)) * TILE_SIZE));
      const py = Math.min(TILE_SIZE - 1, Math.floor((ty - Math.floor(ty)) * TILE_SIZE));
      const k = py * TILE_SIZE + px;
      const out: Record<string, number | null> = {};
      manifest.bands.forEach((b, i) => {
        const v = tile[i][k];
        out[b.id] = Number.isNaN(v) ? null : v;
      });
      return out;
    }),
  );
}
