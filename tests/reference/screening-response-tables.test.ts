import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  buildResponseTables,
  fieldResponseAtCount,
  flsResponse,
  rampShape,
  rampTimeToRise_yr,
  rampWarming_K,
} from '../../layers/screening/response-tables';
import { lookup } from '../../layers/screening/log-table';
import { finiteLineSourceG, pileFieldGFunction } from '../../layers/physics/finite-line-source';
import { finiteLineSourcePointG } from '../../layers/physics/finite-line-source-point';
import { cylinderSourceG } from '../../layers/physics/infinite-cylinder-source';
import { foundationGroup } from '../../layers/screening/foundation-group';
import { layoutPositions } from '../../layers/site/sizing-layout';
import { DEFAULT_SCENARIO, parseScenario } from '../../layers/screening/scenario';

const T = buildResponseTables(DEFAULT_SCENARIO);
// Linear surface rise b = 0.05 K/yr, α = 1e-6 m²/s = 31.5576 m²/yr (365.25-day year), reference-values §7.
const B = 0.05;
const ALPHA_YR = 31.5576;

describe('tabulated linear-ramp response (Carslaw & Jaeger 1959 §2.5, T − Ti = 4bt·i²erfc(x/2√αt))', () => {
  // Values computed from C&J §2.5 with mpmath (reference-values.md §7, table LR-1 and LR-2), tol 2e-4 K
  // (the printed precision).
  const cases: [number, number, number][] = [
    [5, 10, 0.36],
    [10, 10, 0.2533],
    [20, 10, 0.1166],
    [5, 30, 1.2442],
    [10, 30, 1.0243],
    [20, 30, 0.6784],
    [50, 30, 0.1613],
  ];
  for (const [x, t, expected] of cases) {
    it(`x = ${x} m, t = ${t} yr: ${expected} K`, () => {
      expect(Math.abs(rampWarming_K(T, x, t, B, ALPHA_YR) - expected)).toBeLessThan(2e-4);
    });
  }
  it('at the surface the rise is b·t exactly', () => {
    expect(rampWarming_K(T, 0, 40, B, ALPHA_YR)).toBeCloseTo(2, 12);
  });
  it('the inverse table returns the time of a given rise (round trip within 0.1 %, property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 40, noNaN: true }),
        fc.double({ min: 1, max: 500, noNaN: true }),
        fc.double({ min: 3, max: 60, noNaN: true }),
        (z, t, a) => {
          const rise = rampWarming_K(T, z, t, B, a);
          if (rise < 1e-6) return;
          expect(Math.abs(rampTimeToRise_yr(T, z, rise, B, a) / t - 1)).toBeLessThan(1e-3);
        },
      ),
      { seed: 31, numRuns: 300 },
    );
  });
  it('the forward table matches the exact shape τ·i²erfc(1/2√τ) within 0.4 %', () => {
    for (let e = -1.5; e <= 6.5; e += 0.173) {
      const tau = 10 ** e;
      expect(Math.abs(lookup(T.rampForward, tau) / rampShape(tau) - 1)).toBeLessThan(4e-3);
    }
  });
});

describe('tabulated finite line source (layers/physics/finite-line-source.ts, Eskilson 1987; Zeng et al. 2002)', () => {
  const s = DEFAULT_SCENARIO;
  const geometry = { length_m: s.pile.length_m, buriedDepth_m: s.pile.topDepth_m, diffusivity_m2_s: 1e-6 };
  const year = 365 * 86400;
  it('mean over the pile at its radius: within 0.1 % of the direct quadrature from 1 day to 300 years', () => {
    for (const t of [86400, 30 * 86400, year, 10 * year, 30 * year, 300 * year]) {
      const g = finiteLineSourceG({ ...geometry, radius_m: s.pile.radius_m, time_s: t, point: 'mean' });
      expect(Math.abs(flsResponse(T.pileMean, 1e-6, t) / g - 1)).toBeLessThan(1e-3);
    }
  });
  it('the foundation group, mean over its piles: within 1e-3 of the direct field g-function (4 × 4 at 3 m)', () => {
    const positions = foundationGroup(s).positions;
    const times = [30 * 86400, year, 5 * year, 30 * year, 100 * year, 300 * year];
    const direct = pileFieldGFunction({
      ...geometry,
      positions,
      pileRadius_m: s.pile.radius_m,
      times_s: times,
    });
    times.forEach((t, i) => {
      expect(Math.abs(flsResponse(T.fieldMean, 1e-6, t) - direct[i]) / direct[3]).toBeLessThan(1e-3);
    });
    // a 4 × 4 group at 3 m responds 2.4-2.7 times one pile alone at 30 years (issue 11; measured here)
    const ratio = flsResponse(T.fieldMean, 1e-6, 30 * year) / flsResponse(T.pileMean, 1e-6, 30 * year);
    expect(ratio).toBeGreaterThan(2.2);
    expect(ratio).toBeLessThan(2.9);
  });
  it('fields larger than the foundation: within 2 % of the direct field g-function between and beyond the tabulated sizes', () => {
    // Interpolated in ln N between 16, 36, 64, 144 and 256 piles; 400 is extrapolated along the last segment.
    for (const count of [16, 25, 49, 100, 200, 400]) {
      const positions = layoutPositions({
        count,
        layout: { spacing_m: s.building.pileSpacing_m },
        pileRadius_m: s.pile.radius_m,
      });
      const times = [30 * 86400 + 6 * 3600, 30 * year];
      const direct = pileFieldGFunction({
        ...geometry,
        positions,
        pileRadius_m: s.pile.radius_m,
        times_s: times,
      });
      times.forEach((t, i) => {
        const got = fieldResponseAtCount(T, count, 1e-6 * t);
        expect(Math.abs(got / direct[i] - 1), `${count} piles at ${t} s`).toBeLessThan(0.02);
      });
    }
  });
  it('one pile alone at the default reference point (mid-depth, 1.5 m) equals the mid-depth FLS of the core', () => {
    const one = parseScenario({ building: { foundationPiles: 1 } });
    const t1 = buildResponseTables(one);
    const g30 = finiteLineSourceG({ ...geometry, radius_m: 1.5, time_s: 30 * year, point: 'midDepth' });
    for (const t of [30 * 86400, year, 5 * year, 30 * year, 100 * year, 300 * year]) {
      const g = finiteLineSourceG({ ...geometry, radius_m: 1.5, time_s: t, point: 'midDepth' });
      expect(Math.abs(flsResponse(t1.referencePoint, 1e-6, t) - g) / g30).toBeLessThan(1e-3);
    }
  });
  // Item 6 of issue 11: the reference point at the scenario's depth, near the pile head and tip too.
  for (const depth of [1.2, 6, 10.8, 13]) {
    it(`the group at the reference point at ${depth} m: within 1e-3 of the direct sum of point responses`, () => {
      const sc = parseScenario({ referenceDepth_m: depth });
      const tt = buildResponseTables(sc);
      const d = foundationGroup(sc).referenceDistances_m;
      const direct = (t: number) =>
        d.reduce(
          (a, r) => a + finiteLineSourcePointG({ ...geometry, radius_m: r, depth_m: depth, time_s: t }),
          0,
        );
      const g30 = direct(30 * year);
      for (const t of [30 * 86400, year, 5 * year, 30 * year, 300 * year]) {
        expect(Math.abs(flsResponse(tt.referencePoint, 1e-6, t) - direct(t)) / g30).toBeLessThan(1e-3);
      }
    });
  }
  it('cylinder source at the pile wall: within 1e-3 of the direct integral (6 h to 1 month, all soils)', () => {
    for (const fo of [0.02, 0.3, 3.05, 40, 400, 5000]) {
      const g = 2 * Math.PI * cylinderSourceG(fo);
      expect(Math.abs(lookup(T.cylinderWall, fo) / g - 1)).toBeLessThan(1e-3);
    }
  });
});
