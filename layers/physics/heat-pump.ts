/**
 * Heat pump performance against entering fluid temperature (EFT, the brine entering the heat pump from
 * the piles), and the ground load it draws.
 *
 * Curve: COP and heating capacity (as a ratio of the capacity at 0 °C EFT) at tabulated EFTs, linearly
 * interpolated and held constant beyond the end points; editable. `DEFAULT_HEAT_PUMP_CURVE` is common
 * practice for a brine-to-water unit supplying about 35 °C to low-temperature heating: a smooth curve
 * through typical catalogue magnitudes (COP about 3.7 at 0 °C EFT, falling about 0.08 per K), not any
 * particular product. Minimum EFT default -8 °C (common practice: -5 to -8 °C for common units).
 *
 * Ground load (energy balance of the heat pump, e.g. ASHRAE Handbook—HVAC Applications, geothermal
 * energy chapter; Kavanaugh & Rafferty 1997): heating Q_ground = Q_building (1 − 1/COP); compressor
 * W = Q_building / COP. Validity: steady operation, the compressor's heat all delivered to the building.
 */
import { z } from 'zod';
import { requireRange } from './validate';
import { formatIssue } from '../validation-error';

export const HeatPumpCurveSchema = z
  .object({
    enteringFluid_C: z.array(z.number().finite().min(-30).max(40)).min(2),
    cop: z.array(z.number().finite().gt(1).max(15)).min(2),
    capacityRatio: z.array(z.number().finite().gt(0).max(5)).min(2),
    minEnteringFluid_C: z.number().finite().min(-30).max(20),
  })
  .strict()
  .refine(
    (c) => c.cop.length === c.enteringFluid_C.length && c.capacityRatio.length === c.enteringFluid_C.length,
    {
      message: 'cop, capacityRatio and enteringFluid_C must have the same length',
      path: ['cop'],
    },
  )
  .refine((c) => c.enteringFluid_C.every((t, i, a) => i === 0 || t > a[i - 1]), {
    message: 'enteringFluid_C must be strictly increasing',
    path: ['enteringFluid_C'],
  });

export type HeatPumpCurve = z.infer<typeof HeatPumpCurveSchema>;

/** Default curve (common practice, see module comment). */
export const DEFAULT_HEAT_PUMP_CURVE: HeatPumpCurve = {
  enteringFluid_C: [-15, -10, -5, 0, 5, 10, 15],
  cop: [2.5, 2.85, 3.25, 3.7, 4.1, 4.5, 4.85],
  capacityRatio: [0.66, 0.77, 0.88, 1.0, 1.12, 1.24, 1.35],
  minEnteringFluid_C: -8,
};

function interp(xs: readonly number[], ys: readonly number[], x: number): number {
  if (x <= xs[0]) return ys[0];
  const n = xs.length;
  if (x >= xs[n - 1]) return ys[n - 1];
  let i = 0;
  while (x > xs[i + 1]) i++;
  const w = (x - xs[i]) / (xs[i + 1] - xs[i]);
  return (1 - w) * ys[i] + w * ys[i + 1];
}

/**
 * The curve validated once (zod; RangeError naming the first bad field), as a function of the entering
 * fluid temperature: for loops that evaluate the same curve every time step (the site simulator's heat
 * pump), where validating the curve on every call cost more than the interpolation.
 */
export function heatPumpCurveAt(
  curve: HeatPumpCurve = DEFAULT_HEAT_PUMP_CURVE,
): (enteringFluid_C: number) => { cop: number; capacityRatio: number } {
  const parsed = HeatPumpCurveSchema.safeParse(curve);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new RangeError(formatIssue(issue, { prefix: 'curve' }));
  }
  const c = parsed.data;
  return (enteringFluid_C) => {
    const t = requireRange('enteringFluid_C', enteringFluid_C, -60, 60, '°C');
    return {
      cop: interp(c.enteringFluid_C, c.cop, t),
      capacityRatio: interp(c.enteringFluid_C, c.capacityRatio, t),
    };
  };
}

/** COP and capacity ratio at an entering fluid temperature (curve validated with zod). */
export function heatPumpAt(input: { enteringFluid_C: number; curve?: HeatPumpCurve }): {
  cop: number;
  capacityRatio: number;
} {
  requireRange('enteringFluid_C', input.enteringFluid_C, -60, 60, '°C');
  return heatPumpCurveAt(input.curve)(input.enteringFluid_C);
}

/** Heat drawn from the ground in heating, Q_building (1 − 1/COP), W. */
export function groundLoad_W(input: { buildingLoad_W: number; cop: number }): number {
  const q = requireRange('buildingLoad_W', input.buildingLoad_W, 0, Infinity, 'W');
  const cop = requireRange('cop', input.cop, 1, 20);
  return q * (1 - 1 / cop);
}

/** Compressor (electric) power in heating, Q_building / COP, W. */
export function compressorPower_W(input: { buildingLoad_W: number; cop: number }): number {
  const q = requireRange('buildingLoad_W', input.buildingLoad_W, 0, Infinity, 'W');
  const cop = requireRange('cop', input.cop, 1, 20);
  return q / cop;
}

/** Heat rejected to the ground in cooling, Q_cooling (1 + 1/COP), W. */
export function groundRejection_W(input: { coolingLoad_W: number; cop: number }): number {
  const q = requireRange('coolingLoad_W', input.coolingLoad_W, 0, Infinity, 'W');
  const cop = requireRange('cop', input.cop, 1, 20);
  return q * (1 + 1 / cop);
}

/** One ton of refrigeration = 12 000 Btu/h = 3516.853 W (exact definition). */
export const WATTS_PER_TON = 3516.853;
