/**
 * The site study under each scenario of a scenario set (issue 17 item 4): the planner's inputs, with
 * each scenario's own climate and design life, and the key figures of each run side by side.
 *
 * A scenario's warming reaches the site as its pathway (warming-pathway.ts, pathwayKnots: air change
 * since the scenario's start year against years since the start), pattern-scaled as the per-cell model
 * scales it (cell-constants.ts: the cell's trend over patternReference_C_per_yr; Santer et al. 1990),
 * or, for a scenario without a pathway, the cell's linear trend. The run lasts at least the scenario's
 * design life, so the end-of-life figures exist; everything else is the planner's form as it stands.
 */
import type { SiteInput, SiteInputDraft, SiteResult } from '../site/site-input-schema';
import { annualMeanAt, profileAtYear, type ProfileColumn } from '../site/site-profile';
import type { SiteSizing } from '../site/site-sizing';
import type { Scenario } from './scenario';
import { pathwayKnots } from './warming-pathway';

type SitePathway = NonNullable<SiteInputDraft['climate']['warmingPathway']>;

/**
 * The scenario's pathway in the site input's form for a cell warming at `warming_C_per_yr` (module
 * comment), or undefined when the scenario has none (the linear trend applies). A pathway wholly
 * before the start year holds the climate: two points of no change.
 */
export function sitePathway(s: Scenario, warming_C_per_yr: number): SitePathway | undefined {
  const p = s.warmingPathway;
  if (!p) return undefined;
  const scale = p.patternReference_C_per_yr ? warming_C_per_yr / p.patternReference_C_per_yr : 1;
  const knots = pathwayKnots(p, s.startYear);
  const points = knots.time_yr.map((time_yr, i) => ({
    time_yr,
    airWarming_K: Math.round(knots.airOffset_K[i] * scale * 1000) / 1000,
  }));
  return points.length >= 2 ? points : [points[0], { time_yr: 1, airWarming_K: 0 }];
}

/** The planner's draft under scenario `s`: its warming (pathway or trend) and at least its design life. */
export function scenarioStudyDraft(draft: SiteInputDraft, s: Scenario): SiteInputDraft {
  const { warmingPathway: _old, ...climate } = draft.climate;
  void _old;
  const pathway = sitePathway(s, draft.climate.warming_C_per_yr);
  return {
    ...draft,
    years: Math.max(draft.years ?? 0, Math.round(s.designLife_yr)),
    climate: pathway ? { ...climate, warmingPathway: pathway } : climate,
  };
}

/** Key figures of one scenario's run, SI (null: not defined for the run). */
export interface ScenarioStudyFigures {
  /** Thaw delay at the reference probe (probe 0), yr, and whether it is a bound of the run. */
  thawDelay_yr: number | null;
  thawDelayBound: 'lower' | 'upper' | null;
  /** Piles of the foundation by design pulse. */
  pileCount: number | null;
  /** Share of the building's heating the piles carried over the run. */
  loadShare: number | null;
  /** Annual-mean ground temperature at the pile's mid-depth in the last year of the design life, °C. */
  groundTempEnd_C: number | null;
  groundTempEndPiles_C: number | null;
}

/** The key figures of a finished run under scenario `s` (see ScenarioStudyFigures). */
export function scenarioStudyFigures(
  run: { input: SiteInput; result: SiteResult; column: ProfileColumn; sizing: SiteSizing | null },
  loadShare: number | null,
  s: Scenario,
): ScenarioStudyFigures {
  const { input, result, column } = run;
  const pile = input.pile;
  const mid = pile ? pile.topDepth_m + pile.length_m / 2 : s.referenceDepth_m;
  const year = Math.min(Math.round(s.designLife_yr), input.years);
  const at = (c: SiteResult['noPile'] | null) => {
    if (!c) return null;
    const v = annualMeanAt(profileAtYear(c, column, year), mid);
    return Number.isFinite(v) ? v : null;
  };
  return {
    thawDelay_yr: result.thawDelay_yr[0] ?? null,
    thawDelayBound: result.thawDelayIsLowerBound[0]
      ? 'lower'
      : result.thawDelayIsUpperBound[0]
        ? 'upper'
        : null,
    pileCount: run.sizing?.ok ? run.sizing.sizing.pileCount : null,
    loadShare,
    groundTempEnd_C: at(result.noPile),
    groundTempEndPiles_C: at(result.withPile ?? null),
  };
}
