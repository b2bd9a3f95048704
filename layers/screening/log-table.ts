/**
 * Lookup tables on a logarithmic abscissa, for the per-cell hot path (precomputed once per scenario).
 *
 * Method. y_i = f(x_i) at x_i = x_min·10^(i/perDecade); `lookup` interpolates linearly in log10 x
 * (and, with `logY`, in log10 y: exact for power laws, so smooth log-log curves such as the ramp
 * response need few points). Outside [x_min, x_max] the end values are held (callers that need an
 * asymptote handle it themselves). Interpolation error for a function with bounded second derivative
 * in log x is ≤ h²·max|f''|/8 with h = 1/perDecade; the builders below state the measured error.
 */

const INV_LN10 = 1 / Math.LN10;

export interface LogTable {
  log10Min: number;
  perDecade: number;
  /** Tabulated values (log10 of them when logY). */
  values: Float64Array;
  logY: boolean;
}

/** Tabulate f on [xMin, xMax] with `perDecade` points per decade. f must be finite (positive if logY). */
export function buildLogTable(
  f: (x: number) => number,
  range: { xMin: number; xMax: number; perDecade: number; logY?: boolean },
): LogTable {
  const { xMin, xMax, perDecade } = range;
  if (!(xMin > 0 && xMax > xMin && perDecade > 0)) {
    throw new RangeError(
      `buildLogTable: need 0 < xMin < xMax and perDecade > 0; received ${xMin}, ${xMax}, ${perDecade}`,
    );
  }
  const log10Min = Math.log10(xMin);
  const n = Math.ceil((Math.log10(xMax) - log10Min) * perDecade) + 1;
  const values = new Float64Array(n);
  const logY = range.logY ?? false;
  for (let i = 0; i < n; i++) {
    const y = f(Math.pow(10, log10Min + i / perDecade));
    if (!Number.isFinite(y) || (logY && !(y > 0))) {
      throw new RangeError(
        `buildLogTable: f(${Math.pow(10, log10Min + i / perDecade)}) = ${y} is not tabulable`,
      );
    }
    values[i] = logY ? Math.log10(y) : y;
  }
  return { log10Min, perDecade, values, logY };
}

/**
 * Fractional index of x on a table's grid, (log10 x − log10 x_min)·perDecade (−1 for x ≤ 0, NaN for
 * NaN): tables on the same grid share it, so one logarithm serves several lookups (lookupAt).
 */
export function tablePosition(t: LogTable, x: number): number {
  return x > 0 ? (Math.log(x) * INV_LN10 - t.log10Min) * t.perDecade : Number.isNaN(x) ? NaN : -1;
}

/** lookup at a fractional index from tablePosition (of this table or one on the same grid). */
export function lookupAt(t: LogTable, u: number): number {
  if (Number.isNaN(u)) return NaN;
  const v = t.values;
  let y: number;
  if (u <= 0) y = v[0];
  else if (u >= v.length - 1) y = v[v.length - 1];
  else {
    const i = Math.floor(u);
    const f = u - i;
    y = v[i] + (v[i + 1] - v[i]) * f;
  }
  return t.logY ? Math.exp(y * Math.LN10) : y;
}

/** Interpolated f(x) (see module comment); x ≤ 0 or NaN gives the first value or NaN respectively. */
export function lookup(t: LogTable, x: number): number {
  return lookupAt(t, tablePosition(t, x));
}
