/**
 * Three-pulse sizing with the seasonal ground along the pile (layers/site/pile-sizing.ts,
 * ground.monthlyTemperature_C) and the pile-averaged monthly ground of a run (site-profile.ts
 * pileMonthlyGround_C). Checks by construction (hand-computed), no published values: the monthly form
 * reduces exactly to the classical three pulses when every month sits at the annual mean, a colder
 * late-winter month that carries less load than January can control the design, and the pile average
 * of a field linear in depth and sinusoidal in time is its value at mid-pile at mid-month.
 */
import { describe, expect, it } from 'vitest';
import {
  designEnteringFluid_C,
  sizePileField,
  type PileFieldSizingInput,
} from '../../layers/site/pile-sizing';
import { pileMonthlyGround_C } from '../../layers/site/site-profile';
import type { SiteCaseResult } from '../../layers/site/site-input-schema';

const base: PileFieldSizingInput = {
  peakHeatingLoad_W: 8000,
  annualHeating_kWh: 20_000,
  pile: { length_m: 10, radius_m: 0.084, buriedDepth_m: 1, Rb_mK_W: 0.15 },
  layout: { spacing_m: 3 },
  ground: { conductivity_W_mK: 2.0, diffusivity_m2_s: 1.1e-6, undisturbedTemperature_C: -2 },
  fluid: { fluid: 'propyleneGlycol', massFraction: 0.4 },
  designLife_yr: 30,
  includeLifeSeries: false,
};

describe('three-pulse sizing with the seasonal ground along the pile', () => {
  it('every month at the annual mean gives the classical three-pulse count and design fluid exactly', () => {
    const classic = sizePileField(base);
    const flat = sizePileField({
      ...base,
      ground: { ...base.ground, monthlyTemperature_C: new Array<number>(12).fill(-2) },
    });
    expect(flat.pileCount).toBe(classic.pileCount);
    expect(flat.enteringFluidAtDesign_C).toBeCloseTo(classic.enteringFluidAtDesign_C, 12);
  });

  it('a late-winter month 2 K colder than the mean controls the design and needs more piles', () => {
    const months = new Array<number>(12).fill(-2);
    months[2] = -4; // March: less load than January (0.12 against 0.15 of the year), much colder ground
    const input = { ...base, ground: { ...base.ground, monthlyTemperature_C: months } };
    const classic = sizePileField(base);
    const wave = sizePileField(input);
    expect(wave.pileCount).toBeGreaterThan(classic.pileCount);
    // The least count: one pile fewer leaves the design fluid below the heat pump's limit.
    const minEft = -8; // the default curve's lowest entering fluid
    expect(wave.enteringFluidAtDesign_C).toBeGreaterThanOrEqual(minEft - 1e-9);
    expect(designEnteringFluid_C({ ...input, pileCount: wave.pileCount - 1 })).toBeLessThan(minEft);
    // By hand: at the same count, March's fluid is January's fluid with its own ground and load pulse.
    const n = wave.pileCount;
    const jan = designEnteringFluid_C({ ...base, pileCount: n });
    expect(designEnteringFluid_C({ ...input, pileCount: n })).toBeLessThan(jan);
  });

  it('refuses a monthly ground that is not 12 values, naming the field', () => {
    expect(() =>
      sizePileField({ ...base, ground: { ...base.ground, monthlyTemperature_C: [-2, -2] } }),
    ).toThrow(/ground\.monthlyTemperature_C must hold 12 values/);
  });
});

describe('pile-averaged monthly ground of a run', () => {
  it('of T = a + b·z + A·sin(2πt) is a + b·z_mid + A·sin(2π t_mid) (trapezoid exact in z; linear in t)', () => {
    const depths_m = [0.5, 1, 2, 4, 6, 8, 10, 12, 15];
    const dt = 1 / 52; // weekly samples: linear interpolation in time errs by about A·(2π·dt)²/8
    const time_yr = Array.from({ length: 2 * 52 + 1 }, (_, i) => i * dt);
    const T = (z: number, t: number) => -3 + 0.05 * z + 1.5 * Math.sin(2 * Math.PI * t);
    const run = {
      time_yr,
      probes: depths_m.map((z) => ({ T_C: time_yr.map((t) => T(z, t)) })),
    } as unknown as SiteCaseResult;
    const column = { r_m: 1, depths_m, firstProbe: 0 };
    const got = pileMonthlyGround_C(run, column, 2, 1, 11);
    expect(got).not.toBeNull();
    got!.forEach((v, m) => {
      const tMid = 1 + (m + 0.5) / 12;
      expect(v).toBeCloseTo(T(6, tMid), 2);
    });
    // A pile below the column's deepest probe cannot be averaged.
    expect(pileMonthlyGround_C(run, column, 1, 1, 20)).toBeNull();
  });
});
