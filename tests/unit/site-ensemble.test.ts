import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  ENSEMBLE_MEMBER_STEP_DAYS,
  planSiteEnsemble,
  SITE_ENSEMBLE_INPUTS,
  summariseSiteEnsemble,
  thawShareOf,
} from '../../layers/screening/site-ensemble';
import { scenarioUncertaintySchema, zeroSpread } from '../../layers/screening/uncertainty-schema';
import { siteInputSchema, type SiteResult } from '../../layers/site/site-input-schema';

const input = siteInputSchema.parse(JSON.parse(readFileSync('examples/site-demo.json', 'utf8')));
const u = scenarioUncertaintySchema.parse({});

describe('site-study ensemble', () => {
  it('plans valid, stratified members with the declared spreads, at coarse fidelity', () => {
    const plan = planSiteEnsemble(input, u, 24, 1);
    expect(plan.members).toHaveLength(24);
    for (const m of plan.members) {
      expect(siteInputSchema.safeParse(m).success).toBe(true);
      expect(m.numerics.fidelity).toBe('coarse');
    }
    const k = SITE_ENSEMBLE_INPUTS.length;
    // The warming factor is uniform 0.7-1.3 (uncertainty-schema.ts): one member per stratum of 0.6/24.
    const w = Array.from({ length: 24 }, (_, j) => plan.design[j * k + 2]);
    const strata = w.map((v) => Math.floor(((v - 0.7) / 0.6) * 24)).sort((a, b) => a - b);
    expect(strata).toEqual(Array.from({ length: 24 }, (_, i) => i));
    // Zero spread: every member is the site itself, apart from the fidelity and the member step (at
    // least ENSEMBLE_MEMBER_STEP_DAYS, never past the output interval).
    const same = planSiteEnsemble(input, zeroSpread(u), 4, 1, 'standard');
    for (const m of same.members) {
      expect(m.timeStep_days).toBe(Math.max(input.timeStep_days, ENSEMBLE_MEMBER_STEP_DAYS));
      expect({ ...m, timeStep_days: input.timeStep_days }).toEqual(input);
    }
    expect(() => planSiteEnsemble(input, u, 1, 1)).toThrow(/members/);
  });

  it('summarises a fan, the thaw-delay range and first-order indices (linear case: exact ranking)', () => {
    const n = 32;
    const plan = planSiteEnsemble(input, u, n, 3);
    const k = SITE_ENSEMBLE_INPUTS.length;
    // A stand-in result whose end temperature is linear in the design: T_end = 2·ΔMAAT + 0.5·ΔA + 3·(w − 1).
    // Its first-order indices are a_i²·Var(x_i)/Var(T) (Saltelli et al. 2008 §1.2.5): MAAT (sd 0.5, a 2)
    // leads, then warming (uniform 0.7-1.3: sd 0.173, a 3), then amplitude (sd 0.5, a 0.5); the rest 0.
    const results = Array.from({ length: n }, (_, j) => {
      const x = plan.design.subarray(j * k, j * k + k);
      const end = -2 + 2 * x[0] + 0.5 * x[1] + 3 * (x[2] - 1);
      const probe = { r_m: 1, z_m: 2, thawYear: null, T_C: [-2, (-2 + end) / 2, end] };
      return {
        noPile: { time_yr: [0, 1, 2], probes: [probe] },
        withPile: { time_yr: [0, 1, 2], probes: [probe] },
        thawDelay_yr: [j % 2 === 0 ? j : null],
      } as unknown as SiteResult;
    });
    const s = summariseSiteEnsemble(plan, results);
    expect(s.rSquared).toBeCloseTo(1, 9);
    expect(s.sensitivity.map((x) => x.id).slice(0, 3)).toEqual(['meanAirTemp', 'warming', 'amplitude']);
    const total = s.sensitivity.reduce((a, b) => a + b.index, 0);
    expect(total).toBeCloseTo(1, 1);
    expect(s.probeP10_C[2]).toBeLessThan(s.probeP50_C[2]);
    expect(s.probeP50_C[2]).toBeLessThan(s.probeP90_C[2]);
    expect(s.probeP10_C[0]).toBe(-2);
    expect(s.thawDelay.defined).toBe(16);
    expect(s.thawDelay.p10).toBeLessThan(s.thawDelay.p90);
  });

  it('gives the share of members thawed by each output time, without and with the pile', () => {
    const time = [0, 5, 10, 12, 15, 20, 25, 30];
    // Hand-built members (thaw years at the first probe; null = never within the 30-year run):
    // without the pile 10, 12, 20, never; with the pile 15, 30, never, never.
    const noPile = [10, 12, 20, null];
    const withPile = [15, 30, null, null];
    const caseOf = (thawYear: number | null) => ({
      time_yr: time,
      probes: [{ r_m: 1, z_m: 2, thawYear, T_C: time.map((t) => -2 + 0.05 * t) }],
    });
    const results = noPile.map(
      (a, j) =>
        ({
          noPile: caseOf(a),
          withPile: caseOf(withPile[j]),
          thawDelay_yr: [[5, 18, 10, null][j]],
        }) as unknown as SiteResult,
    );
    const s = thawShareOf(results, time);
    // Hand count, thawed (thaw year ≤ t) out of 4 at t = 0, 5, 10, 12, 15, 20, 25, 30 yr:
    // without the pile 0, 0, 1 (10), 2 (10, 12), 2, 3 (…, 20), 3, 3 (the fourth never thaws);
    // with the pile 0, 0, 0, 0, 1 (15), 1, 1, 2 (…, 30; a thaw at the last output time counts).
    expect(s.noPile).toEqual([0, 0, 0.25, 0.5, 0.5, 0.75, 0.75, 0.75]);
    expect(s.withPile).toEqual([0, 0, 0, 0, 0.25, 0.25, 0.25, 0.5]);
    expect(s.thawedNoPile).toBe(3);
    expect(s.thawedWithPile).toBe(2);
    const w = s.withPile ?? [];
    for (let i = 0; i < time.length; i++) {
      if (i > 0) {
        expect(s.noPile[i]).toBeGreaterThanOrEqual(s.noPile[i - 1]);
        expect(w[i]).toBeGreaterThanOrEqual(w[i - 1]);
      }
      expect(w[i]).toBeLessThanOrEqual(s.noPile[i]);
    }
    // In the summary (the regression needs more members than inputs + 1: the four, three times over):
    // the same shares at the summary's output times.
    const twelve = [...results, ...results, ...results];
    const sum = summariseSiteEnsemble(planSiteEnsemble(input, u, 12, 1), twelve);
    expect(sum.time_yr).toEqual(time);
    expect(sum.thawShare.noPile).toEqual(s.noPile);
    expect(sum.thawShare.withPile).toEqual(s.withPile);
    expect(sum.thawShare.thawedNoPile).toBe(9);
    // A site without a pile: no with-pile curve.
    const bare = results.map((r) => ({ ...r, withPile: null, thawDelay_yr: [null] }));
    const b = thawShareOf(bare, time);
    expect(b.withPile).toBeNull();
    expect(b.thawedWithPile).toBeNull();
    expect(b.noPile).toEqual(s.noPile);
  });
});
