/**
 * The site study's report: every figure and note the dashboard's study shows after a run, and that
 * `pile-atlas site --report` prints, from one function. Inputs: the run (site input with the profile
 * probes, result, profile column, sizing by design pulse) and the scenario of the map. Pure.
 *
 * - Energy, COP, fuel and CO2 from the run's monthly fluid record (site-energy.ts) and the diesel-grid
 *   balance (economics.ts), for the building's piles over a typical simulated year.
 * - The quick estimate (the map's per-cell model, screenCell) for the same inputs (cellInputsFromSite),
 *   and for each quantity both estimate: the two values, the published calibration band where there is
 *   one (calibration-bands.ts), whether they agree, and why they differ in words (study-comparison.ts).
 * - The operating window (study-window.ts): the map's bounds, where this run's mean extraction falls on
 *   them and what the run's fluid did, read by the chart and the notes alike.
 * - The site notes (site-notes.ts) plus the window note.
 */
import type { SiteInput, SiteResult } from '../site/site-input-schema';
import type { ProfileColumn } from '../site/site-profile';
import { annualMeanAt, profileAtYear } from '../site/site-profile';
import type { SiteSizing } from '../site/site-sizing';
import { energyByYear, meanExtraction_W_m, type SiteYearEnergy } from '../site/site-energy';
import { siteNotes, type SiteNote } from '../site/site-notes';
import { DEFAULT_HEAT_PUMP_CURVE, heatPumpAt } from '../physics/heat-pump';
import { createSystemResult, simplePayback_yr, systemConstants, systemKernel } from './system-cop';
import { designDayLoad_W } from '../site/site-load-line';
import { freezingPoint_C as fluidFreezingPoint_C } from '../physics/fluids';
import { SCREENING_CAUTION, GROUND_CAUTIONS } from '../cautions';
import { dieselGridSavings, type DieselGridSavings } from './economics';
import type { Scenario } from './scenario';
import { screenCell, type CellScreening } from './cell-screening-model';
import { cellInputsFromSite } from './site-prefill';
import { compareStudy, type StudyComparisonRow } from './study-comparison';
import { studyWindow, type StudyWindow } from './study-window';

export interface SiteStudyRun {
  input: SiteInput;
  result: SiteResult;
  column: ProfileColumn;
  sizing: SiteSizing | null;
}

/** System figures of a site run (system-cop.ts): null without a design load. */
export interface SiteSystemFigures {
  systemCop: number;
  pumpPower_W: number;
  capitalCost: number;
  /** Simple payback against an oil furnace, yr (NaN: never). */
  payback_yr: number;
}

export type SiteSavings = DieselGridSavings & {
  seasonalCop: number;
  delivered_kWh: number;
  system: SiteSystemFigures | null;
};

export interface SiteStudyReport {
  cautions: string[];
  simulatedYears: number;
  /** Energy per pile by simulated year. */
  years: SiteYearEnergy[];
  /** No-pile annual-mean ground temperature at the pile's mid-depth in year 1, °C. */
  groundTemp_C: number;
  /** Design-day peak load of the building (the load line's top plus the scenario's margin), W. */
  peakLoad_W: number | null;
  piles: number;
  sizing: SiteSizing | null;
  savings: SiteSavings | null;
  /** Mean heat from the ground per pile over the run, W, and per metre of pile, W/m. */
  extraction_W: number | null;
  extraction_W_m: number | null;
  minEnteringFluid_C: number | null;
  fluidFreezing_C: number | null;
  lowestFluid_C: number | null;
  /** Share of the building's heating the piles carried over the run (building mode). */
  loadShare: number | null;
  quick: CellScreening | null;
  /** The map model's one-pile form (onePileScenario), the calibrated counterpart of the simulated pile. */
  quickOnePile: CellScreening | null;
  comparison: StudyComparisonRow[];
  window: StudyWindow | null;
  notes: SiteNote[];
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
): SiteSavings | null {
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

/** The quick estimate (map model) for a site input, or null for explicit layer properties. */
export function quickEstimate(input: SiteInput, scenario: Scenario): CellScreening | null {
  try {
    const ci = cellInputsFromSite(input, scenario);
    return ci ? screenCell(ci, scenario) : null;
  } catch {
    return null;
  }
}

/**
 * The scenario of the map model's one-pile form: one pile carrying one pile's share of the standard
 * building (heat-loss coefficient / foundation piles). This is the form the published calibration
 * compares with the simulator's one pile (README, "Calibration against the site simulator"); the study
 * simulates exactly that pile (each of the building's piles at designLoad / pileCount).
 */
export function onePileScenario(s: Scenario): Scenario {
  const n = s.building.foundationPiles;
  return {
    ...s,
    building: {
      ...s.building,
      foundationPiles: 1,
      heatLossCoefficient_W_K: s.building.heatLossCoefficient_W_K / n,
    },
  };
}

/** The report of one run (module comment). */
export function siteStudyReport(run: SiteStudyRun, scenario: Scenario): SiteStudyReport {
  const { input, result, column } = run;
  const years = energyByYear(input, result);
  const pile = input.pile;
  const mid = pile ? pile.topDepth_m + pile.length_m / 2 : scenario.referenceDepth_m;
  const groundTemp_C = annualMeanAt(profileAtYear(result.noPile, column, 1), mid);
  const building = input.operation.mode === 'building' ? input.operation : null;
  const piles = building ? building.pileCount : scenario.building.foundationPiles;
  const peakLoad_W = building
    ? designDayLoad_W(
        building.designLoad_W,
        input.climate,
        building.balancePoint_C,
        scenario.building.designMargin_K,
      )
    : null;
  const savings = siteSavings(years, piles, scenario, peakLoad_W);
  const curve = building?.heatPump ?? DEFAULT_HEAT_PUMP_CURVE;
  let fluidFreezing_C: number | null = null;
  if (pile) {
    try {
      fluidFreezing_C = fluidFreezingPoint_C({
        fluid: pile.fluid.name,
        massFraction: pile.fluid.name === 'water' ? 0 : pile.fluid.massFraction,
      });
    } catch {
      fluidFreezing_C = null;
    }
  }
  const finite = (v: number) => (Number.isFinite(v) ? v : null);
  // Heat per pile and load share over the design life (the map's question), or the run if shorter.
  const life = years.slice(0, Math.max(1, Math.round(scenario.designLife_yr)));
  const extraction_W = life.length
    ? finite(life.reduce((s, y) => s + y.meanExtraction_W, 0) / life.length)
    : null;
  const extraction_W_m = pile ? finite(meanExtraction_W_m(life, pile.length_m)) : null;
  const delivered = life.reduce((s, y) => s + y.delivered_kWh, 0);
  const unmet = life.reduce((s, y) => s + y.unmet_kWh, 0);
  const loadShare = building && delivered + unmet > 0 ? delivered / (delivered + unmet) : null;
  const minEnteringFluid_C = pile ? curve.minEnteringFluid_C : null;
  const lowestFluid_C = result.fluid?.lowest_C ?? null;
  const quick = quickEstimate(input, scenario);
  const quickOnePile = quickEstimate(input, onePileScenario(scenario));
  const window = quick
    ? studyWindow({ quick, extraction_W_m, lowestFluid_C, minEnteringFluid_C, scenario, loadShare })
    : null;
  const notes = siteNotes(input, result, years, minEnteringFluid_C, column.firstProbe);
  if (window) notes.push({ kind: 'fluid', text: window.note, parts: window.noteParts });
  const base = {
    cautions: [SCREENING_CAUTION, ...GROUND_CAUTIONS],
    simulatedYears: input.years,
    years,
    groundTemp_C,
    peakLoad_W,
    piles,
    sizing: run.sizing,
    savings,
    extraction_W,
    extraction_W_m,
    minEnteringFluid_C,
    fluidFreezing_C,
    lowestFluid_C,
    loadShare,
    quick,
    quickOnePile,
    window,
    notes,
  };
  return { ...base, comparison: compareStudy({ run, report: base, scenario }) };
}
