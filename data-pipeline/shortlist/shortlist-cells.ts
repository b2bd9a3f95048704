/**
 * `pile-atlas shortlist`: reads a build (manifest.json + the per-band GeoTIFFs of the analysis grid),
 * keeps the cells (or the settlements' cells) for which the `--where` expression holds, and returns an
 * RFC 7946 FeatureCollection (WGS 84 lon/lat, no crs member): cells as polygons of their four corners,
 * settlements as points; every band's value as a property whose name carries its unit; the cautions,
 * the expression, the scenario and the data provenance as foreign members of the collection.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Feature, FeatureCollection, Point, Polygon } from 'geojson';
import { manifestSchema, type Band, type Manifest } from '../../layers/screening/manifest';
import { horizonText } from '../../layers/screening/climate-horizon';
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
  /** At most this many features (default 10 000); the collection says how many matched. */
  limit?: number;
  /** Keep only places within `within_km` of this settlement (its name, any letter case). */
  near?: string;
  within_km?: number;
}

/** Property name of a band: its id with the unit appended (groundTemp -> groundTemp_C). */
export function propertyName(band: Band): string {
  if (!band.unit || band.kind === 'class') return band.id;
  const slug = band.unit
    .replace(/°/g, '')
    .replace(/³/g, '3')
    .replace(/²/g, '2')
    .replace(/\//g, '_per_')
    .replace(/\s+/g, '_')
    .replace(/[^A-Za-z0-9_]/g, '');
  return band.id.toLowerCase().endsWith(`_${slug.toLowerCase()}`) ? band.id : `${band.id}_${slug}`;
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

export async function shortlist(options: ShortlistOptions): Promise<FeatureCollection> {
  const { tilesDir } = options;
  const limit = options.limit ?? 10_000;
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
  const names = manifest.bands.map(propertyName);
  const flagIndex = manifest.bands.map((b) =>
    b.horizon ? manifest.bands.findIndex((x) => x.id === b.horizon?.flagBand) : -1,
  );
  const values = new Float64Array(manifest.bands.length);
  const propertiesOf = (cell: number): Record<string, number | string | null> => {
    const props: Record<string, number | string | null> = {};
    manifest.bands.forEach((band, b) => {
      const v = planes[b][cell];
      props[names[b]] = v === v ? +v.toPrecision(6) : null;
      if (band.classes) props[`${band.id}_label`] = band.classes.find((c) => c.value === v)?.label ?? null;
      if (band.horizon) {
        // Past the scenario's climate horizon: "after 2100", "≥ 45 yr" (climate-horizon.ts); null otherwise.
        const f = flagIndex[b];
        const value = v === v ? `${+v.toPrecision(4)} ${band.unit}` : '';
        props[`${band.id}_qualifier`] = horizonText(band.horizon, f < 0 ? undefined : planes[f][cell], value);
      }
    });
    return props;
  };
  const toLonLat = createTransform(grid.crs, 'EPSG:4326');
  const fromLonLat = createTransform('EPSG:4326', grid.crs);
  const gt = grid.geoTransform;
  const round = (p: [number, number]): [number, number] => [+p[0].toFixed(6), +p[1].toFixed(6)];
  const features: Feature[] = [];
  let matched = 0;

  const near = options.near === undefined ? null : await findSettlement(tilesDir, manifest, options.near);
  const within_km = options.within_km ?? Infinity;
  const testCell = (cell: number): boolean => {
    for (const b of where.bandsUsed) values[b] = planes[b][cell];
    return where.test(values);
  };
  /** Within the radius of --near (the cell centre's or the point's great-circle distance). */
  const inRadius = (lon: number, lat: number): boolean =>
    near === null || haversine_km([lon, lat], near.lonLat) <= within_km;

  if (options.settlements) {
    if (!manifest.settlements)
      throw new InputError(`${join(tilesDir, 'manifest.json')}: build lists no settlements`);
    const file = join(tilesDir, manifest.settlements);
    const collection = JSON.parse(await readFile(file, 'utf8')) as FeatureCollection<Point>;
    for (const s of collection.features) {
      if (s.geometry?.type !== 'Point') continue;
      const [lon, lat] = s.geometry.coordinates;
      const [x, y] = fromLonLat(lon, lat);
      const col = Math.floor((x - gt[0]) / gt[1]);
      const row = Math.floor((y - gt[3]) / gt[5]);
      if (col < 0 || row < 0 || col >= grid.width || row >= grid.height) continue;
      const cell = row * grid.width + col;
      if (!inRadius(lon, lat) || !testCell(cell)) continue;
      matched++;
      if (features.length >= limit) continue;
      features.push({
        type: 'Feature',
        geometry: { type: 'Point', coordinates: [lon, lat] },
        properties: { ...s.properties, cellCol: col, cellRow: row, ...propertiesOf(cell) },
      });
    }
  } else {
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
        if (features.length >= limit) continue;
        const x0 = gt[0] + col * gt[1];
        const y0 = gt[3] + (row + 1) * gt[5];
        const x1 = x0 + gt[1];
        const y1 = gt[3] + row * gt[5];
        const ring = [toLonLat(x0, y0), toLonLat(x1, y0), toLonLat(x1, y1), toLonLat(x0, y1)].map(round);
        ring.push(ring[0]);
        const centre = round(toLonLat(x0 + gt[1] / 2, (y0 + y1) / 2));
        const geometry: Polygon = { type: 'Polygon', coordinates: [ring] };
        features.push({
          type: 'Feature',
          geometry,
          properties: {
            cellCol: col,
            cellRow: row,
            centreLon: centre[0],
            centreLat: centre[1],
            ...propertiesOf(cell),
          },
        });
      }
    }
  }

  const scenario = manifest.scenario as { name?: string } | undefined;
  return {
    type: 'FeatureCollection',
    features,
    // Foreign members (RFC 7946 section 6.1): what was asked, of which build, with which cautions.
    ...{
      notice: manifest.notice,
      fictional: manifest.fictional,
      where: options.where ?? null,
      near: near ? { settlement: near.name, lon: near.lonLat[0], lat: near.lonLat[1], within_km } : null,
      subject: options.settlements ? 'settlements' : 'cells',
      matched,
      returned: features.length,
      truncated: matched > features.length,
      cellSize_m: grid.cellSize_m,
      region: manifest.region.name,
      scenario: scenario?.name ?? null,
      model: manifest.parameters.model ?? null,
      build: { tool: manifest.tool, createdAt: manifest.createdAt },
      units: Object.fromEntries(
        manifest.bands.map((b, i) => [names[i], b.unit || (b.kind === 'class' ? 'class code' : '1')]),
      ),
      sources: manifest.sources.map((s) => ({
        file: s.file,
        role: s.role,
        sha256: s.sha256,
        provenance: s.provenance,
        licence: s.licence,
      })),
    },
  } as FeatureCollection;
}
