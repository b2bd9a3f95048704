/**
 * System seasonal COP of the pile heat-pump system (unit COP told apart from system COP), capital
 * cost and simple payback against an oil furnace.
 *
 * Method.
 *  - Design flow V̇ = Q_g/(ρ·c_p·ΔT), Q_g = the heat pump's design heating capacity × (1 − 1/COP at
 *    the fluid limit) (the ground side at the peak), ΔT the loop's design temperature difference.
 *  - Pressure drop: the piles in parallel, each a U-loop of twice the pile tip depth plus one pile
 *    spacing of connection, carrying V̇/N; plus the supply and return header at V̇; each by
 *    Darcy–Weisbach with the Haaland friction factor (layers/physics/pipe-friction.ts), times
 *    (1 + fittings allowance). Fluid properties of the scenario's propylene glycol at the lowest mean
 *    fluid temperature (layers/physics/fluids.ts), where the viscosity and the drop are largest.
 *  - Pump power P = Δp·V̇/η_pump, running while the heat pump runs: hours = heat from the heat pump /
 *    capacity (at most a year).
 *  - System COP = Q / (Q·(1 − b)·(1 + d)/COP_unit + Q·b + E_pump + E_aux), b the electric backup share
 *    (COP 1), d the defrost share of the compressor energy, E_aux controls and standby all year.
 *  - Capital C = N·c_loop + capacity·c_hp + c_install; simple payback C / yearly cost saved (NaN where
 *    nothing is saved).
 * Validity: steady seasonal averages; a screening figure, not a hydraulic design.
 */
import { fluidProperties } from '../physics/fluids';
import { pipePressureDropKernel_Pa } from '../physics/pipe-friction';
import { meanFluidFromEntering_C } from '../physics/fluid-temperature-convention';
import type { Scenario } from './scenario';

const HOURS_PER_YEAR = 8760;

/** Per-scenario constants of the system model. */
export interface SystemConstants {
  density_kg_m3: number;
  specificHeat_J_kgK: number;
  viscosity_Pa_s: number;
}

/** Fluid properties at the lowest mean fluid temperature (kept above the fluid's freezing point). */
export function systemConstants(s: Scenario): SystemConstants {
  const hp = s.heatPump;
  const spec = { fluid: 'propyleneGlycol' as const, massFraction: s.system.glycolMassFraction };
  const freeze = fluidProperties({ ...spec, temperature_C: 20 }).freezingPoint_C;
  const tMean = meanFluidFromEntering_C(hp.minEnteringFluid_C, 2 * hp.fluidHalfDelta_K, 'heating');
  const p = fluidProperties({ ...spec, temperature_C: Math.max(tMean, freeze + 0.01) });
  return {
    density_kg_m3: p.density_kg_m3,
    specificHeat_J_kgK: p.specificHeat_J_kgK,
    viscosity_Pa_s: p.viscosity_Pa_s,
  };
}

export interface SystemResult {
  /** Design volume flow of the loop, m³/s. */
  flow_m3_s: number;
  /** Pressure drop of the loop at the design flow, Pa. */
  pressureDrop_Pa: number;
  pumpPower_W: number;
  /** Electricity of the whole system per year, kWh. */
  electricity_kWh: number;
  systemCop: number;
  capitalCost: number;
}

/**
 * System figures of one cell (kernel: no checks). `capacity_W` is the heat pump's design heating
 * capacity, `heat_kWh` the heat it delivers per year, `unitCop` its seasonal COP and `copAtLimit`
 * the COP at the fluid limit.
 */
export function systemKernel(
  s: Scenario,
  c: SystemConstants,
  capacity_W: number,
  heat_kWh: number,
  unitCop: number,
  copAtLimit: number,
  out: SystemResult,
): void {
  const sys = s.system;
  const n = s.building.foundationPiles;
  const dT = 2 * s.heatPump.fluidHalfDelta_K;
  const groundPeak_W = capacity_W * (1 - 1 / copAtLimit);
  const flow = dT > 0 ? groundPeak_W / (c.density_kg_m3 * c.specificHeat_J_kgK * dT) : 0;
  const loopLength = 2 * (s.pile.topDepth_m + s.pile.length_m) + s.building.pileSpacing_m;
  const drop =
    (1 + sys.fittingsAllowance) *
    (pipePressureDropKernel_Pa(
      flow / n,
      sys.loopPipeInnerDiameter_m,
      loopLength,
      sys.pipeRoughness_m,
      c.density_kg_m3,
      c.viscosity_Pa_s,
    ) +
      pipePressureDropKernel_Pa(
        flow,
        sys.headerInnerDiameter_m,
        sys.headerLength_m,
        sys.pipeRoughness_m,
        c.density_kg_m3,
        c.viscosity_Pa_s,
      ));
  const pump_W = (drop * flow) / sys.pumpEfficiency;
  const hours = capacity_W > 0 ? Math.min(HOURS_PER_YEAR, (heat_kWh * 1000) / capacity_W) : 0;
  const b = sys.backupElectricShare;
  const electricity =
    (heat_kWh * (1 - b) * (1 + sys.defrostShare)) / unitCop +
    heat_kWh * b +
    (pump_W * hours) / 1000 +
    (sys.auxiliaryPower_W * HOURS_PER_YEAR) / 1000;
  out.flow_m3_s = flow;
  out.pressureDrop_Pa = drop;
  out.pumpPower_W = pump_W;
  out.electricity_kWh = electricity;
  out.systemCop = electricity > 0 ? heat_kWh / electricity : NaN;
  const e = s.economics;
  out.capitalCost = n * e.loopCostPerPile + (capacity_W / 1000) * e.heatPumpCost_per_kW + e.installationCost;
}

/** Simple payback, yr: capital over the yearly cost saved; NaN when nothing is saved. */
export function simplePayback_yr(capitalCost: number, costSaved_per_yr: number): number {
  return costSaved_per_yr > 0 ? capitalCost / costSaved_per_yr : NaN;
}

export function createSystemResult(): SystemResult {
  return {
    flow_m3_s: 0,
    pressureDrop_Pa: 0,
    pumpPower_W: 0,
    electricity_kWh: 0,
    systemCop: 0,
    capitalCost: 0,
  };
}
