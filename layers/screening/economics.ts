/**
 * Fuel, CO2 and cost of heating a building with a ground-source heat pump on a diesel-generated grid
 * versus an oil-fired furnace (domain-notes.md "Fuel, CO2 and cost"; figures in reference-values.md §12).
 *
 * Method. Per kWh of delivered heat the furnace burns 1/(η_f·E_oil) litres of heating oil (η_f seasonal
 * furnace efficiency, E_oil heat content in kWh/L); the heat pump draws 1/COP kWh of electricity, for
 * which the generators burn 1/(COP·g·(1 − λ)) litres of diesel (g generator output kWh/L, λ line-loss
 * fraction). Equating the two gives the break-even coefficients of performance:
 *   fuel:  COP_fuel = η_f·E_oil / (g·(1 − λ))
 *   CO2:   COP_CO2  = COP_fuel · c_diesel / c_oil          (c = kg CO2 per litre)
 *   cost:  COP_cost = η_f·E_oil · p_el / p_oil             (p_el per kWh, p_oil per litre)
 * A heat pump running below COP_fuel *increases* the community's fuel burn: flagged. The three figures
 * are kept apart because their break-evens differ (the cost one depends on tariffs and subsidies).
 * Central case 0.80 × 10.7 / (3.6 × 0.93) = 2.557 (domain-notes, "about 2.6").
 * Validity: steady seasonal averages; generator part-load and plant peak capacity are not modelled.
 */
import type { Scenario } from './scenario';

export type EconomicsParams = Scenario['economics'];

/** Per-kWh coefficients of one economics setting; compute once per scenario (hot-path friendly). */
export interface EconomicsCoefficients {
  /** Heating oil burnt by the furnace per kWh of delivered heat, L/kWh. */
  oilPerHeat_L_kWh: number;
  /** Generator diesel per kWh of electricity delivered to the building, L/kWh. */
  dieselPerElectricity_L_kWh: number;
  heatingOilCO2_kg_L: number;
  dieselCO2_kg_L: number;
  heatingOilPrice_per_L: number;
  electricityPrice_per_kWh: number;
}

export interface BreakEvenCops {
  /** COP above which the heat pump burns less fuel than the furnace. */
  fuel: number;
  /** COP above which the heat pump emits less CO2. */
  co2: number;
  /** COP above which the owner pays less. */
  cost: number;
}

export interface DieselGridSavings {
  /** Heating oil no longer burnt, L/yr. */
  oilAvoided_L: number;
  /** Extra generator diesel for the heat pump, L/yr. */
  dieselAdded_L: number;
  /** Net community fuel saved, L/yr (negative: the heat pump increases fuel burn). */
  fuelSaved_L: number;
  /** Net CO2 avoided, tonnes/yr. */
  co2Avoided_t: number;
  /** Owner's net cost saved per year, in the scenario currency. */
  costSaved: number;
  /** Electricity drawn by the heat pump, kWh/yr. */
  electricity_kWh: number;
  /** True when the seasonal COP is below the fuel break-even: the heat pump increases fuel burn. */
  fuelIncrease: boolean;
}

function checkPositive(name: string, v: number): void {
  if (!(typeof v === 'number' && Number.isFinite(v) && v > 0)) {
    throw new RangeError(`${name} must be a finite number > 0; received ${v}`);
  }
}

/** Coefficients of one economics setting; throws RangeError naming a bad field. */
export function economicsCoefficients(e: EconomicsParams): EconomicsCoefficients {
  checkPositive('economics.furnaceEfficiency', e.furnaceEfficiency);
  checkPositive('economics.heatingOilEnergy_kWh_L', e.heatingOilEnergy_kWh_L);
  checkPositive('economics.generatorOutput_kWh_L', e.generatorOutput_kWh_L);
  if (!(e.lineLossFraction >= 0 && e.lineLossFraction < 1)) {
    throw new RangeError(`economics.lineLossFraction must be in [0, 1); received ${e.lineLossFraction}`);
  }
  checkPositive('economics.dieselCO2_kg_L', e.dieselCO2_kg_L);
  checkPositive('economics.heatingOilCO2_kg_L', e.heatingOilCO2_kg_L);
  checkPositive('economics.electricityPrice_per_kWh', e.electricityPrice_per_kWh);
  checkPositive('economics.heatingOilPrice_per_L', e.heatingOilPrice_per_L);
  return {
    oilPerHeat_L_kWh: 1 / (e.furnaceEfficiency * e.heatingOilEnergy_kWh_L),
    dieselPerElectricity_L_kWh: 1 / (e.generatorOutput_kWh_L * (1 - e.lineLossFraction)),
    heatingOilCO2_kg_L: e.heatingOilCO2_kg_L,
    dieselCO2_kg_L: e.dieselCO2_kg_L,
    heatingOilPrice_per_L: e.heatingOilPrice_per_L,
    electricityPrice_per_kWh: e.electricityPrice_per_kWh,
  };
}

/** Break-even COPs for fuel, CO2 and cost (equations in the module comment). */
export function breakEvenCops(e: EconomicsParams): BreakEvenCops {
  const c = economicsCoefficients(e);
  const fuel = c.dieselPerElectricity_L_kWh / c.oilPerHeat_L_kWh;
  return {
    fuel,
    co2: (fuel * c.dieselCO2_kg_L) / c.heatingOilCO2_kg_L,
    cost: c.electricityPrice_per_kWh / (c.heatingOilPrice_per_L * c.oilPerHeat_L_kWh),
  };
}

/** Net fuel saved, L/yr (kernel: no checks, NaN in → NaN out). */
export function fuelSavedKernel_L(c: EconomicsCoefficients, heat_kWh: number, cop: number): number {
  return heat_kWh * (c.oilPerHeat_L_kWh - c.dieselPerElectricity_L_kWh / cop);
}

/** Net CO2 avoided, t/yr (kernel: no checks). */
export function co2AvoidedKernel_t(c: EconomicsCoefficients, heat_kWh: number, cop: number): number {
  return (
    (heat_kWh *
      (c.oilPerHeat_L_kWh * c.heatingOilCO2_kg_L - (c.dieselPerElectricity_L_kWh / cop) * c.dieselCO2_kg_L)) /
    1000
  );
}

/** Owner's net cost saved per year (kernel: no checks). */
export function costSavedKernel(c: EconomicsCoefficients, heat_kWh: number, cop: number): number {
  return heat_kWh * (c.oilPerHeat_L_kWh * c.heatingOilPrice_per_L - c.electricityPrice_per_kWh / cop);
}

/**
 * Annual fuel, CO2 and cost of replacing furnace heat by heat-pump heat on a diesel grid.
 * `heatDelivered_kWh` ≥ 0 is the heat the heat pump delivers per year, `seasonalCop` > 0 its seasonal COP.
 */
export function dieselGridSavings(input: {
  heatDelivered_kWh: number;
  seasonalCop: number;
  economics: EconomicsParams;
}): DieselGridSavings {
  const q = input.heatDelivered_kWh;
  if (!(typeof q === 'number' && Number.isFinite(q) && q >= 0)) {
    throw new RangeError(`heatDelivered_kWh must be a finite number >= 0; received ${q}`);
  }
  checkPositive('seasonalCop', input.seasonalCop);
  const c = economicsCoefficients(input.economics);
  const cop = input.seasonalCop;
  const oilAvoided_L = q * c.oilPerHeat_L_kWh;
  const electricity_kWh = q / cop;
  const dieselAdded_L = electricity_kWh * c.dieselPerElectricity_L_kWh;
  return {
    oilAvoided_L,
    dieselAdded_L,
    fuelSaved_L: fuelSavedKernel_L(c, q, cop),
    co2Avoided_t: co2AvoidedKernel_t(c, q, cop),
    costSaved: costSavedKernel(c, q, cop),
    electricity_kWh,
    fuelIncrease: cop < c.dieselPerElectricity_L_kWh / c.oilPerHeat_L_kWh,
  };
}
