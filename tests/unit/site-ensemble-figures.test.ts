/**
 * The batch's per-site ensemble figures (layers/screening/site-ensemble-figures.ts): P10/P50/P90 by
 * Hyndman & Fan (1996, Am. Stat. 50:361) definition 7 over the members where the figure is defined,
 * null where fewer than half define it (the map ensemble's rule, README "Shortlist export columns").
 */
import { describe, expect, it } from 'vitest';
import { siteEnsembleFigures } from '../../layers/screening/site-ensemble-figures';
import type { SiteResult } from '../../layers/site/site-input-schema';

/** A stand-in member result: thaw delay at the first probe, its lower-bound flag, lowest fluid temperature. */
function member(delay: number | null, lowest_C: number | null, lowerBound = false): SiteResult {
  return {
    thawDelay_yr: [delay],
    thawDelayIsLowerBound: [lowerBound],
    fluid: lowest_C === null ? undefined : { lowest_C },
  } as unknown as SiteResult;
}

describe('site ensemble figures for the batch', () => {
  it('gives definition-7 percentiles of the defined members, rounded like the exports', () => {
    // Delays 1..5 yr (one member undefined): definition 7, h = (m - 1)·p on the sorted defined values:
    // P10 h = 0.4 -> 1.4; P50 h = 2 -> 3; P90 h = 3.6 -> 4.6 (hand-computed).
    const f = siteEnsembleFigures([
      member(3, -6.004),
      member(1, -5.0),
      member(null, -7.0),
      member(5, -6.5, true),
      member(2, -5.5),
      member(4, -6.0),
    ]);
    expect(f.members).toBe(6);
    expect(f.thawDelayDefinedMembers).toBe(5);
    expect(f.thawDelayLowerBoundMembers).toBe(1);
    expect([f.thawDelayP10_yr, f.thawDelayP50_yr, f.thawDelayP90_yr]).toEqual([1.4, 3, 4.6]);
    // Lowest fluid: sorted -7, -6.5, -6.004, -6, -5.5, -5 (m = 6): P10 h = 0.5 -> -6.75;
    // P50 h = 2.5 -> -6.002 -> -6.00 at the export's 0.01 K; P90 h = 4.5 -> -5.25.
    expect([f.lowestFluidP10_C, f.lowestFluidP50_C, f.lowestFluidP90_C]).toEqual([-6.75, -6, -5.25]);
  });

  it('is null where fewer than half the members define a figure', () => {
    const f = siteEnsembleFigures([
      member(2, null),
      member(null, null),
      member(null, -4),
      member(null, -4.2),
    ]);
    // One delay of four: below half, so no range; two fluid temperatures of four: half, so a range.
    expect(f.thawDelayDefinedMembers).toBe(1);
    expect([f.thawDelayP10_yr, f.thawDelayP50_yr, f.thawDelayP90_yr]).toEqual([null, null, null]);
    expect(f.lowestFluidP50_C).toBe(-4.1);
    expect(() => siteEnsembleFigures([member(1, -4)])).toThrow(/at least 2/);
  });
});
