/**
 * The boundary worker's job (web/src/filters/boundary-job.ts), called directly: a file read and
 * checked, its area, its drawn copy and its cell mask; bad files refused with a reason.
 */
import { describe, expect, it } from 'vitest';
import {
  MAX_DISPLAY_VERTICES,
  runBoundaryJob,
  type BoundaryJobRequest,
} from '../../web/src/filters/boundary-job';
import { unflattenPolygons } from '../../web/src/geometry/flat-rings';

const square = {
  type: 'Feature',
  properties: {},
  geometry: {
    type: 'Polygon',
    coordinates: [
      [
        [0, 0],
        [2, 0],
        [2, 2],
        [0, 2],
        [0, 0],
      ],
    ],
  },
};
const file = (text: string) => new Blob([text], { type: 'application/geo+json' });
const request = (
  source: BoundaryJobRequest['source'],
  cells: BoundaryJobRequest['cells'] = null,
): BoundaryJobRequest => ({
  id: 1,
  source,
  cells,
  displayTolerance_deg: 0.001,
});

describe('boundary job', () => {
  it('reads a file, measures it and marks the cells inside (hand counts)', async () => {
    // Centres (0.5, 0.5), (1.5, 1.5) inside the 2° square; (2.5, 0.5) and (-0.5, 1) outside.
    const cells = {
      lon: Float64Array.from([0.5, 1.5, 2.5, -0.5]),
      lat: Float64Array.from([0.5, 1.5, 0.5, 1]),
    };
    const reply = await runBoundaryJob(
      request({ kind: 'file', file: file(JSON.stringify(square)), name: 'sq.geojson' }, cells),
    );
    expect(reply.type).toBe('done');
    if (reply.type !== 'done') return;
    expect(Array.from(reply.mask ?? [])).toEqual([1, 1, 0, 0]);
    expect(reply.boundary.vertices).toBe(4);
    expect(unflattenPolygons(reply.boundary.display)).toEqual([square.geometry.coordinates]);
    // Small enough for a link: the full ring travels, not the drawn copy.
    expect(reply.boundary.link).toEqual({
      name: 'sq.geojson',
      polygons: [square.geometry.coordinates],
      simplified: false,
    });
    // 2° x 2° from the equator on the sphere R = 6371.0088 km: R² Δλ sin(2°) = 49 438.6 km² (spherical zone, computed).
    const R = 6371.0088;
    expect(reply.boundary.area_km2).toBeCloseTo(
      R * R * ((2 * Math.PI) / 180) * Math.sin((2 * Math.PI) / 180),
      0,
    );
  });

  it('refuses what is not JSON, and what is too large to read', async () => {
    const bad = await runBoundaryJob(
      request({ kind: 'file', file: file('{"type": "Polygon", '), name: 'x' }),
    );
    expect(bad.type === 'refused' && bad.problems[0]).toMatch(/^not valid JSON/);
    const huge = { size: 300 * 2 ** 20, text: async () => '' } as unknown as Blob;
    const big = await runBoundaryJob(request({ kind: 'file', file: huge, name: 'big' }));
    expect(big.type === 'refused' && big.problems[0]).toBe('the file is 300 MB; at most 256 MB can be read');
  });

  it('draws at most MAX_DISPLAY_VERTICES of a large boundary, hands back no full rings, and recounts cells from its source', async () => {
    const n = 200_000;
    const ring: number[][] = [];
    for (let i = 0; i < n; i++) {
      const t = (2 * Math.PI * i) / n;
      const r = 1 + 0.01 * Math.sin(5000 * t);
      ring.push([r * Math.cos(t), r * Math.sin(t)]);
    }
    ring.push(ring[0]);
    const source = { kind: 'json', json: { type: 'Polygon', coordinates: [ring] }, name: 'big' } as const;
    const reply = await runBoundaryJob(request(source));
    if (reply.type !== 'done') throw new Error('refused');
    expect(reply.boundary.vertices).toBe(n);
    expect(reply.boundary.displayVertices).toBeLessThanOrEqual(MAX_DISPLAY_VERTICES);
    expect(reply.boundary.displayVertices).toBeGreaterThan(100);
    // The page gets the drawn copy only (closing positions included, one ring).
    expect(reply.boundary.display.coords.length).toBe(2 * (reply.boundary.displayVertices + 1));
    expect('rings' in reply.boundary).toBe(false);
    // Too long for a link at full resolution: the link carries the drawn copy.
    // Too long for a link even simplified: 10,001 drawn vertices encode to more than MAX_BOUNDARY_URL_CHARS.
    expect(reply.boundary.link).toBeNull();
    const again = await runBoundaryJob(
      request(source, { lon: Float64Array.from([0, 3]), lat: Float64Array.from([0, 0]) }),
    );
    expect(again.type === 'done' && Array.from(again.mask ?? [])).toEqual([1, 0]);
  });

  it('sends a boundary too long for a link as its drawn copy', async () => {
    // A smooth 1° circle of 20,000 vertices: at full resolution at least 40,000 characters (each
    // position encodes to two or more), far more than MAX_BOUNDARY_URL_CHARS; its drawn copy is short.
    const ring: number[][] = [];
    for (let i = 0; i < 20_000; i++) {
      const t = (2 * Math.PI * i) / 20_000;
      ring.push([Math.cos(t), Math.sin(t)]);
    }
    ring.push(ring[0]);
    const reply = await runBoundaryJob(
      request({ kind: 'json', json: { type: 'Polygon', coordinates: [ring] }, name: 'circle' }),
    );
    if (reply.type !== 'done') throw new Error('refused');
    const link = reply.boundary.link;
    expect(link?.simplified).toBe(true);
    expect(link?.name).toBe('circle');
    // The link's polygon is the drawn copy, position for position.
    expect(link?.polygons).toEqual(unflattenPolygons(reply.boundary.display));
    expect(link?.polygons[0][0].length).toBe(reply.boundary.displayVertices + 1);
    expect(reply.boundary.displayVertices).toBeLessThan(1000);
  });
});
