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
import { ttop_C, meanSurfaceTemp_C } from '../../layers/physics/ttop';
import { stefanDepth_m, stefanTime_s } from '../../layers/physics/stefan';
import { kudryavtsevTtop_C, kudryavtsevActiveLayer_m } from '../../layers/physics/kudryavtsev';

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

describe('Stefan equation', () => {
  it('STE-1: k 1.3, I 1200 °C·d, L 140.28 MJ/m³ -> X = 1.3862 m (computed with mpmath; tol 1e-4 rel)', () => {
    expect(
      rel(stefanDepth_m({ conductivity_W_mK: 1.3, index_Cd: 1200, latent_J_m3: 140.28e6 }), 1.3862),
    ).toBeLessThan(1e-4);
  });
  it('STE-3 textbook lake-ice problem: ρ 920, L 334 kJ/kg, k 1.6, ΔT 10 K: 0.25 m in 6.0e5 s, 40 m in 1.5e10 s (read from the published worked example; tol ±1 in the last printed digit)', () => {
    const L = 920 * 334e3;
    expect(
      Math.abs(
        stefanTime_s({ conductivity_W_mK: 1.6, depth_m: 0.25, temperatureExcess_K: 10, latent_J_m3: L }) -
          6.0e5,
      ),
    ).toBeLessThan(0.1e5);
    expect(
      Math.abs(
        stefanTime_s({ conductivity_W_mK: 1.6, depth_m: 40, temperatureExcess_K: 10, latent_J_m3: L }) -
          1.5e10,
      ),
    ).toBeLessThan(0.1e10);
  });
  it('US Army English form X(ft) = √(48·k·nF/L), L = 144·γd·w/100 agrees with the SI form (unit conversion check)', () => {
    // silt γd 100 pcf, w 15 %, k 0.8 Btu/h·ft·°F, nF 750 °F·d (MB-1 inputs in the reference notes): X = 3.651 ft.
    const xFt = Math.sqrt((48 * 0.8 * 750) / (144 * 100 * 0.15));
    expect(rel(xFt, 3.651)).toBeLessThan(1e-3);
    const L_SI = 144 * 100 * 0.15 * 37258.9; // Btu/ft³ -> J/m³
    const xSI = stefanDepth_m({
      conductivity_W_mK: 0.8 * 1.730735,
      index_Cd: (750 * 5) / 9,
      latent_J_m3: L_SI,
    });
    expect(rel(xSI / 0.3048, xFt)).toBeLessThan(1e-4);
  });
});

describe('Kudryavtsev (computed with mpmath from the recalled equations; tol 1e-4)', () => {
  const ttops: [string, number, number, number, number, number][] = [
    ['KUD-1', -2, 15, 1.2, 1.8, -3.2724],
    ['KUD-2', -5, 20, 1.3, 1.9, -6.2841],
    ['KUD-3', 0, 15, 1.2, 1.8, -1.5915],
  ];
  for (const [id, ts, as, kt, kf, v] of ttops) {
    it(`${id}: TTOP ${v}`, () => {
      expect(
        Math.abs(
          kudryavtsevTtop_C({
            meanSurfaceTemp_C: ts,
            surfaceAmplitude_C: as,
            kThawed_W_mK: kt,
            kFrozen_W_mK: kf,
          }) - v,
        ),
      ).toBeLessThan(1e-4);
    });
  }
  it('KUD-3 closed form −Ās(k_f−k_t)/(π k_f) and KUD-4 equal conductivities give T̄s', () => {
    expect(
      kudryavtsevTtop_C({
        meanSurfaceTemp_C: 0,
        surfaceAmplitude_C: 15,
        kThawed_W_mK: 1.2,
        kFrozen_W_mK: 1.8,
      }),
    ).toBeCloseTo((-15 * 0.6) / (Math.PI * 1.8), 12);
    expect(
      kudryavtsevTtop_C({
        meanSurfaceTemp_C: -2.5,
        surfaceAmplitude_C: 15,
        kThawed_W_mK: 1.5,
        kFrozen_W_mK: 1.5,
      }),
    ).toBeCloseTo(-2.5, 12);
  });
  it('KUD-5: Ās 15, TTOP −3, k 1.3, C 2.9e6, Q_L 140e6 -> ALT 1.1955 m', () => {
    const z = kudryavtsevActiveLayer_m({
      surfaceAmplitude_C: 15,
      ttop_C: -3,
      conductivity_W_mK: 1.3,
      heatCapacity_J_m3K: 2.9e6,
      latent_J_m3: 140e6,
    });
    expect(Math.abs(z - 1.1955)).toBeLessThan(1e-4);
  });
  it('KUD-8 limit Q_L -> 0 is pure conduction, d·ln(Ās/T) = 3.4141 m (derived limit)', () => {
    const z = kudryavtsevActiveLayer_m({
      surfaceAmplitude_C: 15,
      ttop_C: -3,
      conductivity_W_mK: 1.3,
      heatCapacity_J_m3K: 2.9e6,
      latent_J_m3: 1,
    });
    expect(Math.abs(z - 3.4141)).toBeLessThan(1e-4);
    expect(
      kudryavtsevActiveLayer_m({
        surfaceAmplitude_C: 15,
        ttop_C: -3,
        conductivity_W_mK: 1.3,
        heatCapacity_J_m3K: 2.9e6,
        latent_J_m3: 0,
      }),
    ).toBeCloseTo(3.41409, 4);
  });
  it('Kudryavtsev ALT lies below the Stefan depth for the same thaw index (sensible heat is not free)', () => {
    // Surface sinusoid about TTOP -3 with Ās 15: thawing index of that sinusoid drives Stefan.
    const dd = degreeDays({ meanAirTemp_C: -3, amplitude_C: 15 });
    const stefan = stefanDepth_m({
      conductivity_W_mK: 1.3,
      index_Cd: dd.thawingIndex_Cd,
      latent_J_m3: 140e6,
    });
    const kud = kudryavtsevActiveLayer_m({
      surfaceAmplitude_C: 15,
      ttop_C: -3,
      conductivity_W_mK: 1.3,
      heatCapacity_J_m3K: 2.9e6,
      latent_J_m3: 140e6,
    });
    expect(kud).toBeLessThan(stefan);
    expect(kud).toBeGreaterThan(0.5 * stefan);
  });
});

describe('bad input', () => {
  it('negative amplitude', () => {
    expect(() => degreeDays({ meanAirTemp_C: -5, amplitude_C: -1 })).toThrow(
      /amplitude_C must be in \[0, 80\]/,
    );
  });
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
  it('Stefan with zero latent heat and negative index', () => {
    expect(() => stefanDepth_m({ conductivity_W_mK: 1, index_Cd: 100, latent_J_m3: 0 })).toThrow(
      /latent_J_m3 must be > 0/,
    );
    expect(() => stefanDepth_m({ conductivity_W_mK: 1, index_Cd: -1, latent_J_m3: 1e6 })).toThrow(/index_Cd/);
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
  it('Kudryavtsev with non-positive heat capacity', () => {
    expect(() =>
      kudryavtsevActiveLayer_m({
        surfaceAmplitude_C: 15,
        ttop_C: -3,
        conductivity_W_mK: 1.3,
        heatCapacity_J_m3K: 0,
        latent_J_m3: 1e8,
      }),
    ).toThrow(/heatCapacity_J_m3K/);
  });
});
