/**
 * Thaw beyond the scenario's climate horizon (issue 11 item 8). The per-cell model's warming is a
 * linear trend that holds only as far as the scenario's climate (Scenario.climateHorizonYear, default
 * 2100); a thaw later than that is reported as "after <year>", never as a year the trend would reach
 * centuries on.
 *
 * Encoding (declared in the manifest, bandSchema.horizon): the class band `thawBeyondHorizon` holds
 *   0 both thaw years (without and with piles) within the horizon,
 *   1 thaw with piles after the horizon: thawYearPiles holds the horizon year ("after <year>"), the
 *     thaw delay and the frozen margin are lower bounds ("≥ value"),
 *   2 no thaw before the horizon even without piles: thawYear and thawYearPiles hold the horizon year,
 *     the frozen margin is a lower bound and the thaw delay is not determined (nodata);
 * nodata where the reference point is thawed today. `horizonQualifier` and `horizonText` turn a band's
 * value and the cell's flag into what every reader shows (map readouts, class card, exports).
 */
import type { HorizonQualifier } from './screening-model';
import type { Scenario } from './scenario';
import { pathwayHorizonYear } from './warming-pathway';

/**
 * The climate horizon of a scenario, calendar year: climateHorizonYear, capped by the last year of the
 * warming pathway when the scenario has one (there is no climate beyond the pathway's table).
 */
export function effectiveHorizonYear(s: Pick<Scenario, 'climateHorizonYear' | 'warmingPathway'>): number {
  return s.warmingPathway
    ? Math.min(s.climateHorizonYear, pathwayHorizonYear(s.warmingPathway))
    : s.climateHorizonYear;
}

export const THAW_HORIZON = { within: 0, pilesAfter: 1, bothAfter: 2 } as const;

export const THAW_HORIZON_LABELS: Record<number, string> = {
  0: 'thaw within the climate horizon',
  1: 'thaw with piles after the climate horizon',
  2: 'no thaw before the climate horizon',
};

/** How a band's value reads for a cell with thawBeyondHorizon = `flag` (null: a plain value). */
export function horizonQualifier(
  h: HorizonQualifier | undefined,
  flag: number | null | undefined,
): 'after' | 'atLeast' | 'undetermined' | null {
  if (!h || flag === null || flag === undefined || !Number.isFinite(flag)) return null;
  const f = Math.round(flag);
  if (h.after.includes(f)) return 'after';
  if (h.atLeast.includes(f)) return 'atLeast';
  if (h.undetermined.includes(f)) return 'undetermined';
  return null;
}

/**
 * The text of a horizon-bounded value: "after 2100", "≥ 45 yr" (from the formatted value) or
 * "not before 2100"; null when the value is a plain number (format it as usual).
 */
export function horizonText(
  h: HorizonQualifier | undefined,
  flag: number | null | undefined,
  formattedValue: string,
): string | null {
  const q = horizonQualifier(h, flag);
  if (q === null || !h) return null;
  if (q === 'after') return `after ${h.year}`;
  if (q === 'atLeast') return `≥ ${formattedValue}`;
  return `not determined: no thaw before ${h.year}`;
}

/**
 * The ensemble's thaw-delay percentiles past the horizon (cell-ensemble-model.ts). A member whose thaw
 * with piles falls after the horizon holds a capped delay, a lower bound of its own; a percentile is
 * then a lower bound too unless every such member lies above the order statistics it is interpolated
 * from (percentileIsLowerBound, ensemble-statistics.ts). Those order statistics grow with the
 * percentile, so the bounded percentiles are always the top ones: the class band
 * `thawDelayRangeBound` holds how many of P10/P50/P90 are bounded, counted from P90 down
 * (0 none, 1 P90, 2 P50 and P90, 3 all three); nodata where the percentiles are not defined.
 */
export const RANGE_BOUND_PERCENTILES = ['P10', 'P50', 'P90'] as const;

export const RANGE_BOUND_LABELS: Record<number, string> = {
  0: 'P10, P50 and P90 within the climate horizon',
  1: 'P90 a lower bound (thaw with piles after the climate horizon)',
  2: 'P50 and P90 lower bounds (thaw with piles after the climate horizon)',
  3: 'P10, P50 and P90 lower bounds (thaw with piles after the climate horizon)',
};

/** The values of `thawDelayRangeBound` under which percentile `p` is a lower bound ("≥ value"). */
export function rangeBoundFlags(p: (typeof RANGE_BOUND_PERCENTILES)[number]): number[] {
  const fromTop = RANGE_BOUND_PERCENTILES.length - RANGE_BOUND_PERCENTILES.indexOf(p);
  const out: number[] = [];
  for (let v = fromTop; v <= RANGE_BOUND_PERCENTILES.length; v++) out.push(v);
  return out;
}
