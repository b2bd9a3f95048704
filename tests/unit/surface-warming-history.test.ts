/**
 * Warming as a piecewise-linear pathway (issue 17 item 1) in the per-cell model:
 * - superposed Carslaw & Jaeger ramps against a direct numerical Duhamel convolution of the step
 *   response erfc(z/(2√(αt))) (Carslaw & Jaeger 1959 §1.14 Duhamel's theorem, §2.4 eq. 2);
 * - a one-segment pathway against the linear ramp check value LR-2 (reference-values.md §7, computed
 *   with mpmath: b = 0.05 K/yr, α = 1e-6 m²/s, t = 30 yr, z = 5 m → 1.2442 K);
 * - the latent delay against years-to-thaw.ts's closed form z·√(L/(k_t·b)) for a linear history and
 *   against the hand integral for a rise that stops;
 * - the kernel: a straight-line pathway reproduces the linear trend (n-factors 1, so the surface
 *   transfer is the identity: the mean of the sinusoid moves with the air), a higher pathway thaws
 *   no later, and the pathway's last year caps every thaw year.
 */
import { describe, expect, it } from 'vitest';
import { erfc } from '../../layers/physics/special-functions';
import { SECONDS_PER_YEAR } from '../../layers/physics/surface-forcing';
import { buildResponseTables } from '../../layers/screening/response-tables';
import { DEFAULT_SCENARIO, parseScenario } from '../../layers/screening/scenario';
import {
  createWarmingHistory,
  historyLatentDelay_yr,
  historySurfaceGain_yr,
  historyTimeToRise_yr,
  historyWarming_K,
  setPathwayHistory,
  surfaceLevel_K,
} from '../../layers/screening/surface-warming-history';
import { screenCell } from '../../layers/screening/cell-screening-model';
import { effectiveHorizonYear } from '../../layers/screening/climate-horizon';
import { cellLayers } from '../../layers/screening/cell-layers';

const tables = buildResponseTables(DEFAULT_SCENARIO);
const alphaYr = 1e-6 * SECONDS_PER_YEAR; // m²/yr

/** A history whose surface levels equal the given air offsets (n-factors 1: identity transfer). */
function identityHistory(time_yr: number[], offset_K: number[]) {
  return setPathwayHistory(createWarmingHistory(), { time_yr, airOffset_K: offset_K }, 1, {
    meanAirTemp_C: -5,
    airAmplitude_C: 0,
    nFreeze: 1,
    nThaw: 1,
    sensitivity: 1,
  });
}

/** Duhamel: W(z,t) = ∫₀ᵗ S'(τ)·erfc(z/(2√(α(t−τ)))) dτ, midpoint rule on 20 000 sub-intervals. */
function duhamel(slope: (t: number) => number, z: number, t: number): number {
  const n = 20000;
  const d = t / n;
  let w = 0;
  for (let i = 0; i < n; i++) {
    const tau = (i + 0.5) * d;
    w += slope(tau) * erfc(z / (2 * Math.sqrt(alphaYr * (t - tau)))) * d;
  }
  return w;
}

describe('surface-warming history: superposed ramps', () => {
  const knots = [0, 25, 55, 75];
  const levels = [0, 1.0, 3.1, 2.6]; // rises, rises faster, then falls (a peak-and-decline pathway)
  const h = identityHistory(knots, levels);
  const slope = (t: number) => {
    for (let j = knots.length - 2; j >= 0; j--) {
      if (t >= knots[j])
        return t < knots[j + 1] ? (levels[j + 1] - levels[j]) / (knots[j + 1] - knots[j]) : 0;
    }
    return 0;
  };
  it('matches a direct numerical Duhamel convolution at 2, 6 and 15 m over 100 years', () => {
    for (const z of [2, 6, 15]) {
      for (const t of [10, 40, 70, 100]) {
        const ref = duhamel(slope, z, t);
        const got = historyWarming_K(tables, h, z, t, alphaYr);
        expect(Math.abs(got - ref)).toBeLessThan(2e-3 * Math.max(0.05, Math.abs(ref)));
      }
    }
  });
  it('is the surface level at the surface and holds the last level after the last knot', () => {
    expect(surfaceLevel_K(h, 40)).toBeCloseTo(1 + (2.1 * 15) / 30, 12);
    expect(surfaceLevel_K(h, 300)).toBe(2.6);
    expect(historyWarming_K(tables, h, 0, 40, alphaYr)).toBeCloseTo(surfaceLevel_K(h, 40), 9);
  });
  it('a one-segment pathway at 0.05 K/yr gives LR-2: 1.2442 K at 5 m after 30 yr', () => {
    const lin = identityHistory([0, 400], [0, 20]);
    expect(historyWarming_K(tables, lin, 5, 30, alphaYr)).toBeCloseTo(1.2442, 3);
  });
  it('time to a rise inverts the warming; a rise above the peak surface level never comes', () => {
    const t = historyTimeToRise_yr(tables, h, 6, 1.5, alphaYr, 200);
    expect(Math.abs(historyWarming_K(tables, h, 6, t, alphaYr) - 1.5)).toBeLessThan(2e-3);
    expect(historyWarming_K(tables, h, 6, t - 0.5, alphaYr)).toBeLessThan(1.5);
    expect(historyTimeToRise_yr(tables, h, 6, 3.2, alphaYr, 500)).toBe(Infinity);
  });
});

describe('surface-warming history: latent delay and surface gain', () => {
  const L = 100e6;
  const kT = 1.2;
  it('a linear history reproduces z·√(L/(k_t·b)) (years-to-thaw.ts)', () => {
    const b = 0.04;
    const lin = identityHistory([0, 500], [0, b * 500]);
    const expected = (6 * Math.sqrt(L / (kT * (b / SECONDS_PER_YEAR)))) / SECONDS_PER_YEAR;
    expect(historyLatentDelay_yr(lin, 20, 6, L, kT)).toBeCloseTo(expected, 6);
    expect(historySurfaceGain_yr(lin, 30, 0.5)).toBeCloseTo(0.5 / b, 9);
  });
  it('a rise that stops: the hand integral ∫E dt = z²L/(2k_t), E = b(t − t0) to t1 then constant', () => {
    // b = 0.05 K/yr from t0 = 10 to t1 = 40 (E reaches 1.5 K; ∫ to t1 = 22.5 K·yr), then E = 1.5 K
    const h = identityHistory([0, 40], [0, 2]);
    const z = 3;
    const target = (z * z * L) / (2 * kT * SECONDS_PER_YEAR); // K·yr
    const b = 0.05;
    const expected = target <= 22.5 ? Math.sqrt((2 * target) / b) : 30 + (target - 22.5) / 1.5;
    expect(historyLatentDelay_yr(h, 10, z, L, kT)).toBeCloseTo(expected, 6);
    expect(historySurfaceGain_yr(h, 30, 1)).toBe(Infinity); // only 0.5 K of rise left
  });
});

describe('per-cell model with a warming pathway', () => {
  const cell = {
    meanAirTemp_C: -2.5,
    airAmplitude_C: 18,
    warming_C_per_yr: 0.06,
    textureClass: 'silt',
    waterContent_m3m3: 0.38,
    bedrockDepth_m: 18,
    groundTemp_C: null,
    geothermalFlux_W_m2: 0.06,
    nFreeze: 1,
    latitude_deg: 75.2,
  };
  const scen = { climateHorizonYear: 2400 };
  it('a straight-line pathway equal to the cell trend reproduces the linear model', () => {
    const linear = screenCell(cell, scen);
    const path = screenCell(cell, {
      ...scen,
      warmingPathway: {
        label: 'straight line',
        points: [
          { year: 2025, airWarming_K: 0 },
          { year: 2425, airWarming_K: 24 },
        ],
      },
    });
    for (const id of ['thawYear', 'thawYearPiles', 'groundTempEnd', 'windowLower', 'pilesPerTon'] as const) {
      const a = linear.metrics[id].value;
      const b = path.metrics[id].value;
      expect(a).not.toBeNull();
      expect(Math.abs((b as number) - (a as number))).toBeLessThan(0.05);
    }
  });
  it('a higher pathway thaws no later, and the pathway end caps the thaw years', () => {
    const pathway = (k: number, end: number) => ({
      label: `x${k}`,
      points: [
        { year: 2000, airWarming_K: 0 },
        { year: 2050, airWarming_K: 1.5 * k },
        { year: end, airWarming_K: 4 * k },
      ],
    });
    const low = screenCell(cell, { warmingPathway: pathway(1, 2100) });
    const high = screenCell(cell, { warmingPathway: pathway(2, 2100) });
    expect(high.metrics.thawYear.value as number).toBeLessThanOrEqual(low.metrics.thawYear.value as number);
    const short = parseScenario({ warmingPathway: pathway(2, 2080) });
    expect(effectiveHorizonYear(short)).toBe(2080);
    expect(cellLayers(short).find((l) => l.id === 'thawYear')?.horizon?.year).toBe(2080);
    const capped = screenCell(cell, { warmingPathway: pathway(2, 2080) });
    expect(capped.metrics.thawYearPiles.value as number).toBeLessThanOrEqual(2080);
    expect(capped.metrics.thawYear.value as number).toBeLessThanOrEqual(2080);
  });
  it('rejects a pathway that starts after the start year, naming the field', () => {
    expect(() =>
      parseScenario({
        warmingPathway: {
          label: 'late',
          points: [
            { year: 2030, airWarming_K: 0 },
            { year: 2100, airWarming_K: 2 },
          ],
        },
      }),
    ).toThrow(/warmingPathway\.points\.0\.year/);
    expect(() =>
      parseScenario({
        warmingPathway: {
          label: 'back',
          points: [
            { year: 2000, airWarming_K: 0 },
            { year: 1990, airWarming_K: 2 },
          ],
        },
      }),
    ).toThrow(/warmingPathway\.points\.1\.year/);
  });
});
