import { PERIOD_DAYS } from './surface-forcing';
import { requireNFactor } from './surface-forcing';
import { requireNonNegative, requirePositive } from './validate';

/**
 * TTOP, the mean annual temperature at the top of permafrost, Smith & Riseborough (1996), Permafrost
 * and Periglacial Processes 7:301–309, and (2002) 13:1–15 (equation recalled from memory, high confidence):
 *
 *   TTOP = (r_k·n_t·I_t − n_f·I_f)/P    if r_k·n_t·I_t − n_f·I_f ≤ 0   (permafrost: TTOP ≤ 0)
 *   TTOP = (n_t·I_t − n_f·I_f/r_k)/P    otherwise                      (no permafrost: TTOP > 0)
 *
 * r_k = k_thawed/k_frozen, P = 365 days, I_t and I_f air thawing and freezing indices (°C·day).
 * The thermal offset (TTOP − MAGST) comes from the conductivity contrast alone; it assumes conduction
 * in the active layer and a steady climate.
 */
export interface TtopInput {
  freezingIndex_Cd: number;
  thawingIndex_Cd: number;
  nFreeze: number;
  nThaw: number;
  kThawed_W_mK: number;
  kFrozen_W_mK: number;
}

export function ttop_C(input: TtopInput): number {
  const fi = requireNonNegative('freezingIndex_Cd', input.freezingIndex_Cd, 'C day');
  const ti = requireNonNegative('thawingIndex_Cd', input.thawingIndex_Cd, 'C day');
  const nf = requireNFactor('nFreeze', input.nFreeze);
  const nt = requireNFactor('nThaw', input.nThaw);
  const rk =
    requirePositive('kThawed_W_mK', input.kThawed_W_mK, 'W/m/K') /
    requirePositive('kFrozen_W_mK', input.kFrozen_W_mK, 'W/m/K');
  const numerator = rk * nt * ti - nf * fi;
  if (numerator <= 0) return numerator / PERIOD_DAYS;
  return (nt * ti - (nf * fi) / rk) / PERIOD_DAYS;
}

/** Mean annual ground-surface temperature MAGST = (n_t·I_t − n_f·I_f)/P, °C. */
export function meanSurfaceTemp_C(input: Omit<TtopInput, 'kThawed_W_mK' | 'kFrozen_W_mK'>): number {
  const fi = requireNonNegative('freezingIndex_Cd', input.freezingIndex_Cd, 'C day');
  const ti = requireNonNegative('thawingIndex_Cd', input.thawingIndex_Cd, 'C day');
  return (
    (requireNFactor('nThaw', input.nThaw) * ti - requireNFactor('nFreeze', input.nFreeze) * fi) / PERIOD_DAYS
  );
}
