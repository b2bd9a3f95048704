/**
 * Point-in-polygon through the strip index (web/src/geometry/polygon-strip-index.ts): hand cases
 * (square with a hole, union of overlapping parts) and agreement with an independent implementation
 * (turf's booleanPointInPolygon) on seeded random points around a random star-shaped polygon.
 */
import booleanPointInPolygon from '@turf/boolean-point-in-polygon';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { flattenPolygons, type LonLat } from '../../web/src/geometry/flat-rings';
import {
  buildStripIndex,
  maskPointsInPolygons,
  pointInStripIndex,
} from '../../web/src/geometry/polygon-strip-index';

const sq = (x0: number, y0: number, d: number): LonLat[] => [
  [x0, y0],
  [x0 + d, y0],
  [x0 + d, y0 + d],
  [x0, y0 + d],
  [x0, y0],
];

describe('polygon strip index', () => {
  it('square with a hole: inside, in the hole, outside (hand cases)', () => {
    const idx = buildStripIndex(flattenPolygons([[sq(0, 0, 4), [...sq(1, 1, 2)].reverse()]]));
    expect(pointInStripIndex(idx, 0.5, 0.5)).toBe(true);
    expect(pointInStripIndex(idx, 3.5, 2)).toBe(true);
    expect(pointInStripIndex(idx, 2, 2)).toBe(false); // in the hole
    expect(pointInStripIndex(idx, 5, 2)).toBe(false);
    expect(pointInStripIndex(idx, -1, 2)).toBe(false);
    expect(pointInStripIndex(idx, 2, 4.5)).toBe(false);
  });

  it('a MultiPolygon is a union: the overlap of two parts stays inside', () => {
    const idx = buildStripIndex(flattenPolygons([[sq(0, 0, 2)], [sq(1, 1, 2)]]));
    expect(pointInStripIndex(idx, 1.5, 1.5)).toBe(true); // in both
    expect(pointInStripIndex(idx, 0.5, 0.5)).toBe(true);
    expect(pointInStripIndex(idx, 2.5, 2.5)).toBe(true);
    expect(pointInStripIndex(idx, 0.5, 2.5)).toBe(false);
  });

  it('agrees with turf on random points around random star polygons', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.2, max: 1, noNaN: true }), { minLength: 3, maxLength: 400 }),
        fc.array(
          fc.tuple(
            fc.double({ min: -1.2, max: 1.2, noNaN: true }),
            fc.double({ min: -1.2, max: 1.2, noNaN: true }),
          ),
          {
            minLength: 1,
            maxLength: 200,
          },
        ),
        (radii, points) => {
          const ring: LonLat[] = radii.map((r, i) => {
            const t = (2 * Math.PI * i) / radii.length;
            return [r * Math.cos(t), r * Math.sin(t)];
          });
          ring.push(ring[0]);
          const idx = buildStripIndex(flattenPolygons([[ring]]));
          const lon = Float64Array.from(points.map((p) => p[0]));
          const lat = Float64Array.from(points.map((p) => p[1]));
          const mask = maskPointsInPolygons(idx, lon, lat);
          const poly = { type: 'Polygon' as const, coordinates: [ring] };
          points.forEach((p, i) => {
            // Points on an edge may go either way (module comment); random doubles never land on one.
            expect(mask[i] === 1).toBe(booleanPointInPolygon(p, poly));
          });
        },
      ),
      { seed: 20261202, numRuns: 200 },
    );
  });
});
