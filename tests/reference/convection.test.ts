import { describe, it, expect } from 'vitest';
import fixtures from './fixtures/exchanger-mpmath.json';
import {
  annulusConvection,
  dittusBoelterNusselt,
  gnielinskiNusselt,
  tubeConvection,
} from '../../layers/physics/convection';

const water20 = {
  density_kg_m3: 998.2,
  specificHeat_J_kgK: 4182,
  conductivity_W_mK: 0.598,
  viscosity_Pa_s: 1.002e-3,
};

describe('Gnielinski (1976) with Petukhov f (computed from the published equation with mpmath; tol 1e-10 rel)', () => {
  for (const [re, pr, nu] of fixtures.gnielinski) {
    it(`Re ${re}, Pr ${pr}: Nu ${nu.toFixed(4)}`, () => {
      expect(Math.abs(gnielinskiNusselt({ reynolds: re, prandtl: pr }) / nu - 1)).toBeLessThan(1e-10);
    });
  }
});

describe('Dittus–Boelter cross-check (Incropera & DeWitt eq. 8.60; stated error of DB up to 25 %)', () => {
  it('Re 3e4, Pr 7, heating: within 15 % of Gnielinski', () => {
    const db = dittusBoelterNusselt({ reynolds: 3e4, prandtl: 7, heating: true });
    const gn = gnielinskiNusselt({ reynolds: 3e4, prandtl: 7 });
    expect(Math.abs(db / gn - 1)).toBeLessThan(0.15);
  });
});

describe('laminar fully developed tube flow (Incropera & DeWitt eqs. 8.53 and 8.55, recalled from memory)', () => {
  const slow = { fluid: water20, flowRate_m3_s: 1e-5, innerRadius_m: 0.0131 };
  it('uniform heat flux: Nu = 4.36, regime laminar', () => {
    const r = tubeConvection(slow);
    expect(r.regime).toBe('laminar');
    expect(r.nusselt).toBe(4.36);
    expect(r.h_W_m2K).toBeCloseTo((4.36 * 0.598) / 0.0262, 10);
  });
  it('uniform wall temperature: Nu = 3.66', () => {
    expect(tubeConvection({ ...slow, wall: 'uniformWallTemperature' }).nusselt).toBe(3.66);
  });
});

describe('regimes and the Gnielinski (2013) transition blend', () => {
  const nuAt = (re: number): number => {
    // flow for a given Re in a 26.2 mm tube of 20 °C water
    const d = 0.0262;
    const q = (re * water20.viscosity_Pa_s * Math.PI * d) / (4 * water20.density_kg_m3);
    return tubeConvection({ fluid: water20, flowRate_m3_s: q, innerRadius_m: d / 2 }).nusselt;
  };
  it('Nu is continuous at Re = 2300 and 1e4 and increasing through the transition', () => {
    expect(Math.abs(nuAt(2300.0001) - nuAt(2299.9999))).toBeLessThan(1e-3);
    expect(Math.abs(nuAt(10000.001) - nuAt(9999.999)) / nuAt(1e4)).toBeLessThan(1e-5);
    let prev = 0;
    for (let re = 2400; re < 1e4; re += 400) {
      const nu = nuAt(re);
      expect(nu).toBeGreaterThan(prev);
      prev = nu;
    }
  });
  it('reports the regime', () => {
    const d = 0.0262;
    const q = (re: number) => (re * water20.viscosity_Pa_s * Math.PI * d) / (4 * water20.density_kg_m3);
    expect(tubeConvection({ fluid: water20, flowRate_m3_s: q(5000), innerRadius_m: d / 2 }).regime).toBe(
      'transitional',
    );
    expect(tubeConvection({ fluid: water20, flowRate_m3_s: q(2e4), innerRadius_m: d / 2 }).regime).toBe(
      'turbulent',
    );
  });
});

describe('annulus (Kays & Perkins laminar values in Incropera & DeWitt Table 8.2, recalled from memory)', () => {
  it('laminar, D_i/D_o = 0.5: outer wall Nu 4.43, inner wall Nu 5.74', () => {
    const base = { fluid: water20, flowRate_m3_s: 1e-5, innerRadius_m: 0.05, outerRadius_m: 0.1 };
    expect(annulusConvection({ ...base, wall: 'outer' }).nusselt).toBeCloseTo(4.43, 10);
    expect(annulusConvection({ ...base, wall: 'inner' }).nusselt).toBeCloseTo(5.74, 10);
  });
  it('turbulent: outer-wall Nu = (0.9 − 0.15 a^0.6) × tube Gnielinski on D_h (Gnielinski 2009, recalled)', () => {
    const ri = 0.05;
    const ro = 0.1;
    const dh = 2 * (ro - ri);
    const re = 2e4;
    const q = (re * water20.viscosity_Pa_s * Math.PI * (ro * ro - ri * ri)) / (water20.density_kg_m3 * dh);
    const r = annulusConvection({
      fluid: water20,
      flowRate_m3_s: q,
      innerRadius_m: ri,
      outerRadius_m: ro,
      wall: 'outer',
    });
    expect(r.reynolds).toBeCloseTo(re, 6);
    expect(r.nusselt / gnielinskiNusselt({ reynolds: re, prandtl: r.prandtl })).toBeCloseTo(
      0.9 - 0.15 * 0.5 ** 0.6,
      10,
    );
  });
});
