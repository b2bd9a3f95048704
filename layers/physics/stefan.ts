import { SECONDS_PER_DAY } from './surface-forcing';
import { requireNonNegative, requirePositive } from './validate';

/**
 * The Stefan equation for the depth of thaw (or frost) under a surface index I (°C·day, already
 * multiplied by its n-factor), e.g. Lunardini (1981), Heat Transfer in Cold Climates, ch. 9; Aldrich &
 * Paynter (1953):
 *
 *   X = √(2·k·I·86400 / L)
 *
 * k conductivity of the thawed (frozen) layer, L volumetric latent heat, J/m³. Neglects the sensible
 * heat of the layer (Stefan number → 0), so it over-predicts: by ~1.5 % at Ste = 0.05 and ~3 % at
 * Ste = 0.1 relative to the one-phase Neumann solution (see neumann.ts).
 */
export function stefanDepth_m(input: {
  conductivity_W_mK: number;
  index_Cd: number;
  latent_J_m3: number;
}): number {
  const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK, 'W/m/K');
  const index = requireNonNegative('index_Cd', input.index_Cd, 'C day');
  const L = requirePositive('latent_J_m3', input.latent_J_m3, 'J/m3');
  return Math.sqrt((2 * k * index * SECONDS_PER_DAY) / L);
}

/**
 * Inverse Stefan: time for a front to reach `depth_m` under a constant surface temperature excess
 * `temperatureExcess_K` above the freezing point: t = L·X² / (2·k·ΔT), s.
 */
export function stefanTime_s(input: {
  conductivity_W_mK: number;
  depth_m: number;
  temperatureExcess_K: number;
  latent_J_m3: number;
}): number {
  const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK, 'W/m/K');
  const x = requireNonNegative('depth_m', input.depth_m, 'm');
  const dT = requirePositive('temperatureExcess_K', input.temperatureExcess_K, 'K');
  const L = requirePositive('latent_J_m3', input.latent_J_m3, 'J/m3');
  return (L * x * x) / (2 * k * dT);
}
