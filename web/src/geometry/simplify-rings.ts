/**
 * Fewer vertices for drawing a boundary: the Douglas-Peucker line simplification (D. H. Douglas &
 * T. K. Peucker, "Algorithms for the reduction of the number of points required to represent a
 * digitized line or its caricature", The Canadian Cartographer 10(2), 1973): keep the vertex farthest
 * from the chord while it is farther than the tolerance, recursively (here with an explicit stack, so
 * a million vertices cannot overflow the call stack). Distances are planar in degrees with longitude
 * scaled by cos(latitude) of the ring's middle, so the tolerance means about the same ground distance
 * east-west as north-south. A closed ring is split at its first vertex and the vertex farthest from
 * it, and both halves are simplified. The result is for display only (it may differ from the input by
 * up to the tolerance, and may even touch itself); counts and areas use the full boundary.
 */
import { ringCount, type FlatRings, type LonLat } from './flat-rings';

function simplifyRange(
  xs: Float64Array,
  ys: Float64Array,
  first: number,
  last: number,
  tol2: number,
  keep: Uint8Array,
): void {
  const stack: number[] = [first, last];
  while (stack.length > 0) {
    const b = stack.pop() as number;
    const a = stack.pop() as number;
    const ax = xs[a];
    const ay = ys[a];
    const dx = xs[b] - ax;
    const dy = ys[b] - ay;
    const len2 = dx * dx + dy * dy;
    let far = -1;
    let farD2 = tol2;
    for (let i = a + 1; i < b; i++) {
      const px = xs[i] - ax;
      const py = ys[i] - ay;
      let d2: number;
      if (len2 === 0) d2 = px * px + py * py;
      else {
        const t = Math.max(0, Math.min(1, (px * dx + py * dy) / len2));
        const ex = px - t * dx;
        const ey = py - t * dy;
        d2 = ex * ex + ey * ey;
      }
      if (d2 > farD2) {
        farD2 = d2;
        far = i;
      }
    }
    if (far >= 0) {
      keep[far] = 1;
      stack.push(a, far, far, b);
    }
  }
}

/** One closed ring simplified (at least 4 positions, still closed). */
function simplifyRing(rings: FlatRings, r: number, tolerance_deg: number): LonLat[] {
  const s = rings.ringStart[r];
  const e = rings.ringStart[r + 1];
  const n = e - s;
  const { coords } = rings;
  let midLat = 0;
  for (let i = s; i < e; i++) midLat += coords[2 * i + 1];
  const k = Math.cos(((midLat / n) * Math.PI) / 180);
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    xs[i] = coords[2 * (s + i)] * k;
    ys[i] = coords[2 * (s + i) + 1];
  }
  const keep = new Uint8Array(n);
  keep[0] = 1;
  keep[n - 1] = 1;
  let far = 0;
  let farD2 = -1;
  for (let i = 1; i < n - 1; i++) {
    const d2 = (xs[i] - xs[0]) ** 2 + (ys[i] - ys[0]) ** 2;
    if (d2 > farD2) {
      farD2 = d2;
      far = i;
    }
  }
  keep[far] = 1;
  const tol2 = tolerance_deg * tolerance_deg;
  simplifyRange(xs, ys, 0, far, tol2, keep);
  simplifyRange(xs, ys, far, n - 1, tol2, keep);
  let kept = 0;
  for (let i = 0; i < n; i++) kept += keep[i];
  if (kept < 4) {
    // Keep a visible triangle at least: the two vertices farthest from the chord 0 -> far.
    let best = -1;
    let bestD = -1;
    for (let i = 1; i < n - 1; i++)
      if (!keep[i]) {
        const d = Math.abs((xs[far] - xs[0]) * (ys[i] - ys[0]) - (ys[far] - ys[0]) * (xs[i] - xs[0]));
        if (d > bestD) {
          bestD = d;
          best = i;
        }
      }
    if (best >= 0) keep[best] = 1;
  }
  const out: LonLat[] = [];
  for (let i = 0; i < n; i++) if (keep[i]) out.push([coords[2 * (s + i)], coords[2 * (s + i) + 1]]);
  return out;
}

/** Every ring simplified with `tolerance_deg` (see the module comment). */
export function simplifyRings(rings: FlatRings, tolerance_deg: number): LonLat[][] {
  if (!(tolerance_deg >= 0) || !Number.isFinite(tolerance_deg))
    throw new RangeError(`simplifyRings: tolerance_deg must be a finite number >= 0, got ${tolerance_deg}`);
  const out: LonLat[][] = [];
  for (let r = 0; r < ringCount(rings); r++) out.push(simplifyRing(rings, r, tolerance_deg));
  return out;
}
