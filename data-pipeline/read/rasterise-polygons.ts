/**
 * Polygon inputs (GeoJSON, GeoPackage, any vector format GDAL reads): an attribute mapped to a role's
 * value, e.g. a surficial-geology unit to a soil texture class or a ground-ice class to a water + ice
 * content. GDAL reprojects the polygons into the analysis CRS (ogr2ogr), each feature's attribute is
 * mapped through the inputs config's `values` table (or read as a number when there is none), and GDAL
 * burns the mapped values into a Float32 raster (gdal_rasterize, the pixel centre inside the polygon)
 * of `pixel_m`, finer than the analysis cells, which then goes the way of every raster input (scan,
 * range check, warp). Features whose attribute is null or empty are left as nodata; a value missing
 * from the table is an error naming it.
 */
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { loadGdal, type Gdal } from '../gdal/gdal-wasm';
import { InputError } from '../input-error';

export interface PolygonOptions {
  label: string;
  attribute: string;
  values?: Record<string, number>;
  layer?: string;
  /** The CRS to rasterise in (the analysis CRS). */
  srs: string;
  /** Largest raster side, pixels (the pixel grows for larger regions). */
  maxSide?: number;
}

export const POLYGON_NODATA = -9999;

type Geometry = { type: string; coordinates: unknown };
type Feature = { type: 'Feature'; properties: Record<string, unknown> | null; geometry: Geometry | null };

function extend(box: number[], coords: unknown): void {
  if (Array.isArray(coords) && typeof coords[0] === 'number') {
    const [x, y] = coords as number[];
    box[0] = Math.min(box[0], x);
    box[1] = Math.min(box[1], y);
    box[2] = Math.max(box[2], x);
    box[3] = Math.max(box[3], y);
  } else if (Array.isArray(coords)) for (const c of coords) extend(box, c);
}

/** Reproject the polygons at `path` into `o.srs` as GeoJSON (ogr2ogr), keeping only the attribute. */
async function reprojectPolygons(
  gdal: Gdal,
  path: string,
  reprojected: string,
  o: PolygonOptions,
): Promise<Feature[]> {
  try {
    gdal.vectorTranslate(path, reprojected, [
      '-f',
      'GeoJSON',
      '-t_srs',
      o.srs,
      '-select',
      o.attribute,
      '-nlt',
      'PROMOTE_TO_MULTI',
      ...(o.layer ? [o.layer] : []),
    ]);
  } catch (err) {
    throw new InputError(`${o.label}: cannot read the polygons (${(err as Error).message})`);
  }
  const fc = JSON.parse(await readFile(reprojected, 'utf8')) as { features?: Feature[] };
  return fc.features ?? [];
}

/** Feature `i`'s attribute `raw` as the role's value: through the `values` table, else as a number. */
function valueOf(raw: unknown, i: number, o: PolygonOptions): number {
  if (o.values) {
    const v = o.values[String(raw)];
    if (v === undefined) {
      throw new InputError(
        `${o.label}: feature ${i} has ${o.attribute} = "${String(raw)}", not in the inputs config's values ` +
          `(${Object.keys(o.values).join(', ')})`,
      );
    }
    return v;
  }
  const value = typeof raw === 'number' ? raw : Number(raw);
  if (!Number.isFinite(value)) {
    throw new InputError(
      `${o.label}: feature ${i} has ${o.attribute} = "${String(raw)}", not a number (give "values" to map it)`,
    );
  }
  return value;
}

/**
 * The polygon features with a value, each carrying only `value`, and their bounding box; features
 * without the attribute are an error, with a null or empty one skipped.
 */
function mapFeatures(
  features: Feature[],
  o: PolygonOptions,
): { mapped: Feature[]; box: number[]; withAttribute: number } {
  const box = [Infinity, Infinity, -Infinity, -Infinity];
  const mapped: Feature[] = [];
  let withAttribute = 0;
  for (const [i, f] of features.entries()) {
    if (!f.geometry || !/Polygon$/.test(f.geometry.type)) continue;
    if (!f.properties || !(o.attribute in f.properties)) {
      throw new InputError(`${o.label}: feature ${i} has no attribute "${o.attribute}"`);
    }
    const raw = f.properties[o.attribute];
    if (raw === null || raw === undefined || raw === '') continue;
    withAttribute++;
    const value = valueOf(raw, i, o);
    extend(box, f.geometry.coordinates);
    mapped.push({ type: 'Feature', properties: { value }, geometry: f.geometry });
  }
  if (mapped.length === 0) {
    throw new InputError(`${o.label}: no polygon with a value for attribute "${o.attribute}"`);
  }
  return { mapped, box, withAttribute };
}

/** Burn `value` of the features in `valued` into a Float32 GeoTIFF of square `pixel`s covering `box`. */
function burnValues(
  gdal: Gdal,
  valued: string,
  tif: string,
  box: number[],
  pixel: number,
  o: PolygonOptions,
): void {
  const te = [
    Math.floor(box[0] / pixel) * pixel,
    Math.floor(box[1] / pixel) * pixel,
    Math.ceil(box[2] / pixel) * pixel,
    Math.ceil(box[3] / pixel) * pixel,
  ];
  try {
    gdal.rasterize(valued, tif, [
      '-a',
      'value',
      '-a_srs',
      o.srs,
      '-te',
      ...te.map(String),
      '-tr',
      String(pixel),
      String(pixel),
      '-ot',
      'Float32',
      '-a_nodata',
      String(POLYGON_NODATA),
      '-init',
      String(POLYGON_NODATA),
      '-of',
      'GTiff',
    ]);
  } catch (err) {
    throw new InputError(`${o.label}: cannot rasterise the polygons (${(err as Error).message})`);
  }
}

/** Rasterise the polygons at `path`; returns the GeoTIFF written into `outDir` and what was read. */
export async function rasterisePolygons(
  path: string,
  outDir: string,
  name: string,
  o: PolygonOptions,
): Promise<{ tif: string; reading: Record<string, unknown> }> {
  const gdal = await loadGdal();
  const features = await reprojectPolygons(gdal, path, join(outDir, `${name}-polygons.geojson`), o);
  const { mapped, box, withAttribute } = mapFeatures(features, o);
  const valued = join(outDir, `${name}-valued.geojson`);
  await writeFile(valued, JSON.stringify({ type: 'FeatureCollection', features: mapped }));
  const maxSide = o.maxSide ?? 4000;
  const span = Math.max(box[2] - box[0], box[3] - box[1]);
  const pixel = Math.max(250, Math.ceil(span / maxSide / 50) * 50);
  const tif = join(outDir, `${name}-polygons.tif`);
  burnValues(gdal, valued, tif, box, pixel, o);
  return {
    tif,
    reading: {
      polygons: {
        attribute: o.attribute,
        ...(o.values ? { values: o.values } : {}),
        ...(o.layer ? { layer: o.layer } : {}),
        features: features.length,
        featuresWithValue: withAttribute,
        rasterisedAt_m: pixel,
        rule: 'pixel centre inside the polygon (gdal_rasterize)',
      },
    },
  };
}
