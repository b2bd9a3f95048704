/**
 * Ring crossing search (web/src/geometry/ring-crossings.ts) on shapes whose answer is found by hand,
 * and on large simple polygons (must find nothing) and the same with one crossing planted.
 */
import { describe, expect, it } from 'vitest';
import { flattenPolygons, type LonLat } from '../../web/src/geometry/flat-rings';
import { findRingCrossing, segmentContact } from '../../web/src/geometry/ring-crossings';

const sq = (x0: number, y0: number, d: number): LonLat[] => [
  [x0, y0],
  [x0 + d, y0],
  [x0 + d, y0 + d],
  [x0, y0 + d],
  [x0, y0],
];

/** A simple polygon: r(θ) = 1 + 0.05 sin(37 θ) around the origin (θ increases, so it never crosses). */
function wiggly(n: number): LonLat[] {
  const ring: LonLat[] = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    const r = 1 + 0.05 * Math.sin(37 * t);
    ring.push([r * Math.cos(t), r * Math.sin(t)]);
  }
  ring.push(ring[0]);
  return ring;
}

describe('segment contact', () => {
  const p = (...xy: number[]) => Float64Array.from(xy);
  it('classifies crossing, touching, overlapping and apart (hand cases)', () => {
    expect(segmentContact(p(0, 0, 2, 2, 0, 2, 2, 0), 0, 1, 2, 3)).toBe('cross');
    expect(segmentContact(p(0, 0, 2, 0, 1, 0, 1, 5), 0, 1, 2, 3)).toBe('touch'); // T junction at (1, 0)
    expect(segmentContact(p(0, 0, 2, 0, 1, 0, 3, 0), 0, 1, 2, 3)).toBe('overlap'); // share (1..2, 0)
    expect(segmentContact(p(0, 0, 1, 0, 1, 0, 2, 0), 0, 1, 2, 3)).toBe('touch'); // end to end
    expect(segmentContact(p(0, 0, 1, 0, 0, 1, 1, 1), 0, 1, 2, 3)).toBeNull(); // parallel
    expect(segmentContact(p(0, 0, 1, 1, 3, 0, 2, 1), 0, 1, 2, 3)).toBeNull(); // lines meet at (1.5,1.5), segments do not
  });
});

describe('ring crossings', () => {
  it('finds nothing in simple shapes (square, square with a hole touching it at a corner)', () => {
    expect(findRingCrossing(flattenPolygons([[sq(0, 0, 1)]]))).toEqual({ crossing: null, complete: true });
    // A hole may touch its exterior at one point (OGC): hole corner (0, 0.5)... on the left edge.
    const hole: LonLat[] = [
      [0, 0.5],
      [0.5, 0.25],
      [0.5, 0.75],
      [0, 0.5],
    ];
    expect(findRingCrossing(flattenPolygons([[sq(0, 0, 1), hole]])).crossing).toBeNull();
  });

  it('finds a figure eight touching itself at (1, 1)', () => {
    const eight: LonLat[] = [
      [0, 0],
      [2, 0],
      [1, 1],
      [2, 2],
      [0, 2],
      [1, 1],
      [0, 0],
    ];
    const c = findRingCrossing(flattenPolygons([[eight]])).crossing;
    expect(c?.kind).toBe('touch');
    expect([c?.lon, c?.lat]).toEqual([1, 1]);
  });

  it('finds a spike (an edge that runs straight back) between neighbouring edges', () => {
    // (1, 2) -> (1, 3) -> (1, 2.5) folds back on itself at (1, 3), and the next edge then starts on
    // the edge (1, 2)-(1, 3): whichever the sweep meets first is reported, both on x = 1, y 2.5..3.
    const spike: LonLat[] = [
      [0, 0],
      [2, 0],
      [2, 2],
      [1, 2],
      [1, 3],
      [1, 2.5],
      [0, 2],
      [0, 0],
    ];
    const c = findRingCrossing(flattenPolygons([[spike]])).crossing;
    expect(['overlap', 'touch']).toContain(c?.kind);
    expect(c?.lon).toBe(1);
    expect(c?.lat).toBeGreaterThanOrEqual(2.5);
    expect(c?.lat).toBeLessThanOrEqual(3);
  });

  it('does not compare different polygons of a MultiPolygon (treated as a union)', () => {
    expect(findRingCrossing(flattenPolygons([[sq(0, 0, 2)], [sq(1, 1, 2)]])).crossing).toBeNull();
  });

  it('finds nothing in a simple 200,000-vertex ring, and the one crossing planted in it', () => {
    const ring = wiggly(200_000);
    expect(findRingCrossing(flattenPolygons([[ring]]))).toEqual({ crossing: null, complete: true });
    // Swap two neighbouring vertices: edges (a, c) and (b, d) now cross between them.
    const k = 123_457;
    const bad = ring.slice();
    [bad[k], bad[k + 1]] = [bad[k + 1], bad[k]];
    const c = findRingCrossing(flattenPolygons([[bad]])).crossing;
    expect(c?.kind).toBe('cross');
    expect(Math.min(c!.edgeA, c!.edgeB)).toBe(k - 1);
    expect(Math.max(c!.edgeA, c!.edgeB)).toBe(k + 1);
  });
});
