import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { neumannTwoPhase, neumannTwoPhaseLambdaKernel } from '../../layers/physics/neumann';

const params = { seed: 20261202, numRuns: 400 };

describe('Newton kernel for the two-phase Neumann λ (seeded property test)', () => {
  it('matches the bisection of neumannTwoPhase to 1e-6 relative (fast erf fits, 1.2e-7)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.2, max: 4, noNaN: true }), // k1
        fc.double({ min: 0.2, max: 4, noNaN: true }), // k2
        fc.double({ min: 1e6, max: 4e6, noNaN: true }), // C1
        fc.double({ min: 1e6, max: 4e6, noNaN: true }), // C2
        fc.double({ min: 1e5, max: 3e8, noNaN: true }), // L
        fc.double({ min: 0.1, max: 30, noNaN: true }), // surface excess
        fc.double({ min: 0, max: 20, noNaN: true }), // initial deficit
        (k1, k2, c1, c2, L, ts, ti) => {
          const ref = neumannTwoPhase({
            near: { conductivity_W_mK: k1, heatCapacity_J_m3K: c1 },
            far: { conductivity_W_mK: k2, heatCapacity_J_m3K: c2 },
            latent_J_m3: L,
            surfaceTemp_C: ts,
            meltTemp_C: 0,
            initialTemp_C: -ti,
            time_s: 1e6,
          }).lambda;
          const nu = Math.sqrt(k1 / c1 / (k2 / c2));
          const lambda = neumannTwoPhaseLambdaKernel(((k2 / k1) * nu * ti) / ts, nu, L / (c1 * ts));
          expect(Math.abs(lambda - ref) / ref).toBeLessThan(1e-6);
        },
      ),
      params,
    );
  });
  it('no latent heat and B = 0 has no front (Infinity); invalid input gives NaN', () => {
    expect(neumannTwoPhaseLambdaKernel(0, 1, 0)).toBe(Infinity);
    expect(neumannTwoPhaseLambdaKernel(-1, 1, 1)).toBeNaN();
    expect(neumannTwoPhaseLambdaKernel(1, 0, 1)).toBeNaN();
    expect(neumannTwoPhaseLambdaKernel(0.5, 1, 0)).toBeGreaterThan(0);
  });
});
