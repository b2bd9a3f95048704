/**
 * Calibration of the per-cell screening model against the transient site simulator (layers/site),
 * absolute values, not differences.
 *
 * The group as the simulator allows: the simulator is axisymmetric, one pile in a cylinder of ground, so
 * it cannot hold the standard 4 × 4 foundation. The group enters the per-cell model only through linear
 * superposition of finite-line-source responses (foundation-group.ts, response-tables.ts), exact for
 * conduction and checked against the analytical field response in its own tests. The calibration
 * therefore compares the model's *one-pile* form with the simulator's pile, each pile carrying what one
 * pile of the standard building carries: the model run with `building.foundationPiles` = 1 and the
 * building's heat-loss coefficient divided by the standard pile count (16), the simulator's pile in
 * building mode with the standard building's load shared by 16 piles (the same load per pile), as the
 * site study runs it. Everything that is not
 * superposition (ground temperature, active layer, n-factors, monthly lag, pile resistance, phase change,
 * warming, thaw at the reference point) is compared like for like. A bracket
 * (`groupBracket`) runs the simulator's pile inside an adiabatic cylinder of the group's plan area per
 * pile (radius s/√π, the interior pile of an endless field, the most interference the group could have)
 * and checks that the model's 4 × 4 figure lies between the isolated and the endless-field pile.
 *
 * Quantities, per cell (model | simulator):
 *  - undisturbed ground along the pile, °C: model groundTemp | no-pile probes along the pile, year 1;
 *  - active layer, m: model activeLayer | no-pile annual thaw depth, mean of years 2–3;
 *  - end-of-life ground at the pile's mid-depth, °C (no piles): model groundTempEnd | no-pile probe,
 *    mean over the design life's last year;
 *  - lowest monthly mean fluid over the design life, °C: the model's monthly response at its bivalent
 *    monthly loads (bivalent-operation.ts; monthly-peak.ts without the 6-hour pulse the simulator's
 *    steps cannot resolve) | the simulator's monthly mean of inlet and outlet;
 *  - heat per pile carried, annual mean over the design life, W: model extractionCarried × length (the
 *    piles carry each month's request up to what the fluid limit allows, backup heat the rest) | the
 *    simulator's pile in building mode (one pile's share of the standard building's load line, the heat
 *    pump cutting a step's draw to hold its entering fluid at the limit: site-operation.ts), the mean
 *    ground extraction of the first design-life years;
 *  - load share over the design life: model loadShare | delivered / (delivered + backup) of those years;
 *  - piles per ton for the standard building (its N-pile field, the design-day peak): model pilesPerTon
 *    of the standard scenario | the study's three-pulse sizing from the simulated ground of the same run
 *    (run-site-study.ts, the full sizing only), its count × one ton / the design-day peak;
 *  - thaw at the reference point without and with the pile, and the delay, yr, up to the scenario's
 *    climate horizon (the simulator runs from the start year to the horizon; a thaw after it is "after").
 */
import { simulateSite } from '../layers/site/simulate-site';
import { siteInputSchema, type SiteInput, type SiteResult } from '../layers/site/site-input-schema';
import { energyByYear } from '../layers/site/site-energy';
import { sizeSiteByPulse } from '../layers/site/site-sizing';
import { designDayLoad_W } from '../layers/site/site-load-line';
import type { ProfileColumn } from '../layers/site/site-profile';
import { studyFoundation, studyRunInput } from '../layers/screening/run-site-study';
import { standardLoadAtColdestAir_W, standardPileDraft } from '../layers/screening/site-prefill';
import { TON_W } from '../layers/screening/cell-kernel';
import { createRandom } from '../data-pipeline/demo/seeded-random';
import type { SiteInputDraft } from '../layers/site/site-input-schema';
import { SECONDS_PER_YEAR } from '../layers/physics/surface-forcing';
import type { CellInputs } from '../layers/screening/screening-model';
import { TEXTURE_CODES, type TextureCode } from '../layers/screening/screening-model';
import { buildCellConstants, soilAt } from '../layers/screening/cell-constants';
import { createKernelScratch, evaluateCellMetrics } from '../layers/screening/cell-kernel';
import { METRIC, METRIC_COUNT } from '../layers/screening/cell-layers';
import { flsResponse } from '../layers/screening/response-tables';
import { MONTHS } from '../layers/screening/monthly-peak';
import { monthMeanFluid_C } from '../layers/screening/bivalent-operation';
import { SiteFluidLimitError } from '../layers/site/site-bounds';
import { THAW_HORIZON } from '../layers/screening/climate-horizon';
import { BINDING } from '../layers/screening/operating-window';
import { DEFAULT_SCENARIO, parseScenario, type Scenario } from '../layers/screening/scenario';
/** Demo-region input ranges (data-pipeline/demo/demo-region.ts) the sample spans. */
export const DEMO_RANGES = {
  meanAirTemp_C: [-12.5, -3.2],
  airAmplitude_C: [12.5, 21.8],
  warming_C_per_yr: [0.03, 0.08],
  /** Mineral and organic textures (bedrock cells are excluded from the pile metrics). */
  textures: [1, 2, 3, 4, 5],
  /** Water + ice content by texture, central demo values ± 15 %. */
  water: { 1: 0.15, 2: 0.24, 3: 0.45, 4: 0.45, 5: 0.8 } as Record<number, number>,
} as const;

/** A Latin-hypercube-like seeded sample of `n` cells over the demo ranges. */
export function sampleCalibrationCells(n: number, seed: number): CellInputs[] {
  const r = createRandom(seed);
  const strata = (k: number) => {
    const idx = Array.from({ length: n }, (_, i) => (i + r()) / n);
    for (let i = n - 1; i > 0; i--) {
      const j = Math.floor(r() * (i + 1));
      [idx[i], idx[j]] = [idx[j], idx[i]];
    }
    return idx.map((u) => u + 0 * k);
  };
  const [u1, u2, u3] = [strata(1), strata(2), strata(3)];
  const R = DEMO_RANGES;
  return Array.from({ length: n }, (_, i) => {
    const tex = R.textures[i % R.textures.length];
    const lerp = (range: readonly number[], u: number) => range[0] + (range[1] - range[0]) * u;
    return {
      meanAirTemp_C: lerp(R.meanAirTemp_C, u1[i]),
      airAmplitude_C: lerp(R.airAmplitude_C, u2[i]),
      warming_C_per_yr: lerp(R.warming_C_per_yr, u3[i]),
      textureClass: tex,
      waterContent_m3m3: R.water[tex] * (0.85 + 0.3 * r()),
      bedrockDepth_m: 40,
      groundTemp_C: NaN,
      geothermalFlux_W_m2: NaN,
      nFreeze: NaN,
      latitude_deg: NaN,
    };
  });
}

export interface CalibrationOptions {
  timeStep_days: number;
  fidelity: 'coarse' | 'standard' | 'fine';
  /** Outer radius of the simulator's ground cylinder, m (adiabatic side): 20 isolated, s/√π the field. */
  domainRadius_m: number;
}

/**
 * The calibration's numerics: the simulator's coarse mesh and 7-day steps (20 m radius), as the site
 * study's ensemble members run (layers/screening/site-ensemble.ts). The refinement study of
 * docs/site-convergence.md puts their bias against the default (standard mesh, 3.5-day steps) at
 * 0.6–0.9 yr on a thaw year and a few hundredths of a kelvin on ground temperatures; the default would
 * take about four times as long per cell.
 */
export const DEFAULT_CALIBRATION_OPTIONS: CalibrationOptions = {
  timeStep_days: 7,
  fidelity: 'coarse',
  domainRadius_m: 20,
};

/** The standard building's pile count the one-pile calibration divides the building by. */
export const STANDARD_PILES = DEFAULT_SCENARIO.building.foundationPiles;

/** One pile carrying one pile's share of the standard building, no neighbours (module comment). */
export function onePileScenario(s: Scenario = DEFAULT_SCENARIO): Scenario {
  return parseScenario({
    ...s,
    building: {
      ...s.building,
      foundationPiles: 1,
      pileColumns: 1,
      heatLossCoefficient_W_K: s.building.heatLossCoefficient_W_K / s.building.foundationPiles,
    },
  });
}

export interface CalibrationFigures {
  groundPile_C: number | null;
  activeLayer_m: number | null;
  groundEnd_C: number | null;
  lowestMeanFluid_C: number | null;
  /** Heat per pile carried, annual mean over the design life, W. */
  heatCarried_W: number | null;
  pilesPerTon: number | null;
  loadShare: number | null;
  /** Years from the start to thaw at the reference point (null: after the climate horizon). */
  noPileThaw_yr: number | null;
  pileThaw_yr: number | null;
}

export interface CalibrationCase {
  cell: CellInputs;
  excluded: boolean;
  model: CalibrationFigures & { carried_W_m: number; fluidBinds: boolean };
  sim: CalibrationFigures & { seconds: number };
}

const PILE_PROBES = [1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5, 8.5, 9.5, 10.5];

const MONTH_S = SECONDS_PER_YEAR / 12;
const finite = (x: number) => (Number.isFinite(x) ? x : null);

interface ModelSide {
  excluded: boolean;
  figures: CalibrationCase['model'];
}

/**
 * Lowest monthly mean fluid of the model at its bivalent monthly loads, °C (module comment): the
 * three-pulse monthly response at each month's carried load q_m (monthMeanFluid_C, bivalent-operation.ts).
 */
function modelLowestFluid_C(
  x: ReturnType<typeof createKernelScratch>,
  p: { tPile: number; surfaceAmp: number; kF: number; gLife: number; gMonth: number; H: number; Rb: number },
  carried_W: number,
): number {
  const a = x.bivalent.carried_W;
  // The bivalent carry may be capped further by over-cooling: scale its months alike.
  const scale = a > 0 ? carried_W / a : 0;
  const month = {
    groundMean_C: p.tPile,
    surfaceAmplitude_C: p.surfaceAmp,
    phasor: x.phasor,
    length_m: p.H,
    resistance_mK_W: p.Rb,
    conductivity_W_mK: p.kF,
    gLife: p.gLife,
    gMonth: p.gMonth,
  };
  let lowest = Infinity;
  for (let mo = 0; mo < MONTHS; mo++) {
    lowest = Math.min(lowest, monthMeanFluid_C(month, carried_W, scale * x.bivalent.monthly_W[mo], mo));
  }
  return lowest;
}

/**
 * The model's side of one case (module comment), for scenario `s` (the one-pile form) and the standard
 * building `base` (the piles per ton).
 */
export function modelSide(cell: CellInputs, s: Scenario, base: Scenario = DEFAULT_SCENARIO): ModelSide {
  const k = buildCellConstants(s);
  const x = createKernelScratch();
  const m = new Float64Array(METRIC_COUNT);
  evaluateCellMetrics(cell, k, x, m);
  const full = new Float64Array(METRIC_COUNT);
  evaluateCellMetrics(cell, buildCellConstants(base), createKernelScratch(), full);
  const excluded = m[METRIC.exclusion] !== 0;
  const soil = soilAt(k.soil[cell.textureClass], cell.waterContent_m3m3, createKernelScratch().soil);
  const kF = soil.kFrozen;
  const alphaF = kF / soil.cFrozen;
  const H = s.pile.length_m;
  const gLife = flsResponse(k.tables.fieldMean, alphaF, s.designLife_yr * SECONDS_PER_YEAR);
  const gMonth = flsResponse(k.tables.fieldMean, alphaF, MONTH_S);
  const tPile = m[METRIC.groundTemp];
  const carried = m[METRIC.extractionCarried];
  const geometry = { tPile, surfaceAmp: s.ground.nFreeze * cell.airAmplitude_C, kF, gLife, gMonth, H };
  const lowest = modelLowestFluid_C(x, { ...geometry, Rb: s.pile.resistance_mK_W }, carried * H);
  const flag = m[METRIC.thawBeyondHorizon];
  const start = s.startYear;
  return {
    excluded,
    figures: {
      groundPile_C: finite(tPile),
      activeLayer_m: finite(m[METRIC.activeLayer]),
      groundEnd_C: finite(m[METRIC.groundTempEnd]),
      lowestMeanFluid_C: carried > 0 ? finite(lowest) : null,
      heatCarried_W: finite(carried * H),
      pilesPerTon: finite(full[METRIC.pilesPerTon]),
      loadShare: finite(m[METRIC.loadShare]),
      noPileThaw_yr: flag === THAW_HORIZON.bothAfter ? null : finite(m[METRIC.thawYear] - start),
      pileThaw_yr: flag === THAW_HORIZON.within ? finite(m[METRIC.thawYearPiles] - start) : null,
      carried_W_m: carried,
      fluidBinds: m[METRIC.bindingLimit] === BINDING.fluid,
    },
  };
}

/**
 * The simulator's input for one case: the cell's soil and climate, the model's standard pile (coaxial,
 * the model's resistance) in building mode, the standard building shared by its piles (module comment).
 */
function calibrationInput(cell: CellInputs, base: Scenario, o: CalibrationOptions): SiteInputDraft {
  const s = base;
  const H = s.pile.length_m;
  const years = s.climateHorizonYear - s.startYear;
  const midDepth_m = s.pile.topDepth_m + H / 2;
  return {
    years,
    timeStep_days: o.timeStep_days,
    outputStep_days: 365 / 12,
    ground: {
      layers: [
        {
          top_m: 0,
          bottom_m: 50,
          soil: {
            texture: TEXTURE_CODES[cell.textureClass as TextureCode],
            waterContent_m3m3: cell.waterContent_m3m3,
          },
        },
      ],
      geothermalFlux_W_m2: s.ground.geothermalFlux_W_m2,
      initial: 'equilibrium',
    },
    climate: {
      meanAirTemp_C: cell.meanAirTemp_C,
      amplitude_C: cell.airAmplitude_C,
      warming_C_per_yr: cell.warming_C_per_yr,
      nThaw: s.ground.nThaw,
      nFreeze: s.ground.nFreeze,
    },
    // The study's standard pile (site-prefill.ts): coaxial, the model's resistance, its loop flow.
    pile: standardPileDraft(s, cell.meanAirTemp_C, cell.airAmplitude_C),
    // The standard building's load line shared by its piles, as the site study runs it (site-prefill.ts).
    operation: {
      mode: 'building',
      designLoad_W: standardLoadAtColdestAir_W(s, cell.meanAirTemp_C, cell.airAmplitude_C),
      pileCount: s.building.foundationPiles,
      balancePoint_C: s.building.balanceTemp_C,
    },
    probes: [
      { r_m: s.referenceRadius_m, z_m: s.referenceDepth_m },
      { r_m: 0.5, z_m: midDepth_m },
      ...PILE_PROBES.map((z) => ({ r_m: 0.5, z_m: z })),
    ],
    domain: { radius_m: o.domainRadius_m, depth_m: 50 },
    numerics: { fidelity: o.fidelity },
  };
}

/** Lowest monthly mean fluid (inlet and outlet mean) in the first `life` years, and its month (−1: none). */
function lowestFluidMonth(r: ReturnType<typeof simulateSite>, life: number): { lowest: number; at: number } {
  let lowest = Infinity;
  let at = -1;
  const fl = r.fluid;
  if (fl) {
    const months = Math.min(fl.month_yr.length, life * 12);
    for (let i = 0; i < months; i++) {
      const a = fl.inlet_C[i];
      const b = fl.outlet_C[i];
      if (a === null || b === null) continue;
      if (0.5 * (a + b) < lowest) {
        lowest = 0.5 * (a + b);
        at = i;
      }
    }
  }
  return { lowest, at };
}

/** Mean ground extraction per pile (W) and the load share of the first `life` simulated years. */
function operationOverLife(input: SiteInput, r: SiteResult, life: number) {
  const years = energyByYear(input, r).slice(0, life);
  if (years.length === 0) return { heat_W: null, share: null };
  const delivered = years.reduce((acc, y) => acc + y.delivered_kWh, 0);
  const unmet = years.reduce((acc, y) => acc + y.unmet_kWh, 0);
  return {
    heat_W: years.reduce((acc, y) => acc + y.meanExtraction_W, 0) / years.length,
    share: delivered + unmet > 0 ? delivered / (delivered + unmet) : null,
  };
}

/** Piles per ton of the study's full three-pulse sizing from the run (module comment). */
function simPilesPerTon(input: SiteInput, r: SiteResult, column: ProfileColumn, s: Scenario): number | null {
  if (input.operation.mode !== 'building') return null;
  const op = input.operation;
  const sized = sizeSiteByPulse(input, r, column, studyFoundation(s), true);
  if (!sized || !sized.ok) return null;
  const peak_W = designDayLoad_W(
    op.designLoad_W,
    input.climate,
    op.balancePoint_C,
    s.building.designMargin_K,
  );
  return (sized.sizing.pileCount * TON_W) / peak_W;
}

/** The simulator's side of one case from its run `r` (module comment). */
function simulatorSide(
  run: { input: SiteInput; column: ProfileColumn },
  r: SiteResult,
  s: Scenario,
  seconds: number,
): CalibrationCase['sim'] {
  const years = s.climateHorizonYear - s.startYear;
  const alongPile = r.noPile.probes.slice(2, 2 + PILE_PROBES.length);
  const monthMean = (probes: typeof alongPile, i: number) =>
    probes.reduce((acc, p) => acc + p.T_C[i], 0) / probes.length;
  const yearMean = (T: number[], y: number) => T.slice(12 * y, 12 * y + 12).reduce((p, q) => p + q, 0) / 12;
  const groundPile =
    Array.from({ length: 12 }, (_, i) => monthMean(alongPile, i)).reduce((p, q) => p + q, 0) / 12;
  const al = r.noPile.annualThawDepth_m;
  const life = Math.round(s.designLife_yr);
  const { lowest, at } = lowestFluidMonth(r, life);
  const op = operationOverLife(run.input, r, life);
  const ref = (c: typeof r.noPile | null) => (c ? c.probes[0].thawYear : null);
  const horizonOnly = (t: number | null) => (t !== null && t <= years ? t : null);
  return {
    groundPile_C: groundPile,
    activeLayer_m: al.length >= 3 ? 0.5 * (al[1] + al[2]) : null,
    groundEnd_C:
      r.noPile.probes[1].T_C.length >= 12 * life ? yearMean(r.noPile.probes[1].T_C, life - 1) : null,
    lowestMeanFluid_C: at >= 0 ? lowest : null,
    heatCarried_W: op.heat_W,
    pilesPerTon: simPilesPerTon(run.input, r, run.column, s),
    loadShare: op.share,
    noPileThaw_yr: horizonOnly(ref(r.noPile)),
    pileThaw_yr: horizonOnly(ref(r.withPile)),
    seconds,
  };
}

/** Run one calibration case: the model's one-pile form and the simulator (module comment). */
export function calibrateCell(
  cell: CellInputs,
  base: Scenario = DEFAULT_SCENARIO,
  o: CalibrationOptions = DEFAULT_CALIBRATION_OPTIONS,
): CalibrationCase {
  const model = modelSide(cell, onePileScenario(base), base);
  const none: CalibrationFigures = {
    groundPile_C: null,
    activeLayer_m: null,
    groundEnd_C: null,
    lowestMeanFluid_C: null,
    heatCarried_W: null,
    pilesPerTon: null,
    loadShare: null,
    noPileThaw_yr: null,
    pileThaw_yr: null,
  };
  const carried = model.figures.carried_W_m;
  if (model.excluded || !(carried > 0)) {
    return { cell, excluded: model.excluded, model: model.figures, sim: { ...none, seconds: 0 } };
  }
  const run = studyRunInput(siteInputSchema.parse(calibrationInput(cell, base, o)), base);
  const t0 = performance.now();
  const r = simulateSite(run.input);
  const seconds = (performance.now() - t0) / 1000;
  return { cell, excluded: false, model: model.figures, sim: simulatorSide(run, r, base, seconds) };
}

/**
 * Group bracket for one cell: the model's 4 × 4 heat per pile at the fluid limit against the simulator's
 * isolated pile (20 m cylinder) and the interior pile of an endless field (adiabatic cylinder of the
 * group's plan area per pile, radius spacing/√π). Returns the three heats, W.
 */
export function groupBracket(
  cell: CellInputs,
  base: Scenario = DEFAULT_SCENARIO,
  o: Omit<CalibrationOptions, 'domainRadius_m'> = DEFAULT_CALIBRATION_OPTIONS,
): { modelGroup_W: number | null; simIsolated_W: number | null; simField_W: number | null } {
  const group = modelSide(cell, base, base).figures.heatCarried_W;
  const isolated = calibrateCell(cell, base, { ...o, domainRadius_m: 20 }).sim.heatCarried_W;
  // The endless field at the model's carried load can cool until the fluid would freeze (the simulator
  // stops the run): its heat at the limit is then below the carried load but not measured, so null.
  let field: number | null;
  try {
    field = calibrateCell(cell, base, {
      ...o,
      domainRadius_m: base.building.pileSpacing_m / Math.sqrt(Math.PI),
    }).sim.heatCarried_W;
  } catch (e) {
    if (!(e instanceof SiteFluidLimitError)) throw e;
    field = null;
  }
  return { modelGroup_W: group, simIsolated_W: isolated, simField_W: field };
}

/**
 * Median, 95th percentile (nearest rank) and maximum of |x|, and the median of the signed x
 * (the bias: > 0 when the model is above the simulator more often than not).
 */
export function errorSummary(xs: number[]): {
  n: number;
  median: number;
  p95: number;
  max: number;
  signedMedian: number;
} {
  const a = xs.map(Math.abs).sort((p, q) => p - q);
  const signed = [...xs].sort((p, q) => p - q);
  const rank = (v: number[], p: number) =>
    v[Math.min(v.length - 1, Math.max(0, Math.ceil(p * v.length) - 1))];
  return {
    n: a.length,
    median: a.length ? rank(a, 0.5) : NaN,
    p95: a.length ? rank(a, 0.95) : NaN,
    max: a.length ? a[a.length - 1] : NaN,
    signedMedian: signed.length ? rank(signed, 0.5) : NaN,
  };
}

/** Signed model − simulator errors of one case, per quantity (null: not comparable). */
export function caseErrors(c: CalibrationCase): Record<CalibrationQuantity, number | null> {
  const m = c.model;
  const r = c.sim;
  const diff = (a: number | null, b: number | null) => (a === null || b === null ? null : a - b);
  const rel = (a: number | null, b: number | null) =>
    a === null || b === null || b === 0 ? null : a / b - 1;
  const bothWithin =
    m.noPileThaw_yr !== null && r.noPileThaw_yr !== null && m.pileThaw_yr !== null && r.pileThaw_yr !== null;
  return {
    groundPile_K: diff(m.groundPile_C, r.groundPile_C),
    activeLayer_rel: rel(m.activeLayer_m, r.activeLayer_m),
    groundEnd_K: diff(m.groundEnd_C, r.groundEnd_C),
    lowestMeanFluid_K: diff(m.lowestMeanFluid_C, r.lowestMeanFluid_C),
    heatCarried_rel: rel(m.heatCarried_W, r.heatCarried_W),
    pilesPerTon_rel: rel(m.pilesPerTon, r.pilesPerTon),
    loadShare_abs: diff(m.loadShare, r.loadShare),
    noPileThaw_yr:
      m.noPileThaw_yr !== null && r.noPileThaw_yr !== null ? m.noPileThaw_yr - r.noPileThaw_yr : null,
    thawDelay_yr: bothWithin
      ? (m.pileThaw_yr as number) -
        (m.noPileThaw_yr as number) -
        ((r.pileThaw_yr as number) - (r.noPileThaw_yr as number))
      : null,
  };
}

export const CALIBRATION_QUANTITIES = [
  'groundPile_K',
  'activeLayer_rel',
  'groundEnd_K',
  'lowestMeanFluid_K',
  'heatCarried_rel',
  'pilesPerTon_rel',
  'loadShare_abs',
  'noPileThaw_yr',
  'thawDelay_yr',
] as const;
export type CalibrationQuantity = (typeof CALIBRATION_QUANTITIES)[number];

/** Thaw within the climate horizon: do model and simulator agree on "within" / "after", per run? */
export function thawAgreement(cases: CalibrationCase[]): {
  n: number;
  noPileAgree: number;
  pileAgree: number;
} {
  const sim = cases.filter((c) => !c.excluded && c.sim.seconds > 0);
  const agree = (a: number | null, b: number | null) => (a === null) === (b === null);
  return {
    n: sim.length,
    noPileAgree: sim.filter((c) => agree(c.model.noPileThaw_yr, c.sim.noPileThaw_yr)).length,
    pileAgree: sim.filter((c) => agree(c.model.pileThaw_yr, c.sim.pileThaw_yr)).length,
  };
}

/** errorSummary of every quantity, over all cases and per texture code. */
export function calibrationSummary(cases: CalibrationCase[]) {
  const pick = (cs: CalibrationCase[], q: CalibrationQuantity) =>
    cs.flatMap((c) => {
      const e = caseErrors(c)[q];
      return e === null || !Number.isFinite(e) ? [] : [e];
    });
  const per = (cs: CalibrationCase[]) =>
    Object.fromEntries(CALIBRATION_QUANTITIES.map((q) => [q, errorSummary(pick(cs, q))])) as Record<
      CalibrationQuantity,
      ReturnType<typeof errorSummary>
    >;
  const textures = [...new Set(cases.map((c) => c.cell.textureClass))].sort((a, b) => a - b);
  return {
    all: per(cases),
    byTexture: Object.fromEntries(
      textures.map((t) => [
        TEXTURE_CODES[t as TextureCode],
        per(cases.filter((c) => c.cell.textureClass === t)),
      ]),
    ),
    thaw: thawAgreement(cases),
  };
}
