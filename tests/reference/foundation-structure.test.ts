/**
 * Structural relations of the foundation checks against their published values.
 * [M] = value recalled from memory (check against the source before relying on it).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  adfreezeCapacity_kN,
  adfreezeStrength_kPa,
  ADFREEZE_TABLE,
} from '../../layers/physics/adfreeze-strength';
import { frostHeaveUplift_kN, frostJackingRatio } from '../../layers/physics/frost-jacking';
import { thawSettlement_m, thawStrain } from '../../layers/physics/thaw-settlement';

describe('long-term adfreeze strength against ground temperature (SNiP 2.02.04-88 Table 3, clayey-silty row) [M, medium-low]', () => {
  // The standard's tabulated values as recalled: −0.3 °C 40 kPa, −1 °C 100, −2 °C 150, −3 °C 200, −10 °C 400.
  const published: [number, number][] = [
    [-0.3, 40],
    [-0.5, 60],
    [-1, 100],
    [-1.5, 130],
    [-2, 150],
    [-2.5, 180],
    [-3, 200],
    [-4, 230],
    [-6, 290],
    [-8, 350],
    [-10, 400],
  ];
  it('reproduces every tabulated value (to the printed 10 kPa)', () => {
    for (const [t, r] of published) expect(Math.abs(adfreezeStrength_kPa(t) - r)).toBeLessThan(0.5);
    expect(ADFREEZE_TABLE.temperature_C).toHaveLength(published.length);
  });
  it('linear between the tabulated temperatures, 0 at 0 °C and above, held beyond −10 °C', () => {
    expect(adfreezeStrength_kPa(-0.75)).toBeCloseTo(80, 9);
    expect(adfreezeStrength_kPa(-5)).toBeCloseTo(260, 9);
    expect(adfreezeStrength_kPa(-0.15)).toBeCloseTo(20, 9);
    expect(adfreezeStrength_kPa(0)).toBe(0);
    expect(adfreezeStrength_kPa(2)).toBe(0);
    expect(adfreezeStrength_kPa(-25)).toBe(400);
  });
  it('the bond at −1 °C is 2.5 times that at −0.3 °C: the reason for the −1 °C hard limit', () => {
    expect(adfreezeStrength_kPa(-1) / adfreezeStrength_kPa(-0.3)).toBeCloseTo(2.5, 9);
  });
  it('colder ground never bonds less (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -30, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        (t, d) => {
          expect(adfreezeStrength_kPa(t - d)).toBeGreaterThanOrEqual(adfreezeStrength_kPa(t) - 1e-9);
        },
      ),
      { seed: 13, numRuns: 300 },
    );
  });
  it('refuses a non-number temperature naming it', () => {
    expect(() => adfreezeStrength_kPa(NaN)).toThrow(/temp_C/);
  });
});

describe("adfreeze shaft capacity Σ R_af·p·Δz (the standard's shaft term)", () => {
  it('uniform −3 °C over 9 m of a 168.3 mm shaft: 200 kPa × π·0.1683 m × 9 m = 951.7 kN (hand calculation)', () => {
    const q = adfreezeCapacity_kN({ radius_m: 0.08415, top_m: 2, bottom_m: 11, temperatureAt: () => -3 });
    expect(q).toBeCloseTo(200 * Math.PI * 0.1683 * 9, 6);
  });
  it('a linear profile from −1 to −3 °C gives the mean of the linear R_af segments (midpoint rule exact on linear pieces)', () => {
    // R_af is piecewise linear with knots at −1, −1.5, −2, −2.5, −3; with 20 slices over 4 m (T drops
    // 0.5 K per metre) the knots fall on slice edges, so the midpoint rule is exact:
    // mean R_af = average of the four trapezoids (100+130)/2, (130+150)/2, (150+180)/2, (180+200)/2 = 152.5 kPa.
    const q = adfreezeCapacity_kN({
      radius_m: 0.1,
      top_m: 1,
      bottom_m: 5,
      temperatureAt: (z) => -1 - 0.5 * (z - 1),
    });
    expect(q).toBeCloseTo(152.5 * 2 * Math.PI * 0.1 * 4, 6);
  });
  it('zero embedment gives zero capacity', () => {
    expect(adfreezeCapacity_kN({ radius_m: 0.1, top_m: 5, bottom_m: 5, temperatureAt: () => -5 })).toBe(0);
  });
});

describe('frost jacking: tangential heave stress × shaft area over the frozen depth', () => {
  it('150 and 350 kPa, the ends of the measured range on steel in freezing silt (domain-notes; Penner & Gold 1971), on a 168.3 mm shaft over 1.5 m: 119.0 and 277.6 kN', () => {
    const a = Math.PI * 0.1683 * 1.5;
    expect(frostHeaveUplift_kN({ heaveStress_kPa: 150, radius_m: 0.08415, frozenDepth_m: 1.5 })).toBeCloseTo(
      150 * a,
      9,
    );
    expect(frostHeaveUplift_kN({ heaveStress_kPa: 350, radius_m: 0.08415, frozenDepth_m: 1.5 })).toBeCloseTo(
      350 * a,
      9,
    );
    expect(150 * a).toBeCloseTo(118.96, 1);
  });
  it('the jacking ratio is uplift × F over anchorage plus dead load; 1 at the limit', () => {
    expect(
      frostJackingRatio({ uplift_kN: 100, anchorage_kN: 130, deadLoad_kN: 20, safetyFactor: 1.5 }),
    ).toBeCloseTo(1, 12);
    expect(frostJackingRatio({ uplift_kN: 0, anchorage_kN: 0, deadLoad_kN: 0, safetyFactor: 1.5 })).toBe(0);
    expect(frostJackingRatio({ uplift_kN: 10, anchorage_kN: 0, deadLoad_kN: 0, safetyFactor: 1.5 })).toBe(
      Infinity,
    );
    expect(() =>
      frostJackingRatio({ uplift_kN: -1, anchorage_kN: 1, deadLoad_kN: 0, safetyFactor: 1 }),
    ).toThrow(/uplift_kN/);
  });
});

describe('thaw settlement from excess ice (thaw strain = excess-ice fraction; Nelson et al. 2001; Andersland & Ladanyi 2004) [M, medium]', () => {
  it('10 % excess ice thawed over 2 m settles 0.2 m; ice-poor ground does not settle', () => {
    expect(thawStrain(0.1)).toBe(0.1);
    expect(thawSettlement_m({ excessIce_m3m3: 0.1, thawedThickness_m: 2 })).toBeCloseTo(0.2, 12);
    expect(thawSettlement_m({ excessIce_m3m3: 0, thawedThickness_m: 3 })).toBe(0);
  });
  it('refuses an excess-ice fraction outside 0..1 naming it', () => {
    expect(() => thawStrain(1.2)).toThrow(/excessIce_m3m3/);
  });
});
