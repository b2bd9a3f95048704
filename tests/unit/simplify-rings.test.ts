/**
 * Douglas-Peucker simplification of rings for drawing (web/src/geometry/simplify-rings.ts): collinear
 * vertices go (hand case), every dropped vertex lies within the tolerance of the kept outline (the
 * method's defining property, Douglas & Peucker 1973), and rings stay closed with at least 4 positions.
 */
import { describe, expect, it } from 'vitest';
import { flattenPolygons, type LonLat } from '../../web/src/geometry/flat-rings';
import { simplifyRings } from '../../web/src/geometry/simplify-rings';

function distToSegment(p: LonLat, a: LonLat, b: LonLat, k: number): number {
  const [px, py] = [(p[0] - a[0]) * k, p[1] - a[1]];
  const [dx, dy] = [(b[0] - a[0]) * k, b[1] - a[1]];
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, (px * dx + py * dy) / len2));
  return Math.hypot(px - t * dx, py - t * dy);
}

describe('simplify rings', () => {
  it('keeps only the corners of a square whose edges carry collinear vertices', () => {
    const ring: LonLat[] = [];
    for (let i = 0; i < 10; i++) ring.push([i / 10, 0]);
    for (let i = 0; i < 10; i++) ring.push([1, i / 10]);
    for (let i = 0; i < 10; i++) ring.push([1 - i / 10, 1]);
    for (let i = 0; i < 10; i++) ring.push([0, 1 - i / 10]);
    ring.push([0, 0]);
    const [out] = simplifyRings(flattenPolygons([[ring]]), 1e-9);
    expect(new Set(out.map((p) => p.join(',')))).toEqual(new Set(['0,0', '1,0', '1,1', '0,1']));
    expect(out[0]).toEqual(out[out.length - 1]);
  });

  it('leaves every dropped vertex within the tolerance of the kept outline', () => {
    const n = 20_000;
    const lat0 = 75;
    const k = Math.cos((lat0 * Math.PI) / 180);
    const ring: LonLat[] = [];
    for (let i = 0; i < n; i++) {
      const t = (2 * Math.PI * i) / n;
      const r = 1 + 0.05 * Math.sin(37 * t) + 0.002 * Math.sin(911 * t);
      ring.push([(r * Math.cos(t)) / k, lat0 + r * Math.sin(t)]);
    }
    ring.push(ring[0]);
    const tol = 0.003;
    const [out] = simplifyRings(flattenPolygons([[ring]]), tol);
    expect(out.length).toBeLessThan(n / 5);
    // Walk the original ring along the kept vertices (they appear in order).
    let seg = 0;
    let worst = 0;
    for (const p of ring) {
      const [a, b] = [out[seg], out[seg + 1]];
      worst = Math.max(worst, distToSegment(p, a, b, k));
      if (seg < out.length - 2 && p[0] === b[0] && p[1] === b[1]) seg++;
    }
    expect(seg).toBe(out.length - 2); // every kept vertex met, in order
    expect(worst).toBeGreaterThan(tol / 10); // something was dropped near the limit
    expect(worst).toBeLessThanOrEqual(tol * (1 + 1e-9));
  });

  it('keeps a triangle even with a huge tolerance, and refuses a bad tolerance', () => {
    const tri: LonLat[] = [
      [0, 0],
      [1, 0],
      [0, 1],
      [0, 0],
    ];
    expect(simplifyRings(flattenPolygons([[tri]]), 10)[0]).toHaveLength(4);
    expect(() => simplifyRings(flattenPolygons([[tri]]), -1)).toThrow(/tolerance_deg .* got -1/);
  });
});
