/**
 * `pile-atlas shortlist`: reads a build (manifest.json + the per-band GeoTIFFs of the analysis grid),
 * keeps the cells (or the settlements' cells) for which the `--where` expression holds, and yields RFC
 * 7946 features (WGS 84 lon/lat): cells as polygons of their four corners, settlements as points; each
 * with the export schema's record (layers/screening/export-schema.ts, shared with the web: position,
 * every band rounded to its step with its unit in the column name, class codes with labels, cautions).
 * The features come one by one from a generator, so a writer can stream every match (no limit unless
 * asked); the expression, the scenario, the units and the data provenance are the collection's members.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Feature, FeatureCollection, Point, Polygon } from 'geojson';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import {
  exportColumns,
  exportRecord,
  exportUnits,
  EXPORT_CAUTIONS,
  type ExportColumn,
} from '../../layers/screening/export-schema';
import { createTransform } from '../crs/crs-definitions';
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

/** Open a build and prepare the filter; the features come from the run's generator. */
export async function openShortlist(options: ShortlistOptions): Promise<ShortlistRun> {
  const { tilesDir } = options;
  const limit = options.limit ?? Infinity;
  const manifest = await readManifest(tilesDir);
  const where: CompiledWhere = options.where
    ? compileWhere(options.where, manifest.bands)
    : { bandsUsed: [], test: () => true };
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
  const bandIndex = new Map(manifest.bands.map((b, i) => [b.id, i]));
  /** The export schema's record of a cell (shared with the web: export-schema.ts). */
  const recordOf = (cell: number, lon: number, lat: number) =>
    exportRecord(manifest, lon, lat, (id) => {
      const b = bandIndex.get(id);
      return b === undefined ? undefined : planes[b][cell];
    });
  const toLonLat = createTransform(grid.crs, 'EPSG:4326');
  const fromLonLat = createTransform('EPSG:4326', grid.crs);
  const gt = grid.geoTransform;
  const round = (p: [number, number]): [number, number] => [+p[0].toFixed(6), +p[1].toFixed(6)];
  let matched = 0;
  let returned = 0;

  const near = options.near === undefined ? null : await findSettlement(tilesDir, manifest, options.near);
  const within_km = options.within_km ?? Infinity;
  const values = new Float64Array(manifest.bands.length);
  const testCell = (cell: number): boolean => {
    for (const b of where.bandsUsed) values[b] = planes[b][cell];
    return where.test(values);
  };
  /** Within the radius of --near (the cell centre's or the point's great-circle distance). */
  const inRadius = (lon: number, lat: number): boolean =>
    near === null || haversine_km([lon, lat], near.lonLat) <= within_km;

  const cellColumns: ExportColumn[] = [
    { name: 'cellCol', type: 'integer', unit: 'column of the analysis grid' },
    { name: 'cellRow', type: 'integer', unit: 'row of the analysis grid' },
  ];
  const recordColumns = exportColumns(manifest);
  let settlements: Feature<Point>[] = [];
  const settlementColumns: ExportColumn[] = [];
  if (options.settlements) {
    if (!manifest.settlements)
      throw new InputError(`${join(tilesDir, 'manifest.json')}: build lists no settlements`);
    const file = join(tilesDir, manifest.settlements);
    const collection = JSON.parse(await readFile(file, 'utf8')) as FeatureCollection<Point>;
    settlements = collection.features.filter((s) => s.geometry?.type === 'Point');
    // The settlement's own properties come first (name, population, ...): numbers or text.
    const taken = new Set([...cellColumns, ...recordColumns].map((c) => c.name));
    const numeric = new Map<string, boolean>();
    for (const s of settlements) {
      for (const [k, v] of Object.entries(s.properties ?? {})) {
        if (taken.has(k)) continue;
        numeric.set(k, (numeric.get(k) ?? true) && (v === null || typeof v === 'number'));
      }
    }
    for (const [name, isNumber] of numeric) {
      settlementColumns.push({ name, type: isNumber ? 'real' : 'text', unit: '' });
    }
  }

  function* cellFeatures(): Generator<Feature> {
    for (let row = 0; row < grid.height; row++) {
      for (let col = 0; col < grid.width; col++) {
        const cell = row * grid.width + col;
        if (
          planes[0][cell] !== planes[0][cell] &&
          planes[planes.length - 1][cell] !== planes[planes.length - 1][cell]
        ) {
          continue; // outside the screened area
        }
        if (near !== null) {
          const [lon, lat] = toLonLat(gt[0] + (col + 0.5) * gt[1], gt[3] + (row + 0.5) * gt[5]);
          if (!inRadius(lon, lat)) continue;
        }
        if (!testCell(cell)) continue;
        matched++;
        if (returned >= limit) continue;
        const x0 = gt[0] + col * gt[1];
        const y0 = gt[3] + (row + 1) * gt[5];
        const x1 = x0 + gt[1];
        const y1 = gt[3] + row * gt[5];
        const ring = [toLonLat(x0, y0), toLonLat(x1, y0), toLonLat(x1, y1), toLonLat(x0, y1)].map(round);
        ring.push(ring[0]);
        const centre = toLonLat(x0 + gt[1] / 2, (y0 + y1) / 2);
        const geometry: Polygon = { type: 'Polygon', coordinates: [ring] };
        returned++;
        yield {
          type: 'Feature',
          geometry,
          properties: { cellCol: col, cellRow: row, ...recordOf(cell, centre[0], centre[1]) },
        };
      }
    }
  }

  function* settlementFeatures(): Generator<Feature> {
    for (const s of settlements) {
      const [lon, lat] = s.geometry.coordinates;
      const [x, y] = fromLonLat(lon, lat);
      const col = Math.floor((x - gt[0]) / gt[1]);
      const row = Math.floor((y - gt[3]) / gt[5]);
      if (col < 0 || row < 0 || col >= grid.width || row >= grid.height) continue;
      const cell = row * grid.width + col;
      if (!inRadius(lon, lat) || !testCell(cell)) continue;
      matched++;
      if (returned >= limit) continue;
      const own: Record<string, unknown> = {};
      for (const c of settlementColumns) own[c.name] = s.properties?.[c.name] ?? null;
      returned++;
      yield {
        type: 'Feature',
        geometry: { type: 'Point', coordinates: round([lon, lat]) },
        properties: { ...own, cellCol: col, cellRow: row, ...recordOf(cell, lon, lat) },
      };
    }
  }

  const scenario = manifest.scenario as { name?: string } | undefined;
  const columns = [...settlementColumns, ...cellColumns, ...recordColumns];
  return {
    manifest,
    geometryType: options.settlements ? 'Point' : 'Polygon',
    columns,
    features: options.settlements ? settlementFeatures : cellFeatures,
    // Foreign members (RFC 7946 section 6.1): what was asked, of which build, with which cautions.
    members: () => ({
      notice: manifest.notice,
      cautions: EXPORT_CAUTIONS,
      fictional: manifest.fictional,
      where: options.where ?? null,
      near: near ? { settlement: near.name, lon: near.lonLat[0], lat: near.lonLat[1], within_km } : null,
      subject: options.settlements ? 'settlements' : 'cells',
      matched,
      returned,
      truncated: matched > returned,
      limit: Number.isFinite(limit) ? limit : null,
      cellSize_m: grid.cellSize_m,
      region: manifest.region.name,
      scenario: scenario?.name ?? null,
      model: manifest.parameters.model ?? null,
      build: { tool: manifest.tool, createdAt: manifest.createdAt },
      // Every numeric column's unit (the record's, exportUnits, and the cell's column and row).
      units: { ...Object.fromEntries(cellColumns.map((c) => [c.name, c.unit])), ...exportUnits(manifest) },
      sources: manifest.sources.map((s) => ({
        file: s.file,
        role: s.role,
        sha256: s.sha256,
        provenance: s.provenance,
        licence: s.licence,
      })),
    }),
  };
}

/** The whole shortlist as one FeatureCollection in memory (for small results; the CLI streams). */
export async function shortlist(options: ShortlistOptions): Promise<FeatureCollection> {
  const run = await openShortlist(options);
  const features = [...run.features()];
  return { type: 'FeatureCollection', features, ...run.members() } as FeatureCollection;
}
