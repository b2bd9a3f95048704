import { describe, it, expect } from 'vitest';
import fixtures from './fixtures/thermal-regime-mpmath.json';
import {
  annualAmplitudeAtDepth_C,
  annualPhaseLag_days,
  dampingDepth_m,
  depthOfAmplitude_m,
  kusudaAchenbachTemp_C,
} from '../../layers/physics/ground-temperature-wave';
import {
  rampResponse_C,
  rampSurfaceFlux_W_m2,
  stepResponse_C,
  trendResponse_C,
} from '../../layers/physics/carslaw-jaeger-surface-response';
import { geothermalGradient_K_m, geothermalRise_C } from '../../layers/physics/geothermal-gradient';
import { groundTemperature_C, meanGroundTemperature_C } from '../../layers/physics/ground-temperature';
import { SECONDS_PER_DAY, SECONDS_PER_YEAR } from '../../layers/physics/surface-forcing';

const rel = (a: number, e: number) => Math.abs(a - e) / Math.abs(e);
const JULIAN_YEAR_S = 365.25 * SECONDS_PER_DAY;

describe('Kusuda & Achenbach (1965) annual wave (example KA, computed with mpmath; tol 1e-4 K)', () => {
  // Tm −3 °C, As 18 K, t0 35 d, α 1e-6 m²/s -> d = 3.16832 m, lag 18.335 d per metre.
  const wave = { meanSurfaceTemp_C: -3, surfaceAmplitude_C: 18, diffusivity_m2_s: 1e-6, coldestDay: 35 };
  it('damping depth 3.16832 m, lag 18.335 d/m; α 0.05 m²/day -> d 2.4102 m', () => {
    expect(rel(dampingDepth_m(1e-6), 3.16832)).toBeLessThan(1e-5);
    expect(rel(annualPhaseLag_days(1, 1e-6), 18.335)).toBeLessThan(1e-4);
    expect(rel(dampingDepth_m(0.05 / SECONDS_PER_DAY), 2.4102)).toBeLessThan(1e-4);
  });
  const rows: [number, number, number, number][] = [
    [0, 18.0, -21.0, 14.1894],
    [1, 13.128, -15.4795, 7.7084],
    [2, 9.5747, -10.7295, 2.7049],
  ];
  for (const [z, amp, t35, t200] of rows) {
    it(`KA z = ${z} m: amplitude ${amp}, T(day 35) ${t35}, T(day 200) ${t200}`, () => {
      expect(Math.abs(annualAmplitudeAtDepth_C({ ...wave, depth_m: z }) - amp)).toBeLessThan(1e-4);
      expect(
        Math.abs(kusudaAchenbachTemp_C({ ...wave, depth_m: z, time_s: 35 * SECONDS_PER_DAY }) - t35),
      ).toBeLessThan(1e-4);
      expect(
        Math.abs(kusudaAchenbachTemp_C({ ...wave, depth_m: z, time_s: 200 * SECONDS_PER_DAY }) - t200),
      ).toBeLessThan(1e-4);
    });
  }
  for (const [z, day, v] of fixtures.kusuda) {
    it(`z ${z} m, day ${day}: ${Number(v).toFixed(4)} °C (mpmath fixture; tol 1e-9 K)`, () => {
      expect(
        Math.abs(
          kusudaAchenbachTemp_C({ ...wave, depth_m: Number(z), time_s: Number(day) * SECONDS_PER_DAY }) -
            Number(v),
        ),
      ).toBeLessThan(1e-9);
    });
  }
  it('depth of 0.1 K amplitude = d·ln(18/0.1) = 16.453 m', () => {
    expect(
      Math.abs(
        depthOfAmplitude_m({ surfaceAmplitude_C: 18, threshold_C: 0.1, diffusivity_m2_s: 1e-6 }) - 16.453,
      ),
    ).toBeLessThan(1e-3);
  });
});

describe('Carslaw & Jaeger (1959) §2.4 step and §2.5 ramp (examples ST, LR; computed with mpmath)', () => {
  const a = 1e-6;
  // ST: ΔT = 1 K, α 1e-6 m²/s, Julian years; printed to 5 decimals (tol 1e-5 abs).
  const st: [number, number, number][] = [
    [1, 1, 0.89983],
    [1, 5, 0.52911],
    [1, 10, 0.20813],
    [1, 20, 0.01182],
    [10, 1, 0.96825],
    [10, 5, 0.84224],
    [10, 10, 0.6906],
    [10, 20, 0.42598],
    [10, 50, 0.04657],
    [50, 1, 0.9858],
    [50, 5, 0.92908],
    [50, 10, 0.85871],
    [50, 20, 0.72182],
    [50, 50, 0.37344],
  ];
  for (const [t, x, v] of st) {
    it(`step t ${t} yr, x ${x} m: ${v}`, () => {
      expect(
        Math.abs(
          stepResponse_C({ depth_m: x, time_s: t * JULIAN_YEAR_S, diffusivity_m2_s: a, step_C: 1 }) - v,
        ),
      ).toBeLessThan(1e-5);
    });
  }
  // LR: b = 0.05 K/yr, printed to 4 decimals (tol 1e-4 abs).
  const lr: [number, number[]][] = [
    [10, [0.5, 0.36, 0.2533, 0.1166, 0.0059, 0.0]],
    [30, [1.5, 1.2442, 1.0243, 0.6784, 0.1613, 0.0069]],
  ];
  const xs = [0, 5, 10, 20, 50, 100];
  for (const [t, vals] of lr) {
    it(`ramp t ${t} yr at x = 0/5/10/20/50/100 m`, () => {
      xs.forEach((x, i) => {
        const v = rampResponse_C({
          depth_m: x,
          time_s: t * JULIAN_YEAR_S,
          diffusivity_m2_s: a,
          rate_C_per_s: 0.05 / JULIAN_YEAR_S,
        });
        expect(Math.abs(v - vals[i])).toBeLessThan(1e-4);
      });
    });
  }
  for (const [t, x, v] of fixtures.ramp) {
    it(`ramp vs Duhamel quadrature of the step, t ${t} yr, x ${x} m (mpmath; tol 1e-9 rel)`, () => {
      const r = rampResponse_C({
        depth_m: Number(x),
        time_s: Number(t) * SECONDS_PER_YEAR,
        diffusivity_m2_s: a,
        rate_C_per_s: 0.05 / SECONDS_PER_YEAR,
      });
      expect(rel(r, Number(v))).toBeLessThan(1e-9);
    });
  }
  it('LR-5: surface flux after 50 yr with k 2 = 0.14203 W/m²', () => {
    const q = rampSurfaceFlux_W_m2({
      conductivity_W_mK: 2,
      diffusivity_m2_s: a,
      rate_C_per_s: 0.05 / JULIAN_YEAR_S,
      time_s: 50 * JULIAN_YEAR_S,
    });
    expect(Math.abs(q - 0.14203)).toBeLessThan(1e-5);
  });
  it('a piecewise trend that is linear equals the single ramp; a slope change superposes a second ramp', () => {
    const lin = trendResponse_C({
      depth_m: 7,
      time_s: 40 * SECONDS_PER_YEAR,
      diffusivity_m2_s: a,
      trend: { kind: 'linear', rate_C_per_yr: 0.04 },
    });
    const pw = trendResponse_C({
      depth_m: 7,
      time_s: 40 * SECONDS_PER_YEAR,
      diffusivity_m2_s: a,
      trend: {
        kind: 'piecewise',
        points: [
          { year: 0, offset_C: 0 },
          { year: 200, offset_C: 8 },
        ],
      },
    });
    expect(rel(pw, lin)).toBeLessThan(1e-12);
    const kinked = trendResponse_C({
      depth_m: 7,
      time_s: 40 * SECONDS_PER_YEAR,
      diffusivity_m2_s: a,
      trend: {
        kind: 'piecewise',
        points: [
          { year: 0, offset_C: 0 },
          { year: 20, offset_C: 1 },
          { year: 60, offset_C: 1 },
        ],
      },
    });
    const expected =
      rampResponse_C({
        depth_m: 7,
        time_s: 40 * SECONDS_PER_YEAR,
        diffusivity_m2_s: a,
        rate_C_per_s: 0.05 / SECONDS_PER_YEAR,
      }) -
      rampResponse_C({
        depth_m: 7,
        time_s: 20 * SECONDS_PER_YEAR,
        diffusivity_m2_s: a,
        rate_C_per_s: 0.05 / SECONDS_PER_YEAR,
      });
    expect(rel(kinked, expected)).toBeLessThan(1e-12);
  });
});

describe('geothermal gradient and the superposed T(z, t)', () => {
  it('q 0.06 W/m², k 2 -> 0.03 K/m; layered 10 m at k 1 + rest at k 3 to 40 m -> 0.6 + 0.6 K', () => {
    expect(geothermalGradient_K_m(0.06, 2)).toBeCloseTo(0.03, 14);
    expect(
      geothermalRise_C({
        depth_m: 40,
        geothermalFlux_W_m2: 0.06,
        layers: [
          { thickness_m: 10, conductivity_W_mK: 1 },
          { thickness_m: 1, conductivity_W_mK: 3 },
        ],
      }),
    ).toBeCloseTo(1.2, 12);
  });
  it('superposition = wave + gradient + ramp, each from its own module', () => {
    const input = {
      depth_m: 4,
      time_s: 20.3 * SECONDS_PER_YEAR,
      meanSurfaceTemp_C: -4,
      surfaceAmplitude_C: 12,
      diffusivity_m2_s: 8e-7,
      conductivity_W_mK: 1.8,
      geothermalFlux_W_m2: 0.06,
      trend: { kind: 'linear' as const, rate_C_per_yr: 0.06 },
    };
    const expected =
      kusudaAchenbachTemp_C(input) +
      (0.06 / 1.8) * 4 +
      rampResponse_C({
        depth_m: 4,
        time_s: input.time_s,
        diffusivity_m2_s: 8e-7,
        rate_C_per_s: 0.06 / SECONDS_PER_YEAR,
      });
    expect(groundTemperature_C(input)).toBeCloseTo(expected, 12);
    expect(meanGroundTemperature_C(input)).toBeCloseTo(expected - kusudaAchenbachTemp_C(input) - 4, 12);
  });
});

describe('bad input', () => {
  it('negative depth, zero diffusivity, non-finite time', () => {
    expect(() => stepResponse_C({ depth_m: -1, time_s: 1, diffusivity_m2_s: 1e-6, step_C: 1 })).toThrow(
      /depth_m/,
    );
    expect(() => dampingDepth_m(0)).toThrow(/diffusivity_m2_s must be > 0/);
    expect(() =>
      kusudaAchenbachTemp_C({
        depth_m: 1,
        time_s: Infinity,
        meanSurfaceTemp_C: 0,
        surfaceAmplitude_C: 1,
        diffusivity_m2_s: 1e-6,
      }),
    ).toThrow(TypeError);
    expect(() =>
      annualAmplitudeAtDepth_C({ depth_m: 1, surfaceAmplitude_C: -2, diffusivity_m2_s: 1e-6 }),
    ).toThrow(/surfaceAmplitude_C/);
  });
});
