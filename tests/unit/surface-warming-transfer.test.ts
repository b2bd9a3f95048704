/**
 * Issue 11 item 5: one surface-warming transfer for the map and the simulator. The simulator's surface
 * (site-setup.ts surfaceForcing → surfaceTemperature_C) adds the trend to the air and then applies the
 * n-factors; the map's surface warming (cell-kernel.ts surfaceWarmingRate_K_per_yr) must give the same
 * change of the surface mean. Year means of the simulator's surface are taken by the midpoint rule on
 * 400 000 points a year (spectral for the smooth part; the two kinks at 0 °C cost O(h²) ≈ 1e-9 K).
 */
import { describe, it, expect } from 'vitest';
import { surfaceForcing } from '../../layers/site/site-setup';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { surfaceWarmingRate_K_per_yr } from '../../layers/screening/cell-kernel';
import {
  nFactorSurfaceMean_C,
  SECONDS_PER_YEAR,
  surfaceMeanSensitivity,
  surfaceMeanWarming_K,
} from '../../layers/physics/surface-forcing';

const N = 400_000;

function siteInput(mean: number, amp: number, nF: number, nT: number, rate: number) {
  return siteInputSchema.parse({
    ground: {
      layers: [{ top_m: 0, bottom_m: 50, soil: { texture: 'silt', waterContent_m3m3: 0.3 } }],
      initial: 'equilibrium',
    },
    climate: { meanAirTemp_C: mean, amplitude_C: amp, warming_C_per_yr: rate, nThaw: nT, nFreeze: nF },
    pile: null,
    operation: { mode: 'heatRate', extraction_W: 0 },
    probes: [],
  });
}

/** Mean of the simulator's surface temperature over one year starting at t0_s. */
function simulatorYearMean(f: (t: number) => number, t0_s: number): number {
  let sum = 0;
  for (let i = 0; i < N; i++) sum += f(t0_s + ((i + 0.5) / N) * SECONDS_PER_YEAR);
  return sum / N;
}

// MAAT °C, amplitude K, n_f, n_t, air trend K/yr
const CLIMATES: [number, number, number, number, number][] = [
  [-6.5, 18, 0.5, 1.0, 0.04],
  [-12, 22, 0.45, 1.0, 0.06],
  [-2, 19, 0.5, 1.25, 0.05],
  [-9, 15, 0.9, 0.8, 0.03],
];
const LIFE = 30;

describe('surface-warming transfer shared by the map and the simulator (issue 11 item 5)', () => {
  for (const [mean, amp, nF, nT, rate] of CLIMATES) {
    it(`MAAT ${mean} °C, A ${amp} K, n_f ${nF}, n_t ${nT}: map surface-mean change = simulator's to 1e-6 K`, () => {
      const map_K =
        surfaceWarmingRate_K_per_yr(
          { meanAirTemp_C: mean, airAmplitude_C: amp, warming_C_per_yr: rate },
          nF,
          nT,
          LIFE,
        ) * LIFE;
      // The simulator's surface with the air mean at its end-of-life offset b·life, and today.
      const end = surfaceForcing(siteInput(mean + rate * LIFE, amp, nF, nT, 0), false);
      const today = surfaceForcing(siteInput(mean, amp, nF, nT, 0), false);
      const sim_K = simulatorYearMean(end, 0) - simulatorYearMean(today, 0);
      expect(Math.abs(map_K - sim_K)).toBeLessThan(1e-6);
      // Less than the air warming under snow (n_f < n_t): the map used to put b·life on the surface.
      if (nF < nT) expect(map_K).toBeLessThan(rate * LIFE);
    });
  }
  it('with the trend running, the simulator year centred on a warmest day has the surface mean of the transfer at that offset (1e-5 K: the drift within the year is second order there)', () => {
    const [mean, amp, nF, nT, rate] = CLIMATES[0];
    const f = surfaceForcing(siteInput(mean, amp, nF, nT, rate), true);
    // Warmest day of year 30: coldest day 15 (default) + half a year; the window is centred on it, so
    // the thaw season sits symmetric in it and the first-order drift term cancels.
    const centre_yr = LIFE + (15 + 182.5) / 365;
    const withTrend = simulatorYearMean(f, (centre_yr - 0.5) * SECONDS_PER_YEAR);
    const c = { meanAirTemp_C: mean, amplitude_C: amp, nFreeze: nF, nThaw: nT };
    const expected = nFactorSurfaceMean_C(c) + surfaceMeanWarming_K({ ...c, airWarming_K: rate * centre_yr });
    expect(Math.abs(withTrend - expected)).toBeLessThan(1e-5);
  });
  it('sensitivity n_t·f_t + n_f·(1 − f_t): (n_t + n_f)/2 at MAAT 0 (hand: f_t = 1/2); equals the derivative of the degree-day mean', () => {
    expect(surfaceMeanSensitivity({ meanAirTemp_C: 0, amplitude_C: 15, nFreeze: 0.5, nThaw: 1 })).toBeCloseTo(
      0.75,
      12,
    );
    // MAAT −A/2: asin(−1/2) = −π/6, f_t = 1/2 − 1/6 = 1/3 (hand): 1·1/3 + 0.5·2/3 = 2/3.
    expect(
      surfaceMeanSensitivity({ meanAirTemp_C: -7.5, amplitude_C: 15, nFreeze: 0.5, nThaw: 1 }),
    ).toBeCloseTo(2 / 3, 12);
    const c = { meanAirTemp_C: -7.5, amplitude_C: 15, nFreeze: 0.5, nThaw: 1 };
    const h = 1e-4;
    const fd =
      (surfaceMeanWarming_K({ ...c, airWarming_K: h }) - surfaceMeanWarming_K({ ...c, airWarming_K: -h })) /
      (2 * h);
    expect(Math.abs(fd - 2 / 3)).toBeLessThan(1e-7);
    // Whole year frozen: only n_f acts; whole year thawed: only n_t.
    expect(surfaceMeanSensitivity({ meanAirTemp_C: -20, amplitude_C: 15, nFreeze: 0.5, nThaw: 1 })).toBe(0.5);
    expect(surfaceMeanSensitivity({ meanAirTemp_C: 20, amplitude_C: 15, nFreeze: 0.5, nThaw: 1.2 })).toBe(
      1.2,
    );
  });
});
