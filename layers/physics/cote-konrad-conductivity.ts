import { SOIL_CONSTITUENTS as S } from './soil-constituents';
import { requireOneOf, requireRange } from './validate';
import type { WaterState } from './johansen-conductivity';

/**
 * Thermal conductivity by Côté & Konrad (2005), "A generalized thermal conductivity model for soils
 * and construction materials", Can. Geotech. J. 42:443–458 (equations and parameters recalled from
 * memory, medium-high confidence). Used here as the alternative to Johansen for mineral soils and as
 * the model for organic soils (peat), for which Johansen's relations do not hold.
 *
 *   k = (k_sat − k_dry)·Ke + k_dry,  Ke = κ·Sr / (1 + (κ − 1)·Sr),  k_dry = χ·10^(−η·n)
 *   k_sat: geometric mean as in Johansen (solids^(1−n) · water or ice^n).
 *
 * κ (thawed/frozen): gravel & coarse sand 4.60/1.70; medium & fine sand 3.55/0.95; silt & clay
 * 1.90/0.85; organic fibrous soils 0.60/0.25. (χ, η): natural mineral soils 0.75/1.20; crushed rock
 * 1.70/1.80; organic fibrous soils 0.30/0.87.
 */
export const COTE_KONRAD_KAPPA = {
  gravelCoarseSand: { thawed: 4.6, frozen: 1.7 },
  mediumFineSand: { thawed: 3.55, frozen: 0.95 },
  siltClay: { thawed: 1.9, frozen: 0.85 },
  organicFibrous: { thawed: 0.6, frozen: 0.25 },
} as const;
export type CoteKonradSoilGroup = keyof typeof COTE_KONRAD_KAPPA;

export const COTE_KONRAD_DRY = {
  naturalMineral: { chi_W_mK: 0.75, eta: 1.2 },
  crushedRock: { chi_W_mK: 1.7, eta: 1.8 },
  organicFibrous: { chi_W_mK: 0.3, eta: 0.87 },
} as const;
export type CoteKonradDryClass = keyof typeof COTE_KONRAD_DRY;

export interface CoteKonradInput {
  porosity: number;
  waterContent_m3m3: number;
  solidsConductivity_W_mK: number;
  group: CoteKonradSoilGroup;
  dryClass: CoteKonradDryClass;
  state: WaterState;
}

/** Côté–Konrad (2005) conductivity, W/m·K. Throws on out-of-domain input. */
export function coteKonradConductivity_W_mK(input: CoteKonradInput): number {
  const n = requireRange('porosity', input.porosity, 0.01, 0.99);
  const theta = requireRange('waterContent_m3m3', input.waterContent_m3m3, 0, n, 'm3/m3 (0..porosity)');
  const ks = requireRange('solidsConductivity_W_mK', input.solidsConductivity_W_mK, 0.01, 20, 'W/m/K');
  const group = requireOneOf('group', input.group, Object.keys(COTE_KONRAD_KAPPA) as CoteKonradSoilGroup[]);
  const dry = requireOneOf('dryClass', input.dryClass, Object.keys(COTE_KONRAD_DRY) as CoteKonradDryClass[]);
  const state = requireOneOf('state', input.state, ['frozen', 'thawed'] as const);
  const kappa = COTE_KONRAD_KAPPA[group][state];
  const { chi_W_mK, eta } = COTE_KONRAD_DRY[dry];
  const kdry = chi_W_mK * Math.pow(10, -eta * n);
  const fluid = state === 'thawed' ? S.waterConductivity_W_mK : S.iceConductivity_W_mK;
  const ksat = Math.pow(ks, 1 - n) * Math.pow(fluid, n);
  const sr = theta / n;
  const ke = (kappa * sr) / (1 + (kappa - 1) * sr);
  return (ksat - kdry) * ke + kdry;
}
