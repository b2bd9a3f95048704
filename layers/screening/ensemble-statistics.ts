/**
 * Statistics of an ensemble's members: percentiles, the agreement on a class, and first-order
 * sensitivity indices.
 *
 * Percentiles: Hyndman & Fan (1996, The American Statistician 50:361) definition 7, the linear
 * interpolation between order statistics at h = (n − 1)·p (the default of R and NumPy). For P10/P90 of
 * a normal output the estimator's sampling error under Latin hypercube sampling is much smaller than
 * under simple random sampling for outputs that are near-additive in the inputs (Stein 1987,
 * Technometrics 29:143); the convergence study (bench/ensemble-convergence.ts) measures it here.
 *
 * Sensitivity: squared standardised regression coefficients, SRC_i² = (b_i·σ_i/σ_y)², b the least-
 * squares slopes of the output on all inputs together (Saltelli et al. 2008, Global Sensitivity
 * Analysis: The Primer, §1.2.5). For a linear model they equal the first-order Sobol indices exactly;
 * for a non-linear one they are the first-order indices of its best linear fit, and their sum R²
 * (returned) says how far to trust them: near 1 the ranking holds, far below 1 interactions or
 * non-linearity carry the rest. They need only N > k + 1 members, where Saltelli's estimator of the
 * Sobol indices needs N·(k + 2) runs; that is why the site study uses them.
 */

/**
 * Percentile p ∈ [0, 1] of the finite values among `values[0..n)`, Hyndman & Fan definition 7.
 * `sorted` is scratch of length ≥ n (sorted in place). NaN when fewer than `minFinite` are finite.
 */
export function percentileOf(
  values: ArrayLike<number>,
  n: number,
  p: number,
  sorted: Float64Array,
  minFinite = 1,
): number {
  let m = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v === v && v !== Infinity && v !== -Infinity) sorted[m++] = v;
  }
  if (m < minFinite || m === 0) return NaN;
  const s = sorted.subarray(0, m);
  s.sort();
  return percentileOfSorted(s, p);
}

/**
 * Whether percentile p (definition 7, as `percentileOf`) of the finite values among `values[0..n)` is
 * only a lower bound of the true one when the members with `isBound[i]` true hold lower bounds of their
 * true values (e.g. a thaw delay capped at the climate horizon). Raising values never lowers an order
 * statistic, so the percentile is always a lower bound; it is exact when every bounded member lies
 * strictly above the order statistics it is interpolated from (raising those members then changes
 * neither). Ties count as bounded. `sorted` is scratch of length ≥ n. False when no finite value is
 * bounded.
 */
export function percentileIsLowerBound(
  values: ArrayLike<number>,
  isBound: ArrayLike<boolean | number>,
  n: number,
  p: number,
  sorted: Float64Array,
): boolean {
  let m = 0;
  let lowestBound = Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (!(v === v && v !== Infinity && v !== -Infinity)) continue;
    sorted[m++] = v;
    if (isBound[i] && v < lowestBound) lowestBound = v;
  }
  if (m === 0 || lowestBound === Infinity) return false;
  const s = sorted.subarray(0, m);
  s.sort();
  const h = (m - 1) * p;
  const lo = Math.floor(h);
  // The highest order statistic with a non-zero weight in the interpolation.
  const top = h === lo ? lo : Math.min(m - 1, lo + 1);
  return lowestBound <= s[top];
}

/** Definition 7 on an already sorted array (length ≥ 1). */
export function percentileOfSorted(s: ArrayLike<number>, p: number): number {
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(s.length - 1, lo + 1);
  return s[lo] + (h - lo) * (s[hi] - s[lo]);
}

/**
 * The class most members agree on and the share that does (ties to the lower class value). Classes are
 * small non-negative integers below `counts.length`.
 */
export function modalClass(
  classes: ArrayLike<number>,
  n: number,
  counts: Int32Array,
): { value: number; share: number } {
  counts.fill(0);
  for (let i = 0; i < n; i++) {
    const c = classes[i];
    if (c >= 0 && c < counts.length) counts[c]++;
  }
  let best = 0;
  for (let c = 1; c < counts.length; c++) if (counts[c] > counts[best]) best = c;
  return { value: best, share: n > 0 ? counts[best] / n : NaN };
}

/**
 * First-order sensitivity of y to the columns of x (n members × k inputs, row-major) by squared
 * standardised regression coefficients (module comment). Inputs that do not vary get index 0.
 * Throws RangeError when n ≤ k + 1 (too few members to fit).
 */
export function standardisedRegressionIndices(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  n: number,
  k: number,
): { indices: number[]; rSquared: number } {
  if (!(n > k + 1)) throw new RangeError(`members: need more than ${k + 1} for ${k} inputs; received ${n}`);
  const mean = new Float64Array(k);
  const sd = new Float64Array(k);
  let my = 0;
  for (let i = 0; i < n; i++) {
    my += y[i];
    for (let j = 0; j < k; j++) mean[j] += x[i * k + j];
  }
  my /= n;
  for (let j = 0; j < k; j++) mean[j] /= n;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    syy += (y[i] - my) ** 2;
    for (let j = 0; j < k; j++) sd[j] += (x[i * k + j] - mean[j]) ** 2;
  }
  const active: number[] = [];
  for (let j = 0; j < k; j++) if (sd[j] > 0) active.push(j);
  const indices = new Array<number>(k).fill(0);
  if (!(syy > 0) || active.length === 0) return { indices, rSquared: 0 };
  // Normal equations on the standardised active inputs: (ZᵀZ) β = Zᵀ y_s, solved by Gaussian
  // elimination with partial pivoting (k is a handful).
  const a = active.length;
  const m = Array.from({ length: a }, () => new Float64Array(a + 1));
  const sdy = Math.sqrt(syy / n);
  for (const jp of active) sd[jp] = Math.sqrt(sd[jp] / n);
  for (let i = 0; i < n; i++) {
    const ys = (y[i] - my) / sdy;
    for (let p = 0; p < a; p++) {
      const zp = (x[i * k + active[p]] - mean[active[p]]) / sd[active[p]];
      for (let q = 0; q < a; q++) m[p][q] += zp * ((x[i * k + active[q]] - mean[active[q]]) / sd[active[q]]);
      m[p][a] += zp * ys;
    }
  }
  for (let c = 0; c < a; c++) {
    let piv = c;
    for (let r = c + 1; r < a; r++) if (Math.abs(m[r][c]) > Math.abs(m[piv][c])) piv = r;
    [m[c], m[piv]] = [m[piv], m[c]];
    if (Math.abs(m[c][c]) < 1e-12 * n) continue;
    for (let r = 0; r < a; r++) {
      if (r === c) continue;
      const f = m[r][c] / m[c][c];
      for (let q = c; q <= a; q++) m[r][q] -= f * m[c][q];
    }
  }
  for (let p = 0; p < a; p++) {
    const beta = Math.abs(m[p][p]) < 1e-12 * n ? 0 : m[p][a] / m[p][p];
    indices[active[p]] = beta * beta;
  }
  // R² from the fitted values.
  let sse = 0;
  for (let i = 0; i < n; i++) {
    let fit = 0;
    for (let p = 0; p < a; p++) {
      const beta = Math.abs(m[p][p]) < 1e-12 * n ? 0 : m[p][a] / m[p][p];
      fit += beta * ((x[i * k + active[p]] - mean[active[p]]) / sd[active[p]]);
    }
    sse += ((y[i] - my) / sdy - fit) ** 2;
  }
  return { indices, rSquared: 1 - sse / n };
}
