/**
 * Steps 5, 6 and 8 of the per-cell kernel (cell-kernel.ts, whose module comment documents the method):
 * the standard building's loads, the operating window with the pile count and the bivalent operation,
 * and the economics.
 */
import { designHeatingLoad_W } from '../site/site-load-line';
import { degreeDays } from '../physics/surface-forcing';
import type { CellInputs } from './screening-model';
import { copFromTable, type CellConstants } from './cell-constants';
import { flsResponse } from './response-tables';
import { operatingWindow } from './operating-window';
import {
  bivalentOperation,
  bivalentResolve,
  enteringFluidOfMonth_C,
  type BivalentInput,
  type BivalentResult,
} from './bivalent-operation';
import {
  MONTH_COS,
  MONTHS,
  monthlyPeakFromAvailable_W,
  monthlyPeakPerPile_W,
  monthsAvailable_K,
  pileWavePhasor,
  type MonthlyPeakInput,
} from './monthly-peak';
import { lookup, lookupAt, tablePosition } from './log-table';
import { enteringFromMeanFluid_C, meanFluidFromEntering_C } from '../physics/fluid-temperature-convention';
import { co2AvoidedKernel_t, costSavedKernel, fuelSavedKernel_L } from './economics';
import { isFrostSusceptible } from './suitability';
import { METRIC as M } from './cell-layers';
import { simplePayback_yr, systemKernel } from './system-cop';
import { TON_W, MONTH_S, PEAK_S, HOURS_PER_YEAR, type KernelScratch } from './cell-kernel-state';

const FIELD_MONTH = new Float64Array(1);
const FIELD_AVAILABLE = new Float64Array(MONTHS);

/**
 * Step 5. standard building: design peak, annual average and the 12 monthly loads (month centres of the
 * sinusoidal year, m = 0 the coldest), each month's peak the design margin below its mean.
 */
export function buildingStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
  const s = k.scenario;
  const st = x.state;
  const bld = s.building;
  const ua = bld.heatLossCoefficient_W_K;
  const hdd = degreeDays({
    meanAirTemp_C: cell.meanAirTemp_C - bld.balanceTemp_C,
    amplitude_C: cell.airAmplitude_C,
  }).freezingIndex_Cd;
  const demand_kWh = (ua * hdd * 24) / 1000;
  m[M.heatingDemand] = demand_kWh;
  const peak_W = designHeatingLoad_W({
    heatLossCoefficient_W_K: ua,
    balanceTemp_C: bld.balanceTemp_C,
    designMargin_K: bld.designMargin_K,
    meanAirTemp_C: cell.meanAirTemp_C,
    amplitude_C: cell.airAmplitude_C,
  });
  const avg_W = (demand_kWh * 1000) / HOURS_PER_YEAR;
  const hp = s.heatPump;
  // Ground loads as pile-sizing.ts: the peak at the COP of the lowest EFT, the annual and monthly loads
  // at the COP of the undisturbed ground (more heat from the ground: conservative).
  const groundFactor = 1 - 1 / copFromTable(k.cop, hp.minEnteringFluid_C);
  const seasonFactor = 1 - 1 / copFromTable(k.cop, st.tPile);
  const toPeak = seasonFactor / (peak_W * groundFactor);
  for (let i = 0; i < MONTHS; i++) {
    const tAir = cell.meanAirTemp_C - cell.airAmplitude_C * MONTH_COS[i];
    x.monthlyFraction[i] = ua * Math.max(0, bld.balanceTemp_C - tAir) * toPeak;
    x.peakFraction[i] = (ua * Math.max(0, bld.balanceTemp_C - tAir + bld.designMargin_K)) / peak_W;
  }
  st.demand_kWh = demand_kWh;
  st.peak_W = peak_W;
  st.avg_W = avg_W;
  st.groundFactor = groundFactor;
  st.seasonFactor = seasonFactor;
  st.toPeak = toPeak;
}

/**
 * Step 6. fluid bound, pile count, window: one pile of the foundation group, month by month against the
 * lagged pile-averaged wave (monthly-peak.ts).
 */
export function windowStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
  const s = k.scenario;
  const st = x.state;
  const kF = x.soil.kFrozen;
  const alphaF = st.alphaF;
  const hp = s.heatPump;
  const H = s.pile.length_m;
  // flsResponse at the life and a month plus the peak, through their grid positions (the larger
  // fields' tables share the grid: fieldPeakPerPile_W).
  const uLife = tablePosition(k.tables.fieldMean, alphaF * st.lifeS);
  const uMonth = tablePosition(k.tables.fieldMean, alphaF * (MONTH_S + PEAK_S));
  const gLife = st.lifeS > 0 ? lookupAt(k.tables.fieldMean, uLife) : 0;
  const gMonth = lookupAt(k.tables.fieldMean, uMonth);
  const rb = s.pile.radius_m;
  const gPeak = lookup(k.tables.cylinderWall, (alphaF * PEAK_S) / (rb * rb));
  const annualFraction = st.avg_W * st.toPeak;
  x.annualFraction = annualFraction;
  pileWavePhasor(
    { diffusivity_m2_s: alphaF, top_m: s.pile.topDepth_m, bottom_m: s.pile.topDepth_m + H },
    x.phasor,
  );
  const peakInput = {
    groundMean_C: st.tPile,
    surfaceAmplitude_C: st.nF * cell.airAmplitude_C,
    phasor: x.phasor,
    meanFluid_C: meanFluidFromEntering_C(hp.minEnteringFluid_C, 2 * hp.fluidHalfDelta_K, 'heating'),
    length_m: H,
    resistance_mK_W: s.pile.resistance_mK_W,
    conductivity_W_mK: kF,
    gLife,
    gMonth,
    gPeak,
    annualFraction,
    monthlyFraction: x.monthlyFraction,
    peakFraction: x.peakFraction,
  };
  const qPeak = monthlyPeakPerPile_W(peakInput, x.peakMonth);
  m[M.extractionPerPile] = annualFraction * qPeak;
  // Piles per ton: the piles the standard building needs, as a field of that many piles. Where that is
  // more than the foundation, the larger field cools its ground more (a 4 × 4 group's 30-year response
  // is 9.5, a 7 × 8 field's 13.8), so the count is found by fixed-point iteration on the field size
  // (near-square at the foundation spacing, as the site study's three-pulse sizing lays it out).
  const peakGround_W = st.peak_W * st.groundFactor;
  const qField = qPeak > 0 ? fieldPeakPerPile_W(k, peakInput, qPeak, peakGround_W, uLife, uMonth) : qPeak;
  m[M.pilesPerTon] = qField > 0 ? (TON_W * st.groundFactor) / qField : NaN;
  const gRefLife = flsResponse(k.tables.referencePoint, alphaF, st.lifeS);
  const request_W_m = (st.avg_W * st.seasonFactor) / (s.building.foundationPiles * H);
  const biv = bivalentStage(
    k,
    x,
    peakInput,
    request_W_m * H,
    alphaF,
    peakGround_W / s.building.foundationPiles,
  );
  // The whole heating load's ground extraction at the operating COPs (bivalentStage).
  const full_W_m = biv.requested_W / H;
  const w = operatingWindow(
    {
      referenceTemp_C: st.tRef,
      warmingAtLife_K: st.warmRefLife,
      frozenMargin_K: s.frozenMargin_K,
      overcooling_K: isFrostSusceptible(cell.textureClass) ? s.maxOvercooling_K : s.maxOvercoolingCoarse_K,
      conductivity_W_mK: kF,
      gReferenceLife: gRefLife,
      upperFluid_W_m: biv.fluidBound_W / H,
      full_W_m,
    },
    x.window,
  );
  m[M.windowLower] = w.lower_W_m;
  m[M.windowUpper] = w.upper_W_m;
  m[M.windowUpperFluid] = w.upperFluid_W_m;
  m[M.windowUpperOvercool] = w.upperOvercool_W_m;
  m[M.loadShare] = w.loadShare;
  m[M.extractionCarried] = w.carried_W_m;
  m[M.bindingLimit] = w.binding;
  st.gLife = gLife;
  st.gRefLife = gRefLife;
  st.qPeak = qPeak;
}

/**
 * Step 6b. bivalent operation (bivalent-operation.ts): the building's monthly ground loads per pile
 * (their mean the full annual request `full_W`, at the COP of the undisturbed ground), carried up to what
 * each month gives at the fluid limit. A second pass takes each month's ground share of the heat at the
 * COP of that month's entering fluid from the first (the heat pump's curve, as the simulator's building
 * mode does step by step): colder fluid, lower COP, less heat from the ground per unit of heating.
 */
function bivalentStage(
  k: CellConstants,
  x: KernelScratch,
  p: MonthlyPeakInput,
  full_W: number,
  alphaF: number,
  peakPerPile_W: number,
): BivalentResult {
  let sum = 0;
  for (let i = 0; i < MONTHS; i++) sum += x.monthlyFraction[i];
  for (let i = 0; i < MONTHS; i++)
    x.requested[i] = sum > 0 ? (x.monthlyFraction[i] * MONTHS * full_W) / sum : 0;
  const input: BivalentInput = {
    groundMean_C: p.groundMean_C,
    surfaceAmplitude_C: p.surfaceAmplitude_C,
    phasor: p.phasor,
    enteringLimit_C: k.scenario.heatPump.minEnteringFluid_C,
    // Fixed loop flow, sized for the loop difference at the design peak per pile (site-prefill.ts).
    loopDelta_K_W: (2 * k.scenario.heatPump.fluidHalfDelta_K) / peakPerPile_W,
    length_m: p.length_m,
    resistance_mK_W: p.resistance_mK_W,
    conductivity_W_mK: p.conductivity_W_mK,
    gLife: p.gLife,
    gMonth: flsResponse(k.tables.fieldMean, alphaF, MONTH_S),
    requested_W: x.requested,
  };
  const first = bivalentOperation(input, x.bivalent);
  const season = x.state.seasonFactor;
  for (let i = 0; i < MONTHS; i++) {
    const ground = 1 - 1 / copFromTable(k.cop, enteringFluidOfMonth_C(input, first, i));
    x.requested[i] *= season > 0 && ground > 0 ? ground / season : 0;
  }
  // Only the requests changed: the capacity coefficients of the first pass hold.
  return bivalentResolve(input, x.bivalent);
}

/** Step 8. economics: seasonal and system COP, fuel, CO2, cost, capital cost and payback. */
export function economicsStage(k: CellConstants, x: KernelScratch, m: Float64Array): void {
  const s = k.scenario;
  const st = x.state;
  const w = x.window;
  const hp = s.heatPump;
  const eft = enteringFromMeanFluid_C(
    st.tPile - w.carried_W_m * (s.pile.resistance_mK_W + st.gLife / (2 * Math.PI * x.soil.kFrozen)),
    2 * hp.fluidHalfDelta_K,
    'heating',
  );
  const scop = copFromTable(k.cop, eft);
  const heat_kWh = w.loadShare * st.demand_kWh;
  m[M.seasonalCop] = scop;
  // system COP (system-cop.ts): the heat pump sized to the piles' carried peak
  const copLimit = copFromTable(k.cop, hp.minEnteringFluid_C);
  const carriedShare = w.upperFluid_W_m > 0 ? Math.min(1, w.carried_W_m / w.upperFluid_W_m) : 0;
  const capacity_W = Math.min(
    st.peak_W,
    (s.building.foundationPiles * st.qPeak * carriedShare) / st.groundFactor,
  );
  const sys = x.system;
  systemKernel(s, k.system, Math.max(0, capacity_W), heat_kWh, scop, copLimit, sys);
  const cop = sys.systemCop;
  m[M.systemCop] = cop;
  m[M.pumpPower] = sys.pumpPower_W;
  m[M.fuelSaved] = fuelSavedKernel_L(k.econ, heat_kWh, cop);
  m[M.co2Avoided] = co2AvoidedKernel_t(k.econ, heat_kWh, cop);
  m[M.costSaved] = costSavedKernel(k.econ, heat_kWh, cop);
  m[M.fuelIncrease] = cop < k.breakEven.fuel ? 1 : 0;
  m[M.capitalCost] = sys.capitalCost;
  m[M.simplePayback] = simplePayback_yr(sys.capitalCost, m[M.costSaved]);
}

/**
 * Design-peak capacity per pile (W) of a field of as many piles as the peak ground load needs: from
 * the foundation pile's capacity `q0`, the count and the field response are iterated to a fixed point
 * (the field response grows about as ln N, so 2–4 passes reach 0.5 %). Returns q0 when the foundation
 * suffices.
 */
function fieldPeakPerPile_W(
  k: CellConstants,
  base: MonthlyPeakInput,
  q0: number,
  peakGround_W: number,
  uLife: number,
  uMonth: number,
): number {
  const t = k.tables;
  let q = q0;
  let n = peakGround_W / q0;
  const { counts, tables, logSteps } = t.fieldBySize;
  if (!(n > counts[0])) return q;
  // fieldResponseAtCount at the two times, by hand: the grid positions (uLife, uMonth: αt at the life
  // and at a month plus the peak on the field tables' grid) are shared by every field size and pass,
  // and the bracketing tables' values are looked up again only when the bracket changes.
  const field = { ...base };
  const available = monthsAvailable_K(base, FIELD_AVAILABLE);
  let bracket = -1;
  let lifeLo = 0;
  let lifeHi = 0;
  let monthLo = 0;
  let monthHi = 0;
  for (let pass = 0; pass < 30 && n > counts[0]; pass++) {
    let i = 0;
    while (i < counts.length - 2 && n > counts[i + 1]) i++;
    if (i !== bracket) {
      bracket = i;
      lifeLo = lookupAt(tables[i], uLife);
      lifeHi = lookupAt(tables[i + 1], uLife);
      monthLo = lookupAt(tables[i], uMonth);
      monthHi = lookupAt(tables[i + 1], uMonth);
    }
    const w = Math.log(n / counts[i]) / logSteps[i];
    field.gLife = lifeLo + w * (lifeHi - lifeLo);
    field.gMonth = monthLo + w * (monthHi - monthLo);
    q = monthlyPeakFromAvailable_W(field, available, FIELD_MONTH);
    if (!(q > 0)) return q;
    const next = peakGround_W / q;
    const done = Math.abs(next - n) <= 0.005 * n;
    n = next;
    if (done) break;
  }
  return q;
}
