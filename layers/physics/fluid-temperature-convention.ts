/**
 * The project's one fluid-temperature convention for a heat pump on a ground loop (design.md §8,
 * "Conventions written once"). Every module that turns a heat-pump limit into a loop temperature goes
 * through these functions: the per-cell screening model, pile sizing (layers/site/pile-sizing.ts) and
 * the site simulator, whose pile outlet is the heat pump's entering fluid in heating.
 *
 * Which temperature: the heat pump's lowest allowed fluid temperature and its COP curve
 * (layers/physics/heat-pump.ts) refer to the entering fluid temperature, EFT: the brine entering the
 * heat pump from the ground loop (ASHRAE Handbook—HVAC Applications, geothermal chapter; Kavanaugh &
 * Rafferty 1997, where t_wi is the water entering the heat pump and the length equation uses the
 * mean (t_wi + t_wo)/2).
 *
 * Loop temperatures, ΔT ≥ 0 the temperature change of the fluid across the heat pump
 * (ΔT = Q_ground/(ṁ c_p)):
 *  - heating (heat extracted from the ground): the heat pump cools the brine, so the fluid entering it
 *    is the warmest point of the loop: mean = EFT − ΔT/2, leaving (= entering the piles) = EFT − ΔT;
 *  - cooling (heat rejected to the ground): the opposite, mean = EFT + ΔT/2, leaving = EFT + ΔT.
 * The mean fluid temperature is what the ground-side equations (three-pulse length, resistances)
 * see: the arithmetic mean of inlet and outlet, exact for a linear temperature profile along the loop
 * and the usual design approximation otherwise.
 */
import { requireNonNegative, requireOneOf, requireRange } from './validate';

export type LoopDuty = 'heating' | 'cooling';

export interface LoopFluidTemperatures {
  /** Fluid entering the heat pump (leaving the piles), °C. */
  entering_C: number;
  /** Mean of entering and leaving, °C: the temperature the ground equations use. */
  mean_C: number;
  /** Fluid leaving the heat pump (entering the piles), °C. */
  leaving_C: number;
}

/** +1 in heating (EFT is the warmest point), −1 in cooling (EFT is the coldest point). */
function sign(duty: LoopDuty): number {
  return duty === 'heating' ? 1 : -1;
}

/**
 * Mean loop fluid temperature from the entering fluid temperature (kernel: no checks; NaN propagates):
 * EFT − ΔT/2 in heating, EFT + ΔT/2 in cooling.
 */
export function meanFluidFromEntering_C(entering_C: number, loopDelta_K: number, duty: LoopDuty): number {
  return entering_C - (sign(duty) * loopDelta_K) / 2;
}

/** Entering fluid temperature from the mean loop fluid (kernel: no checks): mean + ΔT/2 in heating. */
export function enteringFromMeanFluid_C(mean_C: number, loopDelta_K: number, duty: LoopDuty): number {
  return mean_C + (sign(duty) * loopDelta_K) / 2;
}

/** Entering fluid temperature from the fluid leaving the heat pump (kernel): leaving + ΔT in heating. */
export function enteringFromLeavingFluid_C(leaving_C: number, loopDelta_K: number, duty: LoopDuty): number {
  return leaving_C + sign(duty) * loopDelta_K;
}

/** Fluid leaving the heat pump from the entering fluid temperature (kernel): EFT − ΔT in heating. */
export function leavingFromEnteringFluid_C(entering_C: number, loopDelta_K: number, duty: LoopDuty): number {
  return entering_C - sign(duty) * loopDelta_K;
}

/**
 * Entering, mean and leaving fluid temperatures for one operating point (public form: throws naming
 * the parameter for a temperature outside −60…60 °C, a negative ΔT or an unknown duty).
 */
export function loopFluidTemperatures(input: {
  enteringFluid_C: number;
  loopDelta_K: number;
  duty: LoopDuty;
}): LoopFluidTemperatures {
  const eft = requireRange('enteringFluid_C', input.enteringFluid_C, -60, 60, '°C');
  const dT = requireNonNegative('loopDelta_K', input.loopDelta_K, 'K');
  const duty = requireOneOf('duty', input.duty, ['heating', 'cooling'] as const);
  const s = sign(duty);
  return { entering_C: eft, mean_C: eft - (s * dT) / 2, leaving_C: eft - s * dT };
}
