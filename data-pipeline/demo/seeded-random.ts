/**
 * Deterministic randomness for the demo-region generator: a seeded PRNG (mulberry32, a 32-bit
 * multiply-xorshift generator in the public domain, common practice) and seeded 2-D value noise with
 * fractal sums (fBm). Nothing here calls Math.random, so one seed always gives the same region.
 */

/** A PRNG returning uniform numbers in [0, 1) from a 32-bit seed (mulberry32). */
export function createRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Hash of an integer lattice point and a seed to [0, 1) (integer avalanche hash). */
function latticeValue(ix: number, iy: number, seed: number): number {
  let h = Math.imul(ix, 0x27d4eb2d) ^ Math.imul(iy, 0x165667b1) ^ Math.imul(seed, 0x9e3779b1);
  h = Math.imul(h ^ (h >>> 15), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  h ^= h >>> 16;
  return (h >>> 0) / 4294967296;
}

const smooth = (t: number): number => t * t * (3 - 2 * t);

/** Value noise in [-1, 1] at (x, y) in lattice units, smoothly interpolated between lattice points. */
export function valueNoise(x: number, y: number, seed: number): number {
  const ix = Math.floor(x);
  const iy = Math.floor(y);
  const fx = smooth(x - ix);
  const fy = smooth(y - iy);
  const a = latticeValue(ix, iy, seed);
  const b = latticeValue(ix + 1, iy, seed);
  const c = latticeValue(ix, iy + 1, seed);
  const d = latticeValue(ix + 1, iy + 1, seed);
  const top = a + (b - a) * fx;
  const bottom = c + (d - c) * fx;
  return 2 * (top + (bottom - top) * fy) - 1;
}

/** Fractal (fBm) value noise: `octaves` layers, each twice the frequency and half the amplitude. */
export function fractalNoise(x: number, y: number, seed: number, octaves = 4): number {
  let sum = 0;
  let amplitude = 1;
  let norm = 0;
  let f = 1;
  for (let o = 0; o < octaves; o++) {
    sum += amplitude * valueNoise(x * f, y * f, seed + o * 1013);
    norm += amplitude;
    amplitude *= 0.5;
    f *= 2;
  }
  return sum / norm;
}
