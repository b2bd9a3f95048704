/**
 * Energy of a site run by simulated year, per pile, from the run's monthly fluid record.
 *
 * Q_ground = Σ extracted_kWh over a simulated year; in building mode Q_delivered = Σ delivered_kWh and the
 * electricity E = Q_delivered − Q_ground (heat-pump energy balance, heat-pump.ts), so the seasonal
 * COP = Q_delivered / E. In the other modes the heat pump is not simulated: COP comes from the heat-pump
 * curve at the year's mean entering (outlet) fluid temperature and Q_delivered = Q_ground · COP / (COP − 1).
 */
import type { SiteInput, SiteResult } from './site-input-schema';
import { heatPumpAt, DEFAULT_HEAT_PUMP_CURVE } from '../physics/heat-pump';

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

/** Mean extraction per metre of active pile over the run, W/m (NaN without a pile). */
export function meanExtraction_W_m(years: SiteYearEnergy[], length_m: number): number {
  if (years.length === 0) return NaN;
  return years.reduce((s, y) => s + y.meanExtraction_W, 0) / years.length / length_m;
}
