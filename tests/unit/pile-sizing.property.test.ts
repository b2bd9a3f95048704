import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  designEnteringFluid_C,
  sizePileField,
  type PileFieldSizingInput,
} from '../../layers/site/pile-sizing';

const VOLUMETRIC_HEAT_CAPACITY = 2.2e6; // J/(m³·K), frozen silt order of magnitude (common practice)

const scenario = fc.record({
  peak_kW: fc.double({ min: 4, max: 25, noNaN: true }),
  fullLoadHours: fc.double({ min: 1500, max: 3500, noNaN: true }),
  k: fc.double({ min: 0.8, max: 3.0, noNaN: true }),
  tg: fc.double({ min: -4, max: 1, noNaN: true }),
  length: fc.double({ min: 6, max: 20, noNaN: true }),
  spacing: fc.double({ min: 1.5, max: 6, noNaN: true }),
  rb: fc.double({ min: 0.05, max: 0.16, noNaN: true }),
  Rb: fc.double({ min: 0.03, max: 0.3, noNaN: true }),
});
type Scenario = typeof scenario extends fc.Arbitrary<infer T> ? T : never;

function inputOf(s: Scenario): PileFieldSizingInput {
  return {
    peakHeatingLoad_W: s.peak_kW * 1000,
    annualHeating_kWh: s.peak_kW * s.fullLoadHours,
    pile: { length_m: s.length, radius_m: s.rb, buriedDepth_m: 1, Rb_mK_W: s.Rb },
    layout: { spacing_m: s.spacing },
    ground: {
      conductivity_W_mK: s.k,
      diffusivity_m2_s: s.k / VOLUMETRIC_HEAT_CAPACITY,
      undisturbedTemperature_C: s.tg,
    },
    minEnteringFluid_C: -8,
    fluid: { fluid: 'propyleneGlycol', massFraction: 0.4 },
    includeLifeSeries: false,
    maxPiles: 5000,
  };
}

describe('pile sizing invariants (seeded property tests)', () => {
  it('more piles never need a colder fluid', () => {
    fc.assert(
      fc.property(scenario, fc.integer({ min: 1, max: 80 }), (s, n) => {
        const a = designEnteringFluid_C({ ...inputOf(s), pileCount: n });
        const b = designEnteringFluid_C({ ...inputOf(s), pileCount: n + 1 });
        expect(b).toBeGreaterThanOrEqual(a - 1e-9);
      }),
      { seed: 4101, numRuns: 25 },
    );
  });
  it('higher ground conductivity never needs more piles', () => {
    fc.assert(
      fc.property(scenario, fc.double({ min: 1.05, max: 2, noNaN: true }), (s, f) => {
        const lo = sizePileField(inputOf(s)).pileCount;
        const hi = sizePileField(inputOf({ ...s, k: Math.min(s.k * f, 6) })).pileCount;
        expect(hi).toBeLessThanOrEqual(lo);
      }),
      { seed: 4102, numRuns: 8 },
    );
  });
  it('longer piles never need more piles', () => {
    fc.assert(
      fc.property(scenario, fc.double({ min: 1, max: 10, noNaN: true }), (s, extra) => {
        const short = sizePileField(inputOf(s)).pileCount;
        const long = sizePileField(inputOf({ ...s, length: s.length + extra })).pileCount;
        expect(long).toBeLessThanOrEqual(short);
      }),
      { seed: 4103, numRuns: 8 },
    );
  });
});
