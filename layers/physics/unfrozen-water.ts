import { SOIL_CONSTITUENTS as S } from './soil-constituents';
import { requirePositive, requireRange } from './validate';

/**
 * Unfrozen water content of frozen fine-grained soil, Anderson & Tice (1972), "Predicting unfrozen
 * water contents in frozen soils from surface area measurements", Highway Research Record 393:12–18
 * (equation recalled from memory, medium-high confidence):
 *
 *   ln w_u = 0.2618 + 0.5519·ln S − 1.449·S^(−0.264)·ln θ
 *
 * w_u gravimetric unfrozen water in % of dry mass, S specific surface area in m²/g, θ = degrees
 * below 0 °C (K). Fitted for roughly 0.1 ≤ θ ≤ 20 K and fine soils (S ≳ 5 m²/g); at θ → 0 the power
 * curve diverges and is capped at the total water content, which defines the freezing point.
 * Coarse soils (sand, gravel) are taken to freeze completely at 0 °C.
 */
export interface UnfrozenWaterInput {
  temperature_C: number;
  specificSurface_m2_g: number;
  dryDensity_kg_m3: number;
  /** Total volumetric water + ice content, m³/m³ (caps the result). */
  waterContent_m3m3: number;
}

/** Anderson–Tice gravimetric unfrozen water content in percent of dry mass at `degreesBelow_K` > 0. */
export function andersonTiceGravimetric_percent(
  degreesBelow_K: number,
  specificSurface_m2_g: number,
): number {
  const t = requirePositive('degreesBelow_K', degreesBelow_K, 'K');
  const s = requireRange('specificSurface_m2_g', specificSurface_m2_g, 0.1, 1000, 'm2/g');
  return Math.exp(0.2618 + 0.5519 * Math.log(s) - 1.449 * Math.pow(s, -0.264) * Math.log(t));
}

/** Volumetric unfrozen water content θu (m³/m³) at a temperature, capped by the total water content. */
export function unfrozenWaterContent_m3m3(input: UnfrozenWaterInput): number {
  const temp = requireRange('temperature_C', input.temperature_C, -273.15, 100, 'C');
  const rhoD = requireRange('dryDensity_kg_m3', input.dryDensity_kg_m3, 1, 3000, 'kg/m3');
  const theta = requireRange('waterContent_m3m3', input.waterContent_m3m3, 0, 1, 'm3/m3');
  requireRange('specificSurface_m2_g', input.specificSurface_m2_g, 0.1, 1000, 'm2/g');
  if (temp >= 0) return theta;
  const wu = andersonTiceGravimetric_percent(-temp, input.specificSurface_m2_g) / 100;
  return Math.min(theta, (wu * rhoD) / S.waterDensity_kg_m3);
}

/**
 * Freezing point of the pore water, °C: the temperature at which the Anderson–Tice curve equals the
 * total water content, T_f = −(w/α)^(1/β) with α = e^0.2618·S^0.5519 (%), β = −1.449·S^(−0.264).
 * Capped at 0 °C (wet soil whose curve reaches its water content above 0 °C freezes at 0 °C). Solutes
 * are not modelled (saline permafrost freezes lower; say so in any report that relies on it).
 */
export function freezingPoint_C(input: Omit<UnfrozenWaterInput, 'temperature_C'>): number {
  const rhoD = requireRange('dryDensity_kg_m3', input.dryDensity_kg_m3, 1, 3000, 'kg/m3');
  const theta = requireRange('waterContent_m3m3', input.waterContent_m3m3, 0, 1, 'm3/m3');
  const s = requireRange('specificSurface_m2_g', input.specificSurface_m2_g, 0.1, 1000, 'm2/g');
  if (theta === 0) return 0;
  const wPercent = ((theta * S.waterDensity_kg_m3) / rhoD) * 100;
  const alpha = Math.exp(0.2618 + 0.5519 * Math.log(s));
  const beta = -1.449 * Math.pow(s, -0.264);
  const depression = Math.pow(wPercent / alpha, 1 / beta);
  return Math.min(0, -depression);
}
