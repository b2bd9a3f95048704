/**
 * The time reductions of a NetCDF input (read-netcdf.ts documents them): the selected time steps of a
 * variable, each read as a physical-unit field, reduced per pixel to one Float32 field (NaN nodata).
 */
import { InputError } from '../input-error';
import type { TimeReduce } from './read-netcdf';

/** Monthly mean of a unit sinusoid, relative to its amplitude: sin(pi/12) / (pi/12). */
export const MONTHLY_MEAN_ATTENUATION = Math.sin(Math.PI / 12) / (Math.PI / 12);

/** One selected time step: calendar year, month (1-12) and index along the time axis. */
export interface TimeStep {
  y: number;
  m: number;
  i: number;
}

/** Reads time step `i` as `n` physical values (NaN where missing). */
export type StepReader = (i: number) => Float64Array;

/** Reduce the used steps with `r` (a 2-D variable's single step is its own mean). */
export function reduceSteps(
  label: string,
  r: TimeReduce,
  nd: number,
  n: number,
  used: TimeStep[],
  step: StepReader,
): Float32Array {
  const result = new Float32Array(n).fill(NaN);
  if (r === 'mean' || nd === 2) meanOfSteps(n, used, step, result);
  else reduceCompleteYears(label, r, n, used, step, result);
  return result;
}

/** Per-pixel mean of every valid step. */
function meanOfSteps(n: number, used: TimeStep[], step: StepReader, result: Float32Array): void {
  const sum = new Float64Array(n);
  const cnt = new Uint32Array(n);
  for (const u of used) {
    const s = step(u.i);
    for (let k = 0; k < n; k++) {
      if (s[k] !== s[k]) continue;
      sum[k] += s[k];
      cnt[k]++;
    }
  }
  for (let k = 0; k < n; k++) if (cnt[k]) result[k] = sum[k] / cnt[k];
}

/** The used steps grouped by calendar year, only years with all 12 months; an InputError when none. */
function completeYears(label: string, r: TimeReduce, used: TimeStep[]): [number, TimeStep[]][] {
  const years = new Map<number, TimeStep[]>();
  for (const u of used) (years.get(u.y) ?? years.set(u.y, []).get(u.y)!).push(u);
  const full = [...years.entries()].filter(
    ([, ms]) => new Set(ms.map((q) => q.m)).size === 12 && ms.length === 12,
  );
  if (full.length === 0) {
    throw new InputError(
      `${label}: ${r} needs complete calendar years of monthly steps; none in the selection`,
    );
  }
  return full;
}

/** Per-pixel sums over the complete years: the monthly climatology and the annual means' regression sums. */
interface YearSums {
  clim: Float64Array[];
  /** Years counted per pixel (a pixel lacking any month of a year drops that year). */
  count: Uint32Array;
  sx: Float64Array;
  sy: Float64Array;
  sxx: Float64Array;
  sxy: Float64Array;
}

/** annualMean, annualAmplitude or trend over the complete calendar years of the used steps. */
function reduceCompleteYears(
  label: string,
  r: TimeReduce,
  n: number,
  used: TimeStep[],
  step: StepReader,
  result: Float32Array,
): void {
  const full = completeYears(label, r, used);
  const sums: YearSums = {
    clim: Array.from({ length: 12 }, () => new Float64Array(n)),
    count: new Uint32Array(n),
    sx: new Float64Array(n),
    sy: new Float64Array(n),
    sxx: new Float64Array(n),
    sxy: new Float64Array(n),
  };
  for (const [year, ms] of full) {
    addYear(
      sums,
      year,
      ms.sort((a, b) => a.m - b.m).map((q) => step(q.i)),
      n,
    );
  }
  for (let k = 0; k < n; k++) if (sums.count[k]) result[k] = pixelValue(r, sums, k);
}

/** Add one year's 12 monthly fields (in month order) to the sums, at the pixels valid in every month. */
function addYear(sums: YearSums, year: number, monthly: Float64Array[], n: number): void {
  const yearSum = new Float64Array(n);
  const ok = new Uint8Array(n).fill(1);
  for (const s of monthly) for (let k = 0; k < n; k++) if (s[k] !== s[k]) ok[k] = 0;
  for (let mi = 0; mi < 12; mi++) {
    const s = monthly[mi];
    for (let k = 0; k < n; k++) {
      if (!ok[k]) continue;
      yearSum[k] += s[k];
      sums.clim[mi][k] += s[k];
    }
  }
  for (let k = 0; k < n; k++) {
    if (!ok[k]) continue;
    const mean = yearSum[k] / 12;
    sums.count[k]++;
    sums.sx[k] += year;
    sums.sy[k] += mean;
    sums.sxx[k] += year * year;
    sums.sxy[k] += year * mean;
  }
}

/** The reduced value of pixel `k` (counted in at least one year) from the sums. */
function pixelValue(r: TimeReduce, sums: YearSums, k: number): number {
  const c = sums.count[k];
  const { sx, sy, sxx, sxy, clim } = sums;
  if (r === 'annualMean') return sy[k] / c;
  if (r === 'trend') {
    const den = c * sxx[k] - sx[k] * sx[k];
    return c >= 2 && den > 0 ? (c * sxy[k] - sx[k] * sy[k]) / den : NaN;
  }
  let a = 0;
  let b = 0;
  for (let mi = 0; mi < 12; mi++) {
    const t = clim[mi][k] / c;
    a += (2 / 12) * t * Math.cos((2 * Math.PI * (mi + 0.5)) / 12);
    b += (2 / 12) * t * Math.sin((2 * Math.PI * (mi + 0.5)) / 12);
  }
  return Math.hypot(a, b) / MONTHLY_MEAN_ATTENUATION;
}
