/**
 * The building's heating load line, once, for the simulator, the study's sizing and energy figures and
 * the map's standard building (layers/screening/cell-kernel.ts, site-prefill.ts).
 *
 * Method (degree-day load line, e.g. ASHRAE Handbook Fundamentals, degree-day and bin methods): the
 * heating load is proportional to how far the air is below the balance point,
 *   Q(t) = Q_design · max(0, T_b − T_air(t)) / max(1 K, T_b − T_air,coldest),
 * with T_air(t) = MAAT − A·cos(2π (t − t_coldest)/1 yr), so that Q = Q_design at the coldest air. The
 * 1 K floor keeps the line finite where the coldest air is at or above the balance point (no heating
 * season: the load is then zero at almost every hour anyway).
 * Loads of the standard building (the map's and the study's): at the coldest air of the annual wave
 *   Q_cold = UA · max(1 K, T_b − (MAAT − A))          (the site input's designLoad_W, the load line's top)
 * and on the design day, the margin below the coldest monthly mean, which the peak pulse of the sizing
 * carries:
 *   Q_design = UA · max(1 K, T_b − (MAAT − A − margin)) = Q_cold · (span + margin)/span,
 * UA the heat-loss coefficient and margin the design-day depression (scenario building settings, common
 * practice). Same 1 K floor. The annual energy follows the load line to Q_cold, as the map's degree-day
 * demand UA·HDD does; only the peak uses the margin.
 */

/** Smallest balance-point-to-design-air difference, K (see the module comment). */
export const LOAD_LINE_FLOOR_K = 1;

export interface LoadLineClimate {
  meanAirTemp_C: number;
  amplitude_C: number;
}

/** Q(t) / Q_design for air at `air_C` (module comment). */
export function loadLineFraction(climate: LoadLineClimate, balancePoint_C: number, air_C: number): number {
  const coldest = climate.meanAirTemp_C - climate.amplitude_C;
  const span = Math.max(LOAD_LINE_FLOOR_K, balancePoint_C - coldest);
  return Math.max(0, balancePoint_C - air_C) / span;
}

/** Peak (design-day) load from the load line's top: Q_cold · (span + margin)/span (module comment). */
export function designDayLoad_W(
  loadAtColdestAir_W: number,
  climate: LoadLineClimate,
  balancePoint_C: number,
  designMargin_K: number,
): number {
  const span = Math.max(LOAD_LINE_FLOOR_K, balancePoint_C - (climate.meanAirTemp_C - climate.amplitude_C));
  return (loadAtColdestAir_W * (span + designMargin_K)) / span;
}

/** Design heating load of a building of heat-loss coefficient UA at a site's climate, W. */
export function designHeatingLoad_W(input: {
  heatLossCoefficient_W_K: number;
  balanceTemp_C: number;
  designMargin_K: number;
  meanAirTemp_C: number;
  amplitude_C: number;
}): number {
  const design_C = input.meanAirTemp_C - input.amplitude_C - input.designMargin_K;
  return input.heatLossCoefficient_W_K * Math.max(LOAD_LINE_FLOOR_K, input.balanceTemp_C - design_C);
}

/**
 * Building heating energy over a year on the load line for a design load, kWh, and its monthly shares
 * (Jan first, summing to 1). Day-by-day sum over 365 days.
 */
export function annualHeating(input: {
  designLoad_W: number;
  balancePoint_C: number;
  meanAirTemp_C: number;
  amplitude_C: number;
  coldestDay: number;
}): { annual_kWh: number; monthlyFractions: number[] } {
  const months = new Array<number>(12).fill(0);
  for (let d = 0; d < 365; d++) {
    const air =
      input.meanAirTemp_C - input.amplitude_C * Math.cos((2 * Math.PI * (d + 0.5 - input.coldestDay)) / 365);
    const kWh = (input.designLoad_W * loadLineFraction(input, input.balancePoint_C, air) * 24) / 1000;
    months[Math.min(11, Math.floor(d / (365 / 12)))] += kWh;
  }
  const annual = months.reduce((a, b) => a + b, 0);
  return { annual_kWh: annual, monthlyFractions: annual > 0 ? months.map((m) => m / annual) : months };
}
