/**
 * `pile-atlas shortlist`: reads a build (manifest.json + the per-band GeoTIFFs of the analysis grid),
 * keeps the cells (or the settlements' cells) for which the `--where` expression holds, and yields RFC
 * 7946 features (WGS 84 lon/lat): cells as polygons of their four corners, settlements as points; each
 * with the export schema's record (layers/screening/export-schema.ts, shared with the web: position,
 * every band rounded to its step with its unit in the column name, class codes with labels, cautions).
 * The features come one by one from a generator, so a writer can stream every match (no limit unless
 * asked); the expression, the scenario, the units and the data provenance are the collection's members.
 * A scenario-set build adds every scenario's key figures at the cell, read from that scenario's own
 * GeoTIFFs (one column group per scenario, export-schema.ts).
 */
import { readFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import type { Feature, FeatureCollection, Point, Polygon } from 'geojson';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import {
  exportColumns,
  exportRecord,
  exportUnits,
  UNIT_SYSTEM_NAME,
  type UnitSystem,
  scenarioKeyBands,
  scenarioReadBandIds,
  EXPORT_CAUTIONS,
  type ScenarioKeyBands,
  type ExportColumn,
  type ExportValue,
} from '../../layers/screening/export-schema';
import { createTransform, type PointTransform } from '../crs/crs-definitions';
import { ValidationError } from '../../layers/validation-error';
import { InputError } from '../input-error';
import { parseJsonText } from '../read/read-json-file';
import { readGeoTiffGrid } from '../read/read-geotiff-grid';
import { compileWhere, type CompiledWhere } from './where-expression';
import { haversine_km } from '../../layers/screening/proximity';

export interface ShortlistOptions {
  tilesDir: string;
  /** The conditions; every cell when absent (then --near should narrow the places). */
  where?: string;
  /** Filter the settlements (their cells) instead of every cell. */
  settlements?: boolean;
  /** At most this many features (default: all of them); the counts say how many matched. */
  limit?: number;
  /** Keep only places within `within_km` of this settlement (its name, any letter case). */
  near?: string;
  within_km?: number;
  /** The unit system of the values and column names (default SI, the stored units). */
  units?: UnitSystem;
}

async function readManifest(tilesDir: string): Promise<Manifest> {
  const file = join(tilesDir, 'manifest.json');
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch {
    throw new InputError(`${file}: file not found (is --tiles the output of pile-atlas build?)`);
  }
  const parsed = manifestSchema.safeParse(parseJsonText(file, text));
  if (!parsed.success) throw ValidationError.fromZod(file, parsed.error);
  return parsed.data;
}

/** The settlement named `name` (letter case and surrounding spaces ignored) in the build's settlements. */
async function findSettlement(
  tilesDir: string,
  manifest: Manifest,
  name: string,
): Promise<{ name: string; lonLat: [number, number] }> {
  if (!manifest.settlements)
    throw new InputError(`${join(tilesDir, 'manifest.json')}: build lists no settlements`);
  const file = join(tilesDir, manifest.settlements);
  const collection = JSON.parse(await readFile(file, 'utf8')) as FeatureCollection<Point>;
  const names = collection.features.map((f) => String(f.properties?.name ?? ''));
  const want = name.trim().toLowerCase();
  const i = names.findIndex((n) => n.toLowerCase() === want);
  if (i < 0)
    throw new InputError(
      `--near ${name}: no settlement of that name in ${file}; the settlements are ${names.join(', ')}`,
    );
  const [lon, lat] = collection.features[i].geometry.coordinates;
  return { name: names[i], lonLat: [lon, lat] };
}

/** One shortlist run: the features one at a time, then the collection's members with the counts. */
export interface ShortlistRun {
  manifest: Manifest;
  /** 'Polygon' (cells) or 'Point' (settlements). */
  geometryType: 'Polygon' | 'Point';
  /** Every property column of the features, in order, with its type and unit. */
  columns: ExportColumn[];
  /** The matching features (at most `limit`), generated one by one: nothing is held back in memory. */
  features(): Generator<Feature>;
  /** The collection's foreign members; the counts are final once `features()` has run to its end. */
  members(): Record<string, unknown>;
}

/** Every band's GeoTIFF of the build, read whole, in the manifest's band order. */
async function readBandPlanes(tilesDir: string, manifest: Manifest): Promise<Float32Array[]> {
  const files = manifest.parameters.geotiffs as Record<string, string> | undefined;
  if (!files) {
    throw new InputError(
      `${join(tilesDir, 'manifest.json')}: build has no GeoTIFFs (rebuild without --no-geotiff)`,
    );
  }
  const grid = manifest.analysisGrid;
  const planes: Float32Array[] = [];
  for (const band of manifest.bands) {
    const file = files[band.id];
    if (!file)
      throw new InputError(`${join(tilesDir, 'manifest.json')}: no GeoTIFF listed for band ${band.id}`);
    const src = await readGeoTiffGrid(join(tilesDir, file), { label: join(tilesDir, file) });
    if (src.grid.width !== grid.width || src.grid.height !== grid.height) {
      throw new InputError(
        `${join(tilesDir, file)}: ${src.grid.width} x ${src.grid.height} does not match the manifest grid`,
      );
    }
    planes.push(src.grid.values);
  }
  return planes;
}

/** Every scenario of a scenario-set build: its key bands and their planes (none for one scenario). */
interface ScenarioPlanes {
  sets: ScenarioKeyBands[];
  planes: Map<string, Float32Array>[];
}

/**
 * The key bands of every scenario of the build's set, read from each scenario's own GeoTIFFs (its
 * manifest under the set's root): the per-scenario column groups of the export schema.
 */
async function readScenarioPlanes(tilesDir: string, manifest: Manifest): Promise<ScenarioPlanes> {
  const set = manifest.scenarioSet;
  if (!set || set.scenarios.length < 2) return { sets: [], planes: [] };
  const out: ScenarioPlanes = { sets: [], planes: [] };
  for (const entry of set.scenarios) {
    const dir = dirname(join(tilesDir, set.root || '.', entry.manifest));
    const m = await readManifest(dir);
    const where = join(dir, 'manifest.json');
    const g = m.analysisGrid;
    if (g.width !== manifest.analysisGrid.width || g.height !== manifest.analysisGrid.height)
      throw new InputError(`${where}: analysis grid ${g.width} x ${g.height} differs from the build's`);
    const keys = scenarioKeyBands(entry.name, m.bands);
    const ids = scenarioReadBandIds(keys);
    const bands = ids.map((id) => m.bands.find((b) => b.id === id)).filter((b) => b !== undefined);
    const planes = await readBandPlanes(dir, { ...m, bands });
    out.sets.push(keys);
    out.planes.push(new Map(bands.map((b, i) => [b.id, planes[i]])));
  }
  return out;
}

/** The cell's position in the analysis grid, the first columns of every feature. */
const CELL_COLUMNS: ExportColumn[] = [
  { name: 'cellCol', type: 'integer', unit: 'column of the analysis grid' },
  { name: 'cellRow', type: 'integer', unit: 'row of the analysis grid' },
];

/**
 * The build's settlements (points) and their own property columns (name, population, ...: numbers or
 * text) not `taken` by the record's columns.
 */
async function readSettlements(
  tilesDir: string,
  manifest: Manifest,
  taken: Set<string>,
): Promise<{ settlements: Feature<Point>[]; columns: ExportColumn[] }> {
  if (!manifest.settlements)
    throw new InputError(`${join(tilesDir, 'manifest.json')}: build lists no settlements`);
  const file = join(tilesDir, manifest.settlements);
  const collection = JSON.parse(await readFile(file, 'utf8')) as FeatureCollection<Point>;
  const settlements = collection.features.filter((s) => s.geometry?.type === 'Point');
  const numeric = new Map<string, boolean>();
  for (const s of settlements) {
    for (const [k, v] of Object.entries(s.properties ?? {})) {
      if (taken.has(k)) continue;
      numeric.set(k, (numeric.get(k) ?? true) && (v === null || typeof v === 'number'));
    }
  }
  const columns: ExportColumn[] = [];
  for (const [name, isNumber] of numeric) columns.push({ name, type: isNumber ? 'real' : 'text', unit: '' });
  return { settlements, columns };
}

/** What the feature generators share: the grid, the filter, the record and the running counts. */
interface ShortlistScan {
  grid: Manifest['analysisGrid'];
  planes: Float32Array[];
  limit: number;
  /** Places that matched, and features yielded (at most `limit`). */
  counts: { matched: number; returned: number };
  /** The --where expression holds for the cell. */
  testCell(cell: number): boolean;
  /** Within the radius of --near (the cell centre's or the point's great-circle distance). */
  inRadius(lon: number, lat: number): boolean;
  /** True when there is a --near settlement (cell centres then need their lon/lat). */
  hasNear: boolean;
  /** A scenario-set build's column groups, one per scenario (export-schema.ts). */
  scenarioSets: ScenarioKeyBands[];
  /** The export schema's record of a cell (shared with the web: export-schema.ts). */
  recordOf(cell: number, lon: number, lat: number): Record<string, ExportValue>;
  toLonLat: PointTransform;
  fromLonLat: PointTransform;
}

const round = (p: [number, number]): [number, number] => [+p[0].toFixed(6), +p[1].toFixed(6)];

/** The matching cells, row by row, as polygons of their four corners (outside the screened area skipped). */
function* cellFeatures(scan: ShortlistScan): Generator<Feature> {
  const { grid, planes, counts, toLonLat } = scan;
  const gt = grid.geoTransform;
  for (let row = 0; row < grid.height; row++) {
    for (let col = 0; col < grid.width; col++) {
      const cell = row * grid.width + col;
      if (
        planes[0][cell] !== planes[0][cell] &&
        planes[planes.length - 1][cell] !== planes[planes.length - 1][cell]
      ) {
        continue; // outside the screened area
      }
      if (scan.hasNear) {
        const [lon, lat] = toLonLat(gt[0] + (col + 0.5) * gt[1], gt[3] + (row + 0.5) * gt[5]);
        if (!scan.inRadius(lon, lat)) continue;
      }
      if (!scan.testCell(cell)) continue;
      counts.matched++;
      if (counts.returned >= scan.limit) continue;
      const x0 = gt[0] + col * gt[1];
      const y0 = gt[3] + (row + 1) * gt[5];
      const x1 = x0 + gt[1];
      const y1 = gt[3] + row * gt[5];
      const ring = [toLonLat(x0, y0), toLonLat(x1, y0), toLonLat(x1, y1), toLonLat(x0, y1)].map(round);
      ring.push(ring[0]);
      const centre = toLonLat(x0 + gt[1] / 2, (y0 + y1) / 2);
      const geometry: Polygon = { type: 'Polygon', coordinates: [ring] };
      counts.returned++;
      yield {
        type: 'Feature',
        geometry,
        properties: { cellCol: col, cellRow: row, ...scan.recordOf(cell, centre[0], centre[1]) },
      };
    }
  }
}

/** The settlements inside the grid whose cell matches, as points with their own columns first. */
function* settlementFeatures(
  scan: ShortlistScan,
  settlements: Feature<Point>[],
  settlementColumns: ExportColumn[],
): Generator<Feature> {
  const { grid, counts } = scan;
  const gt = grid.geoTransform;
  for (const s of settlements) {
    const [lon, lat] = s.geometry.coordinates;
    const [x, y] = scan.fromLonLat(lon, lat);
    const col = Math.floor((x - gt[0]) / gt[1]);
    const row = Math.floor((y - gt[3]) / gt[5]);
    if (col < 0 || row < 0 || col >= grid.width || row >= grid.height) continue;
    const cell = row * grid.width + col;
    if (!scan.inRadius(lon, lat) || !scan.testCell(cell)) continue;
    counts.matched++;
    if (counts.returned >= scan.limit) continue;
    const own: Record<string, unknown> = {};
    for (const c of settlementColumns) own[c.name] = s.properties?.[c.name] ?? null;
    counts.returned++;
    yield {
      type: 'Feature',
      geometry: { type: 'Point', coordinates: round([lon, lat]) },
      properties: { ...own, cellCol: col, cellRow: row, ...scan.recordOf(cell, lon, lat) },
    };
  }
}

/**
 * The collection's foreign members (RFC 7946 section 6.1): what was asked, of which build, with which
 * cautions, and the counts so far.
 */
function shortlistMembers(
  manifest: Manifest,
  options: ShortlistOptions,
  near: { name: string; lonLat: [number, number] } | null,
  within_km: number,
  scan: ShortlistScan,
): Record<string, unknown> {
  const { matched, returned } = scan.counts;
  const scenario = manifest.scenario as { name?: string } | undefined;
  return {
    notice: manifest.notice,
    cautions: EXPORT_CAUTIONS,
    fictional: manifest.fictional,
    where: options.where ?? null,
    near: near ? { settlement: near.name, lon: near.lonLat[0], lat: near.lonLat[1], within_km } : null,
    subject: options.settlements ? 'settlements' : 'cells',
    matched,
    returned,
    truncated: matched > returned,
    limit: Number.isFinite(scan.limit) ? scan.limit : null,
    cellSize_m: manifest.analysisGrid.cellSize_m,
    region: manifest.region.name,
    scenario: scenario?.name ?? null,
    model: manifest.parameters.model ?? null,
    build: { tool: manifest.tool, createdAt: manifest.createdAt },
    unitSystem: UNIT_SYSTEM_NAME[options.units ?? 'SI'],
    // Every numeric column's unit (the record's, exportUnits, and the cell's column and row).
    units: {
      ...Object.fromEntries(CELL_COLUMNS.map((c) => [c.name, c.unit])),
      ...exportUnits(manifest, options.units, scan.scenarioSets),
    },
    sources: manifest.sources.map((s) => ({
      file: s.file,
      role: s.role,
      sha256: s.sha256,
      provenance: s.provenance,
      licence: s.licence,
    })),
  };
}

/** Open a build and prepare the filter; the features come from the run's generator. */
export async function openShortlist(options: ShortlistOptions): Promise<ShortlistRun> {
  const { tilesDir } = options;
  const manifest = await readManifest(tilesDir);
  const where: CompiledWhere = options.where
    ? compileWhere(options.where, manifest.bands)
    : { bandsUsed: [], test: () => true };
  const planes = await readBandPlanes(tilesDir, manifest);
  const bandIndex = new Map(manifest.bands.map((b, i) => [b.id, i]));
  const toLonLat = createTransform(manifest.analysisGrid.crs, 'EPSG:4326');
  const fromLonLat = createTransform('EPSG:4326', manifest.analysisGrid.crs);
  const near = options.near === undefined ? null : await findSettlement(tilesDir, manifest, options.near);
  const within_km = options.within_km ?? Infinity;
  const values = new Float64Array(manifest.bands.length);
  const scenarios = await readScenarioPlanes(tilesDir, manifest);
  const scan: ShortlistScan = {
    grid: manifest.analysisGrid,
    planes,
    limit: options.limit ?? Infinity,
    counts: { matched: 0, returned: 0 },
    testCell: (cell) => {
      for (const b of where.bandsUsed) values[b] = planes[b][cell];
      return where.test(values);
    },
    inRadius: (lon, lat) => near === null || haversine_km([lon, lat], near.lonLat) <= within_km,
    hasNear: near !== null,
    scenarioSets: scenarios.sets,
    recordOf: (cell, lon, lat) =>
      exportRecord(
        manifest,
        lon,
        lat,
        (id) => {
          const b = bandIndex.get(id);
          return b === undefined ? undefined : planes[b][cell];
        },
        options.units,
        { sets: scenarios.sets, valueOf: (i, id) => scenarios.planes[i].get(id)?.[cell] },
      ),
    toLonLat,
    fromLonLat,
  };
  const recordColumns = exportColumns(manifest, options.units, scenarios.sets);
  const taken = new Set([...CELL_COLUMNS, ...recordColumns].map((c) => c.name));
  const { settlements, columns: settlementColumns } = options.settlements
    ? await readSettlements(tilesDir, manifest, taken)
    : { settlements: [], columns: [] };
  return {
    manifest,
    geometryType: options.settlements ? 'Point' : 'Polygon',
    columns: [...settlementColumns, ...CELL_COLUMNS, ...recordColumns],
    features: options.settlements
      ? () => settlementFeatures(scan, settlements, settlementColumns)
      : () => cellFeatures(scan),
    members: () => shortlistMembers(manifest, options, near, within_km, scan),
  };
}

/** The whole shortlist as one FeatureCollection in memory (for small results; the CLI streams). */
export async function shortlist(options: ShortlistOptions): Promise<FeatureCollection> {
  const run = await openShortlist(options);
  const features = [...run.features()];
  return { type: 'FeatureCollection', features, ...run.members() } as FeatureCollection;
}
