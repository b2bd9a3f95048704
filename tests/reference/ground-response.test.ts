import { describe, it, expect } from 'vitest';
import fixtures from './fixtures/exchanger-mpmath.json';
import {
  conductivityFromSlope,
  infiniteLineSource,
  infiniteLineSourceG,
} from '../../layers/physics/infinite-line-source';
import {
  besselJ1Y1SquaredSum,
  cylinderSourceG,
  cylinderSourceGBernier,
} from '../../layers/physics/infinite-cylinder-source';
import { finiteLineSourceG, pileFieldGFunction } from '../../layers/physics/finite-line-source';
import {
  finiteSolidCylinderSourceG,
  infiniteSolidCylinderSourceG,
} from '../../layers/physics/solid-cylinder-source';

const rel = (a: number, b: number): number => Math.abs(a / b - 1);
const DAY = 86400;
const YEAR = 365.25 * DAY;

describe('infinite line source, Carslaw & Jaeger (1959) §10.4 (reference-values.md §2, computed with mpmath)', () => {
  const base = { heatRate_W_m: 50, conductivity_W_mK: 2, diffusivity_m2_s: 1e-6, radius_m: 0.06 };
  for (const [id, t, dT] of [
    ['ILS-1', 30 * DAY, 14.6993],
    ['ILS-2', YEAR, 19.671],
    ['ILS-3', 10 * YEAR, 24.2518],
    ['ILS-6', 100 * 3600, 10.7763],
  ] as const) {
    it(`${id}: ΔT = ${dT} K (tol 1e-4 rel)`, () => {
      expect(rel(infiniteLineSource({ ...base, time_s: t }), dT)).toBeLessThan(1e-4);
    });
  }
  it('ILS-7: TRT slope 2.2 K per ln t at 60 W/m gives k = 2.1703 W/(m·K)', () => {
    expect(rel(conductivityFromSlope({ heatRate_W_m: 60, slope_K: 2.2 }), 2.1703)).toBeLessThan(1e-4);
  });
});

describe('infinite cylinder source G(Fo, 1), Carslaw & Jaeger (1959) ch. 13 (computed with mpmath quadrature)', () => {
  it('J1² + Y1² against mpmath at x = 0.5, 3, 12, 12.5, 30 (1e-10 rel)', () => {
    const ref: [number, number][] = [
      [0.5, 2.2239250079748523],
      [3, 0.22037445947057888],
      [12, 0.05318892923125095],
      [12.5, 0.051051098764273994],
      [30, 0.021229491854138777],
    ];
    for (const [x, v] of ref) expect(rel(besselJ1Y1SquaredSum(x), v)).toBeLessThan(1e-10);
  });
  for (const [fo, g] of fixtures.ics) {
    it(`Fo ${fo}: G = ${g.toFixed(6)} (exact quadrature 1e-5 rel)`, () => {
      expect(rel(cylinderSourceG(fo), g)).toBeLessThan(1e-5);
    });
  }
  it('Bernier (2001) fit within 1.5 % of the exact integral for 0.5 <= Fo <= 1e4 (reference-values.md §3)', () => {
    for (const [fo, g] of fixtures.ics) {
      if (fo >= 0.5 && fo <= 1e4) expect(rel(cylinderSourceGBernier(fo), g)).toBeLessThan(0.015);
    }
  });
  it('Bernier fit column of reference-values.md §3 (Fo 2 → 0.16309, Fo 50 → 0.38051, Fo 1e4 → 0.79584; 1e-4)', () => {
    expect(rel(cylinderSourceGBernier(2), 0.16309)).toBeLessThan(1e-4);
    expect(rel(cylinderSourceGBernier(50), 0.38051)).toBeLessThan(1e-4);
    expect(rel(cylinderSourceGBernier(1e4), 0.79584)).toBeLessThan(1e-4);
  });
  it('meets the line source at Fo >= 1000 (6e-4; 5.2e-4 at Fo 1000 in reference-values.md §3)', () => {
    for (const fo of [1000, 1e4, 1e5]) {
      const ils = infiniteLineSourceG({ radius_m: 1, time_s: fo, diffusivity_m2_s: 1 }) / (2 * Math.PI);
      expect(rel(cylinderSourceG(fo), ils)).toBeLessThan(6e-4);
    }
  });
});

describe('finite line source, mean over the line (Claesson & Javed 2011 form; reference-values.md §4 case A, computed with mpmath; tol 1e-3 rel)', () => {
  const ts = 100 ** 2 / (9 * 1e-6);
  const A = { radius_m: 0.05, length_m: 100, diffusivity_m2_s: 1e-6 };
  const rows: [number, number, number, number | null][] = [
    [-8, 2.9013, 2.8981, null],
    [-6, 3.8887, 3.8796, null],
    [-4, 4.8557, 4.8312, 4.9068],
    [-2, 5.7526, 5.7, 5.9063],
    [0, 6.4325, 6.3448, 6.7506],
    [2, 6.6864, 6.575, 7.0239],
    [3, 6.7094, 6.595, 7.0449],
  ];
  for (const [l, gD4, gD0, gMid] of rows) {
    it(`ln(t/ts) = ${l}: D = 4 m ${gD4}, D = 0 ${gD0}${gMid ? `, mid-depth (Zeng et al. 2002) ${gMid}` : ''}`, () => {
      const t = ts * Math.exp(l);
      expect(rel(finiteLineSourceG({ ...A, buriedDepth_m: 4, time_s: t }), gD4)).toBeLessThan(1e-3);
      expect(rel(finiteLineSourceG({ ...A, buriedDepth_m: 0, time_s: t }), gD0)).toBeLessThan(1e-3);
      if (gMid !== null) {
        expect(
          rel(finiteLineSourceG({ ...A, buriedDepth_m: 0, time_s: t, point: 'midDepth' }), gMid),
        ).toBeLessThan(1e-3);
      }
    });
  }
  it('steady state: D = 4 m 6.7170; D = 0 mean 6.6017, mid-depth 7.0516 (closed form ln(H/rb) − ½ ln 3)', () => {
    expect(rel(finiteLineSourceG({ ...A, buriedDepth_m: 4, time_s: Infinity }), 6.717)).toBeLessThan(1e-3);
    expect(rel(finiteLineSourceG({ ...A, buriedDepth_m: 0, time_s: Infinity }), 6.6017)).toBeLessThan(1e-3);
    expect(
      rel(finiteLineSourceG({ ...A, buriedDepth_m: 0, time_s: Infinity, point: 'midDepth' }), 7.0516),
    ).toBeLessThan(1e-3);
  });
  it('case B (short foundation pile H 10 m, D 1 m, rb 0.1 m), mean and mid-depth (computed with mpmath; 1e-4 rel)', () => {
    const tsB = 10 ** 2 / (9 * 1e-6);
    for (const [l, gMean, gMid] of fixtures.flsCaseB) {
      const geo = {
        radius_m: 0.1,
        length_m: 10,
        buriedDepth_m: 1,
        diffusivity_m2_s: 1e-6,
        time_s: tsB * Math.exp(l),
      };
      expect(rel(finiteLineSourceG(geo), gMean)).toBeLessThan(1e-4);
      expect(rel(finiteLineSourceG({ ...geo, point: 'midDepth' }), gMid)).toBeLessThan(1e-4);
    }
  });
});

describe('pile groups by spatial superposition (Cimmino & Bernier 2014; pair values computed with mpmath)', () => {
  const geo = { length_m: 12, buriedDepth_m: 1, diffusivity_m2_s: 8e-7 };
  it('pair response between piles 3 m and 6 m apart (1e-4 rel)', () => {
    for (const [d, t, g] of fixtures.flsPair) {
      expect(rel(finiteLineSourceG({ ...geo, radius_m: d, time_s: t }), g)).toBeLessThan(1e-4);
    }
  });
  it('two piles 3 m apart: field g = self + pair; 3 piles in a line: (3 self + 4 g(3 m) + 2 g(6 m))/3', () => {
    const self = fixtures.flsSelf12;
    const pair3 = fixtures.flsPair[1][2];
    const pair6 = fixtures.flsPair[2][2];
    const t = self[1][0];
    const two = pileFieldGFunction({
      ...geo,
      pileRadius_m: 0.081,
      positions: [
        { x_m: 0, y_m: 0 },
        { x_m: 3, y_m: 0 },
      ],
      times_s: [t],
    });
    expect(rel(two[0], self[1][1] + pair3)).toBeLessThan(1e-4);
    const three = pileFieldGFunction({
      ...geo,
      pileRadius_m: 0.081,
      positions: [0, 3, 6].map((x) => ({ x_m: x, y_m: 0 })),
      times_s: [t],
    });
    expect(rel(three[0], (3 * self[1][1] + 4 * pair3 + 2 * pair6) / 3)).toBeLessThan(1e-4);
  });
});

describe('solid cylinder source (Man et al. 2010; computed with mpmath from the ring-of-lines form; 1e-4 rel)', () => {
  for (const [r0, r, t, g] of fixtures.scsInfinite) {
    it(`infinite, r0 ${r0} m, r ${r} m, t ${t} s: ${g.toFixed(5)}`, () => {
      expect(
        rel(
          infiniteSolidCylinderSourceG({ pileRadius_m: r0, radius_m: r, diffusivity_m2_s: 1e-6, time_s: t }),
          g,
        ),
      ).toBeLessThan(1e-4);
    });
  }
  for (const [r0, H, D, t, g] of fixtures.scsFinite) {
    it(`finite, r0 ${r0} m, H ${H} m, D ${D} m, t ${t} s: ${g.toFixed(5)}`, () => {
      const v = finiteSolidCylinderSourceG({
        pileRadius_m: r0,
        length_m: H,
        buriedDepth_m: D,
        diffusivity_m2_s: 1e-6,
        time_s: t,
      });
      expect(rel(v, g)).toBeLessThan(1e-4);
    });
  }
});
