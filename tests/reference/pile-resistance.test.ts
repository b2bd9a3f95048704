import { describe, it, expect } from 'vitest';
import {
  cylinderWallResistance,
  hellstromLineSource,
  pileResistance,
} from '../../layers/physics/pile-resistance';
import { fluidProperties } from '../../layers/physics/fluids';

// Published input set: Table 1 of a 2015 Geothermal Energy paper (bore 152 mm, 1¼" DR11 pipe 42 mm OD,
// centre-to-centre 64 mm, k_grout 0.78); R_g values computed from Hellström (1991) line-source formula
// (reference-values.md §9b, RB-1/RB-2, tol 1e-4 relative as printed to 4 digits).
describe('Hellström (1991) line-source fill resistance (reference-values.md §9b)', () => {
  const base = {
    boreRadius_m: 0.076,
    pipeOuterRadius_m: 0.021,
    shankHalfSpacing_m: 0.032,
    fillConductivity_W_mK: 0.78,
  };
  for (const [k, rg] of [
    [2.0, 0.1473],
    [1.5, 0.1477],
    [3.0, 0.1468],
  ] as const) {
    it(`RB: k_ground ${k}: R_g = ${rg} m·K/W`, () => {
      const r = hellstromLineSource({ ...base, surroundingConductivity_W_mK: k }).Rg_mK_W;
      expect(Math.abs(r - rg)).toBeLessThan(0.6e-4);
    });
  }
  it('σ = −1 (isothermal casing) equals the two-line-source image solution ln[(rc⁴−xc⁴)/(2 xc rp rc²)]/(4πk)', () => {
    const rc = 0.15;
    const rp = 0.02;
    const xc = 0.07;
    const kf = 0.57;
    const r = hellstromLineSource({
      boreRadius_m: rc,
      pipeOuterRadius_m: rp,
      shankHalfSpacing_m: xc,
      fillConductivity_W_mK: kf,
      surroundingConductivity_W_mK: 1e12,
    }).Rg_mK_W;
    const exact = Math.log((rc ** 4 - xc ** 4) / (2 * xc * rp * rc * rc)) / (4 * Math.PI * kf);
    expect(Math.abs(r / exact - 1)).toBeLessThan(1e-9);
  });
});

describe('cylindrical wall resistances (reference-values.md §9b, computed values)', () => {
  it('DR11 pipe wall ln(21/17.18)/(2π·0.389) = 0.0821 m·K/W', () => {
    const r = cylinderWallResistance({
      innerRadius_m: 0.01718,
      outerRadius_m: 0.021,
      conductivity_W_mK: 0.389,
    });
    expect(Math.abs(r - 0.0821)).toBeLessThan(1e-4);
  });
  it('323.9 × 9.5 mm steel pile, k 45: 2.14e-4 m·K/W', () => {
    const r = cylinderWallResistance({ innerRadius_m: 0.1525, outerRadius_m: 0.162, conductivity_W_mK: 45 });
    expect(Math.abs(r - 2.14e-4)).toBeLessThan(0.01e-4);
  });
  it('grout annulus 0.162 → 0.300 m, k 1.5: 0.0654 m·K/W', () => {
    const r = cylinderWallResistance({ innerRadius_m: 0.162, outerRadius_m: 0.3, conductivity_W_mK: 1.5 });
    expect(Math.abs(r - 0.0654)).toBeLessThan(1e-4);
  });
});

describe('pileResistance assembles its parts', () => {
  const fluid = fluidProperties({ fluid: 'propyleneGlycol', massFraction: 0.3, temperature_C: -3 });
  const casing = { outerRadius_m: 0.162, innerRadius_m: 0.1525, conductivity_W_mK: 45 };
  const uTube = {
    loop: 'uTube' as const,
    casing,
    fluid,
    flowRate_m3_s: 0.4e-3,
    length_m: 12,
    pipeOuterRadius_m: 0.016,
    pipeInnerRadius_m: 0.0131,
    pipeConductivity_W_mK: 0.4,
    shankHalfSpacing_m: 0.09,
    fillConductivity_W_mK: 0.45,
  };
  it('U-tube: Rb = fill + (pipe wall + convection)/2 + steel; Ra > 0; Rb* >= Rb', () => {
    const r = pileResistance(uTube);
    const p = r.parts;
    expect(r.Rb_mK_W).toBeCloseTo(p.fill + (p.pipeWall + p.pipeConvection) / 2 + p.steelCasing, 12);
    expect(r.Ra_mK_W).toBeCloseTo(p.raFill + 2 * (p.pipeWall + p.pipeConvection), 12);
    expect(r.RbEffective_mK_W).toBeGreaterThanOrEqual(r.Rb_mK_W);
    expect(r.neglected.join(' ')).toMatch(/helical plates/);
  });
  it('coaxial: Rb = annulus convection + steel; Ra = centre convection + centre wall + annulus inner wall', () => {
    const r = pileResistance({
      loop: 'coaxial',
      casing,
      fluid,
      flowRate_m3_s: 1.0e-3,
      length_m: 12,
      centreOuterRadius_m: 0.05,
      centreInnerRadius_m: 0.0409,
      centreConductivity_W_mK: 0.1,
      downFlow: 'annulus',
    });
    const p = r.parts;
    expect(r.Rb_mK_W).toBeCloseTo(p.annulusConvection + p.steelCasing, 12);
    expect(r.Ra_mK_W).toBeCloseTo(p.centreConvection + p.centreWall + p.annulusInnerConvection, 12);
    expect(['laminar', 'transitional', 'turbulent']).toContain(r.flow.regime);
  });
  it('more flow never raises Rb (U-tube, laminar through turbulent)', () => {
    let prev = Infinity;
    for (const q of [0.1e-3, 0.3e-3, 0.6e-3, 1e-3, 2e-3, 4e-3]) {
      const rb = pileResistance({ ...uTube, flowRate_m3_s: q }).Rb_mK_W;
      expect(rb).toBeLessThanOrEqual(prev + 1e-12);
      prev = rb;
    }
  });
});
