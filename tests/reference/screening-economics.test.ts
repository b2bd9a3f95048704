import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { breakEvenCops, dieselGridSavings, economicsCoefficients } from '../../layers/screening/economics';
import { DEFAULT_SCENARIO, parseScenario } from '../../layers/screening/scenario';

const BTU_J = 1055.05585; // 1 Btu_IT, exact definition (reference-values §12)
const GAL_L = 3.785411784; // 1 US gallon, exact definition (reference-values §12)

const central = DEFAULT_SCENARIO.economics;

describe('break-even COP (domain-notes "Fuel, CO2 and cost"; reference-values §12)', () => {
  it('central case 0.80 x 10.7 / (3.6 x 0.93) = 2.5568 ("about 2.6", domain-notes central case)', () => {
    const be = breakEvenCops({
      ...central,
      furnaceEfficiency: 0.8,
      heatingOilEnergy_kWh_L: 10.7,
      generatorOutput_kWh_L: 3.6,
      lineLossFraction: 0.07,
    });
    // 8.56 / 3.348 = 2.556750 (hand-computed from the domain-notes equation)
    expect(be.fuel).toBeCloseTo(2.55675, 4);
    expect(Math.round(be.fuel * 10) / 10).toBe(2.6);
  });

  it('unfavourable case "about 3.4": DOE 83 % AFUE, Alaska PCE floor 10.5 kWh/gal (reference-values §12)', () => {
    const generator_kWh_L = 10.5 / GAL_L; // 2.774 kWh/L, reference-values §12 [R]
    expect(generator_kWh_L).toBeCloseTo(2.774, 3);
    const be = breakEvenCops({
      ...central,
      furnaceEfficiency: 0.83,
      heatingOilEnergy_kWh_L: 10.7,
      generatorOutput_kWh_L: generator_kWh_L,
      lineLossFraction: 0.07,
    });
    // 0.83 * 10.7 / (2.77396 * 0.93) = 3.4425 (hand-computed)
    expect(be.fuel).toBeCloseTo(3.4425, 3);
  });

  it('favourable case "about 2.0": old furnace 65 % (reference-values §12), 13.5 kWh/gal plant, 5 % losses', () => {
    const be = breakEvenCops({
      ...central,
      furnaceEfficiency: 0.65,
      heatingOilEnergy_kWh_L: 10.7,
      generatorOutput_kWh_L: 13.5 / GAL_L, // 3.566 kWh/L [R]
      lineLossFraction: 0.05,
    });
    // 6.955 / (3.56634 * 0.95) = 2.0528 (hand-computed)
    expect(be.fuel).toBeCloseTo(2.0528, 3);
  });

  it('CO2 break-even equals the fuel one with equal kg/L and scales with the diesel/oil CO2 ratio', () => {
    const same = breakEvenCops(central);
    expect(same.co2).toBeCloseTo(same.fuel, 12);
    const epa = breakEvenCops({ ...central, dieselCO2_kg_L: 2.66, heatingOilCO2_kg_L: 2.68 });
    // EPA 22.2 lb/gal = 2.660 kg/L for diesel (reference-values §12 [R])
    expect(epa.co2 / epa.fuel).toBeCloseTo(2.66 / 2.68, 12);
  });

  it('cost break-even = eta * E_oil * p_el / p_oil: 0.8 x 10.7 x 0.60 / 1.80 = 2.8533 (hand-computed)', () => {
    const be = breakEvenCops({ ...central, electricityPrice_per_kWh: 0.6, heatingOilPrice_per_L: 1.8 });
    expect(be.cost).toBeCloseTo(2.85333, 4);
  });
});

describe('unit conversions behind the defaults (reference-values §12)', () => {
  it('heating oil 138 500 Btu/gal = 10.72 kWh/L; default 10.7 within 0.3 %', () => {
    const kWh_L = (138500 * BTU_J) / 3.6e6 / GAL_L;
    expect(kWh_L).toBeCloseTo(10.723, 3);
    expect(Math.abs(central.heatingOilEnergy_kWh_L / kWh_L - 1)).toBeLessThan(0.003);
  });
  it('delivered heat per litre at 83 % AFUE = 8.90 kWh/L (reference-values §12 [C])', () => {
    const c = economicsCoefficients({ ...central, furnaceEfficiency: 0.83, heatingOilEnergy_kWh_L: 10.7232 });
    expect(1 / c.oilPerHeat_L_kWh).toBeCloseTo(8.9, 2);
  });
  it('Alaska PCE floor 9.5 kWh/gal = 2.510 kWh/L (reference-values §12 [C])', () => {
    expect(9.5 / GAL_L).toBeCloseTo(2.51, 3);
  });
});

describe('annual savings', () => {
  it('20 000 kWh at COP 3, central case: 345.2 L, 0.925 t CO2 (hand-computed from the equations)', () => {
    const s = dieselGridSavings({ heatDelivered_kWh: 20000, seasonalCop: 3, economics: central });
    // oil 20000 / 8.56 = 2336.449 L; diesel 20000 / 3 / 3.348 = 1991.238 L
    expect(s.oilAvoided_L).toBeCloseTo(2336.449, 2);
    expect(s.dieselAdded_L).toBeCloseTo(1991.238, 2);
    expect(s.fuelSaved_L).toBeCloseTo(345.211, 2);
    expect(s.co2Avoided_t).toBeCloseTo((345.211 * 2.68) / 1000, 4);
    // cost: 2336.449 * 1.8 - 6666.667 * 0.6 = 205.608
    expect(s.costSaved).toBeCloseTo(205.608, 2);
    expect(s.fuelIncrease).toBe(false);
  });

  it('below the fuel break-even the heat pump increases fuel burn and is flagged (property)', () => {
    const be = breakEvenCops(central).fuel;
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 6, noNaN: true }),
        fc.double({ min: 1, max: 1e5, noNaN: true }),
        (cop, q) => {
          const s = dieselGridSavings({ heatDelivered_kWh: q, seasonalCop: cop, economics: central });
          expect(s.fuelIncrease).toBe(cop < be);
          if (cop < be) expect(s.fuelSaved_L).toBeLessThan(0);
          if (cop > be) expect(s.fuelSaved_L).toBeGreaterThan(0);
        },
      ),
      { seed: 42, numRuns: 300 },
    );
  });

  it('at each break-even COP its own figure is zero', () => {
    const e = { ...central, dieselCO2_kg_L: 2.66 };
    const be = breakEvenCops(e);
    const at = (cop: number) =>
      dieselGridSavings({ heatDelivered_kWh: 10000, seasonalCop: cop, economics: e });
    expect(Math.abs(at(be.fuel).fuelSaved_L)).toBeLessThan(1e-9);
    expect(Math.abs(at(be.co2).co2Avoided_t)).toBeLessThan(1e-12);
    expect(Math.abs(at(be.cost).costSaved)).toBeLessThan(1e-9);
  });

  it('bad inputs throw errors naming the field', () => {
    expect(() => dieselGridSavings({ heatDelivered_kWh: -1, seasonalCop: 3, economics: central })).toThrow(
      /heatDelivered_kWh/,
    );
    expect(() => dieselGridSavings({ heatDelivered_kWh: 1, seasonalCop: 0, economics: central })).toThrow(
      /seasonalCop/,
    );
    expect(() => breakEvenCops({ ...central, lineLossFraction: 1 })).toThrow(/lineLossFraction/);
    expect(() => parseScenario({ economics: { generatorOutput_kWh_L: -3 } })).toThrow(
      /economics\.generatorOutput_kWh_L/,
    );
  });
});
