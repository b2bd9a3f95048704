/**
 * Piles needed for a site's peak heating load, by design pulse, from a finished run. Runs in the site
 * worker after the simulation (a group sizing takes about a second per call: never on the main thread).
 *
 * Inputs taken from the run: the undisturbed ground temperature at the pile's mid-depth (annual mean of
 * the first simulated year without the pile, site-profile.ts), the layer's frozen or thawed properties
 * there (soil catalogue), the pile resistance Rb the simulator used, the loop flow per kW (the site's
 * flow per pile × the building's piles / peak kW), foundation spacing = 2 × the scenario's reference
 * radius (which is half the spacing), and the design life = the simulated years.
 * By design pulse (three-pulse method, layers/site/pile-sizing.ts): the count for the annual load alone
 * (every month at the annual mean, no peak above it), then with the design month added, then with the
 * 6-hour peak added (the full sizing). Each adds a pulse, so the counts do not fall; the pulse that adds
 * the most piles is the one that drives the design. The peak of the reduced designs is chosen so the
 * heat pump's ground load at peak equals the month's: Q_peak = q_month / (1 − 1/COP(EFT_min)).
 */
import type { SiteInput, SiteResult } from '../../../layers/site/site-input-schema';
import type { PileFieldSizingResult } from '../../../layers/site/pile-sizing';
import { DEFAULT_HEAT_PUMP_CURVE, heatPumpAt } from '../../../layers/physics/heat-pump';
import type { Scenario } from '../../../layers/screening/scenario';
import { annualMeanAt, profileAtYear, type ProfileColumn } from './site-profile';
import { annualHeating, groundPropertiesAt, sizeSitePiles, type SizingInputs } from './site-summary';

export interface PulseCounts {
  annual: number | null;
  monthly: number | null;
  peak: number;
}

export type SiteSizing =
  | { ok: true; sizing: PileFieldSizingResult; byPulse: PulseCounts; groundTemp_C: number }
  | { ok: false; reason: string };

const YEAR_S = 365.25 * 86400;

/** Size the site's pile field (module comment); null when the run has no pile or no peak load. */
export function sizeSiteByPulse(
  input: SiteInput,
  result: SiteResult,
  column: ProfileColumn,
  scenario: Scenario,
): SiteSizing | null {
  const pile = input.pile;
  if (!pile || !result.fluid || input.operation.mode !== 'building') return null;
  const op = input.operation;
  const mid = pile.topDepth_m + pile.length_m / 2;
  const groundTemp_C = annualMeanAt(profileAtYear(result.noPile, column, 1), mid);
  if (!Number.isFinite(groundTemp_C)) return { ok: false, reason: 'no ground temperature at the pile depth' };
  const props = groundPropertiesAt(input, mid, !(groundTemp_C > 0));
  if (!props) return { ok: false, reason: 'the layer at the pile depth cannot be resolved' };
  const base: SizingInputs = {
    peakLoad_W: op.designLoad_W,
    designLoad_W: op.designLoad_W,
    balancePoint_C: op.balancePoint_C,
    conductivity_W_mK: props.conductivity_W_mK,
    heatCapacity_J_m3K: props.heatCapacity_J_m3K,
    groundTemp_C,
    Rb_mK_W: result.fluid.Rb_mK_W,
    spacing_m: 2 * scenario.referenceRadius_m,
    designLife_yr: input.years,
    flowPerKilowatt_m3_s: Math.min(
      1e-3,
      Math.max(1e-6, ((result.fluid.flow_L_min / 60000) * op.pileCount) / (op.designLoad_W / 1000)),
    ),
  };
  const full = sizeSitePiles(input, base);
  if (!full.ok) return full;
  const curve = op.heatPump ?? DEFAULT_HEAT_PUMP_CURVE;
  const copPeak = heatPumpAt({ enteringFluid_C: curve.minEnteringFluid_C, curve }).cop;
  const copSeason = heatPumpAt({ enteringFluid_C: groundTemp_C, curve }).cop;
  const heat = annualHeating({
    designLoad_W: op.designLoad_W,
    balancePoint_C: op.balancePoint_C,
    meanAirTemp_C: input.climate.meanAirTemp_C,
    amplitude_C: input.climate.amplitude_C,
    coldestDay: input.climate.coldestDay,
  });
  const qAnnual = ((heat.annual_kWh * 3.6e6) / YEAR_S) * (1 - 1 / copSeason);
  const qMonth =
    ((heat.annual_kWh * 3.6e6 * Math.max(...heat.monthlyFractions)) / (YEAR_S / 12)) * (1 - 1 / copSeason);
  const count = (peak_W: number, monthly?: number[]): number | null => {
    const r = sizeSitePiles(input, { ...base, peakLoad_W: peak_W }, monthly);
    return r.ok ? r.sizing.pileCount : null;
  };
  const annual = count(qAnnual / (1 - 1 / copPeak), new Array<number>(12).fill(1 / 12));
  const monthly = count(qMonth / (1 - 1 / copPeak));
  return {
    ok: true,
    sizing: full.sizing,
    byPulse: { annual, monthly, peak: full.sizing.pileCount },
    groundTemp_C,
  };
}
