/**
 * The site panel's summary of a run: energy by year, the simulated seasonal COP, fuel and CO2 on a
 * diesel grid, the piles needed for the entered peak load by the three-pulse method, and the operating
 * point against the quick estimate's operating window. Pure: numbers in, numbers out.
 *
 * Energy (per pile, from the run's monthly fluid record): Q_ground = Σ extracted_kWh over a simulated
 * year; in building mode Q_delivered = Σ delivered_kWh and the electricity E = Q_delivered − Q_ground
 * (heat-pump energy balance, heat-pump.ts), so the seasonal COP = Q_delivered / E. In the other modes the
 * heat pump is not simulated: COP comes from the heat-pump curve at the year's mean entering (outlet)
 * fluid temperature and Q_delivered = Q_ground · COP / (COP − 1).
 * Fuel and CO2: dieselGridSavings (layers/screening/economics.ts) for the building = per pile × piles.
 * Sizing: sizePileField (layers/site/pile-sizing.ts), three pulses (annual, design month, 6 h peak) with
 * pile-group interaction; the annual heating energy and the monthly shares follow the degree-day load
 * line the simulator uses in building mode: load ∝ max(0, T_balance − T_air(t)), T_air a sinusoid with
 * the site's mean and amplitude, scaled so the load equals the design load at the coldest air.
 */
import type { SiteInput, SiteResult } from '../../../layers/site/site-input-schema';
import { sizePileField, type PileFieldSizingResult } from '../../../layers/site/pile-sizing';
import { heatPumpAt, DEFAULT_HEAT_PUMP_CURVE } from '../../../layers/physics/heat-pump';
import { dieselGridSavings, type DieselGridSavings } from '../../../layers/screening/economics';
import type { Scenario } from '../../../layers/screening/scenario';
import {
  createSystemResult,
  simplePayback_yr,
  systemConstants,
  systemKernel,
} from '../../../layers/screening/system-cop';
import { soilThermalProperties } from '../../../layers/physics/soil-catalogue';

export interface SiteYearEnergy {
  year: number;
  /** Heat taken from the ground per pile, kWh. */
  ground_kWh: number;
  /** Heat the heat pump delivers per pile, kWh. */
  delivered_kWh: number;
  /** Heat left to a backup heater per pile (building mode), kWh. */
  unmet_kWh: number;
  seasonalCop: number;
  /** Mean heat rate from the ground per pile over the year, W. */
  meanExtraction_W: number;
}

const HOURS_PER_YEAR = 8760;

/** Mean of the finite values (NaN when none). */
function meanOf(xs: (number | null)[]): number {
  let s = 0;
  let n = 0;
  for (const x of xs) {
    if (x !== null && Number.isFinite(x)) {
      s += x;
      n++;
    }
  }
  return n ? s / n : NaN;
}

/** Energy per simulated year (see the module comment). Empty when the run had no pile. */
export function energyByYear(input: SiteInput, result: SiteResult): SiteYearEnergy[] {
  const f = result.fluid;
  if (!f) return [];
  const curve =
    input.operation.mode === 'building' && input.operation.heatPump
      ? input.operation.heatPump
      : DEFAULT_HEAT_PUMP_CURVE;
  const out: SiteYearEnergy[] = [];
  for (let y = 0; y < input.years; y++) {
    const m0 = y * 12;
    const sum = (xs: number[] | null) => (xs ? xs.slice(m0, m0 + 12).reduce((a, b) => a + b, 0) : NaN);
    const ground = sum(f.extracted_kWh);
    let delivered: number;
    let cop: number;
    if (f.delivered_kWh) {
      delivered = sum(f.delivered_kWh);
      const electric = delivered - ground;
      cop = electric > 0 ? delivered / electric : NaN;
    } else {
      const eft = meanOf(f.outlet_C.slice(m0, m0 + 12));
      cop = Number.isFinite(eft) ? heatPumpAt({ enteringFluid_C: eft, curve }).cop : NaN;
      delivered = ground > 0 && cop > 1 ? (ground * cop) / (cop - 1) : 0;
    }
    out.push({
      year: y + 1,
      ground_kWh: ground,
      delivered_kWh: delivered,
      unmet_kWh: f.unmet_kWh ? sum(f.unmet_kWh) : 0,
      seasonalCop: cop,
      meanExtraction_W: (ground * 1000) / HOURS_PER_YEAR,
    });
  }
  return out;
}

/** System figures of a site run (system-cop.ts): null without a design load. */
export interface SiteSystemFigures {
  systemCop: number;
  pumpPower_W: number;
  capitalCost: number;
  /** Simple payback against an oil furnace, yr (NaN: never). */
  payback_yr: number;
}

/**
 * Fuel, CO2 and cost for the whole building over one typical year (mean over the run), or null.
 * With the building's design load (`peakLoad_W`) the figures are at the system COP (circulation pump,
 * backup, auxiliaries: system-cop.ts, the heat pump sized to the design load) and `system` gives the
 * system COP, pump power, capital cost and payback; without it, at the unit's seasonal COP.
 */
export function siteSavings(
  years: SiteYearEnergy[],
  piles: number,
  scenario: Scenario,
  peakLoad_W: number | null = null,
):
  | (DieselGridSavings & { seasonalCop: number; delivered_kWh: number; system: SiteSystemFigures | null })
  | null {
  const ok = years.filter((y) => Number.isFinite(y.seasonalCop) && y.seasonalCop > 0 && y.delivered_kWh > 0);
  if (ok.length === 0) return null;
  const delivered = (ok.reduce((s, y) => s + y.delivered_kWh, 0) / ok.length) * piles;
  const electric = ok.reduce((s, y) => s + y.delivered_kWh / y.seasonalCop, 0) / ok.length;
  const cop = ok.reduce((s, y) => s + y.delivered_kWh, 0) / ok.length / electric;
  let system: SiteSystemFigures | null = null;
  let economicCop = cop;
  if (peakLoad_W !== null && peakLoad_W > 0 && piles >= 1) {
    const site: Scenario = { ...scenario, building: { ...scenario.building, foundationPiles: piles } };
    const r = createSystemResult();
    const copLimit = heatPumpAt({
      enteringFluid_C: scenario.heatPump.minEnteringFluid_C,
      curve: scenario.heatPump.curve,
    }).cop;
    systemKernel(site, systemConstants(site), peakLoad_W, delivered, cop, copLimit, r);
    if (Number.isFinite(r.systemCop) && r.systemCop > 0) economicCop = r.systemCop;
    system = {
      systemCop: r.systemCop,
      pumpPower_W: r.pumpPower_W,
      capitalCost: r.capitalCost,
      payback_yr: NaN,
    };
  }
  const savings = dieselGridSavings({
    heatDelivered_kWh: delivered,
    seasonalCop: economicCop,
    economics: scenario.economics,
  });
  if (system) system.payback_yr = simplePayback_yr(system.capitalCost, savings.costSaved);
  return { ...savings, seasonalCop: cop, delivered_kWh: delivered, system };
}

/**
 * Building heating energy over a year for a design load at the coldest air and the degree-day load
 * line (module comment), kWh, and its monthly shares (Jan first, summing to 1). Day-by-day sum.
 */
export function annualHeating(input: {
  designLoad_W: number;
  balancePoint_C: number;
  meanAirTemp_C: number;
  amplitude_C: number;
  coldestDay: number;
}): { annual_kWh: number; monthlyFractions: number[] } {
  const coldest = input.meanAirTemp_C - input.amplitude_C;
  const span = input.balancePoint_C - coldest;
  const ua = span > 0 ? input.designLoad_W / span : 0;
  const months = new Array<number>(12).fill(0);
  for (let d = 0; d < 365; d++) {
    const air =
      input.meanAirTemp_C - input.amplitude_C * Math.cos((2 * Math.PI * (d + 0.5 - input.coldestDay)) / 365);
    const kWh = (ua * Math.max(0, input.balancePoint_C - air) * 24) / 1000;
    months[Math.min(11, Math.floor(d / (365 / 12)))] += kWh;
  }
  const annual = months.reduce((a, b) => a + b, 0);
  return { annual_kWh: annual, monthlyFractions: annual > 0 ? months.map((m) => m / annual) : months };
}

export interface SizingInputs {
  /** Peak heating load the field must carry, W. */
  peakLoad_W: number;
  /** Design load at the coldest air that sets the annual energy, W (default peakLoad_W). */
  designLoad_W?: number;
  balancePoint_C: number;
  /** Ground properties at the pile's mid-depth (frozen values in permafrost). */
  conductivity_W_mK: number;
  heatCapacity_J_m3K: number;
  /** Undisturbed ground temperature at the pile's mid-depth (no-pile run, year 1 mean), °C. */
  groundTemp_C: number;
  Rb_mK_W: number;
  spacing_m: number;
  designLife_yr: number;
  /** Loop flow per kW of peak load, m³/s per kW (the site's flow per pile × piles / peak kW). */
  flowPerKilowatt_m3_s?: number;
}

/** Piles of the entered length needed for the peak load (three pulses), or the reason it failed. */
export function sizeSitePiles(
  input: SiteInput,
  s: SizingInputs,
  monthlyFractions?: number[],
): { ok: true; sizing: PileFieldSizingResult } | { ok: false; reason: string } {
  const pile = input.pile;
  if (!pile) return { ok: false, reason: 'no pile in this run' };
  const heat = annualHeating({
    designLoad_W: s.designLoad_W ?? s.peakLoad_W,
    balancePoint_C: s.balancePoint_C,
    meanAirTemp_C: input.climate.meanAirTemp_C,
    amplitude_C: input.climate.amplitude_C,
    coldestDay: input.climate.coldestDay,
  });
  if (!(heat.annual_kWh > 0)) return { ok: false, reason: 'no heating demand at this balance point' };
  const curve =
    input.operation.mode === 'building' && input.operation.heatPump ? input.operation.heatPump : undefined;
  try {
    const sizing = sizePileField({
      peakHeatingLoad_W: s.peakLoad_W,
      annualHeating_kWh: heat.annual_kWh,
      monthlyFractions: monthlyFractions ?? heat.monthlyFractions,
      pile: {
        length_m: pile.length_m,
        radius_m: pile.outerDiameter_m / 2,
        buriedDepth_m: pile.topDepth_m,
        Rb_mK_W: s.Rb_mK_W,
      },
      layout: { spacing_m: s.spacing_m },
      ground: {
        conductivity_W_mK: s.conductivity_W_mK,
        diffusivity_m2_s: s.conductivity_W_mK / s.heatCapacity_J_m3K,
        undisturbedTemperature_C: s.groundTemp_C,
      },
      heatPumpCurve: curve,
      fluid: {
        fluid: pile.fluid.name,
        massFraction: pile.fluid.name === 'water' ? 0 : pile.fluid.massFraction,
      },
      designLife_yr: s.designLife_yr,
      flowPerKilowatt_m3_s: s.flowPerKilowatt_m3_s,
    });
    return { ok: true, sizing };
  } catch (e) {
    return { ok: false, reason: (e as Error).message };
  }
}

/** Mean extraction per metre of active pile over the run, W/m (NaN without a pile). */
export function meanExtraction_W_m(years: SiteYearEnergy[], length_m: number): number {
  if (years.length === 0) return NaN;
  return years.reduce((s, y) => s + y.meanExtraction_W, 0) / years.length / length_m;
}

/**
 * Conductivity and heat capacity of the layer holding depth `z_m` (soil descriptions resolved by the
 * soil catalogue, Johansen / de Vries), frozen or thawed; null when the layer cannot be resolved.
 */
export function groundPropertiesAt(
  input: SiteInput,
  z_m: number,
  frozen: boolean,
): { conductivity_W_mK: number; heatCapacity_J_m3K: number; freezingPoint_C: number } | null {
  const layers = input.ground.layers;
  const layer = layers.find((l) => l.top_m <= z_m && z_m < l.bottom_m) ?? layers[layers.length - 1];
  try {
    if (layer.soil) {
      const p = soilThermalProperties({
        texture: layer.soil.texture,
        waterContent_m3m3: layer.soil.waterContent_m3m3,
        dryDensity_kg_m3: layer.soil.dryDensity_kg_m3,
        quartzFraction: layer.soil.quartzFraction,
        specificSurface_m2_g: layer.soil.specificSurface_m2_g,
      });
      const fp = p.freezingPoint_C;
      return frozen
        ? { conductivity_W_mK: p.kFrozen_W_mK, heatCapacity_J_m3K: p.cFrozen_J_m3K, freezingPoint_C: fp }
        : { conductivity_W_mK: p.kThawed_W_mK, heatCapacity_J_m3K: p.cThawed_J_m3K, freezingPoint_C: fp };
    }
    const k = frozen ? layer.kFrozen_W_mK : layer.kThawed_W_mK;
    const c = frozen ? layer.cFrozen_J_m3K : layer.cThawed_J_m3K;
    const fp = layer.freezingPoint_C ?? 0;
    return k !== undefined && c !== undefined
      ? { conductivity_W_mK: k, heatCapacity_J_m3K: c, freezingPoint_C: fp }
      : null;
  } catch {
    return null;
  }
}
