import { describe, it, expect } from 'vitest';
import { superposeAggregated, superposeExact } from '../../layers/physics/load-aggregation';
import { infiniteLineSourceG } from '../../layers/physics/infinite-line-source';

const dt = 3600;
const g = (t: number): number => infiniteLineSourceG({ radius_m: 0.1, time_s: t, diffusivity_m2_s: 1e-6 });

describe('temporal superposition', () => {
  it('a constant load gives the step response exactly (both methods)', () => {
    const n = 500;
    const loads = new Array<number>(n).fill(40);
    const sr = Array.from({ length: n }, (_, j) => g((j + 1) * dt));
    const ex = superposeExact({ loads, stepResponse: sr });
    const ag = superposeAggregated({ loads, timeStep_s: dt, g });
    for (const m of [0, 10, 99, 257, 499]) {
      expect(ex[m]).toBeCloseTo(40 * g((m + 1) * dt), 10);
      // cells average a constant exactly; beyond 256 steps g is interpolated in ln t
      expect(Math.abs(ag[m] / (40 * g((m + 1) * dt)) - 1)).toBeLessThan(1e-5);
    }
  });
  it('is linear in the load', () => {
    const loads = Array.from({ length: 300 }, (_, i) => 10 + 5 * Math.sin(i / 7));
    const a = superposeAggregated({ loads, timeStep_s: dt, g });
    const b = superposeAggregated({ loads: loads.map((q) => 3 * q), timeStep_s: dt, g });
    for (let i = 0; i < loads.length; i += 37) expect(b[i]).toBeCloseTo(3 * a[i], 9);
  });
  it('aggregation stays within 0.1 % of the exact sum on two years of hourly loads', () => {
    const n = 2 * 8760;
    const loads = Array.from(
      { length: n },
      (_, i) => 30 + 20 * Math.cos((2 * Math.PI * i) / 8760) + 10 * Math.sin((2 * Math.PI * i) / 24),
    );
    const sr = Array.from({ length: n }, (_, j) => g((j + 1) * dt));
    const ex = superposeExact({ loads, stepResponse: sr });
    const ag = superposeAggregated({ loads, timeStep_s: dt, g, cellsPerLevel: 8 });
    let err = 0;
    let max = 0;
    for (let i = 0; i < n; i++) {
      err = Math.max(err, Math.abs(ex[i] - ag[i]));
      max = Math.max(max, Math.abs(ex[i]));
    }
    expect(err / max).toBeLessThan(0.001);
  });
});
