/**
 * Banded Cholesky (Golub & Van Loan, Matrix Computations, 4th ed., Algorithm 4.3.5) on seeded random
 * symmetric positive definite band matrices: the solution satisfies A x = b to round-off, a partial
 * re-factorisation from a row equals a full one, and the two-right-hand-side solve (with and without
 * skipped leading zero rows) equals two single solves.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  choleskyFactor,
  choleskySolve,
  choleskySolvePair,
  createBandMatrix,
  type BandMatrix,
} from '../../layers/site/banded-cholesky';

/** Dense lower band of a diagonally dominant SPD matrix from seeded values in [-1, 1]. */
function randomBand(n: number, p: number, values: number[]): Float64Array {
  const w = p + 1;
  const band = new Float64Array(n * w);
  let k = 0;
  const rowSum = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = Math.max(0, i - p); j < i; j++) {
      const v = values[k++ % values.length];
      band[i * w - i + p + j] = v;
      rowSum[i] += Math.abs(v);
      rowSum[j] += Math.abs(v);
    }
  }
  for (let i = 0; i < n; i++) band[i * w + p] = rowSum[i] + 1;
  return band;
}

function multiply(band: Float64Array, n: number, p: number, x: Float64Array): Float64Array {
  const w = p + 1;
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = Math.max(0, i - p); j <= i; j++) {
      const a = band[i * w - i + p + j];
      y[i] += a * x[j];
      if (j !== i) y[j] += a * x[i];
    }
  }
  return y;
}

const caseArb = fc.record({
  n: fc.integer({ min: 1, max: 60 }),
  p: fc.integer({ min: 1, max: 12 }),
  values: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 1, maxLength: 50 }),
  rhs: fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 1, maxLength: 50 }),
  cut: fc.double({ min: 0, max: 1, noNaN: true }),
});

describe('banded Cholesky', () => {
  it('solves A x = b to round-off; a partial re-factorisation equals a full one', () => {
    fc.assert(
      fc.property(caseArb, ({ n, p, values, rhs, cut }) => {
        const A0 = randomBand(n, p, values);
        const m: BandMatrix = createBandMatrix(n, p);
        m.band.set(A0);
        choleskyFactor(m);
        const b = Float64Array.from({ length: n }, (_, i) => rhs[i % rhs.length]);
        const x = Float64Array.from(b);
        choleskySolve(m, x);
        const r = multiply(A0, n, p, x);
        const scale = Math.max(1, ...b.map(Math.abs));
        for (let i = 0; i < n; i++) expect(Math.abs(r[i] - b[i])).toBeLessThan(1e-12 * scale * n);
        // Re-factor rows from `from` on after restoring their entries of A: same factor.
        const from = Math.floor(cut * n);
        const w = p + 1;
        const partial: BandMatrix = { n, p, band: Float64Array.from(m.band) };
        partial.band.set(A0.subarray(from * w), from * w);
        choleskyFactor(partial, from);
        for (let q = 0; q < m.band.length; q++) expect(partial.band[q]).toBe(m.band[q]);
      }),
      { seed: 20261202, numRuns: 150 },
    );
  });

  it('the pair solve equals two single solves, also when it skips leading zero rows', () => {
    fc.assert(
      fc.property(caseArb, ({ n, p, values, rhs, cut }) => {
        const m = createBandMatrix(n, p);
        m.band.set(randomBand(n, p, values));
        choleskyFactor(m);
        const from = Math.floor(cut * n);
        const b = Float64Array.from({ length: n }, (_, i) => rhs[i % rhs.length]);
        const c = Float64Array.from({ length: n }, (_, i) => (i < from ? 0 : rhs[(i * 7) % rhs.length]));
        const xb = Float64Array.from(b);
        const xc = Float64Array.from(c);
        choleskySolve(m, xb);
        choleskySolve(m, xc);
        for (const skip of [0, from]) {
          const pb = Float64Array.from(b);
          const pc = Float64Array.from(c);
          choleskySolvePair(m, pb, pc, skip);
          for (let i = 0; i < n; i++) {
            expect(Math.abs(pb[i] - xb[i])).toBeLessThan(1e-12 * (1 + Math.abs(xb[i])));
            expect(Math.abs(pc[i] - xc[i])).toBeLessThan(1e-12 * (1 + Math.abs(xc[i])));
          }
        }
      }),
      { seed: 20261203, numRuns: 150 },
    );
  });

  it('rejects a matrix that is not positive definite, naming the row', () => {
    const m = createBandMatrix(2, 1);
    // A = [[1, 2], [2, 1]]: eigenvalues 3 and -1.
    m.band.set([0, 1, 2, 1]);
    expect(() => choleskyFactor(m)).toThrow(/not positive definite at row 1/);
  });
});
