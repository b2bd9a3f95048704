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
 * building's heat-loss coefficient divided by the standard pile count (16), the simulator's pile
 * extracting that model's carried load with the model's own monthly load profile. Everything that is not
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
 *  - lowest monthly mean fluid over the design life at the model's carried load, °C: model's monthly
 *    response (monthly-peak.ts without the 6-hour pulse the monthly simulator cannot resolve) | the
 *    simulator's mean of inlet and outlet;
 *  - heat per pile at the fluid limit (annual mean, W, monthly resolution: the mean fluid of the limiting
 *    month at the limit): model monthlyPeakPerPile_W with the peak equal to the month's mean | the
 *    simulator's carried load scaled by (ground − limit)/(ground − fluid) in its coldest-fluid month, its
 *    own ground that month (linear in the load about the run, which is at or near the limit when the fluid
 *    binds); piles per ton and load share follow from it (same building, same COP);
 *  - thaw at the reference point without and with the pile, and the delay, yr, up to the scenario's
 *    climate horizon (the simulator runs from the start year to the horizon; a thaw after it is "after").
 */
import { simulateSite } from '../layers/site/simulate-site';
import { createRandom } from '../data-pipeline/demo/seeded-random';
import { SITE_DEFAULTS, type SiteInputDraft } from '../layers/site/site-input-schema';
import { SECONDS_PER_YEAR } from '../layers/physics/surface-forcing';
import type { CellInputs } from '../layers/screening/screening-model';
import { TEXTURE_CODES, type TextureCode } from '../layers/screening/screening-model';
import { buildCellConstants, soilAt } from '../layers/screening/cell-constants';
import { createKernelScratch, evaluateCellMetrics } from '../layers/screening/cell-kernel';
import { METRIC, METRIC_COUNT } from '../layers/screening/cell-layers';
import { flsResponse } from '../layers/screening/response-tables';
import { monthAnomaly_K, monthlyPeakPerPile_W, MONTHS } from '../layers/screening/monthly-peak';
import { meanFluidFromEntering_C } from '../layers/physics/fluid-temperature-convention';
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

/** The simulator's own defaults (its default step, standard mesh, 20 m radius). */
export const DEFAULT_CALIBRATION_OPTIONS: CalibrationOptions = {
  timeStep_days: SITE_DEFAULTS.timeStep_days.value,
  fidelity: 'standard',
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
  heatAtLimit_W: number | null;
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
  /** Monthly ground loads as factors of the annual mean, January (the coldest month) first. */
  monthlyFactors: number[];
  /** Mean fluid at the fluid limit, °C, and the annual-average design-peak ratio a. */
  limitMeanFluid_C: number;
}

/** The model's side of one case (module comment), for scenario `s` (the one-pile form by default). */
export function modelSide(cell: CellInputs, s: Scenario): ModelSide {
  const k = buildCellConstants(s);
  const x = createKernelScratch();
  const m = new Float64Array(METRIC_COUNT);
  evaluateCellMetrics(cell, k, x, m);
  const excluded = m[METRIC.exclusion] !== 0;
  const soil = soilAt(k.soil[cell.textureClass], cell.waterContent_m3m3, createKernelScratch().soil);
  const kF = soil.kFrozen;
  const alphaF = kF / soil.cFrozen;
  const H = s.pile.length_m;
  const hp = s.heatPump;
  const limitMean = meanFluidFromEntering_C(hp.minEnteringFluid_C, 2 * hp.fluidHalfDelta_K, 'heating');
  const gLife = flsResponse(k.tables.fieldMean, alphaF, s.designLife_yr * SECONDS_PER_YEAR);
  const gMonth = flsResponse(k.tables.fieldMean, alphaF, MONTH_S);
  const tPile = m[METRIC.groundTemp];
  // The kernel's annual fraction a: annual mean over the design peak (its loads are fractions of it).
  const a = x.annualFraction;
  const fMean = Array.from(x.monthlyFraction).reduce((p, q) => p + q, 0) / MONTHS;
  const monthlyFactors = Array.from(x.monthlyFraction, (f) => (fMean > 0 ? f / fMean : 1));
  const surfaceAmp = s.ground.nFreeze * cell.airAmplitude_C;
  const twoPiK = 2 * Math.PI * kF;
  // Monthly resolution: the month's peak is its mean (no 6-hour pulse), as the simulator's months are.
  const monthlyOnly = monthlyPeakPerPile_W(
    {
      groundMean_C: tPile,
      surfaceAmplitude_C: surfaceAmp,
      phasor: x.phasor,
      meanFluid_C: limitMean,
      length_m: H,
      resistance_mK_W: s.pile.resistance_mK_W,
      conductivity_W_mK: kF,
      gLife,
      gMonth,
      gPeak: 0,
      annualFraction: a,
      monthlyFraction: x.monthlyFraction,
      peakFraction: x.monthlyFraction,
    },
    new Float64Array(1),
  );
  const carried = m[METRIC.extractionCarried];
  // Lowest monthly mean fluid at the carried load: carried·H is the annual mean, so the design-peak scale
  // is carried·H/a and month m extracts that times f_m.
  const peakScale_W = (carried * H) / a;
  let lowest = Infinity;
  for (let mo = 0; mo < MONTHS; mo++) {
    const f = x.monthlyFraction[mo];
    const per = (a * (gLife - gMonth) + f * gMonth) / twoPiK + f * s.pile.resistance_mK_W;
    const tf = tPile - monthAnomaly_K(surfaceAmp, x.phasor, mo) - (peakScale_W * per) / H;
    lowest = Math.min(lowest, tf);
  }
  const heatAtLimit = a * monthlyOnly;
  const flag = m[METRIC.thawBeyondHorizon];
  const start = s.startYear;
  return {
    excluded,
    monthlyFactors,
    limitMeanFluid_C: limitMean,
    figures: {
      groundPile_C: finite(tPile),
      activeLayer_m: finite(m[METRIC.activeLayer]),
      groundEnd_C: finite(m[METRIC.groundTempEnd]),
      lowestMeanFluid_C: carried > 0 ? finite(lowest) : null,
      heatAtLimit_W: finite(heatAtLimit),
      pilesPerTon: finite(m[METRIC.pilesPerTon]),
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
 * the model's resistance) extracting the model's carried load with its monthly profile (module comment).
 */
function calibrationInput(
  cell: CellInputs,
  s: Scenario,
  o: CalibrationOptions,
  model: ModelSide,
): SiteInputDraft {
  const carried = model.figures.carried_W_m;
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
    pile: {
      length_m: H,
      topDepth_m: s.pile.topDepth_m,
      outerDiameter_m: 2 * s.pile.radius_m,
      loop: {
        type: 'coaxial',
        centreOuterDiameter_m: 0.05,
        centreInnerDiameter_m: 0.044,
        centreConductivity_W_mK: 0.4,
        downFlow: 'annulus',
      },
      fluid: { name: 'propyleneGlycol', massFraction: 0.4 },
      resistance: { Rb_mK_W: s.pile.resistance_mK_W, Ra_mK_W: 1 },
    },
    // The model's monthly ground loads, January (its coldest month) first; the annual mean is carried·H.
    operation: { mode: 'heatRate', extraction_W: carried * H, monthlyFactors: model.monthlyFactors },
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

/** The simulator's side of one case from its run `r` (module comment). */
function simulatorSide(
  r: ReturnType<typeof simulateSite>,
  s: Scenario,
  model: ModelSide,
  seconds: number,
): CalibrationCase['sim'] {
  const carried = model.figures.carried_W_m;
  const H = s.pile.length_m;
  const years = s.climateHorizonYear - s.startYear;
  const alongPile = r.noPile.probes.slice(2);
  const monthMean = (probes: typeof alongPile, i: number) =>
    probes.reduce((acc, p) => acc + p.T_C[i], 0) / probes.length;
  const yearMean = (T: number[], y: number) => T.slice(12 * y, 12 * y + 12).reduce((p, q) => p + q, 0) / 12;
  const groundPile =
    Array.from({ length: 12 }, (_, i) => monthMean(alongPile, i)).reduce((p, q) => p + q, 0) / 12;
  const al = r.noPile.annualThawDepth_m;
  const life = Math.round(s.designLife_yr);
  // Lowest monthly mean fluid over the design life, and the no-pile ground along the pile that month.
  const { lowest, at } = lowestFluidMonth(r, life);
  let heatAtLimit: number | null = null;
  if (at >= 0) {
    const ground = monthMean(alongPile, at);
    // Linear in the load about this run: the load that brings this month's mean fluid to the limit.
    heatAtLimit = (carried * H * (ground - model.limitMeanFluid_C)) / (ground - lowest);
  }
  const ratio =
    heatAtLimit !== null && model.figures.heatAtLimit_W ? heatAtLimit / model.figures.heatAtLimit_W : null;
  const ref = (c: typeof r.noPile | null) => (c ? c.probes[0].thawYear : null);
  const horizonOnly = (t: number | null) => (t !== null && t <= years ? t : null);
  return {
    groundPile_C: groundPile,
    activeLayer_m: al.length >= 3 ? 0.5 * (al[1] + al[2]) : null,
    groundEnd_C:
      r.noPile.probes[1].T_C.length >= 12 * life ? yearMean(r.noPile.probes[1].T_C, life - 1) : null,
    lowestMeanFluid_C: at >= 0 ? lowest : null,
    heatAtLimit_W: heatAtLimit,
    // Same building and COP: piles scale inversely with the heat per pile at the limit.
    pilesPerTon: ratio && model.figures.pilesPerTon !== null ? model.figures.pilesPerTon / ratio : null,
    // The load share moves with the heat at the limit only where the fluid binds it.
    loadShare:
      ratio && model.figures.loadShare !== null
        ? model.figures.fluidBinds
          ? Math.min(1, model.figures.loadShare * ratio)
          : model.figures.loadShare
        : null,
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
  const s = onePileScenario(base);
  const model = modelSide(cell, s);
  const none: CalibrationFigures = {
    groundPile_C: null,
    activeLayer_m: null,
    groundEnd_C: null,
    lowestMeanFluid_C: null,
    heatAtLimit_W: null,
    pilesPerTon: null,
    loadShare: null,
    noPileThaw_yr: null,
    pileThaw_yr: null,
  };
  const carried = model.figures.carried_W_m;
  if (model.excluded || !(carried > 0)) {
    return { cell, excluded: model.excluded, model: model.figures, sim: { ...none, seconds: 0 } };
  }
  const input = calibrationInput(cell, s, o, model);
  const t0 = performance.now();
  const r = simulateSite(input);
  const seconds = (performance.now() - t0) / 1000;
  return { cell, excluded: false, model: model.figures, sim: simulatorSide(r, s, model, seconds) };
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
  const group = modelSide(cell, base).figures.heatAtLimit_W;
  const isolated = calibrateCell(cell, base, { ...o, domainRadius_m: 20 }).sim.heatAtLimit_W;
  // The endless field at the model's carried load can cool until the fluid would freeze (the simulator
  // stops the run): its heat at the limit is then below the carried load but not measured, so null.
  let field: number | null;
  try {
    field = calibrateCell(cell, base, {
      ...o,
      domainRadius_m: base.building.pileSpacing_m / Math.sqrt(Math.PI),
    }).sim.heatAtLimit_W;
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
    heatAtLimit_rel: rel(m.heatAtLimit_W, r.heatAtLimit_W),
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
  'heatAtLimit_rel',
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
