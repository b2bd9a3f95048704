/**
 * The key figures of one site's simulated ensemble (site-ensemble.ts), as the batch study ("Study all"
 * in the dashboard, `pile-atlas site --batch --ensemble`) carries them per site into its results, the
 * shortlist report and the exports: P10/P50/P90 of the thaw delay at the first probe and of the lowest
 * fluid temperature, with how many members define each.
 *
 * Percentiles are Hyndman & Fan definition 7 over the members where the figure is defined
 * (ensemble-statistics.ts percentileOf). As for the map ensemble's ranges (cell-ensemble-model.ts), a
 * figure is null where fewer than half the members define it: a percentile of a few members would
 * read as a range of the whole ensemble. The thaw delay of a member whose probe has not thawed with the
 * pile by the end of its run is a lower bound (`thawDelayLowerBoundMembers` counts them). Rounding
 * follows the export schema (export-schema.ts EXPORT_STEPS: durations 0.1 yr, temperatures 0.01 K).
 */
import type { SiteResult } from '../site/site-input-schema';
import { percentileOf } from './ensemble-statistics';
import { EXPORT_STEPS, roundToStep } from './export-schema';

export interface SiteEnsembleFigures {
  members: number;
  thawDelayP10_yr: number | null;
  thawDelayP50_yr: number | null;
  thawDelayP90_yr: number | null;
  /** Members whose thaw delay at the first probe is defined (both runs thawed, or the pile run not yet). */
  thawDelayDefinedMembers: number;
  /** Of those, members whose delay is a lower bound (the pile run had not thawed by the end). */
  thawDelayLowerBoundMembers: number;
  lowestFluidP10_C: number | null;
  lowestFluidP50_C: number | null;
  lowestFluidP90_C: number | null;
}

type Percentiles = [number | null, number | null, number | null];

/** P10/P50/P90 of the finite values, rounded to `step`; nulls where fewer than half are finite. */
function percentiles(values: number[], step: number): Percentiles {
  const n = values.length;
  const scratch = new Float64Array(n);
  const minFinite = Math.ceil(n / 2);
  const at = (p: number) => {
    const v = percentileOf(values, n, p, scratch, minFinite);
    return Number.isFinite(v) ? roundToStep(v, step) : null;
  };
  return [at(0.1), at(0.5), at(0.9)];
}

/** The batch figures of one site's ensemble members' results (any order). */
export function siteEnsembleFigures(results: readonly SiteResult[]): SiteEnsembleFigures {
  if (results.length < 2)
    throw new RangeError(`results: expected at least 2 ensemble members; received ${results.length}`);
  const delays = results.map((r) => r.thawDelay_yr[0] ?? NaN);
  const lowest = results.map((r) => r.fluid?.lowest_C ?? NaN);
  const [d10, d50, d90] = percentiles(delays, EXPORT_STEPS.yr);
  const [f10, f50, f90] = percentiles(lowest, EXPORT_STEPS['°C']);
  return {
    members: results.length,
    thawDelayP10_yr: d10,
    thawDelayP50_yr: d50,
    thawDelayP90_yr: d90,
    thawDelayDefinedMembers: delays.filter(Number.isFinite).length,
    thawDelayLowerBoundMembers: results.filter(
      (r, j) => Number.isFinite(delays[j]) && r.thawDelayIsLowerBound[0] === true,
    ).length,
    lowestFluidP10_C: f10,
    lowestFluidP50_C: f50,
    lowestFluidP90_C: f90,
  };
}
