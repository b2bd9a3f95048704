/**
 * Steps 1-4 of the per-cell kernel (cell-kernel.ts, whose module comment documents the method): soil,
 * forcing, TTOP, the active layer today and at the end of the life, ground temperatures and the
 * cell's surface-warming history.
 */
import {
  degreeDays,
  type DegreeDays,
  SECONDS_PER_YEAR,
  nFactorSurfaceMeanKernel_C,
  surfaceMeanSensitivity,
  thawSeasonFraction,
} from '../physics/surface-forcing';
import { ttop_C } from '../physics/ttop';
import { neumannActiveLayerKernel_m } from '../physics/neumann-active-layer';
import type { CellInputs } from './screening-model';
import { soilAt, type CellConstants, type SoilPoint } from './cell-constants';
import {
  historyLatentDelay_yr,
  historyTimeToRise_yr,
  historyWarming_K,
  setLinearHistory,
  setPathwayHistory,
  type WarmingHistory,
} from './surface-warming-history';
import { permafrostClass } from './suitability';
import { METRIC as M } from './cell-layers';
import { type KernelScratch } from './cell-kernel-state';

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
export function groundStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
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
