/**
 * Piles needed for a site's peak heating load, by design pulse, from a finished run. Runs in the site
 * worker after the simulation (a group sizing takes about a second per call: never on the main thread).
 *
 * Inputs taken from the run: the undisturbed ground temperature at the pile's mid-depth (annual mean of
 * the first simulated year without the pile, site-profile.ts), the layer's frozen or thawed properties
 * there (the soil resolver, site-setup.ts groundPropertiesAt), the pile resistance Rb the simulator used,
 * the loop flow per kW (the site's flow per pile × the building's piles / peak kW). From the caller: the
 * foundation spacing and the design life (the map's: the scenario's spacing and design life, so that the
 * study's pile count answers the same question as the map's piles per ton, whatever the run length).
 * The annual energy and monthly shares follow the building load line (site-load-line.ts).
 * By design pulse (three-pulse method, layers/site/pile-sizing.ts): the count for the annual load alone
 * (every month at the annual mean, no peak above it), then with the design month added, then with the
 * 6-hour peak added (the full sizing). Each adds a pulse, so the counts do not fall; the pulse that adds
 * the most piles is the one that drives the design. The peak of the reduced designs is chosen so the
 * heat pump's ground load at peak equals the month's: Q_peak = q_month / (1 − 1/COP(EFT_min)).
 */
import type { SiteInput, SiteResult } from './site-input-schema';
import { sizePileField, type PileFieldSizingResult } from './pile-sizing';
import { DEFAULT_HEAT_PUMP_CURVE, heatPumpAt } from '../physics/heat-pump';
import { annualMeanAt, pileMonthlyGround_C, profileAtYear, type ProfileColumn } from './site-profile';
import { annualHeating, designDayLoad_W } from './site-load-line';
import { groundPropertiesAt } from './site-setup';

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
  /** Undisturbed ground along the pile, month by month (no-pile run, year 1), °C (pile-sizing.ts). */
  monthlyGround_C?: number[];
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
        monthlyTemperature_C: s.monthlyGround_C,
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
    return { ok: false, reason: sizingFailureInWords(e) };
  }
}

/**
 * A sizing failure in words for the screen and the printed sheet: the ground at or below the heat
 * pump's lowest entering temperature, or too many piles; other failures as a plain sentence without the
 * model's parameter names.
 */
export function sizingFailureInWords(e: unknown): string {
  const msg = e instanceof Error ? e.message : String(e);
  if (/minEnteringFluid_C must be below/.test(msg))
    return "the ground is as cold as the heat pump's lowest entering fluid temperature: the piles cannot supply heat";
  if (/maxPiles|more than \d+ piles/i.test(msg)) return 'more piles than the sizing considers (over 2000)';
  return 'the three-pulse sizing could not be completed for these inputs';
}

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
  foundation: { spacing_m: number; designLife_yr: number; designMargin_K: number },
  /** Only the full sizing (the reduced designs' counts null): for the calibration's many cells. */
  fullOnly = false,
): SiteSizing | null {
  const pile = input.pile;
  if (!pile || !result.fluid || input.operation.mode !== 'building') return null;
  const op = input.operation;
  const mid = pile.topDepth_m + pile.length_m / 2;
  const groundTemp_C = annualMeanAt(profileAtYear(result.noPile, column, 1), mid);
  if (!Number.isFinite(groundTemp_C)) return { ok: false, reason: 'no ground temperature at the pile depth' };
  const props = groundPropertiesAt(input, mid, !(groundTemp_C > 0));
  if (!props) return { ok: false, reason: 'the layer at the pile depth cannot be resolved' };
  // The input's load is the load line's top (coldest air of the wave); the peak pulse carries the
  // design day, the margin colder (site-load-line.ts).
  const peak_W = designDayLoad_W(
    op.designLoad_W,
    input.climate,
    op.balancePoint_C,
    foundation.designMargin_K,
  );
  const base: SizingInputs = {
    peakLoad_W: peak_W,
    designLoad_W: op.designLoad_W,
    balancePoint_C: op.balancePoint_C,
    conductivity_W_mK: props.conductivity_W_mK,
    heatCapacity_J_m3K: props.heatCapacity_J_m3K,
    groundTemp_C,
    monthlyGround_C:
      pileMonthlyGround_C(result.noPile, column, 1, pile.topDepth_m, pile.topDepth_m + pile.length_m) ??
      undefined,
    Rb_mK_W: result.fluid.Rb_mK_W,
    spacing_m: foundation.spacing_m,
    designLife_yr: foundation.designLife_yr,
    flowPerKilowatt_m3_s: Math.min(
      1e-3,
      Math.max(1e-6, ((result.fluid.flow_L_min / 60000) * op.pileCount) / (peak_W / 1000)),
    ),
  };
  const full = sizeSitePiles(input, base);
  if (!full.ok) return full;
  if (fullOnly) {
    return {
      ok: true,
      sizing: full.sizing,
      byPulse: { annual: null, monthly: null, peak: full.sizing.pileCount },
      groundTemp_C,
    };
  }
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
