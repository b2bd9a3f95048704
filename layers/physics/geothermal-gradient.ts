import { requirePositive, requireRange } from './validate';

/**
 * Steady geothermal gradient from Fourier's law: dT/dz = q_g/k, so T(z) = T_top + q_g·z/k in a
 * homogeneous layer (Carslaw & Jaeger 1959, §1.6 steady linear flow). Layered ground: the increments
 * q_g·Δz_i/k_i add (series resistances).
 */
/** Default geothermal heat flux, W/m² (continental average about 0.065; common practice). */
export const DEFAULT_GEOTHERMAL_FLUX_W_M2 = 0.06;

export function geothermalGradient_K_m(geothermalFlux_W_m2: number, conductivity_W_mK: number): number {
  const q = requireRange('geothermalFlux_W_m2', geothermalFlux_W_m2, 0, 1, 'W/m2');
  const k = requirePositive('conductivity_W_mK', conductivity_W_mK, 'W/m/K');
  return q / k;
}

/** Temperature rise from the geothermal flux through layers of given thickness and conductivity down to depth_m, K. */
export function geothermalRise_C(input: {
  depth_m: number;
  geothermalFlux_W_m2: number;
  layers: { thickness_m: number; conductivity_W_mK: number }[];
}): number {
  const z = requireRange('depth_m', input.depth_m, 0, 1e4, 'm');
  const q = requireRange('geothermalFlux_W_m2', input.geothermalFlux_W_m2, 0, 1, 'W/m2');
  if (input.layers.length === 0) throw new RangeError('layers must hold at least one layer; received 0');
  let remaining = z;
  let rise = 0;
  for (let i = 0; i < input.layers.length && remaining > 0; i++) {
    const last = i === input.layers.length - 1;
    const th = last
      ? Infinity
      : requirePositive(`layers[${i}].thickness_m`, input.layers[i].thickness_m, 'm');
    const k = requirePositive(`layers[${i}].conductivity_W_mK`, input.layers[i].conductivity_W_mK, 'W/m/K');
    const dz = Math.min(remaining, th);
    rise += (q * dz) / k;
    remaining -= dz;
  }
  return rise;
}
