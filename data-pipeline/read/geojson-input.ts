/**
 * The GeoJSON layers an inputs config may list (settlements, land, roads), validated as RFC 7946 before
 * they are published with the build: a FeatureCollection (section 3.3) of Features (3.2) whose
 * geometries (3.1) have positions of two or three finite numbers (3.1.1) in WGS 84 longitude and
 * latitude (section 4: longitude -180..180, latitude -90..90), LineStrings of two or more positions
 * (3.1.4), and linear rings of four or more positions whose first and last are equal (3.1.6).
 * Settlements are Point features with a `name`; land is Polygon or MultiPolygon features; roads are
 * Point, MultiPoint, LineString or MultiLineString features.
 * Every problem is a ValidationError naming the file and the path of the offending member.
 */
import { z } from 'zod';
import { ValidationError } from '../../layers/validation-error';
import { parseJsonText } from './read-json-file';

const position = z
  .array(z.number().finite('coordinates must be finite numbers'))
  .min(2, 'a position has at least two numbers (longitude, latitude)')
  .max(3, 'a position has at most three numbers (longitude, latitude, height)')
  .superRefine((p, ctx) => {
    if (p.length < 2) return;
    if (!(p[0] >= -180 && p[0] <= 180)) {
      ctx.addIssue({ code: 'custom', path: [0], message: `longitude ${p[0]} outside -180..180` });
    }
    if (!(p[1] >= -90 && p[1] <= 90)) {
      ctx.addIssue({ code: 'custom', path: [1], message: `latitude ${p[1]} outside -90..90` });
    }
  });

const lineString = z.array(position).min(2, 'a LineString has at least two positions');

const linearRing = z
  .array(position)
  .min(4, 'a linear ring has at least four positions')
  .refine((ring) => ring.length < 4 || ring[0].every((v, i) => v === ring[ring.length - 1][i]), {
    message: 'a linear ring is closed: its first and last positions are equal',
  });

const polygon = z.array(linearRing).min(1, 'a Polygon has at least one linear ring');
const bbox = z.array(z.number().finite()).optional();

const pointGeometry = z.strictObject({ type: z.literal('Point'), coordinates: position, bbox });
const polygonGeometry = z.strictObject({ type: z.literal('Polygon'), coordinates: polygon, bbox });
const multiPolygonGeometry = z.strictObject({
  type: z.literal('MultiPolygon'),
  coordinates: z.array(polygon),
  bbox,
});

const simpleGeometries = [
  pointGeometry,
  z.strictObject({ type: z.literal('MultiPoint'), coordinates: z.array(position), bbox }),
  z.strictObject({ type: z.literal('LineString'), coordinates: lineString, bbox }),
  z.strictObject({ type: z.literal('MultiLineString'), coordinates: z.array(lineString), bbox }),
  polygonGeometry,
  multiPolygonGeometry,
] as const;

/** Any RFC 7946 geometry (GeometryCollection members are the simple geometries, section 3.1.8). */
export const geometrySchema = z.discriminatedUnion('type', [
  ...simpleGeometries,
  z.strictObject({
    type: z.literal('GeometryCollection'),
    geometries: z.array(z.discriminatedUnion('type', [...simpleGeometries])),
    bbox,
  }),
]);

function featureCollectionOf<G extends z.ZodType, P extends z.ZodType>(geometry: G, properties: P) {
  return z.object({
    type: z.literal('FeatureCollection'),
    bbox,
    features: z.array(
      z.object({
        type: z.literal('Feature'),
        id: z.union([z.string(), z.number()]).optional(),
        geometry,
        properties,
      }),
    ),
  });
}

export const settlementsSchema = featureCollectionOf(
  pointGeometry,
  z.looseObject({
    name: z.string().min(1).max(200),
    population: z.number().finite().min(0).optional(),
  }),
);

export const landSchema = featureCollectionOf(
  z.discriminatedUnion('type', [polygonGeometry, multiPolygonGeometry]),
  z.record(z.string(), z.unknown()).nullable(),
);

/** A roads (or any access) layer: points and lines, e.g. roads, tracks, winter roads, airstrips. */
export const roadsSchema = featureCollectionOf(
  z.discriminatedUnion('type', [
    pointGeometry,
    z.strictObject({ type: z.literal('MultiPoint'), coordinates: z.array(position), bbox }),
    z.strictObject({ type: z.literal('LineString'), coordinates: lineString, bbox }),
    z.strictObject({ type: z.literal('MultiLineString'), coordinates: z.array(lineString), bbox }),
  ]),
  z.record(z.string(), z.unknown()).nullable(),
);

export type GeoJsonLayer = 'settlements' | 'land' | 'roads';

/** Parse and validate a GeoJSON layer's text; throws a ValidationError naming `label` and the member. */
export function validateGeoJsonLayer(layer: GeoJsonLayer, label: string, text: string): void {
  const json = parseJsonText(label, text);
  const schema = layer === 'settlements' ? settlementsSchema : layer === 'roads' ? roadsSchema : landSchema;
  const parsed = schema.safeParse(json);
  if (!parsed.success) throw ValidationError.fromZod(label, parsed.error);
}
