import { describe, it, expect } from 'vitest';
import { finiteLineSourceG } from '../../layers/physics/finite-line-source';
import { finiteLineSourcePointG } from '../../layers/physics/finite-line-source-point';
import { erfc } from '../../layers/physics/special-functions';

const YEAR = 365 * 86400;
const geo = { length_m: 10, buriedDepth_m: 1, diffusivity_m2_s: 1e-6 };

/**
 * Direct evaluation of the defining integral of Zeng, Diao & Fang (2002, eq. 8) in the source
 * coordinate z' (composite Simpson, 40 000 intervals: h = 0.25 mm, far below the radii used here), an
 * independent path from the module's hyperbolic substitution.
 */
function direct(r: number, z: number, t: number, H = 10, D = 1, a = 1e-6): number {
  const w = 1 / Math.sqrt(4 * a * t);
  const n = 40_000;
  const h = H / n;
  let s = 0;
  for (let i = 0; i <= n; i++) {
    const zp = D + i * h;
    const rm = Math.hypot(r, z - zp);
    const rp = Math.hypot(r, z + zp);
    const f = erfc(rm * w) / rm - erfc(rp * w) / rp;
    s += (i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2) * f;
  }
  return 0.5 * ((s * h) / 3);
}

describe('finite line source at a point (Zeng, Diao & Fang 2002, eq. 8)', () => {
  it('at mid-depth it equals the mid-depth form of finite-line-source.ts (their eq. 10) within 1e-7', () => {
    for (const r of [0.08415, 0.5, 1.5, 4.5]) {
      for (const t of [30 * 86400, YEAR, 30 * YEAR, 300 * YEAR]) {
        const a = finiteLineSourcePointG({ ...geo, radius_m: r, depth_m: 6, time_s: t });
        const b = finiteLineSourceG({ ...geo, radius_m: r, time_s: t, point: 'midDepth' });
        expect(Math.abs(a - b)).toBeLessThan(1e-7 * Math.max(1, b));
      }
    }
  });
  it('near the pile head and tip, above the head and below the tip: within 1e-6 of the direct z′ integral', () => {
    for (const z of [0.5, 1, 1.2, 3, 10.8, 11, 12]) {
      for (const r of [0.5, 1.5]) {
        for (const t of [YEAR, 30 * YEAR]) {
          const a = finiteLineSourcePointG({ ...geo, radius_m: r, depth_m: z, time_s: t });
          expect(Math.abs(a - direct(r, z, t))).toBeLessThan(1e-6);
        }
      }
    }
  });
  it('steady state in closed form: ½[asinh((D+H−z)/r) − asinh((D−z)/r) − asinh((z+D+H)/r) + asinh((z+D)/r)]', () => {
    // hand value, r = 1.5, z = 6 (mid-depth), D = 1, H = 10:
    // ½[asinh(3.3333) − asinh(−3.3333) − asinh(11.3333) + asinh(4.6667)]
    //  = ½[1.9189 + 1.9189 − 3.1228 + 2.2449] = 1.4799
    const g = finiteLineSourcePointG({ ...geo, radius_m: 1.5, depth_m: 6, time_s: Infinity });
    expect(g).toBeCloseTo(1.4799, 3);
    // the transient tends to it (αt = 1e9 m²: the remaining part is of order r·H/√(αt) ≪ 1e-3)
    const late = finiteLineSourcePointG({ ...geo, radius_m: 1.5, depth_m: 6, time_s: 1e15 });
    expect(Math.abs(late - g)).toBeLessThan(2e-3);
  });
  it('the cooling is largest near mid-depth and smaller towards the head (surface) and below the tip', () => {
    const at = (z: number) =>
      finiteLineSourcePointG({ ...geo, radius_m: 1.5, depth_m: z, time_s: 30 * YEAR });
    expect(at(6)).toBeGreaterThan(at(1.5));
    expect(at(6)).toBeGreaterThan(at(10.5));
    expect(at(1.5)).toBeLessThan(at(10.5)); // the surface mirror cools the head least
    expect(at(0)).toBeCloseTo(0, 12); // surface held at the undisturbed temperature
  });
  it('refuses bad input naming the parameter', () => {
    expect(() => finiteLineSourcePointG({ ...geo, radius_m: 0, depth_m: 6, time_s: YEAR })).toThrow(
      /radius_m/,
    );
    expect(() => finiteLineSourcePointG({ ...geo, radius_m: 1, depth_m: -1, time_s: YEAR })).toThrow(
      /depth_m/,
    );
    expect(() => finiteLineSourcePointG({ ...geo, radius_m: 1, depth_m: 6, time_s: -1 })).toThrow(/time_s/);
  });
});
