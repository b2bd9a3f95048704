/**
 * The per-cell screening kernel: every metric of one cell into a Float64Array indexed by METRIC.
 * Allocation-free apart from the science core's small result objects (escape-analysed by the engine).
 *
 * Method, in order (each step's model is documented in its own module):
 *  1. soil properties from the texture table at the cell's water content (cell-constants.ts);
 *  2. air freezing/thawing indices of the sinusoidal year (degreeDays, surface-forcing.ts), surface
 *     indices with n-factors (Lunardini 1978), TTOP (Smith & Riseborough 1996, 2002), active layer by
 *     the two-phase Neumann solution over the thaw season with the sensible heat of both zones
 *     (layers/physics/neumann-active-layer.ts: the thaw-season step of equal degree-days into frozen
 *     ground at TTOP, as in the modified Berggren method);
 *  1b. excess ice: water above the texture's porosity n is excess ice, e = (θ − n)/(1 − n), carried
 *     in the latent heat, capacity and conductivity (soil-catalogue.ts) and reported (band excessIce);
 *  3. ground temperature at the pile's mid-depth: the ground-temperature grid when given, else TTOP
 *     plus the geothermal gradient q_g/k_frozen below the active layer; the reference-depth temperature
 *     adds the gradient between the two depths; at the end of the life latent-aware
 *     (groundTempEndOfLife_C: 0 °C while the ice melts, the zero curtain, flagged);
 *  4. warming: the air trend through the n-factor transfer shared with the site simulator (the trend
 *     is added to the air, then the n-factors act: surfaceMeanWarming_K, surface-forcing.ts), as the
 *     linear surface rate with the same surface-mean change at the end of the design life
 *     (surfaceWarmingRate_K_per_yr), propagated by conduction in frozen ground
 *     (Carslaw & Jaeger §2.5, response-tables.ts); thaw without piles by the method of
 *     layers/physics/years-to-thaw.ts: the time the conduction rise brings the reference point to
 *     0 °C (tabulated here) plus the latent-heat delay z·√(L/(k_thawed·b)) of a Stefan front under a
 *     rising surface excess; with a warming pathway in the scenario (warming-pathway.ts) the surface
 *     history is piecewise linear instead, one superposed ramp per change of slope, and the thaw time,
 *     latent delay and c/b lengthening are their piecewise generalisations (surface-warming-history.ts);
 *  5. standard building: heating demand UA·HDD (HDD = freezing index of T_air − T_balance), peak load
 *     UA·(T_balance − T_design), and the 12 monthly loads UA·(T_balance − T_month)⁺ with their peaks
 *     the design margin colder; ground load = heat·(1 − 1/COP), the peak at the COP of the lowest EFT,
 *     annual and monthly loads at the COP of the undisturbed ground (as layers/site/pile-sizing.ts);
 *  6. operating window and pile count (operating-window.ts): the peak per pile of the foundation group
 *     (foundation-group.ts; finite-line-source field response, response-tables.ts) at the fluid limit,
 *     month by month against the lagged, pile-averaged annual wave (monthly-peak.ts), the mean fluid
 *     from the lowest EFT by the project's convention (layers/physics/fluid-temperature-convention.ts);
 *     the reference point's cooling from every pile of the group at the reference depth and radius;
 *  7. thaw with piles: first time T_ref + W(t) − q'_carried·g_ref(t)/(2πk) ≥ 0 (g_ref: the whole group at
 *     the reference point), piles operating from the start year on (forward search from the no-pile
 *     time, then regula falsi to 0.01 yr), plus the
 *     latent delay, lengthened by c/b: the Stefan front X·dX/dt = k_t·(b(t − t0) − c)/L driven against
 *     the pile's cooling c at the reference point arrives c/b later (c evaluated at the sensible thaw
 *     time; an extension of years-to-thaw.ts checked against the site simulator, see the calibration);
 *     thaw after the scenario's climate horizon is capped there and flagged (climate-horizon.ts);
 *  8. economics: the unit's seasonal COP at mean fluid T_pile − q'_carried·(R_b + g_N(t_L)/(2πk))
 *     (annual-average extraction through the pile and the group's long-term response), EFT = mean +
 *     ΔT/2 (heating), from the scenario's heat-pump curve (layers/physics/heat-pump.ts); the system
 *     COP with circulation pump, backup and auxiliaries (system-cop.ts) drives fuel, CO2, cost, the
 *     fuel-increase flag, capital cost and simple payback;
 *  3b-3d (after 7, they need the carried load): the adfreeze-zone temperature at the end of the life
 *     with the piles operating (the reference point: T_ref + W(life) − q'_carried·g_ref(life)/(2πk),
 *     at least 0 °C where it thaws within the life), the end-of-life active layer (the Neumann step in
 *     the warmed climate), and the structural layers of foundation-checks.ts;
 *  9. hard foundation checks, soft scores and class: cell-class.ts, a pure function of these outputs.
 */
import { designHeatingLoad_W } from '../site/site-load-line';
import {
  degreeDays,
  type DegreeDays,
  SECONDS_PER_YEAR,
  nFactorSurfaceMeanKernel_C,
  surfaceMeanSensitivity,
  thawSeasonFraction,
} from '../physics/surface-forcing';
import { dampingDepth_m } from '../physics/ground-temperature-wave';
import { ttop_C } from '../physics/ttop';
import { neumannActiveLayerKernel_m } from '../physics/neumann-active-layer';
import type { CellInputs } from './screening-model';
import { copFromTable, soilAt, type CellConstants, type SoilPoint } from './cell-constants';
import { flsResponse } from './response-tables';
import {
  createWarmingHistory,
  historyLatentDelay_yr,
  historySurfaceGain_yr,
  historyTimeToRise_yr,
  historyWarming_K,
  meanSurfaceRate_K_yr,
  setLinearHistory,
  setPathwayHistory,
  type WarmingHistory,
} from './surface-warming-history';
import { operatingWindow, type WindowResult } from './operating-window';
import {
  bivalentOperation,
  bivalentResolve,
  createBivalentResult,
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
import { EXCLUSION, isFrostSusceptible, permafrostClass, thawStabilityScore } from './suitability';
import { METRIC as M } from './cell-layers';
import { THAW_HORIZON } from './climate-horizon';
import { createFoundationResult, foundationKernel, type FoundationResult } from './foundation-checks';
import { createSystemResult, simplePayback_yr, systemKernel, type SystemResult } from './system-cop';
import { classifyCell } from './cell-class';

/** One refrigeration ton, W: 12 000 Btu_IT/h (reference-values §12). */
export const TON_W = 3516.853;
const MONTH_S = SECONDS_PER_YEAR / 12;
/** Duration of the peak pulse, s: 6 h (Kavanaugh & Rafferty 1997; as layers/site/pile-sizing.ts). */
const PEAK_S = 6 * 3600;
const HOURS_PER_YEAR = 8760;

/** Reusable scratch for one thread. */
export interface KernelScratch {
  soil: SoilPoint;
  window: WindowResult;
  /** Monthly mean and peak ground loads over the design peak (monthly-peak.ts). */
  monthlyFraction: Float64Array;
  peakFraction: Float64Array;
  /** Pile-averaged annual-wave phasor [re, im]. */
  phasor: Float64Array;
  /** Month whose load limits the pile (0 = the coldest month of the surface wave). */
  peakMonth: Float64Array;
  /** Requested monthly mean ground load per pile, W, and the bivalent operation (bivalent-operation.ts). */
  requested: Float64Array;
  bivalent: BivalentResult;
  /** Set by groundTempEndOfLife_C: latent heat holds the ground at 0 °C at the end of life. */
  zeroCurtain: boolean;
  foundation: FoundationResult;
  system: SystemResult;
  /** Annual-average ground load over the design peak, a (monthly-peak.ts; read by the calibration). */
  annualFraction: number;
  /** The cell's surface-warming history: linear trend or pathway (surface-warming-history.ts). */
  warming: WarmingHistory;
  /** The figures one stage of evaluateCellMetrics hands to the next. */
  state: CellState;
}

/** Intermediate figures of one cell, written by the stages of evaluateCellMetrics in step order. */
export interface CellState {
  /** Steps 1-3: n-factors, TTOP (°C), active layer today and at the end of the life (m), geothermal gradient (K/m). */
  nF: number;
  nT: number;
  ttop: number;
  alt: number;
  altEnd: number;
  grad: number;
  /** Ground temperature at the pile's mid-depth and at the reference point today, °C. */
  tPile: number;
  tRef: number;
  /** Frozen-ground diffusivity, m²/s and m²/yr; the design life, s. */
  alphaF: number;
  alphaYr: number;
  lifeS: number;
  /** Air warming at the end of the life, K, the surface-warming history and its warming of the reference point at the end of the life, K. */
  airLife_K: number;
  h: WarmingHistory;
  warmRefLife: number;
  /** Step 5: heating demand (kWh), design peak and annual average (W), ground-load factors. */
  demand_kWh: number;
  peak_W: number;
  avg_W: number;
  groundFactor: number;
  seasonFactor: number;
  toPeak: number;
  /** Step 6: field responses over the life (pile field, reference point) and the peak per pile, W. */
  gLife: number;
  gRefLife: number;
  qPeak: number;
  /** Step 7: years to thaw at the reference point with the piles (Infinity: does not thaw). */
  thawPilesYr: number;
}

function createCellState(warming: WarmingHistory): CellState {
  return {
    nF: 0,
    nT: 0,
    ttop: 0,
    alt: 0,
    altEnd: 0,
    grad: 0,
    tPile: 0,
    tRef: 0,
    alphaF: 0,
    alphaYr: 0,
    lifeS: 0,
    airLife_K: 0,
    h: warming,
    warmRefLife: 0,
    demand_kWh: 0,
    peak_W: 0,
    avg_W: 0,
    groundFactor: 0,
    seasonFactor: 0,
    toPeak: 0,
    gLife: 0,
    gRefLife: 0,
    qPeak: 0,
    thawPilesYr: Infinity,
  };
}

export function createKernelScratch(): KernelScratch {
  const warming = createWarmingHistory();
  return {
    soil: { kFrozen: 0, kThawed: 0, cFrozen: 0, cThawed: 0, latent: 0 },
    window: {
      lower_W_m: 0,
      upperFluid_W_m: 0,
      upperOvercool_W_m: 0,
      upper_W_m: 0,
      carried_W_m: 0,
      loadShare: 0,
      binding: 0,
    },
    monthlyFraction: new Float64Array(MONTHS),
    peakFraction: new Float64Array(MONTHS),
    phasor: new Float64Array(2),
    peakMonth: new Float64Array(1),
    requested: new Float64Array(MONTHS),
    bivalent: createBivalentResult(),
    zeroCurtain: false,
    foundation: createFoundationResult(),
    system: createSystemResult(),
    annualFraction: 0,
    warming,
    state: createCellState(warming),
  };
}

/**
 * Winter cold anomaly of the ground averaged over the pile's active length, K (≥ 0: colder than the
 * mean): the largest over the year of the pile-averaged Kusuda & Achenbach (1965) annual wave
 * A_s·e^(−z/d)·cos(ωt − z/d) (layers/physics/ground-temperature-wave.ts). As a phasor average,
 *   A_s·|(d/(z2 − z1))·(e^(−(1+i)z1/d) − e^(−(1+i)z2/d))/(1 + i)|,
 * d the damping depth √(Pα/π) in frozen ground. A_s is the winter half of the n-factor-transferred
 * surface wave, n_f·A (conduction only; latent heat in an active layer above the pile top is ignored,
 * which over-estimates the anomaly there). The kernel uses the month-by-month phasor of monthly-peak.ts
 * (whose modulus this is); kept for the calibration harness.
 */
export function pileWinterAnomaly_K(p: {
  surfaceAmplitude_C: number;
  diffusivity_m2_s: number;
  top_m: number;
  bottom_m: number;
}): number {
  const d = dampingDepth_m(p.diffusivity_m2_s);
  const u1 = p.top_m / d;
  const u2 = p.bottom_m / d;
  const e1 = Math.exp(-u1);
  const e2 = Math.exp(-u2);
  // (e^(−(1+i)u1) − e^(−(1+i)u2)) = re + i·im
  const re = e1 * Math.cos(u1) - e2 * Math.cos(u2);
  const im = -e1 * Math.sin(u1) + e2 * Math.sin(u2);
  // |(re + i·im)/(1 + i)| = |re + i·im|/√2
  return (p.surfaceAmplitude_C * d * Math.hypot(re, im)) / (Math.SQRT2 * (p.bottom_m - p.top_m));
}

/**
 * Surface warming rate of a cell, K/yr: the linear surface trend with the simulator's surface-mean
 * change at the end of the design life, surfaceMeanWarming_K(ΔT_air = b·life)/life (surface-forcing.ts,
 * through its unchecked kernel;
 * under n_f < 1 snow about 0.5–0.8 of the air trend). The ramp, the thaw years and the latent delay
 * all use it. Trends taking the air mean beyond ±40 K or outside −80…60 °C use the slope
 * surfaceMeanSensitivity at today's climate instead.
 */
export function surfaceWarmingRate_K_per_yr(
  cell: Pick<CellInputs, 'meanAirTemp_C' | 'airAmplitude_C' | 'warming_C_per_yr'>,
  nFreeze: number,
  nThaw: number,
  life_yr: number,
): number {
  if (cell.warming_C_per_yr === 0) return 0;
  const airWarming_K = cell.warming_C_per_yr * life_yr;
  const shifted = cell.meanAirTemp_C + airWarming_K;
  if (Math.abs(airWarming_K) > 40 || shifted < -80 || shifted > 60) {
    // Beyond the transfer's checked range (trends of more than 0.4 K/yr held for a century): the
    // slope at today's climate, so that the kernel never throws.
    const sens = surfaceMeanSensitivity({
      meanAirTemp_C: cell.meanAirTemp_C,
      amplitude_C: cell.airAmplitude_C,
      nFreeze,
      nThaw,
    });
    return sens * cell.warming_C_per_yr;
  }
  // surfaceMeanWarming_K without its checks (inputs checked by validInputs; hot path).
  const a = cell.airAmplitude_C;
  return (
    (nFactorSurfaceMeanKernel_C(shifted, a, nFreeze, nThaw) -
      nFactorSurfaceMeanKernel_C(cell.meanAirTemp_C, a, nFreeze, nThaw)) /
    life_yr
  );
}

function validInputs(c: CellInputs): boolean {
  return (
    c.meanAirTemp_C >= -60 &&
    c.meanAirTemp_C <= 40 &&
    c.airAmplitude_C >= 0 &&
    c.airAmplitude_C <= 60 &&
    c.warming_C_per_yr >= -1 &&
    c.warming_C_per_yr <= 1 &&
    Number.isInteger(c.textureClass) &&
    c.textureClass >= 1 &&
    c.textureClass <= 6 &&
    c.waterContent_m3m3 >= 0 &&
    c.waterContent_m3m3 <= 1 &&
    c.bedrockDepth_m >= 0 &&
    (Number.isNaN(c.groundTemp_C) || (c.groundTemp_C >= -40 && c.groundTemp_C <= 30)) &&
    (Number.isNaN(c.geothermalFlux_W_m2) || (c.geothermalFlux_W_m2 >= 0 && c.geothermalFlux_W_m2 <= 1)) &&
    (Number.isNaN(c.nFreeze) || (c.nFreeze >= 0.05 && c.nFreeze <= 1.5))
  );
}

/** Evaluate one cell into `m` (length ≥ METRIC_COUNT; NaN = not applicable). Never throws. */
export function evaluateCellMetrics(
  cell: CellInputs,
  k: CellConstants,
  x: KernelScratch,
  m: Float64Array,
): void {
  evaluate(cell, k, x, m, null);
}

/** The metrics groundStage writes (copied by evaluateCellMetricsSameGround). */
const GROUND_METRICS = [
  M.activeLayer,
  M.groundTemp,
  M.groundTempEnd,
  M.zeroCurtain,
  M.permafrostClassToday,
  M.permafrostClassEnd,
];

/**
 * evaluateCellMetrics of the same cell under constants that differ from those of the evaluation just
 * made into `x` and `ground` only in the heat-pump settings (the robustness perturbations of
 * class-robustness.ts): the ground stage (steps 1-3 with the end-of-life active layer), which does not
 * depend on them, is taken from that evaluation. Same results as evaluateCellMetrics.
 */
export function evaluateCellMetricsSameGround(
  cell: CellInputs,
  k: CellConstants,
  x: KernelScratch,
  m: Float64Array,
  ground: Float64Array,
): void {
  evaluate(cell, k, x, m, ground);
}

function evaluate(
  cell: CellInputs,
  k: CellConstants,
  x: KernelScratch,
  m: Float64Array,
  ground: Float64Array | null,
): void {
  m.fill(NaN);
  if (!validInputs(cell)) {
    m[M.exclusion] = EXCLUSION.outsideData;
    m[M.suitability] = 0;
    return;
  }
  const be = k.breakEven;
  m[M.breakEvenCopFuel] = be.fuel;
  m[M.breakEvenCopCo2] = be.co2;
  m[M.breakEvenCopCost] = be.cost;
  m[M.bedrockDepth] = cell.bedrockDepth_m;
  const tex = cell.textureClass;
  m[M.thawStability] = thawStabilityScore(tex, cell.waterContent_m3m3);
  const porosity = k.soil[tex].thetaMax;
  m[M.excessIce] =
    cell.waterContent_m3m3 > porosity ? (cell.waterContent_m3m3 - porosity) / (1 - porosity) : 0;

  if (ground === null) groundStage(cell, k, x, m);
  else for (const i of GROUND_METRICS) m[i] = ground[i];
  buildingStage(cell, k, x, m);
  windowStage(cell, k, x, m);
  thawStage(k, x, m);
  endOfLifeStage(cell, k, x, m);
  economicsStage(k, x, m);

  // 9. hard foundation checks, soft scores, class (cell-class.ts)
  const c = classifyCell(m, tex, k.scenario, k.weights);
  m[M.exclusion] = c.exclusion;
  m[M.suitabilityScore] = c.score;
  m[M.suitability] = c.suitability;
}

/** TTOP of a climate's degree-days (Smith & Riseborough 1996, 2002), °C (steps 2 and 3c). */
function cellTtop_C(air: DegreeDays, nF: number, nT: number, soil: SoilPoint): number {
  return ttop_C({
    freezingIndex_Cd: air.freezingIndex_Cd,
    thawingIndex_Cd: air.thawingIndex_Cd,
    nFreeze: nF,
    nThaw: nT,
    kThawed_W_mK: soil.kThawed,
    kFrozen_W_mK: soil.kFrozen,
  });
}

/** The two-phase Neumann active layer of a climate of mean `meanAir_C`, m (steps 2 and 3c). */
function cellActiveLayer_m(
  air: DegreeDays,
  meanAir_C: number,
  amplitude_C: number,
  ttop: number,
  nT: number,
  soil: SoilPoint,
): number {
  return neumannActiveLayerKernel_m(
    nT * air.thawingIndex_Cd,
    thawSeasonFraction(meanAir_C, amplitude_C),
    ttop,
    soil.kThawed,
    soil.kFrozen,
    soil.cThawed,
    soil.cFrozen,
    soil.latent,
  );
}

/** Steps 1-3: soil, forcing, TTOP, active layer, ground temperatures today and at the end of the life. */
function groundStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
  const s = k.scenario;
  const st = x.state;
  // 1-2. soil, forcing, TTOP, active layer
  const soil = soilAt(k.soil[cell.textureClass], cell.waterContent_m3m3, x.soil);
  const kF = soil.kFrozen;
  const air = degreeDays({ meanAirTemp_C: cell.meanAirTemp_C, amplitude_C: cell.airAmplitude_C });
  const nF = Number.isNaN(cell.nFreeze) ? s.ground.nFreeze : cell.nFreeze;
  const nT = s.ground.nThaw;
  const ttop = cellTtop_C(air, nF, nT, soil);
  const alt = cellActiveLayer_m(air, cell.meanAirTemp_C, cell.airAmplitude_C, ttop, nT, soil);
  m[M.activeLayer] = alt;

  // 3. ground temperatures
  const qg = Number.isNaN(cell.geothermalFlux_W_m2) ? s.ground.geothermalFlux_W_m2 : cell.geothermalFlux_W_m2;
  const grad = qg / kF;
  const zp = k.pileMidDepth_m;
  const zr = s.referenceDepth_m;
  const tPile = Number.isNaN(cell.groundTemp_C) ? ttop + grad * Math.max(0, zp - alt) : cell.groundTemp_C;
  const tRef = Number.isNaN(cell.groundTemp_C)
    ? ttop + grad * Math.max(0, zr - alt)
    : tPile + grad * (zr - zp);
  const alphaF = kF / soil.cFrozen;
  const alphaYr = alphaF * SECONDS_PER_YEAR;
  const life = s.designLife_yr;
  st.h = cellWarmingHistory(k, cell, nF, nT, x.warming);
  // Air warming at the end of the life (the active layer then): the trend's or the pathway's.
  st.airLife_K = cellAirWarming_K(k, cell, life);
  st.warmRefLife = historyWarming_K(k.tables, st.h, s.referenceDepth_m, life, alphaYr);
  const tPileEnd = groundTempEndOfLife_C(k, x, tPile, zp, life, alphaYr);
  m[M.groundTemp] = tPile;
  m[M.groundTempEnd] = tPileEnd;
  m[M.zeroCurtain] = x.zeroCurtain ? 1 : 0;
  m[M.permafrostClassToday] = permafrostClass(tPile, s.permafrostClasses);
  // Held at 0 °C by its ice: still frozen ground, warm permafrost.
  m[M.permafrostClassEnd] = x.zeroCurtain ? 1 : permafrostClass(tPileEnd, s.permafrostClasses);
  // 3c. end-of-life active layer (air warmed by the trend; piles neglected above the insulated top)
  const meanAirEnd_C = cell.meanAirTemp_C + st.airLife_K;
  const airEnd = degreeDays({ meanAirTemp_C: meanAirEnd_C, amplitude_C: cell.airAmplitude_C });
  const ttopEnd = cellTtop_C(airEnd, nF, nT, soil);
  st.altEnd = cellActiveLayer_m(airEnd, meanAirEnd_C, cell.airAmplitude_C, ttopEnd, nT, soil);
  st.nF = nF;
  st.nT = nT;
  st.ttop = ttop;
  st.alt = alt;
  st.grad = grad;
  st.tPile = tPile;
  st.tRef = tRef;
  st.alphaF = alphaF;
  st.alphaYr = alphaYr;
  st.lifeS = life * SECONDS_PER_YEAR;
}

/**
 * Step 5. standard building: design peak, annual average and the 12 monthly loads (month centres of the
 * sinusoidal year, m = 0 the coldest), each month's peak the design margin below its mean.
 */
function buildingStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
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
function windowStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
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

/** Steps 4 + 7. thaw years: sensible (conduction) part plus the latent-heat delay of years-to-thaw.ts. */
function thawStage(k: CellConstants, x: KernelScratch, m: Float64Array): void {
  const s = k.scenario;
  const st = x.state;
  const tRef = st.tRef;
  const life = s.designLife_yr;
  st.thawPilesYr = Infinity;
  if (!(tRef < 0)) return;
  const { h, alphaYr, alphaF } = st;
  const zr = s.referenceDepth_m;
  const w = x.window;
  const horizon = k.horizon_yr;
  const t0s = historyTimeToRise_yr(k.tables, h, zr, -tRef, alphaYr, Math.max(horizon, life));
  const tL = historyLatentDelay_yr(h, t0s, zr, x.soil.latent, x.soil.kThawed);
  const cP = w.carried_W_m / (2 * Math.PI * x.soil.kFrozen);
  const tPs = thawWithPiles(k, { tRef, t0: t0s, cP, h, alphaYr, alphaF, zr, horizon });
  // The front also melts its way down against the pile's cooling: the quasi-steady Stefan front of
  // years-to-thaw.ts driven by b·(t − t0) − c needs c/b longer, c the cooling at the reference point.
  const cooling = Number.isFinite(tPs)
    ? cP * flsResponse(k.tables.referencePoint, alphaF, tPs * SECONDS_PER_YEAR)
    : 0;
  // Beyond the climate horizon a thaw is "after <year>" (climate-horizon.ts): the years are capped at
  // the horizon and flagged, the delay and margin become lower bounds (delay undetermined when
  // neither thaws within the horizon).
  const t0 = t0s + tL;
  const tP = Math.max(t0, tPs + tL + historySurfaceGain_yr(h, tPs + tL, cooling));
  st.thawPilesYr = tP;
  const flag = !(t0 <= horizon)
    ? THAW_HORIZON.bothAfter
    : !(tP <= horizon)
      ? THAW_HORIZON.pilesAfter
      : THAW_HORIZON.within;
  const t0c = Math.min(t0, horizon);
  const tPc = Math.min(tP, horizon);
  m[M.thawBeyondHorizon] = flag;
  m[M.thawYear] = s.startYear + t0c;
  m[M.thawYearPiles] = s.startYear + tPc;
  m[M.thawDelay] = flag === THAW_HORIZON.bothAfter ? NaN : tPc - t0c;
  m[M.frozenMargin] = tPc - life;
}

/**
 * Steps 3b-3d (they need the carried load): the adfreeze zone at the end of the life with the piles
 * operating, the end-of-life active layer, and the structure (foundation-checks.ts).
 */
function endOfLifeStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
  const s = k.scenario;
  const st = x.state;
  const soil = x.soil;
  const kF = soil.kFrozen;
  const life = s.designLife_yr;
  const zp = k.pileMidDepth_m;
  const thawsInLife = st.thawPilesYr <= life;
  // 3b. end-of-life adfreeze zone with the piles operating (the reference point), latent-aware
  const cPiles = x.window.carried_W_m / (2 * Math.PI * kF);
  const adfEnd = st.tRef + st.warmRefLife - cPiles * st.gRefLife;
  // thawed within the life: at least 0 °C; not yet thawed: at most 0 °C (its ice still melting, the
  // zero curtain, as groundTempEndOfLife_C)
  m[M.adfreezeTempEndPiles] = thawsInLife ? Math.max(0, adfEnd) : Math.min(0, adfEnd);

  // 3c. end-of-life active layer (groundStage)
  const altEnd = st.altEnd;
  m[M.activeLayerEnd] = altEnd;

  // 3d. structure: adfreeze capacity, frost jacking, thaw settlement (foundation-checks.ts)
  const fnd = x.foundation;
  foundationKernel(
    k,
    {
      tableTemp_C: Number.isNaN(cell.groundTemp_C) ? st.ttop : st.tPile - st.grad * Math.max(0, zp - st.alt),
      activeLayer_m: st.alt,
      gradient_K_m: st.grad,
      warmingRate_K_yr: meanSurfaceRate_K_yr(st.h, life),
      diffusivity_m2_yr: st.alphaYr,
      dampingDepth_m: dampingDepth_m(st.alphaF),
    },
    {
      activeLayerEnd_m: altEnd,
      coolingEnd_K: cPiles * st.gRefLife,
      frostSusceptible: isFrostSusceptible(cell.textureClass),
      excessIce_m3m3: m[M.excessIce],
      thawsInLife,
    },
    fnd,
  );
  m[M.capacityStart] = fnd.capacityStart_kN;
  m[M.capacityEnd] = fnd.capacityEnd_kN;
  m[M.capacityEndPiles] = fnd.capacityEndPiles_kN;
  m[M.capacityKept] = fnd.capacityEndPiles_kN - fnd.capacityEnd_kN;
  m[M.frostJackingUplift] = fnd.uplift_kN;
  m[M.frostJackingRatio] = fnd.jackingRatio;
  m[M.thawSettlement] = fnd.settlement_m;
  m[M.iceRichThawYear] =
    m[M.excessIce] > s.suitability.foundation.thawUnstableExcessIce_m3m3 ? m[M.thawYearPiles] : NaN;
}

/** Step 8. economics: seasonal and system COP, fuel, CO2, cost, capital cost and payback. */
function economicsStage(k: CellConstants, x: KernelScratch, m: Float64Array): void {
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

/** Air warming of a cell `t_yr` after the start year, K: its linear trend, or the (pattern-scaled) pathway. */
function cellAirWarming_K(k: CellConstants, cell: CellInputs, t_yr: number): number {
  const p = k.pathway;
  if (!p) return cell.warming_C_per_yr * t_yr;
  const scale =
    p.patternReference_C_per_yr === null ? 1 : cell.warming_C_per_yr / p.patternReference_C_per_yr;
  const n = p.time_yr.length;
  if (t_yr >= p.time_yr[n - 1]) return scale * p.airOffset_K[n - 1];
  for (let j = 1; j < n; j++) {
    if (t_yr <= p.time_yr[j]) {
      const f = (t_yr - p.time_yr[j - 1]) / (p.time_yr[j] - p.time_yr[j - 1]);
      return scale * (p.airOffset_K[j - 1] + f * (p.airOffset_K[j] - p.airOffset_K[j - 1]));
    }
  }
  return 0;
}

/**
 * The cell's surface-warming history (step 4): the scenario's pathway when it has one (its air offsets
 * through the n-factor transfer at each knot, scaled by warming_C_per_yr / patternReference_C_per_yr
 * under pattern scaling), else the linear surface trend surfaceWarmingRate_K_per_yr.
 */
function cellWarmingHistory(
  k: CellConstants,
  cell: CellInputs,
  nF: number,
  nT: number,
  h: WarmingHistory,
): WarmingHistory {
  const p = k.pathway;
  if (!p) return setLinearHistory(h, surfaceWarmingRate_K_per_yr(cell, nF, nT, k.scenario.designLife_yr));
  const scale =
    p.patternReference_C_per_yr === null ? 1 : cell.warming_C_per_yr / p.patternReference_C_per_yr;
  const sensitivity = surfaceMeanSensitivity({
    meanAirTemp_C: cell.meanAirTemp_C,
    amplitude_C: cell.airAmplitude_C,
    nFreeze: nF,
    nThaw: nT,
  });
  return setPathwayHistory(h, p, scale, {
    meanAirTemp_C: cell.meanAirTemp_C,
    airAmplitude_C: cell.airAmplitude_C,
    nFreeze: nF,
    nThaw: nT,
    sensitivity,
  });
}

/**
 * Ground temperature at depth z at the end of the design life without piles, latent-aware (step 3):
 * the conduction response T + W(life) while it stays below 0 °C; once it passes 0 °C (at t0) the
 * ground's ice must melt first, for the latent delay t_L (surface-warming-history.ts), the same split
 * as the thaw years: until t0 + t_L the ground sits at its freezing point, 0 °C (zero curtain,
 * x.zeroCurtain set; freezing-point depression of fine soils neglected, as in the thaw years); after
 * it, the response delayed by t_L, T + W(life − t_L) ≥ 0. Ground unfrozen today (T ≥ 0) keeps the
 * conduction response. So a cell ends its life above 0 °C exactly when its thaw year at that depth
 * falls within the life.
 */
function groundTempEndOfLife_C(
  k: CellConstants,
  x: KernelScratch,
  t_C: number,
  z_m: number,
  life: number,
  alphaYr: number,
): number {
  x.zeroCurtain = false;
  const h = x.warming;
  const ramp = t_C + historyWarming_K(k.tables, h, z_m, life, alphaYr);
  if (!(t_C < 0) || ramp < 0) return ramp;
  const t0 = historyTimeToRise_yr(k.tables, h, z_m, -t_C, alphaYr, life);
  const tL = historyLatentDelay_yr(h, t0, z_m, x.soil.latent, x.soil.kThawed);
  if (!(t0 + tL <= life)) {
    x.zeroCurtain = true;
    return 0;
  }
  return t_C + historyWarming_K(k.tables, h, z_m, life - tL, alphaYr);
}

/** Temperature at the reference point minus 0 °C after t years with the piles operating. */
function excessWithPiles(k: CellConstants, p: ThawSearch, t: number): number {
  return (
    p.tRef +
    historyWarming_K(k.tables, p.h, p.zr, t, p.alphaYr) -
    p.cP * flsResponse(k.tables.referencePoint, p.alphaF, t * SECONDS_PER_YEAR)
  );
}

interface ThawSearch {
  tRef: number;
  t0: number;
  cP: number;
  h: WarmingHistory;
  alphaYr: number;
  alphaF: number;
  zr: number;
  horizon: number;
}

/**
 * Years to thaw at the reference point with the piles operating (step 7): forward search from the
 * no-pile thaw time with steps growing 1.6× (first step: the time the surface trend needs to make up
 * the pile's cooling at t0), then the Illinois variant of regula falsi to 0.01 yr.
 */
function thawWithPiles(k: CellConstants, p: ThawSearch): number {
  if (!Number.isFinite(p.t0)) return Infinity;
  if (!(p.cP > 0)) return p.t0;
  let lo = p.t0;
  let fLo = excessWithPiles(k, p, lo);
  if (fLo >= 0) return lo;
  const rate = meanSurfaceRate_K_yr(p.h, Math.max(p.t0, 1));
  let dt = rate > 0 ? Math.max(0.25, -fLo / rate) : 1;
  let hi = Math.min(p.horizon, lo + dt);
  let fHi = excessWithPiles(k, p, hi);
  while (fHi < 0) {
    if (hi >= p.horizon) return Infinity;
    lo = hi;
    fLo = fHi;
    dt *= 1.6;
    hi = Math.min(p.horizon, lo + dt);
    fHi = excessWithPiles(k, p, hi);
  }
  let side = 0;
  for (let i = 0; i < 40 && hi - lo > 0.01; i++) {
    const t = (lo * fHi - hi * fLo) / (fHi - fLo);
    const ft = excessWithPiles(k, p, t);
    if (ft >= 0) {
      hi = t;
      fHi = ft;
      if (side === 1) fLo /= 2;
      side = 1;
    } else {
      lo = t;
      fLo = ft;
      if (side === -1) fHi /= 2;
      side = -1;
    }
    if (Math.abs(ft) < 1e-6) return t;
  }
  return hi;
}

const FIELD_MONTH = new Float64Array(1);
const FIELD_AVAILABLE = new Float64Array(MONTHS);

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
