import { describe, it, expect } from 'vitest';
import {
  fluidProperties,
  freezingPoint_C,
  massFractionForFreezeProtection,
  requireFluidAbove,
} from '../../layers/physics/fluids';
import reference from './fixtures/fluid-properties-reference.json';

// The table rows are 10 % apart; these checks use the handbook's intermediate rows (25 %, 35 %), which
// are NOT in our table, so they test the interpolation against read values.
describe('propylene glycol against the handbook design table (read values, reference-values.md §9c)', () => {
  const cases = [
    // [mass fraction, freezing point °C, cp at 0 °C J/(kg·K), density at 0 °C kg/m³]
    [0.25, -9.6, 3860, 1031.0],
    [0.35, -16.4, 3720, 1040.7],
  ] as const;
  for (const [x, tf, cp, rho] of cases) {
    it(`${x * 100} % by mass: freezing point ${tf} °C within 0.3 K`, () => {
      expect(Math.abs(freezingPoint_C({ fluid: 'propyleneGlycol', massFraction: x }) - tf)).toBeLessThan(0.3);
    });
    it(`${x * 100} % by mass at 0 °C: cp ${cp} ±10 J/(kg·K), density ${rho} ±0.2 kg/m³`, () => {
      const p = fluidProperties({ fluid: 'propyleneGlycol', massFraction: x, temperature_C: 0 });
      expect(Math.abs(p.specificHeat_J_kgK - cp)).toBeLessThanOrEqual(10);
      expect(Math.abs(p.density_kg_m3 - rho)).toBeLessThanOrEqual(0.2);
    });
  }
  it('freezing points at the tabulated rows 20/30/40 % (read values): -7.1, -12.7, -21.1 °C', () => {
    expect(freezingPoint_C({ fluid: 'propyleneGlycol', massFraction: 0.2 })).toBeCloseTo(-7.1, 6);
    expect(freezingPoint_C({ fluid: 'propyleneGlycol', massFraction: 0.3 })).toBeCloseTo(-12.7, 6);
    expect(freezingPoint_C({ fluid: 'propyleneGlycol', massFraction: 0.4 })).toBeCloseTo(-21.1, 6);
  });
});

describe('water at 25 °C, between table columns (IAPWS-95 / IAPWS 2008 / IAPWS 2011, fixture computed by the iapws package)', () => {
  const p = fluidProperties({ fluid: 'water', massFraction: 0, temperature_C: 25 });
  const w = reference.water.points.find((q) => q.temperature_C === 25);
  it('the fixture has the 25 °C point', () => expect(w?.temperature_C).toBe(25));
  it('density 997.05 kg/m³ ±0.3', () =>
    expect(Math.abs(p.density_kg_m3 - (w?.density_kg_m3 ?? NaN))).toBeLessThan(0.3));
  it('viscosity 0.8900 mPa·s ±1 % (log interpolation)', () =>
    expect(Math.abs(p.viscosity_Pa_s / ((w?.viscosity_mPa_s ?? NaN) * 1e-3) - 1)).toBeLessThan(0.01));
  it('conductivity 0.6065 W/(m·K) ±0.003', () =>
    expect(Math.abs(p.conductivity_W_mK - (w?.conductivity_W_mK ?? NaN))).toBeLessThan(0.003));
  it('specific heat 4181.3 J/(kg·K) ±5', () =>
    expect(Math.abs(p.specificHeat_J_kgK - (w?.specificHeat_J_kgK ?? NaN))).toBeLessThan(5));
});

describe('ethanol at 20 °C (CRC Handbook density table, recalled from memory)', () => {
  it('20 % by mass: 968.6 kg/m³ ±0.5', () => {
    const p = fluidProperties({ fluid: 'ethanol', massFraction: 0.2, temperature_C: 20 });
    expect(Math.abs(p.density_kg_m3 - 968.6)).toBeLessThan(0.5);
  });
  it('25 % by mass interpolates between 20 % and 30 % (CRC 961.4 ±1.5, recalled from memory)', () => {
    const p = fluidProperties({ fluid: 'ethanol', massFraction: 0.25, temperature_C: 20 });
    expect(Math.abs(p.density_kg_m3 - 961.4)).toBeLessThan(1.5);
  });
});

describe('freeze protection', () => {
  it('refuses water below 0 °C and names the concentrations that would do', () => {
    expect(() =>
      requireFluidAbove({ fluid: 'water', massFraction: 0, lowestTemperature_C: -4, margin_K: 3 }),
    ).toThrow(/propyleneGlycol at \d+\.\d % by mass or more or ethanol at \d+\.\d % by mass/);
  });
  it('the advised concentration passes its own check', () => {
    const x = massFractionForFreezeProtection({
      fluid: 'propyleneGlycol',
      lowestTemperature_C: -9,
      margin_K: 3,
    });
    expect(x).not.toBeNull();
    expect(x as number).toBeGreaterThan(0.25);
    expect(x as number).toBeLessThan(0.3);
    expect(
      requireFluidAbove({
        fluid: 'propyleneGlycol',
        massFraction: x as number,
        lowestTemperature_C: -9,
        margin_K: 3,
      }),
    ).toBeLessThanOrEqual(-12);
  });
  it('says no tabulated mixture suffices for -40 °C', () => {
    expect(
      massFractionForFreezeProtection({ fluid: 'propyleneGlycol', lowestTemperature_C: -40, margin_K: 3 }),
    ).toBeNull();
    expect(() =>
      requireFluidAbove({
        fluid: 'propyleneGlycol',
        massFraction: 0.3,
        lowestTemperature_C: -40,
        margin_K: 3,
      }),
    ).toThrow(/no propyleneGlycol mixture up to 40 % by mass/);
  });
  it('refuses a temperature below the freezing point in fluidProperties', () => {
    expect(() => fluidProperties({ fluid: 'propyleneGlycol', massFraction: 0.2, temperature_C: -8 })).toThrow(
      /temperature_C must be in \[-7.1/,
    );
  });
});

describe('physical trends of the tables (monotonicity)', () => {
  for (const fluid of ['propyleneGlycol', 'ethanol'] as const) {
    it(`${fluid}: viscosity falls with temperature and rises with concentration`, () => {
      for (let x = 0.1; x <= 0.4; x += 0.05) {
        let prev = Infinity;
        for (let t = Math.ceil(freezingPoint_C({ fluid, massFraction: x })); t <= 40; t += 2) {
          const mu = fluidProperties({ fluid, massFraction: x, temperature_C: t }).viscosity_Pa_s;
          expect(mu).toBeLessThan(prev);
          prev = mu;
        }
      }
      const a = fluidProperties({ fluid, massFraction: 0.1, temperature_C: 10 }).viscosity_Pa_s;
      const b = fluidProperties({ fluid, massFraction: 0.3, temperature_C: 10 }).viscosity_Pa_s;
      expect(b).toBeGreaterThan(a);
    });
  }
});
