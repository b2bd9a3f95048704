/**
 * The shortlist metrics "Study all" stores per site (keys carry their unit after the last underscore,
 * as every metric does; exported as `metric_<key>`). The simulated ensemble's figures are named like the
 * map ensemble's export columns (`thawDelayP10_yr`, layers/screening/export-schema.ts) with the study's
 * `study` prefix: `studyThawDelayP10_yr`, `studyLowestFluidP50_C`, so the two ensembles stand side by
 * side in an export without sharing a name.
 */
import type { SiteResult } from '../../../layers/site/site-input-schema';
import type { SiteEnsembleFigures } from '../../../layers/screening/site-ensemble-figures';

type Metrics = Record<string, number | string | null>;

/** The site's own run: thaw delay at the first probe (and whether it is a lower bound), lowest fluid. */
export function studyMetrics(result: SiteResult): Metrics {
  return {
    studyThawDelay_yr: result.thawDelay_yr[0] ?? null,
    studyThawDelayAtLeast: result.thawDelayIsLowerBound[0] ? 'yes' : 'no',
    studyLowestFluid_C: result.fluid?.lowest_C ?? null,
  };
}

/** The site's simulated ensemble (site-ensemble-figures.ts) and the seed of its Latin hypercube. */
export function ensembleMetrics(f: SiteEnsembleFigures, seed: number): Metrics {
  return {
    studyEnsembleMembers: f.members,
    studyEnsembleSeed: seed,
    studyThawDelayP10_yr: f.thawDelayP10_yr,
    studyThawDelayP50_yr: f.thawDelayP50_yr,
    studyThawDelayP90_yr: f.thawDelayP90_yr,
    studyThawDelayDefinedMembers: f.thawDelayDefinedMembers,
    studyThawDelayLowerBoundMembers: f.thawDelayLowerBoundMembers,
    studyLowestFluidP10_C: f.lowestFluidP10_C,
    studyLowestFluidP50_C: f.lowestFluidP50_C,
    studyLowestFluidP90_C: f.lowestFluidP90_C,
  };
}
