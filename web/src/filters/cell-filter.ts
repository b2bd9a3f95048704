/**
 * Live filters over the screening bands, pure and allocation-free per cell so that the map can fade
 * failing cells at once and the counter can re-run over the whole region on every slider move.
 *
 * A cell passes when, for every band with a range, its value v (SI, as in the tiles) satisfies
 * min <= v <= max (either bound optional), and for every class band with excluded classes its class is
 * not excluded. A cell with no data in a filtered band fails (its value is unknown).
 */
import type { Band } from '../../../layers/screening/manifest';

export interface BandRange {
  bandId: string;
  /** Lower bound in the band's SI unit (inclusive), absent = open. */
  min?: number;
  /** Upper bound in the band's SI unit (inclusive), absent = open. */
  max?: number;
}

export interface FilterSpec {
  ranges: BandRange[];
  /** Class values to exclude, per class band. */
  excluded: { bandId: string; values: number[] }[];
}

export const EMPTY_FILTER: FilterSpec = { ranges: [], excluded: [] };

/** A filter resolved against the manifest's band order: plain arrays for the hot loops. */
export interface CompiledFilter {
  active: boolean;
  rangeBands: number[];
  rangeMin: number[];
  rangeMax: number[];
  classBands: number[];
  classExcluded: Set<number>[];
}

/** Resolve band ids to indices; unknown bands are ignored (they cannot filter what is not there). */
export function compileFilter(spec: FilterSpec, bands: Band[]): CompiledFilter {
  const index = new Map(bands.map((b, i) => [b.id, i]));
  const c: CompiledFilter = {
    active: false,
    rangeBands: [],
    rangeMin: [],
    rangeMax: [],
    classBands: [],
    classExcluded: [],
  };
  for (const r of spec.ranges) {
    const i = index.get(r.bandId);
    const hasMin = r.min !== undefined && Number.isFinite(r.min);
    const hasMax = r.max !== undefined && Number.isFinite(r.max);
    if (i === undefined || (!hasMin && !hasMax)) continue;
    c.rangeBands.push(i);
    c.rangeMin.push(hasMin ? (r.min as number) : -Infinity);
    c.rangeMax.push(hasMax ? (r.max as number) : Infinity);
  }
  for (const e of spec.excluded) {
    const i = index.get(e.bandId);
    if (i === undefined || e.values.length === 0) continue;
    c.classBands.push(i);
    c.classExcluded.push(new Set(e.values));
  }
  c.active = c.rangeBands.length > 0 || c.classBands.length > 0;
  return c;
}

/** Whether a value lies in a range condition's bounds (NaN, no data, never does). */
export function inRange(v: number, min: number, max: number): boolean {
  return v >= min && v <= max;
}

/** Whether a class value is kept by a class condition (NaN, no data, never is). */
export function classKept(v: number, excluded: Set<number>): boolean {
  return !Number.isNaN(v) && !excluded.has(Math.round(v));
}

/** Whether element k of band-planar data (planes[band][k]) passes the filter. */
export function passesAt(f: CompiledFilter, planes: ArrayLike<number>[], k: number): boolean {
  for (let j = 0; j < f.rangeBands.length; j++) {
    if (!inRange(planes[f.rangeBands[j]][k], f.rangeMin[j], f.rangeMax[j])) return false;
  }
  for (let j = 0; j < f.classBands.length; j++) {
    if (!classKept(planes[f.classBands[j]][k], f.classExcluded[j])) return false;
  }
  return true;
}

/** Whether one cell, given as a band-ordered list of values, passes the filter. */
export function cellPasses(f: CompiledFilter, values: ArrayLike<number>): boolean {
  for (let j = 0; j < f.rangeBands.length; j++) {
    if (!inRange(values[f.rangeBands[j]], f.rangeMin[j], f.rangeMax[j])) return false;
  }
  for (let j = 0; j < f.classBands.length; j++) {
    if (!classKept(values[f.classBands[j]], f.classExcluded[j])) return false;
  }
  return true;
}

/**
 * One condition of a compiled filter (a range on one band, or the classes left out of one band): a
 * cell passes the filter when it passes every condition (passesAt). The key names the condition, so
 * that a pass mask computed for it can be kept while another condition is edited.
 */
export type FilterCondition =
  | { key: string; band: number; min: number; max: number }
  | { key: string; band: number; excluded: Set<number> };

export function filterConditions(f: CompiledFilter): FilterCondition[] {
  const out: FilterCondition[] = [];
  for (let j = 0; j < f.rangeBands.length; j++) {
    const [band, min, max] = [f.rangeBands[j], f.rangeMin[j], f.rangeMax[j]];
    out.push({ key: `range ${band} ${min} ${max}`, band, min, max });
  }
  for (let j = 0; j < f.classBands.length; j++) {
    const [band, excluded] = [f.classBands[j], f.classExcluded[j]];
    out.push({ key: `classes ${band} ${[...excluded].sort((a, b) => a - b).join(',')}`, band, excluded });
  }
  return out;
}

/** out[k] = 1 where value k of the condition's band plane passes the condition, else 0. */
export function conditionMask(c: FilterCondition, planes: ArrayLike<number>[], out: Uint8Array): Uint8Array {
  const plane = planes[c.band];
  if ('excluded' in c) {
    for (let k = 0; k < out.length; k++) out[k] = classKept(plane[k], c.excluded) ? 1 : 0;
  } else {
    for (let k = 0; k < out.length; k++) out[k] = inRange(plane[k], c.min, c.max) ? 1 : 0;
  }
  return out;
}
