/** The per-cell kernel's scratch and the figures its stages hand on (cell-kernel.ts). */
import { SECONDS_PER_YEAR } from '../physics/surface-forcing';
import type { SoilPoint } from './cell-constants';
import { createWarmingHistory, type WarmingHistory } from './surface-warming-history';
import type { WindowResult } from './operating-window';
import { createBivalentResult, type BivalentResult } from './bivalent-operation';
import { MONTHS } from './monthly-peak';
import { createFoundationResult, type FoundationResult } from './foundation-checks';
import { createSystemResult, type SystemResult } from './system-cop';

/** One refrigeration ton, W: 12 000 Btu_IT/h (reference-values §12). */
export const TON_W = 3516.853;
export const MONTH_S = SECONDS_PER_YEAR / 12;
/** Duration of the peak pulse, s: 6 h (Kavanaugh & Rafferty 1997; as layers/site/pile-sizing.ts). */
export const PEAK_S = 6 * 3600;
export const HOURS_PER_YEAR = 8760;

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
