/**
 * Banded Cholesky factorisation A = L Lᵀ of a symmetric positive definite matrix with half-bandwidth
 * p, in place, and the matching forward/back substitution (Golub & Van Loan, Matrix Computations,
 * 4th ed., Algorithm 4.3.5 "band Cholesky"). Cost n·p²/2 to factor, 2·n·p to solve; no pivoting (not
 * needed for SPD). Storage: row i holds A(i, i−p … i) at band[i·(p+1) + (j − i + p)], entries left of
 * column 0 unused. No allocation.
 * The inner products are summed with four partial sums (independent additions the processor can
 * overlap); this changes only the rounding of each sum (a few units in the last place).
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
      const k0 = j0 > j - p ? j0 : j - p;
      let s0 = a[ri + j];
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      let k = k0;
      for (; k + 3 < j; k += 4) {
        s0 -= a[ri + k] * a[rj + k];
        s1 -= a[ri + k + 1] * a[rj + k + 1];
        s2 -= a[ri + k + 2] * a[rj + k + 2];
        s3 -= a[ri + k + 3] * a[rj + k + 3];
      }
      for (; k < j; k++) s0 -= a[ri + k] * a[rj + k];
      const sum = s0 + s1 + (s2 + s3);
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
    let s0 = b[i];
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    let j = j0;
    for (; j + 3 < i; j += 4) {
      s0 -= a[ri + j] * b[j];
      s1 -= a[ri + j + 1] * b[j + 1];
      s2 -= a[ri + j + 2] * b[j + 2];
      s3 -= a[ri + j + 3] * b[j + 3];
    }
    for (; j < i; j++) s0 -= a[ri + j] * b[j];
    b[i] = (s0 + s1 + (s2 + s3)) / a[ri + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * w - i + p;
    const xi = b[i] / a[ri + i];
    b[i] = xi;
    const j0 = i - p > 0 ? i - p : 0;
    let j = j0;
    for (; j + 3 < i; j += 4) {
      b[j] -= a[ri + j] * xi;
      b[j + 1] -= a[ri + j + 1] * xi;
      b[j + 2] -= a[ri + j + 2] * xi;
      b[j + 3] -= a[ri + j + 3] * xi;
    }
    for (; j < i; j++) b[j] -= a[ri + j] * xi;
  }
}

/**
 * Solves L Lᵀ x = b and L Lᵀ y = c in place in one pass over the factor (each factor entry is read
 * once for both right-hand sides: about 1.5 single solves in time instead of 2). `cFrom`: c is zero
 * in every row before it (so is L⁻¹c), which the forward substitution skips.
 */
export function choleskySolvePair(m: BandMatrix, b: Float64Array, c: Float64Array, cFrom = 0): void {
  const { n, p, band: a } = m;
  const w = p + 1;
  const c0 = Math.max(0, Math.min(n, cFrom));
  for (let i = 0; i < c0; i++) {
    const ri = i * w - i + p;
    const j0 = i - p > 0 ? i - p : 0;
    let s0 = b[i];
    let s1 = 0;
    let j = j0;
    for (; j + 1 < i; j += 2) {
      s0 -= a[ri + j] * b[j];
      s1 -= a[ri + j + 1] * b[j + 1];
    }
    if (j < i) s0 -= a[ri + j] * b[j];
    b[i] = (s0 + s1) / a[ri + i];
  }
  for (let i = c0; i < n; i++) {
    const ri = i * w - i + p;
    const j0 = i - p > 0 ? i - p : 0;
    let s0 = b[i];
    let s1 = 0;
    let t0 = c[i];
    let t1 = 0;
    let j = j0;
    for (; j + 1 < i; j += 2) {
      const l0 = a[ri + j];
      const l1 = a[ri + j + 1];
      s0 -= l0 * b[j];
      s1 -= l1 * b[j + 1];
      t0 -= l0 * c[j];
      t1 -= l1 * c[j + 1];
    }
    if (j < i) {
      const l0 = a[ri + j];
      s0 -= l0 * b[j];
      t0 -= l0 * c[j];
    }
    const d = a[ri + i];
    b[i] = (s0 + s1) / d;
    c[i] = (t0 + t1) / d;
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * w - i + p;
    const d = a[ri + i];
    const xi = b[i] / d;
    const yi = c[i] / d;
    b[i] = xi;
    c[i] = yi;
    const j0 = i - p > 0 ? i - p : 0;
    let j = j0;
    for (; j + 1 < i; j += 2) {
      const l0 = a[ri + j];
      const l1 = a[ri + j + 1];
      b[j] -= l0 * xi;
      c[j] -= l0 * yi;
      b[j + 1] -= l1 * xi;
      c[j + 1] -= l1 * yi;
    }
    if (j < i) {
      const l = a[ri + j];
      b[j] -= l * xi;
      c[j] -= l * yi;
    }
  }
}
