/**
 * The site study under a scenario (layers/screening/scenario-study.ts, issue 17 item 4): the
 * scenario's pathway reaches the site input as offsets since the start year (warming-pathway.ts,
 * pathwayKnots), pattern-scaled by the cell's trend over the pathway's reference trend (Santer et
 * al. 1990, NCAR/TN-341: the local change is the regional pattern times the scaling), the run lasts at
 * least the design life, and the prefill under a pathway scenario carries the same pathway.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_SCENARIO_SET } from '../../data-pipeline/demo/demo-scenarios';
import { parseScenario } from '../../layers/screening/scenario';
import { scenarioStudyDraft, sitePathway } from '../../layers/screening/scenario-study';
import { sitePrefill } from '../../layers/screening/site-prefill';
import { pathwayValue_K } from '../../layers/screening/warming-pathway';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { climateTrend } from '../../layers/site/site-setup';

const high = parseScenario(DEMO_SCENARIO_SET.scenarios[3]);
const present = parseScenario(DEMO_SCENARIO_SET.scenarios[0]);
const ref = high.warmingPathway!.patternReference_C_per_yr!;

/** A demo-like cell (values invented for the fictional region). */
const CELL = {
  meanAirTemp_C: -7,
  airAmplitude_C: 19,
  warming_C_per_yr: 0.08,
  textureClass: 3,
  waterContent_m3m3: 0.35,
  bedrockDepth: 30,
};

describe('site study under a scenario', () => {
  it('gives the pathway as offsets since the start year, scaled by the cell trend (pattern scaling)', () => {
    const p = sitePathway(high, ref)!;
    expect(p[0]).toEqual({ time_yr: 0, airWarming_K: 0 });
    const base = pathwayValue_K(high.warmingPathway!, high.startYear);
    for (const pt of high.warmingPathway!.points.filter((q) => q.year > high.startYear)) {
      const at = p.find((q) => q.time_yr === pt.year - high.startYear)!;
      expect(at.airWarming_K).toBeCloseTo(pt.airWarming_K - base, 3);
    }
    // Twice the reference trend: twice the change at every point (the scaling is linear).
    const twice = sitePathway(high, 2 * ref)!;
    twice.forEach((q, i) => expect(q.airWarming_K).toBeCloseTo(2 * p[i].airWarming_K, 2));
    expect(sitePathway(present, 0.05)).toBeUndefined();
  });

  it('runs the planner’s inputs for at least the design life, with the scenario’s warming', () => {
    const prefill = sitePrefill(CELL, present);
    const draft = { ...prefill.draft, years: 30 };
    const underHigh = siteInputSchema.parse(scenarioStudyDraft(draft, high));
    expect(underHigh.years).toBe(50);
    expect(climateTrend(underHigh.climate).kind).toBe('piecewise');
    expect(underHigh.climate.warmingPathway).toEqual(sitePathway(high, CELL.warming_C_per_yr));
    // Back to the present trend: the pathway is dropped, the cell's linear trend applies again.
    const back = siteInputSchema.parse(scenarioStudyDraft(underHigh, present));
    expect(back.climate.warmingPathway).toBeUndefined();
    expect(climateTrend(back.climate)).toEqual({ kind: 'linear', rate_C_per_yr: CELL.warming_C_per_yr });
    expect(back.years).toBe(50); // never shortened: the planner's run length stands
    // The rest of the form is the planner's.
    expect(back.pile).toEqual(siteInputSchema.parse(draft).pile);
  });

  it('prefills the study of a pathway scenario with its pathway', () => {
    const prefill = sitePrefill(CELL, high);
    expect(prefill.draft.climate.warmingPathway).toEqual(sitePathway(high, CELL.warming_C_per_yr));
    expect(sitePrefill(CELL, present).draft.climate.warmingPathway).toBeUndefined();
  });
});
