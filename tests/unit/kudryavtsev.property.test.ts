import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { kudryavtsevActiveLayer_m, kudryavtsevTtop_C } from '../../layers/physics/kudryavtsev';
import { degreeDays } from '../../layers/physics/surface-forcing';
import { stefanDepth_m } from '../../layers/physics/stefan';
import { ttop_C } from '../../layers/physics/ttop';
import { neumannOnePhaseLambda } from '../../layers/physics/neumann';

const params = { seed: 20261201, numRuns: 300 };

describe('phase-change and climate-model invariants (seeded property tests)', () => {
  it('colder climate means a thinner active layer (Stefan and Kudryavtsev)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -15, max: -1, noNaN: true }),
        fc.double({ min: 0.2, max: 5, noNaN: true }),
        fc.double({ min: 8, max: 25, noNaN: true }),
        fc.double({ min: 20e6, max: 200e6, noNaN: true }),
        (mean, cooler, amp, L) => {
          const warm = degreeDays({ meanAirTemp_C: mean, amplitude_C: amp });
          const cold = degreeDays({ meanAirTemp_C: mean - cooler, amplitude_C: amp });
          const s = (i: number) => stefanDepth_m({ conductivity_W_mK: 1.3, index_Cd: i, latent_J_m3: L });
          expect(s(cold.thawingIndex_Cd)).toBeLessThanOrEqual(s(warm.thawingIndex_Cd));
          const alt = (m: number) =>
            kudryavtsevActiveLayer_m({
              surfaceAmplitude_C: amp,
              ttop_C: m,
              conductivity_W_mK: 1.3,
              heatCapacity_J_m3K: 2.5e6,
              latent_J_m3: L,
            });
          expect(alt(mean - cooler)).toBeLessThanOrEqual(alt(mean));
        },
      ),
      params,
    );
  });
  it('TTOP rises with warmer air and lies at or below MAGST when k_t < k_f (thermal offset)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 3000, noNaN: true }),
        fc.double({ min: 0, max: 6000, noNaN: true }),
        fc.double({ min: 1, max: 500, noNaN: true }),
        fc.double({ min: 0.3, max: 1, noNaN: true }),
        (ti, fi, dti, rk) => {
          const base = { freezingIndex_Cd: fi, nFreeze: 0.5, nThaw: 1, kThawed_W_mK: rk, kFrozen_W_mK: 1 };
          const t1 = ttop_C({ ...base, thawingIndex_Cd: ti });
          const t2 = ttop_C({ ...base, thawingIndex_Cd: ti + dti });
          expect(t2).toBeGreaterThanOrEqual(t1);
          expect(t1).toBeLessThanOrEqual((ti - 0.5 * fi) / 365 + 1e-12);
        },
      ),
      params,
    );
  });
  it('Kudryavtsev TTOP lies at or below T̄s when k_t ≤ k_f', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 25, noNaN: true }),
        fc.double({ min: 0.3, max: 1, noNaN: true }),
        (ts, as, rk) => {
          expect(
            kudryavtsevTtop_C({
              meanSurfaceTemp_C: ts,
              surfaceAmplitude_C: as,
              kThawed_W_mK: rk * 2,
              kFrozen_W_mK: 2,
            }),
          ).toBeLessThanOrEqual(ts + 1e-12);
        },
      ),
      params,
    );
  });
  it('the Neumann λ sits below the Stefan value √(Ste/2) and grows with Ste', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-4, max: 10, noNaN: true }),
        fc.double({ min: 1e-3, max: 1, noNaN: true }),
        (ste, d) => {
          const l = neumannOnePhaseLambda(ste);
          expect(l).toBeLessThan(Math.sqrt(ste / 2));
          expect(neumannOnePhaseLambda(ste + d)).toBeGreaterThan(l);
        },
      ),
      params,
    );
  });
});
