import { describe, expect, it } from 'vitest';
import {
  fmix32,
  hashUniform,
  latinColumn,
  normalCdf,
  normalQuantile,
  sampleDistribution,
} from '../../layers/screening/latin-hypercube';

describe('normal quantile (A&S 26.2.23 + one Halley step)', () => {
  // Computed with scipy.stats.norm.ppf (SciPy 1.17, double precision).
  const cases: [number, number][] = [
    [1e-10, -6.361340902404056],
    [1e-6, -4.753424308822899],
    [0.001, -3.090232306167813],
    [0.01, -2.3263478740408408],
    [0.1, -1.2815515655446004],
    [0.25, -0.6744897501960817],
    [0.5, 0],
    [0.75, 0.6744897501960817],
    [0.9, 1.2815515655446004],
    [0.975, 1.959963984540054],
    [0.999, 3.090232306167813],
    [0.999999999, 5.997807019601637],
  ];
  it.each(cases)('Φ⁻¹(%s) matches scipy to 1e-9', (p, x) => {
    expect(Math.abs(normalQuantile(p) - x)).toBeLessThan(1e-9);
  });
  it('inverts the CDF over a dense grid and is monotone', () => {
    let prev = -Infinity;
    for (let i = 1; i < 2000; i++) {
      const p = i / 2000;
      const x = normalQuantile(p);
      expect(Math.abs(normalCdf(x) - p)).toBeLessThan(1e-10);
      expect(x).toBeGreaterThan(prev);
      prev = x;
    }
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(1.5)).toBeNaN();
  });
});

describe('seeded Latin hypercube column (McKay, Beckman & Conover 1979)', () => {
  it('puts exactly one member in each of the N equal-probability strata', () => {
    for (const n of [1, 7, 32, 100]) {
      const u = new Float64Array(n);
      latinColumn(12345, 3, u, new Int32Array(n));
      const strata = Array.from(u, (v) => Math.floor(v * n)).sort((a, b) => a - b);
      expect(strata).toEqual(Array.from({ length: n }, (_, i) => i));
      for (const v of u) expect(v >= 0 && v < 1).toBe(true);
    }
  });
  it('is a pure function of (seed, stream): same inputs, same column; another stream, another column', () => {
    const a = new Float64Array(32);
    const b = new Float64Array(32);
    const c = new Float64Array(32);
    const p = new Int32Array(32);
    latinColumn(9, 1, a, p);
    latinColumn(9, 1, b, p);
    latinColumn(9, 2, c, p);
    expect(Array.from(b)).toEqual(Array.from(a));
    expect(Array.from(c)).not.toEqual(Array.from(a));
  });
  it('hash numbers are uniform: mean 1/2 and variance 1/12 within sampling error', () => {
    const n = 100_000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const v = hashUniform(1, 0, i);
      s += v;
      s2 += v * v;
    }
    const mean = s / n;
    // Standard error of the mean 0.29/√n ≈ 9e-4; of the variance about 3e-4.
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.004);
    expect(Math.abs(s2 / n - mean * mean - 1 / 12)).toBeLessThan(0.0015);
    // fmix32 is a bijection on 32-bit integers: no two of a run of inputs collide.
    const seen = new Set<number>();
    for (let i = 0; i < 10_000; i++) seen.add(fmix32(i));
    expect(seen.size).toBe(10_000);
  });
});

describe('inverse CDFs of the declared distributions', () => {
  it('uniform, triangular, normal and fixed', () => {
    expect(sampleDistribution({ dist: 'uniform', min: 0.7, max: 1.3 }, 0.25, 1)).toBeCloseTo(0.85, 12);
    // Triangular on [0, 2] with mode 1: symmetric, median at the mode; F(0.5) = 0.125.
    const tri = { dist: 'triangular' as const, min: 0, mode: 1, max: 2 };
    expect(sampleDistribution(tri, 0.5, 0)).toBeCloseTo(1, 12);
    expect(sampleDistribution(tri, 0.125, 0)).toBeCloseTo(0.5, 12);
    expect(sampleDistribution(tri, 0.875, 0)).toBeCloseTo(1.5, 12);
    // Normal factor around 1, sd 0.1: the 90th percentile is 1 + 0.1·1.28155 (scipy norm.ppf(0.9)).
    expect(sampleDistribution({ dist: 'normal', sd: 0.1 }, 0.9, 1)).toBeCloseTo(1.128155156554, 9);
    expect(sampleDistribution({ dist: 'fixed' }, 0.9, 1)).toBe(1);
  });
});
