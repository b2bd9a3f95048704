import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  annualAmplitudeAtDepth_C,
  annualPhaseLag_days,
  kusudaAchenbachTemp_C,
} from '../../layers/physics/ground-temperature-wave';
import { rampResponse_C, stepResponse_C } from '../../layers/physics/carslaw-jaeger-surface-response';
import { SECONDS_PER_DAY, SECONDS_PER_YEAR } from '../../layers/physics/surface-forcing';

const params = { seed: 20261201, numRuns: 300 };

describe('ground temperature invariants (seeded property tests)', () => {
  it('deeper means smaller annual amplitude and later phase', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 30, noNaN: true }),
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        fc.double({ min: 1, max: 30, noNaN: true }),
        fc.double({ min: 2e-7, max: 3e-6, noNaN: true }),
        (z, dz, amp, alpha) => {
          const a1 = annualAmplitudeAtDepth_C({
            depth_m: z,
            surfaceAmplitude_C: amp,
            diffusivity_m2_s: alpha,
          });
          const a2 = annualAmplitudeAtDepth_C({
            depth_m: z + dz,
            surfaceAmplitude_C: amp,
            diffusivity_m2_s: alpha,
          });
          expect(a2).toBeLessThan(a1);
          expect(annualPhaseLag_days(z + dz, alpha)).toBeGreaterThan(annualPhaseLag_days(z, alpha));
        },
      ),
      params,
    );
  });
  it('the wave stays within mean ± amplitude at depth, and its yearly mean is the surface mean', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.double({ min: 0, max: 365, noNaN: true }),
        fc.double({ min: -15, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 25, noNaN: true }),
        (z, day, mean, amp) => {
          const w = { depth_m: z, meanSurfaceTemp_C: mean, surfaceAmplitude_C: amp, diffusivity_m2_s: 1e-6 };
          const T = kusudaAchenbachTemp_C({ ...w, time_s: day * SECONDS_PER_DAY });
          const A = annualAmplitudeAtDepth_C(w);
          expect(Math.abs(T - mean)).toBeLessThanOrEqual(A + 1e-9);
          let sum = 0;
          for (let i = 0; i < 73; i++)
            sum += kusudaAchenbachTemp_C({ ...w, time_s: (i * 5 + day) * SECONDS_PER_DAY });
          expect(Math.abs(sum / 73 - mean)).toBeLessThan(1e-9);
        },
      ),
      params,
    );
  });
  it('step and ramp responses grow with time and fall with depth, bounded by the surface change', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 50, noNaN: true }),
        fc.double({ min: 0.5, max: 100, noNaN: true }),
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        (x, years, dyears) => {
          const t = years * SECONDS_PER_YEAR;
          const later = (years + dyears) * SECONDS_PER_YEAR;
          const s = (xx: number, tt: number) =>
            stepResponse_C({ depth_m: xx, time_s: tt, diffusivity_m2_s: 1e-6, step_C: 1 });
          const r = (xx: number, tt: number) =>
            rampResponse_C({
              depth_m: xx,
              time_s: tt,
              diffusivity_m2_s: 1e-6,
              rate_C_per_s: 1 / SECONDS_PER_YEAR,
            });
          expect(s(x, later)).toBeGreaterThanOrEqual(s(x, t));
          expect(s(x + 1, t)).toBeLessThanOrEqual(s(x, t));
          expect(r(x, later)).toBeGreaterThan(r(x, t));
          expect(r(x, t)).toBeLessThanOrEqual(years + 1e-12);
          expect(s(x, t)).toBeLessThanOrEqual(1);
        },
      ),
      params,
    );
  });
});
