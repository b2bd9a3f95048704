import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  criteriaDefinitions,
  linearScore,
  passes,
  permafrostClass,
  softWeights,
  suitabilityClass,
  thawStabilityScore,
  SOFT_CRITERIA_IDS,
} from '../../layers/screening/suitability';
import { DEFAULT_SCENARIO, parseScenario } from '../../layers/screening/scenario';
import { criterionSchema } from '../../layers/screening/manifest';

const classes = DEFAULT_SCENARIO.permafrostClasses;

describe('permafrost temperature classes (Ran et al. 2022, ESSD: cold < -3, cool -3..-1.5, warm > -1.5 °C)', () => {
  it('default thresholds are the published ones', () => {
    expect(classes.coldBelow_C).toBe(-3);
    expect(classes.warmAbove_C).toBe(-1.5);
  });
  it('classifies at and around the boundaries', () => {
    expect(permafrostClass(0.5, classes)).toBe(0);
    expect(permafrostClass(0, classes)).toBe(0);
    expect(permafrostClass(-1, classes)).toBe(1);
    expect(permafrostClass(-1.5, classes)).toBe(2);
    expect(permafrostClass(-3, classes)).toBe(2);
    expect(permafrostClass(-3.01, classes)).toBe(3);
    expect(permafrostClass(NaN, classes)).toBeNaN();
  });
  it('thresholds are settings: the -2 °C "warm" convention (domain-notes) moves the boundary', () => {
    const t = { coldBelow_C: -4, warmAbove_C: -2 };
    expect(permafrostClass(-1.8, t)).toBe(1);
    expect(permafrostClass(-2.5, t)).toBe(2);
  });
  it('colder ground never gets a warmer class (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        (t, d) => {
          expect(permafrostClass(t - d, classes)).toBeGreaterThanOrEqual(permafrostClass(t, classes));
        },
      ),
      { seed: 7, numRuns: 300 },
    );
  });
  it('a scenario with cold above warm threshold is rejected naming the field', () => {
    expect(() => parseScenario({ permafrostClasses: { coldBelow_C: -1, warmAbove_C: -2 } })).toThrow(
      /permafrostClasses\.coldBelow_C/,
    );
  });
});

describe('linear scores and verdicts', () => {
  it('scores 1 at good, 0 at poor, 0.5 at the midpoint, clamped outside', () => {
    expect(linearScore(-4, -4, -1)).toBe(1);
    expect(linearScore(-1, -4, -1)).toBe(0);
    expect(linearScore(-2.5, -4, -1)).toBeCloseTo(0.5, 12);
    expect(linearScore(-10, -4, -1)).toBe(1);
    expect(linearScore(3, -4, -1)).toBe(0);
    expect(linearScore(NaN, -4, -1)).toBe(0);
  });
  it('the verdict at the criterion threshold agrees with the score crossing 0.5 (property)', () => {
    const soft = criteriaDefinitions(DEFAULT_SCENARIO).filter((c) => c.kind === 'soft');
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: soft.length - 1 }),
        fc.double({ min: -1e4, max: 1e4, noNaN: true }),
        (i, v) => {
          const c = soft[i];
          const s = linearScore(v, c.good as number, c.poor as number);
          expect(passes(v, c.comparison, c.threshold)).toBe(s >= 0.5);
        },
      ),
      { seed: 11, numRuns: 500 },
    );
  });
  it('suitability class follows the score bounds', () => {
    const u = DEFAULT_SCENARIO.suitability;
    expect(suitabilityClass(u.goodScore, u)).toBe(3);
    expect(suitabilityClass(u.goodScore - 1e-9, u)).toBe(2);
    expect(suitabilityClass(u.fairScore, u)).toBe(2);
    expect(suitabilityClass(u.fairScore - 1e-9, u)).toBe(1);
    expect(suitabilityClass(NaN, u)).toBeNaN();
  });
});

describe('thaw stability', () => {
  it('gravel and bedrock lean in ice are stable, ice-rich peat is not', () => {
    expect(thawStabilityScore(1, 0.15)).toBe(1);
    expect(thawStabilityScore(6, 0.03)).toBe(1);
    expect(thawStabilityScore(5, 0.8)).toBe(0);
    expect(thawStabilityScore(3, 0.45)).toBeCloseTo(0.4 * 0.5, 12);
    expect(thawStabilityScore(9, 0.2)).toBeNaN();
  });
  it('more ice never makes the ground more thaw-stable (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 6 }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        fc.double({ min: 0, max: 0.3, noNaN: true }),
        (tex, w, d) => {
          expect(thawStabilityScore(tex, w + d)).toBeLessThanOrEqual(thawStabilityScore(tex, w));
        },
      ),
      { seed: 3, numRuns: 300 },
    );
  });
});

describe('criteria definitions (manifest `criteria`)', () => {
  const defs = criteriaDefinitions(DEFAULT_SCENARIO);
  it('lists the hard foundation checks in order, then the soft criteria, each valid against the manifest schema', () => {
    expect(defs.filter((c) => c.kind === 'exclusion').map((c) => c.id)).toEqual([
      'data',
      'rock',
      'permafrost',
      'thawed',
      'adfreezeTemp',
      'thawUnstable',
      'frostJacking',
      'fluid',
    ]);
    // Issue 13: one energy criterion, coldness at the end of life, the jacking margin, thaw stability.
    expect([...SOFT_CRITERIA_IDS]).toEqual(['coldness', 'energy', 'jackingMargin', 'thawStability']);
    expect(defs.findIndex((c) => c.kind === 'soft')).toBe(8);
    expect(defs.filter((c) => c.kind === 'soft').map((c) => c.id)).toEqual([...SOFT_CRITERIA_IDS]);
    for (const c of defs) expect(criterionSchema.safeParse(c).success).toBe(true);
  });
  it('soft weights are normalised and match softWeights(); exclusions weigh 0', () => {
    const soft = defs.filter((c) => c.kind === 'soft');
    expect(soft.reduce((a, c) => a + c.weight, 0)).toBeCloseTo(1, 12);
    expect(Array.from(softWeights(DEFAULT_SCENARIO))).toEqual(soft.map((c) => c.weight));
    for (const c of defs.filter((d) => d.kind === 'exclusion')) expect(c.weight).toBe(0);
  });
  it('thresholds follow the scenario', () => {
    const s = parseScenario({
      suitability: { foundation: { rockMargin_m: 2, maxAdfreezeTempEnd_C: -1.5, thawMargin_yr: 5 } },
      referenceDepth_m: 4,
    });
    const d = criteriaDefinitions(s);
    // rock: pile tip (1 m top + 10 m length) plus the margin
    expect(d.find((c) => c.id === 'rock')?.threshold).toBe(13);
    expect(d.find((c) => c.id === 'adfreezeTemp')?.threshold).toBe(-1.5);
    expect(d.find((c) => c.id === 'thawUnstable')?.threshold).toBe(2025 + 30 + 5);
    expect(d.find((c) => c.id === 'thawed')?.threshold).toBe(4);
  });
  it('all-zero weights are refused', () => {
    const z = { weight: 0 };
    const s = parseScenario({
      suitability: {
        coldness: z,
        energy: z,
        jackingMargin: z,
        thawStability: z,
      },
    });
    expect(() => softWeights(s)).toThrow(/weights/);
  });
});
