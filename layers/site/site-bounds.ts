/**
 * Physical-bounds checks on a site run (simulate-site.ts): a run either ends with finite, physically
 * bounded results or refuses with the reason; it never returns NaN or a temperature below absolute zero.
 *
 * Bounds.
 * - Every reported number is finite (null only where the result type allows it).
 * - Fluid: the lowest fluid temperature must lie above the fluid's freezing point (`requireFluidAbove`
 *   of layers/physics/fluids.ts with zero margin) and the highest at most `FLUID_MAX_C`; otherwise the
 *   run refuses with `SiteFluidLimitError` naming `pile.fluid` and the mixtures that would do. No temperature may be below absolute zero,
 *   −273.15 °C (CODATA / SI definition of the kelvin and the Celsius scale).
 * - Ground (maximum principle for the heat equation with phase change, e.g. Friedman 1968, Trans.
 *   AMS 133:51–87, for the Stefan problem in enthalpy form): every cell stays within the range spanned by
 *   its initial and boundary values, i.e. within [min, max] of the initial field, the surface
 *   temperatures applied and the pile's fluid (boundary) temperatures. The bottom is a heat-flux boundary:
 *   the geothermal flux q only warms, at most by the steady rise q·∫₀ᴰ dz/k_min over the domain depth D
 *   (linear superposition of the steady flux solution, k_min the lower of each layer's frozen and thawed
 *   conductivities; exact for constant properties, a bound otherwise), which widens the upper bound.
 *   The check allows `BOUND_TOLERANCE_K` for round-off. A violation is a `SitePhysicalBoundsError`
 *   (a model failure, not bad input) with the value, the bound and where it occurred.
 * - Coupling: a time step whose pile-loop coupling stopped at the sweep limit is not converged; a run
 *   with any is a `SitePhysicalBoundsError` too (the result would be a non-solution).
 * `createExtremesTracker` collects the extremes during the run at no allocation per step.
 */
import { requireFluidAbove } from '../physics/fluids';
import type { GroundMaterial } from './ground-enthalpy';
import type { SiteResult } from './site-result';

/** Round-off allowance of the bound checks, K (numerical choice: well above the solver's 1e-9 K residual). */
export const BOUND_TOLERANCE_K = 1e-3;

/** Absolute zero on the Celsius scale, °C (SI definition). */
export const ABSOLUTE_ZERO_C = -273.15;

/**
 * Highest fluid temperature accepted, °C: water boils at 100 °C at 1 atm (the fluid tables of
 * layers/physics/fluids.ts end at 40 °C; the loop is pressurised only slightly, common practice).
 */
export const FLUID_MAX_C = 100;

/**
 * The run's fluid would freeze (or boil): bad input for the chosen fluid and operation (the message names
 * `pile.fluid` and what would do).
 */
export class SiteFluidLimitError extends RangeError {
  constructor(message: string) {
    super(message);
    this.name = 'SiteFluidLimitError';
  }
}

/** The run produced a result outside the physical bounds (a model failure; the message says which). */
export class SitePhysicalBoundsError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'SitePhysicalBoundsError';
  }
}

/** Running extremes of a case (°C; ±Infinity until observed; `nonFinite` counts NaN/±Inf seen). */
export interface Extremes {
  min_C: number;
  max_C: number;
  minAt_yr: number;
  maxAt_yr: number;
  nonFinite: number;
  firstNonFiniteAt_yr: number;
}

export interface ExtremesTracker {
  ground: Extremes[];
  surface: Extremes;
  fluid: Extremes;
  initial: Extremes;
  /** Observes the initial field. */
  observeInitial(T: ArrayLike<number>): void;
  /** Observes a field (all cells) of case `k` at time `t_yr`. */
  observeGround(k: number, T: ArrayLike<number>, t_yr: number): void;
  observeSurface(T_C: number, t_yr: number): void;
  observeFluidValue(T_C: number, t_yr: number): void;
}

function emptyExtremes(): Extremes {
  return {
    min_C: Infinity,
    max_C: -Infinity,
    minAt_yr: NaN,
    maxAt_yr: NaN,
    nonFinite: 0,
    firstNonFiniteAt_yr: NaN,
  };
}

function observe(e: Extremes, v: number, t_yr: number): void {
  if (!Number.isFinite(v)) {
    if (e.nonFinite++ === 0) e.firstNonFiniteAt_yr = t_yr;
    return;
  }
  if (v < e.min_C) {
    e.min_C = v;
    e.minAt_yr = t_yr;
  }
  if (v > e.max_C) {
    e.max_C = v;
    e.maxAt_yr = t_yr;
  }
}

/** Allocates the trackers for `cases` cases (the no-pile case first). */
export function createExtremesTracker(cases: number): ExtremesTracker {
  const tracker: ExtremesTracker = {
    ground: Array.from({ length: cases }, emptyExtremes),
    surface: emptyExtremes(),
    fluid: emptyExtremes(),
    initial: emptyExtremes(),
    observeInitial(T) {
      for (let c = 0; c < T.length; c++) observe(tracker.initial, T[c], 0);
    },
    observeGround(k, T, t_yr) {
      const e = tracker.ground[k];
      for (let c = 0; c < T.length; c++) observe(e, T[c], t_yr);
    },
    observeSurface(T_C, t_yr) {
      observe(tracker.surface, T_C, t_yr);
    },
    observeFluidValue(T_C, t_yr) {
      observe(tracker.fluid, T_C, t_yr);
    },
  };
  return tracker;
}

/** What a time step shows the tracker: the fields of every case and the pile loop if any. */
export interface ObservedLoop {
  running: boolean;
  inlet_C: number;
  outlet_C: number;
  rows: number;
  T_C: ArrayLike<number>;
  /** Conductance per row, W/K: rows with none (the insulated section) carry the cell's own value. */
  g_W_K: ArrayLike<number>;
}

/** Observes one step: every case's field, the surface value applied and the fluid while it runs. */
export function observeSiteStep(
  tracker: ExtremesTracker,
  fields: readonly ArrayLike<number>[],
  loop: ObservedLoop | null,
  surface_C: number,
  t_yr: number,
): void {
  for (let k = 0; k < fields.length; k++) tracker.observeGround(k, fields[k], t_yr);
  tracker.observeSurface(surface_C, t_yr);
  if (loop && loop.running) {
    tracker.observeFluidValue(loop.inlet_C, t_yr);
    tracker.observeFluidValue(loop.outlet_C, t_yr);
    for (let j = 0; j < loop.rows; j++) if (loop.g_W_K[j] > 0) tracker.observeFluidValue(loop.T_C[j], t_yr);
  }
}

/** Steady temperature rise the bottom flux q can cause over the domain, q·∫ dz/k_min, K. */
export function fluxRise_K(
  flux_W_m2: number,
  layerBottoms_m: readonly number[],
  layers: readonly GroundMaterial[],
): number {
  let rise = 0;
  let top = 0;
  for (let m = 0; m < layerBottoms_m.length; m++) {
    const kMin = Math.min(layers[m].kFrozen_W_mK, layers[m].kThawed_W_mK);
    rise += (flux_W_m2 * (layerBottoms_m[m] - top)) / kMin;
    top = layerBottoms_m[m];
  }
  return rise;
}

export interface BoundsContext {
  /** Fluid name and mass fraction as given (`pile.fluid`), or null without a pile. */
  fluid: { name: 'water' | 'propyleneGlycol' | 'ethanol'; massFraction: number } | null;
  extremes: ExtremesTracker;
  /** Upper-bound widening by the bottom flux, K (`fluxRise_K`). */
  fluxRise_K: number;
}

const fmt = (x: number): string =>
  Math.abs(x) >= 1e5 || (x !== 0 && Math.abs(x) < 1e-3) ? x.toExponential(3) : x.toFixed(3);

function nonFiniteNumbers(value: unknown, path: string, out: string[]): void {
  if (out.length >= 3) return;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) out.push(`${path} = ${value}`);
  } else if (Array.isArray(value)) {
    for (let i = 0; i < value.length && out.length < 3; i++) nonFiniteNumbers(value[i], `${path}[${i}]`, out);
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) nonFiniteNumbers(v, path ? `${path}.${k}` : k, out);
  }
}

const CASES = ['no-pile', 'with-pile'];

/** Non-finite temperatures or results: the run diverged. */
function divergenceProblems(result: SiteResult, x: BoundsContext['extremes']): string[] {
  const cases = CASES;
  const problems: string[] = [];
  x.ground.forEach((g, k) => {
    if (g.nonFinite > 0) {
      problems.push(
        `${g.nonFinite} non-finite ground temperatures in the ${cases[k]} case, first in year ${fmt(g.firstNonFiniteAt_yr)}`,
      );
    }
  });
  if (x.initial.nonFinite > 0) problems.push(`${x.initial.nonFinite} non-finite initial temperatures`);
  if (x.fluid.nonFinite > 0) {
    problems.push(
      `${x.fluid.nonFinite} non-finite fluid temperatures, first in year ${fmt(x.fluid.firstNonFiniteAt_yr)}`,
    );
  }
  const bad: string[] = [];
  nonFiniteNumbers(result, '', bad);
  if (bad.length) problems.push(`non-finite results: ${bad.join(', ')}`);
  return problems;
}

/** The fluid's freezing and boiling limits (SiteFluidLimitError). */
function checkFluidLimits(ctx: BoundsContext, fluidRan: boolean): void {
  const { extremes: x } = ctx;
  if (fluidRan && ctx.fluid) {
    const f = ctx.fluid;
    try {
      requireFluidAbove({
        fluid: f.name,
        massFraction: f.name === 'water' ? 0 : f.massFraction,
        lowestTemperature_C: Math.max(x.fluid.min_C, ABSOLUTE_ZERO_C),
        margin_K: 0,
      });
    } catch (e) {
      const below =
        x.fluid.min_C < ABSOLUTE_ZERO_C
          ? ` (the loop was driven to ${fmt(x.fluid.min_C)} °C, below absolute zero)`
          : '';
      throw new SiteFluidLimitError(
        `pile.fluid: the fluid freezes in year ${fmt(x.fluid.minAt_yr)}${below}: ${(e as Error).message}; ` +
          'or reduce the heat extracted (operation) or raise the flow (pile.flow_L_min)',
      );
    }
  }
  if (fluidRan && x.fluid.max_C > FLUID_MAX_C) {
    throw new SiteFluidLimitError(
      `pile.fluid: the fluid reaches ${fmt(x.fluid.max_C)} °C in year ${fmt(x.fluid.maxAt_yr)}, above ${FLUID_MAX_C} °C ` +
        '(it would boil): reduce the heat injected (operation) or raise the flow (pile.flow_L_min)',
    );
  }
}

/**
 * Checks a finished run (see the module comment). Throws `SiteFluidLimitError` (the fluid freezes:
 * change pile.fluid) or `SitePhysicalBoundsError` (anything else); returns nothing when the run is
 * within bounds.
 */
export function checkPhysicalBounds(result: SiteResult, ctx: BoundsContext): void {
  const { extremes: x } = ctx;
  const cases = CASES;
  const problems = divergenceProblems(result, x);
  if (problems.length) throw new SitePhysicalBoundsError(`site run diverged: ${problems.join('; ')}`);

  const fluidRan = Number.isFinite(x.fluid.min_C);
  checkFluidLimits(ctx, fluidRan);
  for (const [what, e] of [
    ['ground', x.ground[x.ground.length - 1]],
    ['fluid', x.fluid],
  ] as const) {
    if (e.min_C < ABSOLUTE_ZERO_C) {
      problems.push(
        `${what} temperature ${fmt(e.min_C)} °C in year ${fmt(e.minAt_yr)} is below absolute zero`,
      );
    }
  }
  const lower = Math.min(x.initial.min_C, x.surface.min_C, fluidRan ? x.fluid.min_C : Infinity);
  const upper =
    Math.max(x.initial.max_C, x.surface.max_C, fluidRan ? x.fluid.max_C : -Infinity) + ctx.fluxRise_K;
  x.ground.forEach((g, k) => {
    if (g.min_C < lower - BOUND_TOLERANCE_K) {
      problems.push(
        `${cases[k]} ground reaches ${fmt(g.min_C)} °C in year ${fmt(g.minAt_yr)}, below the coldest initial, ` +
          `surface${k > 0 && fluidRan ? ' or fluid' : ''} temperature ${fmt(lower)} °C (maximum principle)`,
      );
    }
    if (g.max_C > upper + BOUND_TOLERANCE_K) {
      problems.push(
        `${cases[k]} ground reaches ${fmt(g.max_C)} °C in year ${fmt(g.maxAt_yr)}, above the warmest initial, ` +
          `surface${k > 0 && fluidRan ? ' or fluid' : ''} temperature plus the geothermal rise ${fmt(upper)} °C (maximum principle)`,
      );
    }
  });
  const steps = [result.noPile, result.withPile].map((c) => (c ? c.unconvergedSteps : 0));
  if (steps[0] + steps[1] > 0) {
    problems.push(
      `${steps[0] + steps[1]} time steps stopped at the coupling sweep limit (no-pile ${steps[0]}, with pile ${steps[1]}); ` +
        'try a shorter timeStep_days or a larger numerics.tolerance_K',
    );
  }
  if (problems.length)
    throw new SitePhysicalBoundsError(`site run outside physical bounds: ${problems.join('; ')}`);
}
