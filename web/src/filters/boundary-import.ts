/**
 * Reading a boundary for the zonal summary: a GeoJSON Polygon or MultiPolygon (bare geometry, a
 * Feature or a FeatureCollection; all polygons of a collection are merged into one MultiPolygon),
 * in WGS 84 lon/lat (RFC 7946). Also builds the boundary from vertices drawn on the map.
 */
import { z } from 'zod';
import type { Boundary } from './zonal-summary';
import { formatZodIssues } from '../../../layers/validation-error';

const position = z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]).rest(z.number());
const ring = z.array(position).min(4);
const polygon = z.object({ type: z.literal('Polygon'), coordinates: z.array(ring).min(1) });
const multiPolygon = z.object({
  type: z.literal('MultiPolygon'),
  coordinates: z.array(z.array(ring).min(1)).min(1),
});
const geometry = z.union([polygon, multiPolygon]);
const feature = z.object({
  type: z.literal('Feature'),
  geometry: z.unknown(),
  properties: z.unknown().optional(),
});
const collection = z.object({ type: z.literal('FeatureCollection'), features: z.array(feature) });

type Pos = [number, number];

/** Parse a boundary; returns the boundary or the problems found (with paths). */
export function parseBoundary(json: unknown): { boundary: Boundary | null; problems: string[] } {
  const polys: Pos[][][] = [];
  const problems: string[] = [];
  const take = (g: unknown, path: string) => {
    const r = geometry.safeParse(g);
    if (!r.success) {
      problems.push(...formatZodIssues(r.error, { prefix: path }));
      return;
    }
    const strip = (rings: number[][][]): Pos[][] => rings.map((rg) => rg.map((p) => [p[0], p[1]] as Pos));
    if (r.data.type === 'Polygon') polys.push(strip(r.data.coordinates));
    else for (const p of r.data.coordinates) polys.push(strip(p));
  };
  const asCollection = collection.safeParse(json);
  if (asCollection.success) {
    asCollection.data.features.forEach((f, i) => {
      const t = (f.geometry as { type?: string } | null)?.type;
      if (t === 'Polygon' || t === 'MultiPolygon') take(f.geometry, `features.${i}.geometry`);
    });
    if (polys.length === 0 && problems.length === 0)
      problems.push('features: no Polygon or MultiPolygon found');
  } else {
    const asFeature = feature.safeParse(json);
    take(asFeature.success ? asFeature.data.geometry : json, asFeature.success ? 'geometry' : '(root)');
  }
  if (polys.length === 0) return { boundary: null, problems };
  const geom =
    polys.length === 1
      ? { type: 'Polygon' as const, coordinates: polys[0] }
      : { type: 'MultiPolygon' as const, coordinates: polys };
  return { boundary: { type: 'Feature', properties: {}, geometry: geom }, problems: [] };
}

/** A closed polygon from drawn vertices (at least 3), or null. */
export function boundaryFromVertices(vertices: Pos[]): Boundary | null {
  if (vertices.length < 3) return null;
  return {
    type: 'Feature',
    properties: {},
    geometry: { type: 'Polygon', coordinates: [[...vertices, vertices[0]]] },
  };
}

/** Outer rings of a boundary (for drawing). */
export function boundaryRings(b: Boundary): Pos[][] {
  const polysOf = b.geometry.type === 'Polygon' ? [b.geometry.coordinates] : b.geometry.coordinates;
  return polysOf.map((p) => p[0].map((q) => [q[0], q[1]] as Pos));
}
