/**
 * Bivalent operation of the foundation piles: the heat pump takes from the ground what the building asks
 * for, month by month, unless that would take its entering fluid below the limit; then it takes the most
 * the piles give at the limit and a backup heater covers the rest (domain-notes.md, "bivalent": the usual
 * arrangement where the ground loop is not sized for the whole peak). The site simulator's building mode
 * does the same step by step (layers/site/site-operation.ts: the heat-pump command cuts a step's draw to
 * what holds the entering fluid at its limit), so the map's carried heat and load share answer the same
 * question as the simulated ones.
 *
 * Method: the monthly form of the three-pulse equation of monthly-peak.ts (Kavanaugh & Rafferty 1997;
 * the monthly mean, no 6-hour pulse: a peak above the month's mean lasts hours and the backup takes it,
 * a small share of the month's energy), for one pile of a group whose piles carry the same load. The
 * mean fluid of month m at an annual-average extraction a and a monthly mean extraction q_m (W per pile):
 *   T_f(m) = T_g(m) − [a·(g_N(t_L) − g_N(t_M)) + q_m·g_N(t_M)]/(2πk·H) − q_m·R_b/H.
 * The limit is on the fluid entering the heat pump (fluid-temperature-convention.ts: in heating the
 * warmest point of the loop, the mean plus half the loop's temperature difference). The loop runs at a
 * fixed flow, sized for the loop difference ΔT_d at the design peak Q_d per pile (site-prefill.ts does
 * the same for the study's pile), so at q_m the difference is ΔT_d·q_m/Q_d and the entering fluid
 *   T_e(m) = T_f(m) + ΔT_d·q_m/(2·Q_d).
 * The most month m can give with T_e at its limit T_lim is q_m ≤ c_m(a) = α_m − β·a with
 *   α_m = (T_g(m) − T_lim)·H / D,  β = (g_N(t_L) − g_N(t_M))/(2πk·D),
 *   D = g_N(t_M)/(2πk) + R_b − H·ΔT_d/(2·Q_d)
 * (the loop's difference lowers the mean fluid under the limit, more so the more is drawn). D is held at
 * no less than half its value without the last term: a loop whose flow is so small that the term would
 * reach it is outside the linear model (its outlet would approach the ground temperature).
 * The piles carry q_m = min(r_m, max(0, c_m(a))) of the requested r_m, and the annual average is the
 * fixed point a = mean_m q_m (the right-hand side falls as a grows: one root in [0, mean r], found by
 * exact solves on the months' states, Newton's steps on the piecewise-linear right-hand side kept in a
 * bracket by bisection to 1e-7 of the request; fixedPoint). The fluid bound on the annual average, for the display of the
 * operating window, is that fixed point where some month is cut; where none is, it is the request scaled
 * up until the first month reaches the limit, λ·mean r with λ = min_m α_m/(r_m + β·mean r) (≥ 1), so the
 * bound is continuous where the first month starts to be cut.
 * Validity: as monthly-peak.ts (conduction, no latent heat near the pile, the months before m only
 * through the annual average).
 */
import { monthAnomaly_K, MONTHS } from './monthly-peak';

export interface BivalentInput {
  /** Mean ground temperature along the pile, °C, surface amplitude K and pile-average phasor. */
  groundMean_C: number;
  surfaceAmplitude_C: number;
  phasor: Float64Array;
  /** Lowest fluid temperature entering the heat pump, °C (the limit). */
  enteringLimit_C: number;
  /** Loop temperature difference per watt extracted, ΔT_d/Q_d, K/W (fixed flow; module comment). */
  loopDelta_K_W: number;
  length_m: number;
  resistance_mK_W: number;
  conductivity_W_mK: number;
  /** g_N(t_L) and g_N(t_M) of the group (finite line source, mean over its piles). */
  gLife: number;
  gMonth: number;
  /** Requested monthly mean ground load per pile, W, the 12 months (monthly-peak.ts order). */
  requested_W: Float64Array;
}

export interface BivalentResult {
  /** Annual-average ground extraction the pile carries, W. */
  carried_W: number;
  /** Annual-average extraction the building asked for, W. */
  requested_W: number;
  /** The fluid bound on the annual average, W (module comment). */
  fluidBound_W: number;
  /** Months cut at the fluid limit. */
  monthsCut: number;
  /** Each month's carried mean extraction, W. */
  monthly_W: Float64Array;
  /** α_m and β of the module comment at the last solve's input (bivalentResolve reuses them). */
  alpha: Float64Array;
  beta: number;
}

export function createBivalentResult(): BivalentResult {
  return {
    carried_W: 0,
    requested_W: 0,
    fluidBound_W: 0,
    monthsCut: 0,
    monthly_W: new Float64Array(MONTHS),
    alpha: new Float64Array(MONTHS),
    beta: 0,
  };
}

/** α_m (into `alpha`) and β of the module comment. */
function capacityCoefficients(p: BivalentInput, alpha: Float64Array): number {
  const twoPiK = 2 * Math.PI * p.conductivity_W_mK;
  const d0 = p.gMonth / twoPiK + p.resistance_mK_W;
  const d = Math.max(0.5 * d0, d0 - 0.5 * p.length_m * p.loopDelta_K_W);
  for (let m = 0; m < MONTHS; m++) {
    const avail = p.groundMean_C - monthAnomaly_K(p.surfaceAmplitude_C, p.phasor, m) - p.enteringLimit_C;
    alpha[m] = (avail * p.length_m) / d;
  }
  return (p.gLife - p.gMonth) / (twoPiK * d);
}

/** mean_m min(r_m, max(0, α_m − β·a)) (module comment). */
function carriedAt(a: number, r: Float64Array, alpha: Float64Array, beta: number): number {
  let s = 0;
  for (let m = 0; m < MONTHS; m++) s += Math.min(r[m], Math.max(0, alpha[m] - beta * a));
  return s / MONTHS;
}

/**
 * The fixed point exactly, on the months' states at the bisection's estimate `a0` (carried in full, cut
 * at the limit, or giving nothing): a = (Σ_full r_m + Σ_cut α_m)/(12 + β·n_cut), the estimate where the
 * states are ambiguous at it (a month exactly at its limit).
 */
function exactOnActiveSet(a0: number, r: Float64Array, alpha: Float64Array, beta: number): number {
  const a = solveOnStates(a0, r, alpha, beta);
  // Accept it only if every month keeps its state there (same months giving nothing, cut, in full).
  return sameStates(a0, a, r, alpha, beta) ? a : a0;
}

/** The months' states at `a0` and the fixed point on them (exactOnActiveSet without its check). */
function solveOnStates(a0: number, r: Float64Array, alpha: Float64Array, beta: number): number {
  let sum = 0;
  let cut = 0;
  for (let m = 0; m < MONTHS; m++) {
    const cap = alpha[m] - beta * a0;
    if (cap <= 0) continue;
    if (r[m] <= cap) sum += r[m];
    else {
      sum += alpha[m];
      cut++;
    }
  }
  return sum / (MONTHS + beta * cut);
}

/** Whether the months' states at `a0` and at `a` agree (exactOnActiveSet's check). */
function sameStates(a0: number, a: number, r: Float64Array, alpha: Float64Array, beta: number): boolean {
  for (let m = 0; m < MONTHS; m++) {
    const c0 = alpha[m] - beta * a0;
    const c1 = alpha[m] - beta * a;
    if (c0 <= 0 !== c1 <= 0) return false;
    if (c1 > 0 && r[m] > c1 !== r[m] > c0) return false;
  }
  return true;
}

/**
 * The fixed point a = mean_m q_m(a) on [0, mean] (module comment). The right-hand side is piecewise
 * linear in a, so Newton's step from a point is the exact solve on that point's months' states: taken
 * inside the bracket, it lands on the root as soon as it starts from the root's piece (accepted when
 * every month keeps its state there, as exactOnActiveSet), a bisection step otherwise; a bracket
 * narrower than `tol` ends as the bisection did, on exactOnActiveSet of its midpoint. The first step is
 * from `start` when it lies in (0, mean), else from the mean. Inputs that are not finite keep the plain
 * bisection.
 */
function fixedPoint(
  r: Float64Array,
  alpha: Float64Array,
  beta: number,
  mean: number,
  tol: number,
  start: number,
): number {
  let lo = 0;
  let hi = mean;
  if (mean > 0 && Number.isFinite(mean) && Number.isFinite(beta) && finiteAlpha(alpha)) {
    let at = start > 0 && start < mean ? start : mean;
    for (let i = 0; i < 64 && hi - lo > tol; i++) {
      const next = solveOnStates(at, r, alpha, beta);
      if (sameStates(at, next, r, alpha, beta)) return next;
      if (carriedAt(at, r, alpha, beta) > at) lo = at;
      else hi = at;
      at = next > lo && next < hi ? next : 0.5 * (lo + hi);
    }
  }
  while (hi - lo > tol) {
    const mid = 0.5 * (lo + hi);
    if (carriedAt(mid, r, alpha, beta) > mid) lo = mid;
    else hi = mid;
  }
  return exactOnActiveSet(0.5 * (lo + hi), r, alpha, beta);
}

function finiteAlpha(alpha: Float64Array): boolean {
  for (let m = 0; m < MONTHS; m++) if (!Number.isFinite(alpha[m])) return false;
  return true;
}

/** Carried, requested and the fluid bound of one pile in bivalent operation (module comment). */
export function bivalentOperation(p: BivalentInput, out: BivalentResult): BivalentResult {
  out.beta = capacityCoefficients(p, out.alpha);
  return solve(p, out, NaN);
}

/**
 * bivalentOperation again for an input that differs from the last one solved into `out` only in its
 * requested loads: the capacity coefficients α_m, β depend on the rest and are reused, and the search
 * starts from the last solve's carried load (the same fixed point wherever one is found exactly).
 */
export function bivalentResolve(p: BivalentInput, out: BivalentResult): BivalentResult {
  return solve(p, out, out.carried_W);
}

function solve(p: BivalentInput, out: BivalentResult, start: number): BivalentResult {
  const r = p.requested_W;
  const alpha = out.alpha;
  const beta = out.beta;
  let mean = 0;
  for (let m = 0; m < MONTHS; m++) mean += r[m];
  mean /= MONTHS;
  out.requested_W = mean;
  const tol = 1e-7 * mean;
  const a = fixedPoint(r, alpha, beta, mean, tol, start);
  let cut = 0;
  for (let m = 0; m < MONTHS; m++) {
    const cap = Math.max(0, alpha[m] - beta * a);
    out.monthly_W[m] = Math.min(r[m], cap);
    if (r[m] > cap + tol) cut++;
  }
  // λ of the module comment, needed only where no month is cut.
  let lambda = Infinity;
  if (cut === 0) {
    for (let m = 0; m < MONTHS; m++) {
      if (r[m] > 0) lambda = Math.min(lambda, alpha[m] / (r[m] + beta * mean));
    }
  }
  out.carried_W = mean > 0 ? a : 0;
  out.monthsCut = cut;
  out.fluidBound_W = cut > 0 || !Number.isFinite(lambda) ? out.carried_W : Math.max(1, lambda) * mean;
  return out;
}

/** The inputs of one month's mean fluid (monthMeanFluid_C). */
export type MonthFluidInput = Pick<
  BivalentInput,
  | 'groundMean_C'
  | 'surfaceAmplitude_C'
  | 'phasor'
  | 'length_m'
  | 'resistance_mK_W'
  | 'conductivity_W_mK'
  | 'gLife'
  | 'gMonth'
>;

/**
 * Mean fluid of month m, °C: the module comment's T_f(m) at the annual-average extraction `annual_W`
 * and the month's mean extraction `monthly_W` (W per pile).
 */
export function monthMeanFluid_C(p: MonthFluidInput, annual_W: number, monthly_W: number, m: number): number {
  const twoPiK = 2 * Math.PI * p.conductivity_W_mK;
  const q = monthly_W;
  const ground = p.groundMean_C - monthAnomaly_K(p.surfaceAmplitude_C, p.phasor, m);
  return (
    ground -
    (annual_W * (p.gLife - p.gMonth) + q * p.gMonth) / (twoPiK * p.length_m) -
    (q * p.resistance_mK_W) / p.length_m
  );
}

/**
 * Fluid entering the heat pump in month m of a solved operation `r`, °C: the module comment's T_e(m) at
 * the month's carried load and the annual average (the limit in a cut month, warmer in the others).
 */
export function enteringFluidOfMonth_C(p: BivalentInput, r: BivalentResult, m: number): number {
  const q = r.monthly_W[m];
  return monthMeanFluid_C(p, r.carried_W, q, m) + 0.5 * p.loopDelta_K_W * q;
}
