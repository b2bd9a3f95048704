import { SOIL_CONSTITUENTS as S } from './soil-constituents';
import { requireRange } from './validate';

/**
 * Volumetric heat capacity of soil as the volume-weighted sum of its constituents, de Vries (1963),
 * "Thermal properties of soils", in van Wijk (ed.), Physics of Plant Environment, ch. 7, eq. (7.1):
 *
 *   C = Σ ρ_i c_i θ_i = ρ_m c_m θ_m + ρ_o c_o θ_o + ρ_w c_w θ_w + ρ_i c_i θ_ice    (air neglected, ~1e3 J/m³K)
 *
 * with θ the volume fractions. Constituent values in soil-constituents.ts.
 */
export interface HeatCapacityInput {
  /** Volume fraction of mineral solids, m³/m³. */
  mineralFraction: number;
  /** Volume fraction of organic solids, m³/m³ (default 0). */
  organicFraction?: number;
  /** Volume fraction of liquid water, m³/m³. */
  liquidWater_m3m3: number;
  /** Volume fraction of ice, m³/m³ (default 0). */
  ice_m3m3?: number;
  /** Volumetric heat capacity of the mineral solids, J/m³·K (default 2650 kg/m³ × 840 J/kg·K). */
  mineralHeatCapacity_J_m3K?: number;
}

export function deVriesHeatCapacity_J_m3K(input: HeatCapacityInput): number {
  const xm = requireRange('mineralFraction', input.mineralFraction, 0, 1);
  const xo = requireRange('organicFraction', input.organicFraction ?? 0, 0, 1);
  const xw = requireRange('liquidWater_m3m3', input.liquidWater_m3m3, 0, 1, 'm3/m3');
  const xi = requireRange('ice_m3m3', input.ice_m3m3 ?? 0, 0, 1, 'm3/m3');
  if (xm + xo + xw + xi > 1 + 1e-12) {
    throw new RangeError(
      `mineralFraction + organicFraction + liquidWater_m3m3 + ice_m3m3 must be <= 1; received ${xm + xo + xw + xi}`,
    );
  }
  const cm = requireRange(
    'mineralHeatCapacity_J_m3K',
    input.mineralHeatCapacity_J_m3K ?? S.mineralSolidsDensity_kg_m3 * S.mineralSpecificHeat_J_kgK,
    1e5,
    1e7,
    'J/m3/K',
  );
  return (
    cm * xm +
    S.organicSolidsDensity_kg_m3 * S.organicSpecificHeat_J_kgK * xo +
    S.waterDensity_kg_m3 * S.waterSpecificHeat_J_kgK * xw +
    S.iceDensity_kg_m3 * S.iceSpecificHeat_J_kgK * xi
  );
}

/**
 * Volumetric latent heat of the pore water that freezes, J/m³: L = ρ_w · L_f · (θ − θu), with
 * L_f = 333.6 kJ/kg (CRC Handbook) and ρ_w = 1000 kg/m³. θ total volumetric water + ice, θu the part
 * that stays unfrozen (default 0). For gravimetric water content w and dry density ρd, θ = w·ρd/ρ_w.
 */
export function volumetricLatentHeat_J_m3(waterContent_m3m3: number, unfrozenWater_m3m3 = 0): number {
  const theta = requireRange('waterContent_m3m3', waterContent_m3m3, 0, 1, 'm3/m3');
  const thetaU = requireRange('unfrozenWater_m3m3', unfrozenWater_m3m3, 0, theta, 'm3/m3 (0..waterContent)');
  return S.waterDensity_kg_m3 * S.latentHeatFusion_J_kg * (theta - thetaU);
}
