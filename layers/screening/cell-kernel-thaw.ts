/**
 * Steps 7 and 3b-3d of the per-cell kernel (cell-kernel.ts, whose module comment documents the method):
 * the thaw years with and without the piles, and the end-of-life adfreeze zone, active layer and
 * structure.
 */
import { SECONDS_PER_YEAR } from '../physics/surface-forcing';
import { dampingDepth_m } from '../physics/ground-temperature-wave';
import type { CellInputs } from './screening-model';
import type { CellConstants } from './cell-constants';
import { flsResponse } from './response-tables';
import {
  historyLatentDelay_yr,
  historySurfaceGain_yr,
  historyTimeToRise_yr,
  historyWarming_K,
  meanSurfaceRate_K_yr,
  type WarmingHistory,
} from './surface-warming-history';
import { isFrostSusceptible } from './suitability';
import { METRIC as M } from './cell-layers';
import { THAW_HORIZON } from './climate-horizon';
import { foundationKernel } from './foundation-checks';
import { type KernelScratch } from './cell-kernel-state';

/** Steps 4 + 7. thaw years: sensible (conduction) part plus the latent-heat delay of years-to-thaw.ts. */
export function thawStage(k: CellConstants, x: KernelScratch, m: Float64Array): void {
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
export function endOfLifeStage(cell: CellInputs, k: CellConstants, x: KernelScratch, m: Float64Array): void {
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
