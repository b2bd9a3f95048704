import { describe, it, expect } from 'vitest';
import fixtures from './fixtures/thermal-regime-mpmath.json';
import {
  degreeDays,
  surfaceDegreeDays,
  surfaceSinusoid,
  surfaceTemperature_C,
  warmingOffset_C,
  SECONDS_PER_YEAR,
} from '../../layers/physics/surface-forcing';

const rel = (a: number, e: number) => Math.abs(a - e) / Math.abs(e);

describe('surface forcing: degree-days of a sinusoidal 365-day year (exact integral)', () => {
  // Independent check: mpmath quadrature of max(±T, 0) over one year (tol 1e-10 rel, 1e-9 °C·d abs).
  for (const [tm, a, fr, th] of fixtures.degreeDays) {
    it(`T̄ ${tm} °C, A ${a} K: I_f ${Number(fr).toFixed(2)}, I_t ${Number(th).toFixed(2)} °C·d (computed with mpmath quadrature)`, () => {
      const d = degreeDays({ meanAirTemp_C: Number(tm), amplitude_C: Number(a) });
      expect(Math.abs(d.freezingIndex_Cd - Number(fr))).toBeLessThan(1e-9 + 1e-10 * Number(fr));
      expect(Math.abs(d.thawingIndex_Cd - Number(th))).toBeLessThan(1e-9 + 1e-10 * Number(th));
    });
  }
  it('a mean a hair above −amplitude thaws (almost) not at all, never a negative index', () => {
    // Mean −40 + 2e-14 °C, amplitude 40 K: the exact thawing index is O(1e-19) C·day; the closed form
    // cancels to −2e-13 without the clip (found by the site fuzz, issue 16), which TTOP then refused.
    const d = degreeDays({ meanAirTemp_C: -39.99999999999998, amplitude_C: 40 });
    expect(d.thawingIndex_Cd).toBeGreaterThanOrEqual(0);
    expect(d.thawingIndex_Cd).toBeLessThan(1e-9);
    expect(d.freezingIndex_Cd).toBeCloseTo(365 * 40, 6);
  });

  it('n-factors scale the indices (Lunardini 1978): n_f 0.5, n_t 0.9', () => {
    const s = surfaceDegreeDays(
      { freezingIndex_Cd: 3500, thawingIndex_Cd: 1200 },
      { nFreeze: 0.5, nThaw: 0.9 },
    );
    expect(s.freezingIndex_Cd).toBeCloseTo(1750, 10);
    expect(s.thawingIndex_Cd).toBeCloseTo(1080, 10);
  });
  it('the instantaneous n-factor surface temperature integrates to n_t·I_t and n_f·I_f over a year', () => {
    const input = { meanAirTemp_C: -5, amplitude_C: 20, nFreeze: 0.5, nThaw: 0.9 };
    const air = degreeDays(input);
    let thaw = 0;
    let freeze = 0;
    const steps = 365 * 48;
    for (let i = 0; i < steps; i++) {
      const T = surfaceTemperature_C({ ...input, time_s: ((i + 0.5) / steps) * SECONDS_PER_YEAR });
      if (T > 0) thaw += (T * 365) / steps;
      else freeze -= (T * 365) / steps;
    }
    expect(rel(thaw, 0.9 * air.thawingIndex_Cd)).toBeLessThan(1e-5);
    expect(rel(freeze, 0.5 * air.freezingIndex_Cd)).toBeLessThan(1e-5);
  });
  it('the equivalent surface sinusoid reproduces the surface indices', () => {
    const s = surfaceSinusoid({ meanAirTemp_C: -5, amplitude_C: 20, nFreeze: 0.5, nThaw: 1 });
    const d = degreeDays({ meanAirTemp_C: s.meanSurfaceTemp_C, amplitude_C: s.surfaceAmplitude_C });
    expect(rel(d.thawingIndex_Cd, s.thawingIndex_Cd)).toBeLessThan(1e-9);
    expect(rel(d.freezingIndex_Cd, s.freezingIndex_Cd)).toBeLessThan(1e-9);
  });
  it('warming trends: linear and piecewise (interpolated, held at the ends)', () => {
    expect(warmingOffset_C({ kind: 'linear', rate_C_per_yr: 0.05 }, 30)).toBeCloseTo(1.5, 12);
    const trend = {
      kind: 'piecewise' as const,
      points: [
        { year: 0, offset_C: 0 },
        { year: 50, offset_C: 2 },
        { year: 100, offset_C: 5 },
      ],
    };
    expect(warmingOffset_C(trend, 25)).toBeCloseTo(1, 12);
    expect(warmingOffset_C(trend, 75)).toBeCloseTo(3.5, 12);
    expect(warmingOffset_C(trend, 150)).toBe(5);
    expect(
      surfaceTemperature_C({
        meanAirTemp_C: 1,
        amplitude_C: 0,
        nFreeze: 0.5,
        nThaw: 1,
        time_s: 30 * SECONDS_PER_YEAR,
        trend: { kind: 'linear', rate_C_per_yr: 0.1 },
      }),
    ).toBeCloseTo(4, 10);
  });
});

describe('bad input', () => {
  it('negative amplitude', () => {
    expect(() => degreeDays({ meanAirTemp_C: -5, amplitude_C: -1 })).toThrow(
      /amplitude_C must be in \[0, 80\]/,
    );
  });
  it('piecewise table not increasing', () => {
    expect(() =>
      warmingOffset_C(
        {
          kind: 'piecewise',
          points: [
            { year: 10, offset_C: 0 },
            { year: 5, offset_C: 1 },
          ],
        },
        3,
      ),
    ).toThrow(/points\[1\]\.year/);
  });
});
