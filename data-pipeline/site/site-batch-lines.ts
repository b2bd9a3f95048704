/**
 * The lines `pile-atlas site --batch` prints: a site that could not run (its problems), and the summary
 * of a site's run (site-batch.ts; with --ensemble the ensemble's figures join it, site-batch-ensemble.ts).
 */
import type { SiteInput, SiteResult } from '../../layers/site/site-input-schema';
import { SCREENING_CAUTION } from '../../layers/cautions';

/** A site of the batch after its checks: its input, or the problems that keep it from running. */
export type PreparedSite =
  | { head: SiteHead; input: SiteInput; problems?: undefined }
  | { head: SiteHead; input?: undefined; problems: string[] };

export interface SiteHead {
  index: number;
  name: string;
  lon: number | null;
  lat: number | null;
}

/** The line of a site that could not run. */
export function badSiteLine(site: PreparedSite): string {
  return JSON.stringify({ ...site.head, ok: false, problems: site.problems ?? [] });
}

/** The summary of one site's run (thaw years and delay per probe, lowest fluid temperature, …). */
export function siteSummary(head: SiteHead, input: SiteInput, r: SiteResult, elapsed_ms: number) {
  return {
    ...head,
    ok: true,
    elapsed_s: +(elapsed_ms / 1000).toFixed(2),
    years: input.years,
    probes: r.noPile.probes.map((p, k) => ({
      r_m: p.r_m,
      z_m: p.z_m,
      thawYearWithoutPile: p.thawYear,
      thawYearWithPile: r.withPile?.probes[k].thawYear ?? null,
      thawDelay_yr: r.thawDelay_yr[k],
      thawDelayAtLeast: r.thawDelayIsLowerBound[k],
    })),
    lowestFluid_C: r.fluid?.lowest_C ?? null,
    energyBalanceRelativeError: r.energyBalance.relativeError,
    warnings: r.warnings,
    caution: SCREENING_CAUTION,
  };
}
