import { erfc, i2erfc } from './special-functions';
import type { WarmingTrend } from './surface-forcing';
import { SECONDS_PER_YEAR, warmingOffset_C } from './surface-forcing';
import { requireFinite, requireNonNegative, requirePositive, requireRange } from './validate';

/**
 * Response of a semi-infinite solid x ≥ 0, initially at uniform temperature, to a change of its surface
 * temperature, Carslaw & Jaeger (1959), Conduction of Heat in Solids, 2nd ed., §2.4 and §2.5:
 *
 *   step ΔT at t = 0:          T − T_i = ΔT·erfc(ξ),            ξ = x/(2√(αt))      (§2.4, eq. 2)
 *   ramp T(0,t) = T_i + b·t:   T − T_i = 4·b·t·i²erfc(ξ)                           (§2.5, n = 2 case)
 *   ramp surface heat flux:    q = 2·k·b·√(t/(πα))   (from i erfc 0 = 1/√π), into the ground
 *
 * A piecewise-linear surface history (a warming scenario) is the superposition of one step for the
 * initial jump and one ramp per change of slope (linearity of the heat equation). Conduction only: no
 * latent heat, homogeneous ground. At t ≤ 0 the response is 0; at x = 0 it equals the surface change.
 */
function xi(depth_m: number, time_s: number, diffusivity_m2_s: number): number {
  return depth_m / (2 * Math.sqrt(diffusivity_m2_s * time_s));
}

export function stepResponse_C(input: {
  depth_m: number;
  time_s: number;
  diffusivity_m2_s: number;
  step_C: number;
}): number {
  const x = requireNonNegative('depth_m', input.depth_m, 'm');
  const t = requireFinite('time_s', input.time_s);
  const a = requirePositive('diffusivity_m2_s', input.diffusivity_m2_s, 'm2/s');
  const dT = requireRange('step_C', input.step_C, -100, 100, 'K');
  if (t <= 0) return 0;
  return dT * erfc(xi(x, t, a));
}

export function rampResponse_C(input: {
  depth_m: number;
  time_s: number;
  diffusivity_m2_s: number;
  rate_C_per_s: number;
}): number {
  const x = requireNonNegative('depth_m', input.depth_m, 'm');
  const t = requireFinite('time_s', input.time_s);
  const a = requirePositive('diffusivity_m2_s', input.diffusivity_m2_s, 'm2/s');
  const b = requireRange('rate_C_per_s', input.rate_C_per_s, -1e-3, 1e-3, 'K/s');
  if (t <= 0) return 0;
  return 4 * b * t * i2erfc(xi(x, t, a));
}

/** Heat flux into the ground at the surface under the ramp, W/m²: 2·k·b·√(t/(πα)). */
export function rampSurfaceFlux_W_m2(input: {
  conductivity_W_mK: number;
  diffusivity_m2_s: number;
  rate_C_per_s: number;
  time_s: number;
}): number {
  const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK, 'W/m/K');
  const a = requirePositive('diffusivity_m2_s', input.diffusivity_m2_s, 'm2/s');
  const b = requireRange('rate_C_per_s', input.rate_C_per_s, -1e-3, 1e-3, 'K/s');
  const t = requireNonNegative('time_s', input.time_s, 's');
  return 2 * k * b * Math.sqrt(t / (Math.PI * a));
}

/**
 * Response at depth to a warming trend applied at the surface from t = 0 (offset 0 before), by
 * superposition of ramps at each knot of the trend (a linear trend is a single ramp). A piecewise
 * trend's initial offset at year 0, if not zero, enters as a step.
 */
export function trendResponse_C(input: {
  depth_m: number;
  time_s: number;
  diffusivity_m2_s: number;
  trend: WarmingTrend;
}): number {
  const { depth_m, time_s, diffusivity_m2_s, trend } = input;
  if (trend.kind === 'linear') {
    return rampResponse_C({
      depth_m,
      time_s,
      diffusivity_m2_s,
      rate_C_per_s: trend.rate_C_per_yr / SECONDS_PER_YEAR,
    });
  }
  warmingOffset_C(trend, 0); // validates the table
  // Knots at or after year 0, with the slope of each segment; the offset is held before the first and after the last point.
  const knots = trend.points.filter((p) => p.year > 0).map((p) => p.year);
  const times = [0, ...knots];
  let total = stepResponse_C({ depth_m, time_s, diffusivity_m2_s, step_C: warmingOffset_C(trend, 0) });
  let prevSlope = 0;
  for (let i = 0; i < times.length; i++) {
    const start = times[i];
    const end = i + 1 < times.length ? times[i + 1] : start + 1;
    const slope =
      i + 1 < times.length
        ? (warmingOffset_C(trend, end) - warmingOffset_C(trend, start)) / (end - start)
        : 0;
    const change = slope - prevSlope;
    if (change !== 0) {
      total += rampResponse_C({
        depth_m,
        time_s: time_s - start * SECONDS_PER_YEAR,
        diffusivity_m2_s,
        rate_C_per_s: change / SECONDS_PER_YEAR,
      });
    }
    prevSlope = slope;
  }
  return total;
}
