import { kusudaAchenbachTemp_C } from './ground-temperature-wave';
import { trendResponse_C } from './carslaw-jaeger-surface-response';
import { geothermalGradient_K_m } from './geothermal-gradient';
import type { WarmingTrend } from './surface-forcing';
import { requirePositive } from './validate';

/**
 * Ground temperature T(z, t) for the cheap per-cell model, by superposition of three conduction
 * solutions in a homogeneous half-space (the heat equation is linear, so they add):
 *
 *   T(z, t) = T̄_0 + (q_g/k)·z                                  steady mean + geothermal gradient
 *           − A_s·e^(−z/d)·cos(ω(t − t_min) − z/d)             Kusuda & Achenbach (1965) annual wave
 *           + Σ ramp/step responses of the surface trend       Carslaw & Jaeger (1959) §2.4–2.5
 *
 * T̄_0 is the mean annual temperature at the ground surface (or at the top of permafrost, TTOP, to carry
 * the thermal offset of the active layer). Approximations: no latent heat (phase change retards both the
 * wave in the active layer and the warming front: see years-to-thaw.ts), one conductivity and one
 * diffusivity for all depths, the surface mean follows the trend one-to-one (n-factors held fixed).
 */
export interface GroundTemperatureInput {
  depth_m: number;
  /** Time since the start of the scenario, s. */
  time_s: number;
  meanSurfaceTemp_C: number;
  surfaceAmplitude_C: number;
  diffusivity_m2_s: number;
  conductivity_W_mK: number;
  geothermalFlux_W_m2: number;
  trend?: WarmingTrend;
  coldestDay?: number;
}

export function groundTemperature_C(input: GroundTemperatureInput): number {
  const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK, 'W/m/K');
  const wave = kusudaAchenbachTemp_C(input);
  const geo = geothermalGradient_K_m(input.geothermalFlux_W_m2, k) * input.depth_m;
  const trend = input.trend
    ? trendResponse_C({
        depth_m: input.depth_m,
        time_s: input.time_s,
        diffusivity_m2_s: input.diffusivity_m2_s,
        trend: input.trend,
      })
    : 0;
  return wave + geo + trend;
}

/** Mean annual ground temperature at depth and time (the same superposition without the annual wave), °C. */
export function meanGroundTemperature_C(
  input: Omit<GroundTemperatureInput, 'surfaceAmplitude_C' | 'coldestDay'>,
): number {
  return groundTemperature_C({ ...input, surfaceAmplitude_C: 0 });
}
