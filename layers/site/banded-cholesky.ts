/**
 * Banded Cholesky factorisation A = L Lᵀ of a symmetric positive definite matrix with half-bandwidth
 * p, in place, and the matching forward/back substitution (Golub & Van Loan, Matrix Computations,
 * 4th ed., Algorithm 4.3.5 "band Cholesky"). Cost n·p²/2 to factor, 2·n·p to solve; no pivoting (not
 * needed for SPD). Storage: row i holds A(i, i−p … i) at band[i·(p+1) + (j − i + p)], entries left of
 * column 0 unused. No allocation.
 */
export interface BandMatrix {
  n: number;
  p: number;
  band: Float64Array;
}

export function createBandMatrix(n: number, p: number): BandMatrix {
  return { n, p, band: new Float64Array(n * (p + 1)) };
}

/**
 * Factors in place; throws RangeError if a pivot is not positive (matrix not SPD). With `fromRow` > 0,
 * rows before it must already hold the factor L of an earlier call (row i of L depends only on rows
 * ≤ i of A), and only rows from `fromRow` on (holding fresh entries of A) are factored.
 */
export function choleskyFactor(m: BandMatrix, fromRow = 0): void {
  const { n, p, band: a } = m;
  const w = p + 1;
  for (let i = fromRow; i < n; i++) {
    const j0 = i - p > 0 ? i - p : 0;
    const ri = i * w - i + p; // a[ri + j] = A(i, j)
    for (let j = j0; j <= i; j++) {
      const rj = j * w - j + p;
      let sum = a[ri + j];
      const k0 = j0 > j - p ? j0 : j - p;
      for (let k = k0; k < j; k++) sum -= a[ri + k] * a[rj + k];
      if (j === i) {
        if (!(sum > 0)) throw new RangeError(`matrix is not positive definite at row ${i} (pivot ${sum})`);
        a[ri + i] = Math.sqrt(sum);
      } else {
        a[ri + j] = sum / a[rj + j];
      }
    }
  }
}

/** Solves L Lᵀ x = b in place (b becomes x) with a factored matrix. */
export function choleskySolve(m: BandMatrix, b: Float64Array): void {
  const { n, p, band: a } = m;
  const w = p + 1;
  for (let i = 0; i < n; i++) {
    const ri = i * w - i + p;
    const j0 = i - p > 0 ? i - p : 0;
    let sum = b[i];
    for (let j = j0; j < i; j++) sum -= a[ri + j] * b[j];
    b[i] = sum / a[ri + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * w - i + p;
    b[i] /= a[ri + i];
    const xi = b[i];
    const j0 = i - p > 0 ? i - p : 0;
    for (let j = j0; j < i; j++) b[j] -= a[ri + j] * xi;
  }
}
