import { describe, expect, it } from 'vitest';
import {
  modalClass,
  percentileOf,
  standardisedRegressionIndices,
} from '../../layers/screening/ensemble-statistics';
import { latinColumn, normalQuantile } from '../../layers/screening/latin-hypercube';

describe('percentiles, Hyndman & Fan (1996) definition 7', () => {
  it('matches the definition on 1…10 (NumPy percentile default: 1.9, 5.5, 9.1)', () => {
    const v = Float64Array.from({ length: 10 }, (_, i) => 10 - i);
    const s = new Float64Array(10);
    expect(percentileOf(v, 10, 0.1, s)).toBeCloseTo(1.9, 12);
    expect(percentileOf(v, 10, 0.5, s)).toBeCloseTo(5.5, 12);
    expect(percentileOf(v, 10, 0.9, s)).toBeCloseTo(9.1, 12);
  });
  it('skips undefined members and refuses when too few are defined', () => {
    const v = [NaN, 3, 1, NaN, 2];
    const s = new Float64Array(5);
    expect(percentileOf(v, 5, 0.5, s)).toBe(2);
    expect(percentileOf(v, 5, 0.5, s, 4)).toBeNaN();
  });
});

describe('estimator check on a linear model with known variance', () => {
  // y = Σ a_i·x_i, x_i ~ N(μ_i, σ_i) independent: y is normal with mean Σ a_i μ_i and variance
  // Σ a_i² σ_i², so P10/P90 = mean ∓ 1.2815516·σ_y (scipy norm.ppf(0.9)) and the first-order Sobol
  // index of x_i is a_i² σ_i² / Var y.
  const a = [2, -1, 0.5, 3];
  const mu = [1, 4, -2, 0];
  const sigma = [0.5, 1.5, 2, 0.2];
  const varY = a.reduce((s, ai, i) => s + ai * ai * sigma[i] * sigma[i], 0);
  const meanY = a.reduce((s, ai, i) => s + ai * mu[i], 0);
  const sdY = Math.sqrt(varY);
  const z90 = 1.2815515655446004;

  function ensemble(n: number, seed: number) {
    const k = a.length;
    const x = new Float64Array(n * k);
    const y = new Float64Array(n);
    const col = new Float64Array(n);
    const perm = new Int32Array(n);
    for (let j = 0; j < k; j++) {
      latinColumn(seed, j, col, perm);
      for (let i = 0; i < n; i++) x[i * k + j] = mu[j] + sigma[j] * normalQuantile(col[i]);
    }
    for (let i = 0; i < n; i++) for (let j = 0; j < k; j++) y[i] += a[j] * x[i * k + j];
    return { x, y };
  }

  // Asymptotic standard error of a sample p-quantile under simple random sampling,
  // √(p(1 − p)/N)/φ(z_p)·σ_y (Kendall & Stuart, The Advanced Theory of Statistics, vol. 1, §10.10);
  // Latin hypercube sampling is never worse than N/(N − 1) times it (Owen 1997, Stat. Sinica 7:1).
  const phi90 = Math.exp(-0.5 * z90 * z90) / Math.sqrt(2 * Math.PI);
  const seSrs = (n: number, p: number, phi: number) => (Math.sqrt((p * (1 - p)) / n) / phi) * sdY;

  it('P10/P50/P90 of a 256-member Latin hypercube lie within 3 standard errors of the exact values', () => {
    const n = 256;
    const s = new Float64Array(n);
    const se10 = seSrs(n, 0.1, phi90);
    const se50 = seSrs(n, 0.5, 1 / Math.sqrt(2 * Math.PI));
    let sq10 = 0;
    const seeds = 20;
    for (let seed = 1; seed <= seeds; seed++) {
      const { y } = ensemble(n, seed);
      const e10 = percentileOf(y, n, 0.1, s) - (meanY - z90 * sdY);
      sq10 += e10 * e10;
      expect(Math.abs(e10)).toBeLessThan(3 * se10);
      expect(Math.abs(percentileOf(y, n, 0.5, s) - meanY)).toBeLessThan(3 * se50);
      expect(Math.abs(percentileOf(y, n, 0.9, s) - (meanY + z90 * sdY))).toBeLessThan(3 * se10);
    }
    // Over 20 seeds the RMS error of P10 stays below the simple-random-sampling standard error.
    expect(Math.sqrt(sq10 / seeds)).toBeLessThan(se10);
  });

  it('the sample variance converges faster than simple random sampling would allow', () => {
    // With LHS on an additive model the variance of the mean falls like o(1/N) (Stein 1987); here the
    // error of the mean at N = 64 is far below the simple-random-sampling standard error σ_y/8.
    const n = 64;
    const { y } = ensemble(n, 5);
    const m = y.reduce((s, v) => s + v, 0) / n;
    expect(Math.abs(m - meanY)).toBeLessThan(0.1 * (sdY / Math.sqrt(n)));
  });

  it('squared standardised regression coefficients reproduce the first-order Sobol indices', () => {
    const n = 48;
    const { x, y } = ensemble(n, 11);
    const { indices, rSquared } = standardisedRegressionIndices(x, y, n, a.length);
    expect(rSquared).toBeCloseTo(1, 10);
    a.forEach((ai, i) => {
      // Exact S_i = a_i² σ_i² / Var y; LHS sampling error of the sample σ's is a few percent at N = 48.
      expect(Math.abs(indices[i] - (ai * ai * sigma[i] * sigma[i]) / varY)).toBeLessThan(0.03);
    });
    expect(() => standardisedRegressionIndices(x, y, 5, a.length)).toThrow(/need more than 5/);
  });
});

describe('class agreement', () => {
  it('finds the modal class and its share', () => {
    const counts = new Int32Array(4);
    expect(modalClass([3, 3, 2, 3, 0], 5, counts)).toEqual({ value: 3, share: 0.6 });
    expect(modalClass([1, 2], 2, counts)).toEqual({ value: 1, share: 0.5 });
  });
});
