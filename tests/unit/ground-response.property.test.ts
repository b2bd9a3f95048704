import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { infiniteLineSourceG } from '../../layers/physics/infinite-line-source';
import { finiteLineSourceG, pileFieldGFunction } from '../../layers/physics/finite-line-source';
import {
  infiniteSolidCylinderSourceG,
  finiteSolidCylinderSourceG,
} from '../../layers/physics/solid-cylinder-source';
import { cylinderSourceG } from '../../layers/physics/infinite-cylinder-source';

describe('ground response limits and monotonicity (seeded property tests)', () => {
  it('finite line source meets the infinite line source at early time (t < ts/400, mid-depth, within 1 %)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.03, max: 0.2, noNaN: true }),
        fc.double({ min: 8, max: 100, noNaN: true }),
        fc.double({ min: 1e-3, max: 2.5e-3, noNaN: true }),
        (rb, H, frac) => {
          const a = 1e-6;
          const t = (frac * H * H) / (9 * a);
          const fls = finiteLineSourceG({
            radius_m: rb,
            length_m: H,
            buriedDepth_m: 1,
            diffusivity_m2_s: a,
            time_s: t,
            point: 'midDepth',
          });
          const ils = infiniteLineSourceG({ radius_m: rb, time_s: t, diffusivity_m2_s: a });
          expect(Math.abs(fls / ils - 1)).toBeLessThan(0.01);
        },
      ),
      { seed: 4201, numRuns: 15 },
    );
  });
  it('g rises with time for the line, cylinder, finite line and solid cylinder sources and a pile group', () => {
    const times = [1e5, 1e6, 1e7, 1e8, 1e9];
    const series = [
      times.map((t) => infiniteLineSourceG({ radius_m: 0.1, time_s: t, diffusivity_m2_s: 1e-6 })),
      times.map((t) => cylinderSourceG((1e-6 * t) / 0.01)),
      times.map((t) =>
        finiteLineSourceG({
          radius_m: 0.1,
          length_m: 10,
          buriedDepth_m: 1,
          diffusivity_m2_s: 1e-6,
          time_s: t,
        }),
      ),
      times.map((t) =>
        finiteSolidCylinderSourceG({
          pileRadius_m: 0.3,
          length_m: 8,
          buriedDepth_m: 1,
          diffusivity_m2_s: 1e-6,
          time_s: t,
        }),
      ),
      pileFieldGFunction({
        positions: [0, 3, 6, 9].map((x) => ({ x_m: x, y_m: 0 })),
        pileRadius_m: 0.1,
        length_m: 10,
        buriedDepth_m: 1,
        diffusivity_m2_s: 1e-6,
        times_s: times,
      }),
    ];
    for (const s of series) for (let i = 1; i < s.length; i++) expect(s[i]).toBeGreaterThan(s[i - 1]);
  });
  it('solid cylinder at its wall meets the line source late (Fo 1e4, 1e-3); early it lies between line and hollow cylinder', () => {
    const late = infiniteSolidCylinderSourceG({
      pileRadius_m: 0.1,
      radius_m: 0.1,
      diffusivity_m2_s: 1e-6,
      time_s: 1e8,
    });
    expect(
      Math.abs(late / infiniteLineSourceG({ radius_m: 0.1, time_s: 1e8, diffusivity_m2_s: 1e-6 }) - 1),
    ).toBeLessThan(1e-3);
    for (const t of [3600, 86400, 864000]) {
      const scs = infiniteSolidCylinderSourceG({
        pileRadius_m: 0.3,
        radius_m: 0.3,
        diffusivity_m2_s: 1e-6,
        time_s: t,
      });
      expect(scs).toBeGreaterThan(infiniteLineSourceG({ radius_m: 0.3, time_s: t, diffusivity_m2_s: 1e-6 }));
      expect(scs).toBeLessThan(2 * Math.PI * cylinderSourceG((1e-6 * t) / 0.09));
    }
  });
  it('a pile group responds more than a single pile, and closer spacing more than wider', () => {
    const geo = {
      pileRadius_m: 0.1,
      length_m: 10,
      buriedDepth_m: 1,
      diffusivity_m2_s: 1e-6,
      times_s: [7.9e8],
    };
    const one = pileFieldGFunction({ ...geo, positions: [{ x_m: 0, y_m: 0 }] })[0];
    const wide = pileFieldGFunction({ ...geo, positions: [0, 6].map((x) => ({ x_m: x, y_m: 0 })) })[0];
    const close = pileFieldGFunction({ ...geo, positions: [0, 2].map((x) => ({ x_m: x, y_m: 0 })) })[0];
    expect(wide).toBeGreaterThan(one);
    expect(close).toBeGreaterThan(wide);
  });
});
