import { describe, it, expect } from 'vitest';
import { ttop_C, meanSurfaceTemp_C } from '../../layers/physics/ttop';

describe('TTOP (Smith & Riseborough 1996, 2002; computed with mpmath; tol 1e-3 K)', () => {
  // reference-values.md section 11, TT-1, TT-2, TT-4 (inputs invented, values computed from the equation).
  const cases: [string, number, number, number, number, number, number, number][] = [
    ['TT-1', 1200, 3500, 0.9, 0.5, 0.7, -1.836, -2.723],
    ['TT-2', 1800, 3200, 0.9, 0.4, 0.8, 0.932, 0.055],
    ['TT-4', 2000, 2000, 1.0, 0.5, 0.6, 2.74, 0.913],
  ];
  for (const [id, ddt, ddf, nt, nf, rk, magst, ttop] of cases) {
    it(`${id}: MAGST ${magst}, TTOP ${ttop}`, () => {
      const base = { thawingIndex_Cd: ddt, freezingIndex_Cd: ddf, nThaw: nt, nFreeze: nf };
      expect(Math.abs(meanSurfaceTemp_C(base) - magst)).toBeLessThan(1e-3);
      expect(Math.abs(ttop_C({ ...base, kThawed_W_mK: rk, kFrozen_W_mK: 1 }) - ttop)).toBeLessThan(1e-3);
    });
  }
});

describe('bad input', () => {
  it('non-finite index and negative n-factor', () => {
    expect(() =>
      ttop_C({
        freezingIndex_Cd: NaN,
        thawingIndex_Cd: 1,
        nFreeze: 1,
        nThaw: 1,
        kThawed_W_mK: 1,
        kFrozen_W_mK: 1,
      }),
    ).toThrow(TypeError);
    expect(() =>
      ttop_C({
        freezingIndex_Cd: 1,
        thawingIndex_Cd: 1,
        nFreeze: -0.5,
        nThaw: 1,
        kThawed_W_mK: 1,
        kFrozen_W_mK: 1,
      }),
    ).toThrow(/nFreeze/);
  });
});
