/**
 * Finding where the rings of a polygon cross or touch themselves or each other, for a million
 * vertices in well under a second.
 *
 * Method: a sort-and-sweep over the edges of one polygon: the edges are sorted by their west end
 * and swept west to east, keeping the edges whose x-range still reaches the sweep line; each edge is
 * tested only against those of them whose y-range overlaps its own, with the orientation test for
 * segment intersection (e.g. Cormen, Leiserson, Rivest & Stein, Introduction to Algorithms, 3rd ed.,
 * section 33.1, SEGMENTS-INTERSECT). A boundary met in practice is crossed by a vertical line a few
 * times, so few edges are live at once and the work is the sort plus a small multiple of the edge
 * count. A pathological polygon (very many long edges over one place) is stopped after a fixed number
 * of pair tests and reported as not fully checked rather than keeping the worker busy for minutes.
 *
 * What counts (OGC Simple Features, ISO 19125-1 section 6.1.11.1, as usually read): within one ring,
 * two edges that are not neighbours may not meet at all, and two neighbours may not fold back on
 * each other (a spike); edges of different rings of the same polygon may not cross or overlap
 * (touching at a single point is allowed). Different polygons of a MultiPolygon are not compared: the
 * point-in-polygon test treats them as a union, so overlap between them is harmless here. The
 * orientation test uses plain double arithmetic; it decides exactly except for nearly collinear
 * triples within ~1e-16 relative, which only matters for degenerate input.
 */
import { ringCount, type FlatRings } from './flat-rings';

export interface RingCrossing {
  /** Ring indices (into the flat rings) and edge indices within each ring (edge i runs from position i to i + 1). */
  ringA: number;
  edgeA: number;
  ringB: number;
  edgeB: number;
  /** 'cross' (interiors meet at one point), 'touch' (an end point lies on the other edge) or 'overlap' (collinear). */
  kind: 'cross' | 'touch' | 'overlap';
  /** Approximate place of the contact, lon/lat degrees. */
  lon: number;
  lat: number;
}

export interface CrossingSearch {
  crossing: RingCrossing | null;
  /** False when the pair-test budget ran out before every pair sharing a cell was tested. */
  complete: boolean;
}

/** Pair tests allowed per polygon before the search gives up (about 1-2 s of work). */
const PAIR_TEST_BUDGET = 200_000_000;

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  return (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
}

function within(a: number, b: number, c: number): boolean {
  return Math.min(a, b) <= c && c <= Math.max(a, b);
}

/** Kind of contact between segments p1p2 and p3p4, or null when they do not meet. */
export function segmentContact(
  p: ArrayLike<number>,
  i1: number,
  i2: number,
  i3: number,
  i4: number,
): 'cross' | 'touch' | 'overlap' | null {
  const x1 = p[2 * i1];
  const y1 = p[2 * i1 + 1];
  const x2 = p[2 * i2];
  const y2 = p[2 * i2 + 1];
  const x3 = p[2 * i3];
  const y3 = p[2 * i3 + 1];
  const x4 = p[2 * i4];
  const y4 = p[2 * i4 + 1];
  if (Math.max(x1, x2) < Math.min(x3, x4) || Math.max(x3, x4) < Math.min(x1, x2)) return null;
  if (Math.max(y1, y2) < Math.min(y3, y4) || Math.max(y3, y4) < Math.min(y1, y2)) return null;
  const d1 = orient(x3, y3, x4, y4, x1, y1);
  const d2 = orient(x3, y3, x4, y4, x2, y2);
  const d3 = orient(x1, y1, x2, y2, x3, y3);
  const d4 = orient(x1, y1, x2, y2, x4, y4);
  if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0)))
    return 'cross';
  if (d1 === 0 && d2 === 0) {
    // Collinear: overlap when the projections share more than a point, touch when exactly one.
    const useX = Math.abs(x2 - x1) >= Math.abs(y2 - y1);
    const a0 = useX ? Math.min(x1, x2) : Math.min(y1, y2);
    const a1 = useX ? Math.max(x1, x2) : Math.max(y1, y2);
    const b0 = useX ? Math.min(x3, x4) : Math.min(y3, y4);
    const b1 = useX ? Math.max(x3, x4) : Math.max(y3, y4);
    const lo = Math.max(a0, b0);
    const hi = Math.min(a1, b1);
    if (lo < hi) return 'overlap';
    return lo === hi ? 'touch' : null;
  }
  if (d1 === 0 && within(x3, x4, x1) && within(y3, y4, y1)) return 'touch';
  if (d2 === 0 && within(x3, x4, x2) && within(y3, y4, y2)) return 'touch';
  if (d3 === 0 && within(x1, x2, x3) && within(y1, y2, y3)) return 'touch';
  if (d4 === 0 && within(x1, x2, x4) && within(y1, y2, y4)) return 'touch';
  return null;
}

/** Whether neighbouring edges a (i -> i+1) and b (i+1 -> i+2) fold back on each other (a spike). */
function isSpike(p: ArrayLike<number>, i0: number, i1: number, i2: number): boolean {
  const ax = p[2 * i1] - p[2 * i0];
  const ay = p[2 * i1 + 1] - p[2 * i0 + 1];
  const bx = p[2 * i2] - p[2 * i1];
  const by = p[2 * i2 + 1] - p[2 * i1 + 1];
  return ax * by - ay * bx === 0 && ax * bx + ay * by < 0;
}

function contactPoint(
  p: ArrayLike<number>,
  i1: number,
  i2: number,
  i3: number,
  i4: number,
): [number, number] {
  const x1 = p[2 * i1];
  const y1 = p[2 * i1 + 1];
  const x2 = p[2 * i2];
  const y2 = p[2 * i2 + 1];
  const x3 = p[2 * i3];
  const y3 = p[2 * i3 + 1];
  const x4 = p[2 * i4];
  const y4 = p[2 * i4 + 1];
  const den = (x1 - x2) * (y3 - y4) - (y1 - y2) * (x3 - x4);
  if (den === 0)
    return [
      (Math.max(Math.min(x1, x2), Math.min(x3, x4)) + Math.min(Math.max(x1, x2), Math.max(x3, x4))) / 2,
      (Math.max(Math.min(y1, y2), Math.min(y3, y4)) + Math.min(Math.max(y1, y2), Math.max(y3, y4))) / 2,
    ];
  const t = ((x1 - x3) * (y3 - y4) - (y1 - y3) * (x3 - x4)) / den;
  return [x1 + t * (x2 - x1), y1 + t * (y2 - y1)];
}

/** Search the rings firstRing .. endRing - 1 (one polygon) for the first crossing or touch. */
function searchPolygon(
  rings: FlatRings,
  firstRing: number,
  endRing: number,
  budget: { left: number },
): CrossingSearch {
  const { coords, ringStart } = rings;
  let m = 0;
  for (let r = firstRing; r < endRing; r++) m += ringStart[r + 1] - ringStart[r] - 1;
  if (m < 2) return { crossing: null, complete: true };
  const edgeStart = new Uint32Array(m);
  const edgeRing = new Uint32Array(m);
  const minX = new Float64Array(m);
  const maxX = new Float64Array(m);
  const minY = new Float64Array(m);
  const maxY = new Float64Array(m);
  let w = Infinity;
  let e = -Infinity;
  let k = 0;
  for (let r = firstRing; r < endRing; r++)
    for (let i = ringStart[r]; i < ringStart[r + 1] - 1; i++) {
      edgeStart[k] = i;
      edgeRing[k] = r;
      minX[k] = Math.min(coords[2 * i], coords[2 * i + 2]);
      maxX[k] = Math.max(coords[2 * i], coords[2 * i + 2]);
      minY[k] = Math.min(coords[2 * i + 1], coords[2 * i + 3]);
      maxY[k] = Math.max(coords[2 * i + 1], coords[2 * i + 3]);
      w = Math.min(w, minX[k]);
      e = Math.max(e, maxX[k]);
      k++;
    }
  // Sort edges by their west end with one native typed-array sort: key = quantised minX in the high
  // bits, edge number in the low bits (both exact in a double's 53-bit mantissa).
  const indexBits = Math.max(1, Math.ceil(Math.log2(m + 1)));
  const levels = 2 ** (52 - indexBits) - 1;
  const span = Math.max(e - w, 1e-300);
  const keys = new Float64Array(m);
  const scale = 2 ** indexBits;
  for (let j = 0; j < m; j++) keys[j] = Math.floor(((minX[j] - w) / span) * levels) * scale + j;
  keys.sort();
  // Sweep west to east keeping the edges whose x-range reaches the sweep line; each new edge is
  // tested against those of them whose y-range overlaps its own.
  let active = new Uint32Array(64);
  let nActive = 0;
  for (let q = 0; q < m; q++) {
    const key = keys[q];
    const level = Math.floor(key / scale);
    const jb = key - level * scale;
    // Lower bound of this and every later edge's minX (the quantisation rounds down).
    const sweepX = w + (level / levels) * span;
    const ib = edgeStart[jb];
    const rb = edgeRing[jb];
    let kept = 0;
    for (let a = 0; a < nActive; a++) {
      const ja = active[a];
      if (maxX[ja] < sweepX) continue; // ends west of everything still to come
      active[kept++] = ja;
      if (maxY[ja] < minY[jb] || maxY[jb] < minY[ja] || maxX[ja] < minX[jb]) continue;
      if (--budget.left < 0) return { crossing: null, complete: false };
      const found = testPair(rings, ja, jb, edgeStart[ja], ib, edgeRing[ja], rb);
      if (found) return { crossing: found, complete: true };
    }
    nActive = kept;
    if (nActive === active.length) {
      const grown = new Uint32Array(active.length * 2);
      grown.set(active);
      active = grown;
    }
    active[nActive++] = jb;
  }
  return { crossing: null, complete: true };
}

/** The fault between edges ja and jb (starting at positions ia, ib, of rings ra, rb), or null. */
function testPair(
  rings: FlatRings,
  ja: number,
  jb: number,
  ia: number,
  ib: number,
  ra: number,
  rb: number,
): RingCrossing | null {
  const { coords, ringStart } = rings;
  if (ra === rb) {
    const raS = ringStart[ra];
    const raEdges = ringStart[ra + 1] - raS - 1;
    const lo = Math.min(ia, ib) - raS;
    const hi = Math.max(ia, ib) - raS;
    if (hi - lo === 1 || (lo === 0 && hi === raEdges - 1)) {
      // Neighbours share a vertex: only a fold-back is a fault. (A triangle's edges are all neighbours.)
      const [p0, p1, p2] =
        hi - lo === 1 ? [raS + lo, raS + hi, raS + hi + 1] : [raS + hi, raS + hi + 1, raS + 1];
      if (!isSpike(coords, p0, p1, p2)) return null;
      return {
        ringA: ra,
        edgeA: lo,
        ringB: rb,
        edgeB: hi,
        kind: 'overlap',
        lon: coords[2 * p1],
        lat: coords[2 * p1 + 1],
      };
    }
  }
  const kind = segmentContact(coords, ia, ia + 1, ib, ib + 1);
  if (kind === null || (ra !== rb && kind === 'touch')) return null;
  const [lon, lat] = contactPoint(coords, ia, ia + 1, ib, ib + 1);
  const aFirst = ja < jb;
  const [first, second] = aFirst ? [ia, ib] : [ib, ia];
  const [rFirst, rSecond] = aFirst ? [ra, rb] : [rb, ra];
  return {
    ringA: rFirst,
    edgeA: first - ringStart[rFirst],
    ringB: rSecond,
    edgeB: second - ringStart[rSecond],
    kind,
    lon,
    lat,
  };
}

/** The first crossing or touch found in any polygon of `rings` (see the module comment). */
export function findRingCrossing(rings: FlatRings): CrossingSearch {
  const n = ringCount(rings);
  let complete = true;
  let r = 0;
  while (r < n) {
    let end = r + 1;
    while (end < n && rings.ringPolygon[end] === rings.ringPolygon[r]) end++;
    const budget = { left: PAIR_TEST_BUDGET };
    const found = searchPolygon(rings, r, end, budget);
    if (found.crossing) return found;
    complete &&= found.complete;
    r = end;
  }
  return { crossing: null, complete };
}
