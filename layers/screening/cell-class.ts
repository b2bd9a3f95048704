/**
 * The suitability class of one cell as a pure function of the cell's outputs (the metric array of
 * cell-kernel.ts, indexed by METRIC) and the scenario: hard foundation checks first, then the weighted
 * soft criteria (suitability.ts). Used by the kernel, by the robustness test (class-robustness.ts) and
 * by ensemble classification.
 *
 * Hard checks, in order (the first failure is the exclusion reason, EXCLUSION codes):
 *  2 rock: bedrock texture, or bedrock shallower than the pile tip plus suitability.foundation.rockMargin_m;
 *  3 no permafrost at pile depth today; 4 active layer at or below the reference depth;
 *  6 adfreeze zone warmer than maxAdfreezeTempEnd_C at the end of the life with the piles operating
 *    (also when not determined);
 *  7 thaw-unstable ground (excess ice above thawUnstableExcessIce_m3m3) thawing at the reference
 *    depth with the piles operating no later than the end of the life plus thawMargin_yr (a thaw after
 *    the climate horizon is capped at the horizon year: cautious when the horizon comes first);
 *  8 frost-jacking demand over anchorage above 1 (also when not determined);
 *  5 fluid limit: the fluid cannot take heat above the heat pump's minimum entering temperature.
 * Soft score: Σ w_i·score_i over SOFT_CRITERIA_IDS (linear scores, a missing value scores 0);
 * class 3 good ≥ goodScore, 2 fair ≥ fairScore, else 1 poor.
 */
import type { Scenario } from './scenario';
import { METRIC as M } from './cell-layers';
import { EXCLUSION, linearScore, SOFT_CRITERIA_BANDS, softRanges, suitabilityClass } from './suitability';

export interface CellClass {
  exclusion: number;
  /** Weighted soft score 0..1 (NaN where excluded). */
  score: number;
  /** 0 excluded, 1 poor, 2 fair, 3 good. */
  suitability: number;
}

/** Hard foundation checks: the EXCLUSION code of the first that fails (0 none). */
export function exclusionOf(m: ArrayLike<number>, textureClass: number, s: Scenario): number {
  const f = s.suitability.foundation;
  if (m[M.exclusion] === EXCLUSION.outsideData) return EXCLUSION.outsideData;
  const tip = s.pile.topDepth_m + s.pile.length_m;
  if (textureClass === 6 || !(m[M.bedrockDepth] >= tip + f.rockMargin_m)) return EXCLUSION.bedrockShallow;
  if (!(m[M.groundTemp] < 0)) return EXCLUSION.noPermafrost;
  if (m[M.activeLayer] >= s.referenceDepth_m) return EXCLUSION.alreadyThawed;
  if (!(m[M.adfreezeTempEndPiles] <= f.maxAdfreezeTempEnd_C)) return EXCLUSION.adfreezeWarm;
  if (m[M.iceRichThawYear] <= s.startYear + s.designLife_yr + f.thawMargin_yr) return EXCLUSION.thawUnstable;
  if (!(m[M.frostJackingRatio] <= 1)) return EXCLUSION.frostJacking;
  // No month of the design (monthly-peak.ts) can give heat at the peak (the sizing has no answer), or
  // the bivalent operation carries nothing (bivalent-operation.ts: ground no warmer than the limit).
  if (!(m[M.extractionPerPile] > 0) || !(m[M.windowUpperFluid] > 0)) return EXCLUSION.fluidLimit;
  return EXCLUSION.none;
}

interface SoftTable {
  band: Int32Array;
  good: Float64Array;
  poor: Float64Array;
}
const softTables = new WeakMap<Scenario, SoftTable>();

/** Band indices and scoring ranges of a scenario's soft criteria (cached per scenario object). */
function softTable(s: Scenario): SoftTable {
  let t = softTables.get(s);
  if (!t) {
    const r = softRanges(s);
    t = {
      band: Int32Array.from(SOFT_CRITERIA_BANDS, (b) => M[b]),
      good: Float64Array.from(r, (x) => x[0]),
      poor: Float64Array.from(r, (x) => x[1]),
    };
    softTables.set(s, t);
  }
  return t;
}

/** Weighted soft score with normalised `weights` (SOFT_CRITERIA_IDS order). */
export function softScore(m: ArrayLike<number>, s: Scenario, weights: ArrayLike<number>): number {
  const t = softTable(s);
  let score = 0;
  for (let i = 0; i < t.band.length; i++)
    score += weights[i] * linearScore(m[t.band[i]], t.good[i], t.poor[i]);
  return score;
}

/** The class of one cell from its outputs, texture and the scenario (normalised soft `weights`). */
export function classifyCell(
  m: ArrayLike<number>,
  textureClass: number,
  s: Scenario,
  weights: ArrayLike<number>,
): CellClass {
  const exclusion = exclusionOf(m, textureClass, s);
  if (exclusion !== EXCLUSION.none) return { exclusion, score: NaN, suitability: 0 };
  const score = softScore(m, s, weights);
  return { exclusion, score, suitability: suitabilityClass(score, s.suitability) };
}
