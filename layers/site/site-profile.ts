/**
 * Ground temperature against depth from a site run. The simulator reports probes, not fields, so the
 * panel appends a column of "profile probes" at one radius to the planner's own probes before the run
 * (at most 50 probes in all, the schema's limit) and splits them off afterwards.
 *
 * For a chosen year Y the profile at each depth is the mean, the lowest and the highest of the output
 * samples with time in (Y − 1, Y] years: the annual-mean curve and the seasonal envelope ("trumpet
 * curve", the usual way of plotting permafrost temperatures against depth, e.g. Lunardini 1981 ch. 1).
 */
import type { SiteCaseResult, SiteInputDraft } from './site-input-schema';

/** Depths of the profile column, m (trimmed to the domain). */
export const PROFILE_DEPTHS_M = [0.25, 0.5, 1, 1.5, 2, 3, 4, 5, 6, 8, 10, 12, 15, 20, 25, 30] as const;

export const MAX_PROBES = 50;

export interface ProfileColumn {
  r_m: number;
  depths_m: number[];
  /** Index of the first profile probe in the run's probe list (= the planner's probe count). */
  firstProbe: number;
}

/**
 * The run input: the planner's probes followed by the profile column at `r_m` (its depths trimmed to
 * the domain and to the room left under the probe limit).
 */
export function withProfileProbes(
  draft: SiteInputDraft,
  r_m: number,
): { input: SiteInputDraft; column: ProfileColumn } {
  const own = draft.probes ?? [];
  const depth = draft.domain?.depth_m ?? 50;
  const room = Math.max(0, MAX_PROBES - own.length);
  const depths = PROFILE_DEPTHS_M.filter((z) => z < depth).slice(0, room);
  const input: SiteInputDraft = { ...draft, probes: [...own, ...depths.map((z_m) => ({ r_m, z_m }))] };
  return { input, column: { r_m, depths_m: depths, firstProbe: own.length } };
}

export interface ProfilePoint {
  z_m: number;
  mean_C: number;
  min_C: number;
  max_C: number;
}

/** Profile of year `year` (1-based) in one case; empty when the run has no samples in that year. */
export function profileAtYear(run: SiteCaseResult, column: ProfileColumn, year: number): ProfilePoint[] {
  const idx: number[] = [];
  run.time_yr.forEach((t, i) => {
    if (t > year - 1 + 1e-9 && t <= year + 1e-9) idx.push(i);
  });
  if (idx.length === 0) return [];
  return column.depths_m.map((z_m, k) => {
    const T = run.probes[column.firstProbe + k].T_C;
    let sum = 0;
    let lo = Infinity;
    let hi = -Infinity;
    for (const i of idx) {
      sum += T[i];
      lo = Math.min(lo, T[i]);
      hi = Math.max(hi, T[i]);
    }
    return { z_m, mean_C: sum / idx.length, min_C: lo, max_C: hi };
  });
}

/** Annual mean at depth `z_m` of year `year` by linear interpolation in the profile (NaN when outside). */
export function annualMeanAt(profile: ProfilePoint[], z_m: number): number {
  for (let i = 0; i + 1 < profile.length; i++) {
    const a = profile[i];
    const b = profile[i + 1];
    if (z_m >= a.z_m && z_m <= b.z_m) {
      const w = (z_m - a.z_m) / (b.z_m - a.z_m);
      return a.mean_C + w * (b.mean_C - a.mean_C);
    }
  }
  if (profile.length === 1 && profile[0].z_m === z_m) return profile[0].mean_C;
  return NaN;
}

/** Strip the profile probes from a case so the planner's probes stand alone. */
export function ownProbes<T extends { probes: unknown[] }>(run: T, column: ProfileColumn): T {
  return { ...run, probes: run.probes.slice(0, column.firstProbe) };
}

/**
 * Undisturbed ground averaged along a pile (top_m to bottom_m), month by month in year `year` (12
 * values, at mid-month (Y − 1) + (i + ½)/12, linear in time between the output samples, which come
 * about monthly on the run's weekly steps), then over the pile by the trapezoid rule on the column's
 * depths (linear between depths). Null when the run does not cover the year or the column does not
 * reach the pile's depths.
 */
export function pileMonthlyGround_C(
  run: SiteCaseResult,
  column: ProfileColumn,
  year: number,
  top_m: number,
  bottom_m: number,
): number[] | null {
  const z = column.depths_m;
  const t = run.time_yr;
  if (z.length < 2 || !(top_m >= z[0] - 1e-9) || !(bottom_m <= z[z.length - 1] + 1e-9)) return null;
  if (t.length < 2 || !(t[0] <= year - 1 + 1 / 24) || !(t[t.length - 1] >= year - 1 / 24)) return null;
  const out: number[] = [];
  let j = 0;
  for (let m = 0; m < 12; m++) {
    const tm = year - 1 + (m + 0.5) / 12;
    while (j < t.length - 2 && t[j + 1] < tm) j++;
    const wt = Math.min(Math.max((tm - t[j]) / (t[j + 1] - t[j]), 0), 1);
    const at = z.map((_, k) => {
      const T = run.probes[column.firstProbe + k].T_C;
      return T[j] + wt * (T[j + 1] - T[j]);
    });
    const value = (d: number) => {
      let k = 0;
      while (k < z.length - 2 && d > z[k + 1]) k++;
      const w = (d - z[k]) / (z[k + 1] - z[k]);
      return at[k] + w * (at[k + 1] - at[k]);
    };
    // Trapezoid over the pile: its ends and every column depth between them.
    const pts = [top_m, ...z.filter((d) => d > top_m && d < bottom_m), bottom_m];
    let sum = 0;
    for (let i = 0; i + 1 < pts.length; i++)
      sum += 0.5 * (value(pts[i]) + value(pts[i + 1])) * (pts[i + 1] - pts[i]);
    out.push(sum / (bottom_m - top_m));
  }
  return out;
}
