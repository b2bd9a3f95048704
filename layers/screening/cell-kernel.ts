/**
 * The per-cell screening kernel: every metric of one cell into a Float64Array indexed by METRIC.
 * Allocation-free apart from the science core's small result objects (escape-analysed by the engine).
 *
 * Method, in order (each step's model is documented in its own module):
 *  1. soil properties from the texture table at the cell's water content (cell-constants.ts);
 *  2. air freezing/thawing indices of the sinusoidal year (degreeDays, surface-forcing.ts), surface
 *     indices with n-factors (Lunardini 1978), TTOP (Smith & Riseborough 1996, 2002), active layer by
 *     the two-phase Neumann solution over the thaw season with the sensible heat of both zones
 *     (layers/physics/neumann-active-layer.ts: the thaw-season step of equal degree-days into frozen
 *     ground at TTOP, as in the modified Berggren method);
 *  1b. excess ice: water above the texture's porosity n is excess ice, e = (θ − n)/(1 − n), carried
 *     in the latent heat, capacity and conductivity (soil-catalogue.ts) and reported (band excessIce);
 *  3. ground temperature at the pile's mid-depth: the ground-temperature grid when given, else TTOP
 *     plus the geothermal gradient q_g/k_frozen below the active layer; the reference-depth temperature
 *     adds the gradient between the two depths; at the end of the life latent-aware
 *     (groundTempEndOfLife_C: 0 °C while the ice melts, the zero curtain, flagged);
 *  4. warming: the air trend through the n-factor transfer shared with the site simulator (the trend
 *     is added to the air, then the n-factors act: surfaceMeanWarming_K, surface-forcing.ts), as the
 *     linear surface rate with the same surface-mean change at the end of the design life
 *     (surfaceWarmingRate_K_per_yr), propagated by conduction in frozen ground
 *     (Carslaw & Jaeger §2.5, response-tables.ts); thaw without piles by the method of
 *     layers/physics/years-to-thaw.ts: the time the conduction rise brings the reference point to
 *     0 °C (tabulated here) plus the latent-heat delay z·√(L/(k_thawed·b)) of a Stefan front under a
 *     rising surface excess; with a warming pathway in the scenario (warming-pathway.ts) the surface
 *     history is piecewise linear instead, one superposed ramp per change of slope, and the thaw time,
 *     latent delay and c/b lengthening are their piecewise generalisations (surface-warming-history.ts);
 *  5. standard building: heating demand UA·HDD (HDD = freezing index of T_air − T_balance), peak load
 *     UA·(T_balance − T_design), and the 12 monthly loads UA·(T_balance − T_month)⁺ with their peaks
 *     the design margin colder; ground load = heat·(1 − 1/COP), the peak at the COP of the lowest EFT,
 *     annual and monthly loads at the COP of the undisturbed ground (as layers/site/pile-sizing.ts);
 *  6. operating window and pile count (operating-window.ts): the peak per pile of the foundation group
 *     (foundation-group.ts; finite-line-source field response, response-tables.ts) at the fluid limit,
 *     month by month against the lagged, pile-averaged annual wave (monthly-peak.ts), the mean fluid
 *     from the lowest EFT by the project's convention (layers/physics/fluid-temperature-convention.ts);
 *     the reference point's cooling from every pile of the group at the reference depth and radius;
 *  7. thaw with piles: first time T_ref + W(t) − q'_carried·g_ref(t)/(2πk) ≥ 0 (g_ref: the whole group at
 *     the reference point), piles operating from the start year on (forward search from the no-pile
 *     time, then regula falsi to 0.01 yr), plus the
 *     latent delay, lengthened by c/b: the Stefan front X·dX/dt = k_t·(b(t − t0) − c)/L driven against
 *     the pile's cooling c at the reference point arrives c/b later (c evaluated at the sensible thaw
 *     time; an extension of years-to-thaw.ts checked against the site simulator, see the calibration);
 *     thaw after the scenario's climate horizon is capped there and flagged (climate-horizon.ts);
 *  8. economics: the unit's seasonal COP at mean fluid T_pile − q'_carried·(R_b + g_N(t_L)/(2πk))
 *     (annual-average extraction through the pile and the group's long-term response), EFT = mean +
 *     ΔT/2 (heating), from the scenario's heat-pump curve (layers/physics/heat-pump.ts); the system
 *     COP with circulation pump, backup and auxiliaries (system-cop.ts) drives fuel, CO2, cost, the
 *     fuel-increase flag, capital cost and simple payback;
 *  3b-3d (after 7, they need the carried load): the adfreeze-zone temperature at the end of the life
 *     with the piles operating (the reference point: T_ref + W(life) − q'_carried·g_ref(life)/(2πk),
 *     at least 0 °C where it thaws within the life), the end-of-life active layer (the Neumann step in
 *     the warmed climate), and the structural layers of foundation-checks.ts;
 *  9. hard foundation checks, soft scores and class: cell-class.ts, a pure function of these outputs.
 * The stages live in cell-kernel-ground.ts (1-4), cell-kernel-operation.ts (5, 6, 8) and
 * cell-kernel-thaw.ts (7, 3b-3d), the scratch they share in cell-kernel-state.ts.
 */
import { dampingDepth_m } from '../physics/ground-temperature-wave';
import type { CellInputs } from './screening-model';
import type { CellConstants } from './cell-constants';
import { EXCLUSION, thawStabilityScore } from './suitability';
import { METRIC as M } from './cell-layers';
import { classifyCell } from './cell-class';
import type { KernelScratch } from './cell-kernel-state';
import { groundStage } from './cell-kernel-ground';
import { buildingStage, windowStage, economicsStage } from './cell-kernel-operation';
import { thawStage, endOfLifeStage } from './cell-kernel-thaw';
export { TON_W, createKernelScratch, type CellState, type KernelScratch } from './cell-kernel-state';
export { surfaceWarmingRate_K_per_yr } from './cell-kernel-ground';

/**
 * Winter cold anomaly of the ground averaged over the pile's active length, K (≥ 0: colder than the
 * mean): the largest over the year of the pile-averaged Kusuda & Achenbach (1965) annual wave
 * A_s·e^(−z/d)·cos(ωt − z/d) (layers/physics/ground-temperature-wave.ts). As a phasor average,
 *   A_s·|(d/(z2 − z1))·(e^(−(1+i)z1/d) − e^(−(1+i)z2/d))/(1 + i)|,
 * d the damping depth √(Pα/π) in frozen ground. A_s is the winter half of the n-factor-transferred
 * surface wave, n_f·A (conduction only; latent heat in an active layer above the pile top is ignored,
 * which over-estimates the anomaly there). The kernel uses the month-by-month phasor of monthly-peak.ts
 * (whose modulus this is); kept for the calibration harness.
 */
export function pileWinterAnomaly_K(p: {
  surfaceAmplitude_C: number;
  diffusivity_m2_s: number;
  top_m: number;
  bottom_m: number;
}): number {
  const d = dampingDepth_m(p.diffusivity_m2_s);
  const u1 = p.top_m / d;
  const u2 = p.bottom_m / d;
  const e1 = Math.exp(-u1);
  const e2 = Math.exp(-u2);
  // (e^(−(1+i)u1) − e^(−(1+i)u2)) = re + i·im
  const re = e1 * Math.cos(u1) - e2 * Math.cos(u2);
  const im = -e1 * Math.sin(u1) + e2 * Math.sin(u2);
  // |(re + i·im)/(1 + i)| = |re + i·im|/√2
  return (p.surfaceAmplitude_C * d * Math.hypot(re, im)) / (Math.SQRT2 * (p.bottom_m - p.top_m));
}

function validInputs(c: CellInputs): boolean {
  return (
    c.meanAirTemp_C >= -60 &&
    c.meanAirTemp_C <= 40 &&
    c.airAmplitude_C >= 0 &&
    c.airAmplitude_C <= 60 &&
    c.warming_C_per_yr >= -1 &&
    c.warming_C_per_yr <= 1 &&
    Number.isInteger(c.textureClass) &&
    c.textureClass >= 1 &&
    c.textureClass <= 6 &&
    c.waterContent_m3m3 >= 0 &&
    c.waterContent_m3m3 <= 1 &&
    c.bedrockDepth_m >= 0 &&
    (Number.isNaN(c.groundTemp_C) || (c.groundTemp_C >= -40 && c.groundTemp_C <= 30)) &&
    (Number.isNaN(c.geothermalFlux_W_m2) || (c.geothermalFlux_W_m2 >= 0 && c.geothermalFlux_W_m2 <= 1)) &&
    (Number.isNaN(c.nFreeze) || (c.nFreeze >= 0.05 && c.nFreeze <= 1.5))
  );
}

/** Evaluate one cell into `m` (length ≥ METRIC_COUNT; NaN = not applicable). Never throws. */
export function evaluateCellMetrics(
  cell: CellInputs,
  k: CellConstants,
  x: KernelScratch,
  m: Float64Array,
): void {
  evaluate(cell, k, x, m, null);
}

/** The metrics groundStage writes (copied by evaluateCellMetricsSameGround). */
const GROUND_METRICS = [
  M.activeLayer,
  M.groundTemp,
  M.groundTempEnd,
  M.zeroCurtain,
  M.permafrostClassToday,
  M.permafrostClassEnd,
];

/**
 * evaluateCellMetrics of the same cell under constants that differ from those of the evaluation just
 * made into `x` and `ground` only in the heat-pump settings (the robustness perturbations of
 * class-robustness.ts): the ground stage (steps 1-3 with the end-of-life active layer), which does not
 * depend on them, is taken from that evaluation. Same results as evaluateCellMetrics.
 */
export function evaluateCellMetricsSameGround(
  cell: CellInputs,
  k: CellConstants,
  x: KernelScratch,
  m: Float64Array,
  ground: Float64Array,
): void {
  evaluate(cell, k, x, m, ground);
}

function evaluate(
  cell: CellInputs,
  k: CellConstants,
  x: KernelScratch,
  m: Float64Array,
  ground: Float64Array | null,
): void {
  m.fill(NaN);
  if (!validInputs(cell)) {
    m[M.exclusion] = EXCLUSION.outsideData;
    m[M.suitability] = 0;
    return;
  }
  const be = k.breakEven;
  m[M.breakEvenCopFuel] = be.fuel;
  m[M.breakEvenCopCo2] = be.co2;
  m[M.breakEvenCopCost] = be.cost;
  m[M.bedrockDepth] = cell.bedrockDepth_m;
  const tex = cell.textureClass;
  m[M.thawStability] = thawStabilityScore(tex, cell.waterContent_m3m3);
  const porosity = k.soil[tex].thetaMax;
  m[M.excessIce] =
    cell.waterContent_m3m3 > porosity ? (cell.waterContent_m3m3 - porosity) / (1 - porosity) : 0;

  if (ground === null) groundStage(cell, k, x, m);
  else for (const i of GROUND_METRICS) m[i] = ground[i];
  buildingStage(cell, k, x, m);
  windowStage(cell, k, x, m);
  thawStage(k, x, m);
  endOfLifeStage(cell, k, x, m);
  economicsStage(k, x, m);

  // 9. hard foundation checks, soft scores, class (cell-class.ts)
  const c = classifyCell(m, tex, k.scenario, k.weights);
  m[M.exclusion] = c.exclusion;
  m[M.suitabilityScore] = c.score;
  m[M.suitability] = c.suitability;
}
