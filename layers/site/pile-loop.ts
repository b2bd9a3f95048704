/**
 * Fluid loop inside the pile, coupled row by row to the ground mesh (an `InnerBoundary`).
 *
 * Method. Two flow channels run the pile length: "down" (inlet at the top) and "up" (outlet at the
 * top), joined at the bottom. Per metre of pile, channel i exchanges heat with the pile wall through
 * the conductance g_i and the channels with each other through g_12: the delta circuit of Hellström
 * (1991, Ground Heat Storage, ch. 8) with, for a symmetric U-tube, g_down = g_up = 1/(2 Rb) and
 * g_12 = 1/R12, and for a coaxial loop g = 1/Rb on the annulus and 0 on the centre pipe. The wall is
 * joined to the centre of the first ground cell by the half-cell conductance g_a = 2π k / ln(r_c/r_p);
 * eliminating the wall node (star-delta) gives per-metre conductances from each channel to the cell,
 *   g_ci = g_a g_i / S,   and between channels  g_12' = g_12 + g_down g_up / S,   S = g_a + g_down + g_up.
 * The steady fluid energy balance along depth (thermal mass of the fluid neglected: its transit time is
 * minutes, the time step days),
 *   ṁc dT_d/dz = g_cd (T_cell − T_d) + g_12' (T_u − T_d),   −ṁc dT_u/dz = g_cu (T_cell − T_u) + g_12' (T_d − T_u),
 * is integrated over each row with the trapezoidal rule, with T_d = T_u at the bottom. The two-point
 * boundary problem is solved by the double sweep (Godunov's sweep, the continuous form of the Thomas
 * algorithm; e.g. Keller 1968, Numerical Methods for Two-Point Boundary-Value Problems, ch. 3, recalled
 * from memory): a sweep from the bottom up carries the relation u = α d + β at each face (α = 1, β = 0
 * at the bottom; α depends on the conductances only, β is linear in the cell temperatures), which gives
 * T_out = α₀ T_in + β₀ at the top; the operating command then fixes T_in and T_out (given inlet; given
 * extraction ṁc (T_out − T_in); given outlet; or pump off, no exchange) and a sweep down gives each
 * face's channel temperatures. The sweep coefficients stay bounded (|α| ≤ 1, denominators ≥ (ṁc)²) for
 * any number of transfer units, where marching affine forms from the top (the previous method) grows
 * like exp(NTU) and overflowed for long piles at low flow. Summing the two channel equations shows
 * ṁc (T_out − T_in) = extracted heat exactly (discrete energy balance).
 * Heat-pump command: the heat pump draws `extraction_W` unless that would take its entering fluid (the
 * loop outlet) below `minOutlet_C`; then it draws the largest extraction that holds the outlet there,
 * E_lim = ṁc (1 − α₀)(T_eq − minOutlet)/α₀ with T_eq = β₀/(1 − α₀) the outlet at zero extraction (the
 * outlet falls with E); never less than zero (a heat pump in heating does not inject heat). Whether it
 * runs at all is decided once per step, at its first evaluation: off when the limit allows no extraction
 * (the ground is at or below the lowest entering temperature: the building is served by the backup
 * heater for that step). Within the step the extraction min(E, E_lim), clipped at 0, is a continuous,
 * piecewise affine function of the cell temperatures with fixed conductances, so the coupling iteration
 * converges; without the latch the pump switched on and off between sweeps and never converged.
 * The ground sees, per row, conductance Δz (g_cd + g_cu) to the weighted channel temperature.
 * For a fixed command (branch) these boundary temperatures are affine in the cell temperatures;
 * `linearResponse` returns their linear part (the same sweeps with the command's value set to zero),
 * which the solver uses to couple the loop without extra linear solves.
 * Validity: steady fluid (transit time ≪ step); trapezoidal rows resolve the exchange when the NTU per
 * row is below about 2 (beyond it the row profile oscillates, bounded, about the exact one).
 */
import type { InnerBoundary } from './conduction-solver';

export type LoopCommand =
  | { kind: 'off' }
  | { kind: 'inlet'; inlet_C: number }
  | { kind: 'outlet'; outlet_C: number }
  | { kind: 'extraction'; extraction_W: number }
  | { kind: 'heatPump'; extraction_W: number; minOutlet_C: number };

export interface PileLoopSpec {
  /** Length of each pile row, m (the first rows of the mesh). */
  rowLength_m: ArrayLike<number>;
  /** Whether each row exchanges heat with the ground (false: insulated loop section above the top). */
  rowActive: ArrayLike<boolean>;
  /** Channel-to-wall conductances per metre, W/m·K (0 for a channel that does not touch the wall). */
  gDown_W_mK: number;
  gUp_W_mK: number;
  /** Channel-to-channel conductance per metre, W/m·K. */
  gChannels_W_mK: number;
  /** Mass flow × specific heat of the fluid, W/K. */
  flowCapacity_W_K: number;
  /**
   * The operating command for the step ending at `time_s`, given the latest outlet temperature
   * estimate (called after every sweep, so a building mode can follow the heat pump's entering fluid).
   */
  command(time_s: number, outletEstimate_C: number): LoopCommand;
}

export interface PileLoop extends InnerBoundary {
  /** Latest inlet and outlet temperatures, °C, and heat extracted from the ground, W. */
  inlet_C: number;
  outlet_C: number;
  extraction_W: number;
  running: boolean;
  /** Heat-pump command: whether the latest evaluation held the outlet at its lower limit. */
  atLimit: boolean;
  linearResponse(dInnerT_C: Float64Array, out: Float64Array): void;
}

type Branch = 'off' | 'inlet' | 'outlet' | 'extraction';

/** The loop's per-row conductances, sweep coefficients and latest evaluation (one per loop). */
interface LoopState {
  rows: number;
  /** Row lengths, m, and the fluid's flow capacity ṁc, W/K. */
  dz: Float64Array;
  mc: number;
  /** Per-metre conductances channel to cell (down, up) and channel to channel, W/m·K. */
  gc1: Float64Array;
  gc2: Float64Array;
  g12: Float64Array;
  /** Cell temperatures of the latest update, °C. */
  Tc: Float64Array;
  /** Sweep coefficients at each face (u = α d + β), the per-row pivots and the face temperatures. */
  alpha: Float64Array;
  beta: Float64Array;
  pivot: Float64Array;
  Tb: Float64Array;
  /** The cell temperatures the sweeps read (Tc, or the perturbation in linearResponse). */
  src: Float64Array;
  /** Inlet and outlet of the latest evaluation, °C. */
  evalIn: number;
  evalOut: number;
  /** Branch and command value chosen by the latest update. */
  kind: Branch;
  value: number;
  /** Heat-pump latch: the step's on/off decision (null until the step's first evaluation). */
  stepOn: boolean | null;
}

function createLoopState(spec: PileLoopSpec): LoopState {
  const rows = spec.rowLength_m.length;
  const Tc = new Float64Array(rows);
  return {
    rows,
    dz: Float64Array.from(spec.rowLength_m),
    mc: spec.flowCapacity_W_K,
    gc1: new Float64Array(rows),
    gc2: new Float64Array(rows),
    g12: new Float64Array(rows),
    Tc,
    alpha: new Float64Array(rows + 1),
    beta: new Float64Array(rows + 1),
    pivot: new Float64Array(rows),
    Tb: new Float64Array(rows),
    src: Tc,
    evalIn: NaN,
    evalOut: NaN,
    kind: 'off',
    value: 0,
    stepOn: null,
  };
}

/** Star-delta conductances of every row for the half-cell conductances, and the cell temperatures. */
function setConductances(
  spec: PileLoopSpec,
  st: LoopState,
  innerT: Float64Array,
  halfCell: Float64Array,
): void {
  for (let j = 0; j < st.rows; j++) {
    const ga = spec.rowActive[j] ? halfCell[j] : 0;
    const S = ga + spec.gDown_W_mK + spec.gUp_W_mK;
    st.gc1[j] = (ga * spec.gDown_W_mK) / S;
    st.gc2[j] = (ga * spec.gUp_W_mK) / S;
    // Insulated rows: no exchange at all (the channels are taken as insulated from each other too).
    st.g12[j] = ga > 0 ? spec.gChannels_W_mK + (spec.gDown_W_mK * spec.gUp_W_mK) / S : 0;
    st.Tc[j] = innerT[j];
  }
}

/**
 * The branch for a command (module comment: the heat pump holds the outlet at its limit, latched off
 * for the step when the limit allows no extraction): sets st.kind and st.value after the sweep up;
 * returns whether the outlet is held at its lower limit.
 */
function chooseBranch(st: LoopState, cmd: LoopCommand): boolean {
  st.kind = cmd.kind === 'heatPump' ? 'extraction' : cmd.kind;
  st.value = 0;
  if (cmd.kind === 'off') return false;
  st.src = st.Tc;
  sweepUp(st);
  if (cmd.kind !== 'heatPump') {
    st.value = cmd.kind === 'inlet' ? cmd.inlet_C : cmd.kind === 'outlet' ? cmd.outlet_C : cmd.extraction_W;
    return false;
  }
  const lim = extractionLimit(st, cmd.minOutlet_C);
  if (st.stepOn === null) st.stepOn = cmd.extraction_W > 0 && lim > 0;
  if (!st.stepOn) st.kind = 'off';
  else if (cmd.extraction_W > lim) {
    st.kind = lim > 0 ? 'outlet' : 'extraction';
    st.value = lim > 0 ? cmd.minOutlet_C : 0;
    return lim > 0;
  } else st.value = cmd.extraction_W;
  return false;
}

/** Creates the loop boundary for the first `rowLength_m.length` rows of the mesh. */
export function createPileLoop(spec: PileLoopSpec): PileLoop {
  const mc = spec.flowCapacity_W_K;
  if (!(mc > 0)) throw new RangeError(`flowCapacity_W_K must be > 0 W/K; received ${mc}`);
  const st = createLoopState(spec);
  const rows = st.rows;
  let time = 0;
  let lastKind: Branch = 'off';

  const loop: PileLoop = {
    rows,
    g_W_K: new Float64Array(rows),
    T_C: new Float64Array(rows),
    q_W: new Float64Array(rows),
    inlet_C: NaN,
    outlet_C: NaN,
    extraction_W: 0,
    running: false,
    atLimit: false,
    beginStep(time_s: number) {
      time = time_s;
      st.stepOn = null;
    },
    endStep() {},
    update(innerT: Float64Array, halfCell: Float64Array): number {
      setConductances(spec, st, innerT, halfCell);
      const cmd = spec.command(time, Number.isFinite(loop.outlet_C) ? loop.outlet_C : innerT[0]);
      loop.atLimit = chooseBranch(st, cmd);
      const kind = st.kind;
      let change = 0;
      if (kind === 'off') {
        loop.running = false;
        loop.extraction_W = 0;
        lastKind = 'off';
        for (let j = 0; j < rows; j++) {
          change = Math.max(change, loop.g_W_K[j] > 0 ? Math.abs(loop.g_W_K[j]) : 0);
          loop.g_W_K[j] = 0;
          loop.T_C[j] = st.Tc[j];
        }
        return change;
      }
      loop.running = true;
      lastKind = kind;
      evaluate(st, kind, st.value, st.Tb);
      for (let j = 0; j < rows; j++) {
        change = Math.max(change, Math.abs(st.Tb[j] - loop.T_C[j]));
        loop.T_C[j] = st.Tb[j];
        loop.g_W_K[j] = st.dz[j] * (st.gc1[j] + st.gc2[j]);
      }
      loop.inlet_C = st.evalIn;
      loop.outlet_C = st.evalOut;
      loop.extraction_W = mc * (st.evalOut - st.evalIn);
      return change;
    },
    linearResponse(dInnerT: Float64Array, out: Float64Array): void {
      if (lastKind === 'off') {
        for (let j = 0; j < rows; j++) out[j] = dInnerT[j];
        return;
      }
      // The map from cell temperatures to boundary temperatures is affine for a fixed command: its
      // linear part is the same sweeps with the command's value set to zero.
      st.src = dInnerT;
      sweepUp(st);
      evaluate(st, lastKind, 0, out);
      st.src = st.Tc;
    },
  };
  return loop;
}

/** Sweep from the bottom up: u = α d + β at every face for the cell temperatures in `st.src`. */
function sweepUp(st: LoopState): void {
  const { rows, dz, gc1, gc2, g12, alpha, beta, pivot, mc, src } = st;
  alpha[rows] = 1;
  beta[rows] = 0;
  for (let j = rows - 1; j >= 0; j--) {
    // Half-row conductances (channel to cell, channel to channel), W/K.
    const a1 = 0.5 * dz[j] * gc1[j];
    const a2 = 0.5 * dz[j] * gc2[j];
    const b = 0.5 * dz[j] * g12[j];
    const tc = src[j];
    const ap = alpha[j + 1];
    const bp = beta[j + 1];
    const m22 = a2 + b - mc;
    const P = mc + a1 + b - b * ap;
    const Q = -b + m22 * ap;
    const D = Q * b + P * (mc + a2 + b);
    alpha[j] = (P * b - Q * (mc - a1 - b)) / D;
    beta[j] = (P * (2 * a2 * tc - m22 * bp) - Q * (2 * a1 * tc + b * bp)) / D;
    pivot[j] = P;
  }
}

/**
 * Largest extraction that keeps the outlet at or above `minOutlet_C` (W; +Infinity if the outlet does
 * not fall with the extraction), from the sweep coefficients of the current cell temperatures.
 */
function extractionLimit(st: LoopState, minOutlet_C: number): number {
  const a0 = st.alpha[0];
  const b0 = st.beta[0];
  if (!(1 - a0 > 1e-12)) return 0; // no exchange: the loop cannot extract
  const equilibrium = b0 / (1 - a0);
  if (!(a0 > 1e-12)) return equilibrium >= minOutlet_C ? Infinity : -Infinity;
  return (st.mc * (1 - a0) * (equilibrium - minOutlet_C)) / a0;
}

/**
 * Fluid temperatures for the ground temperatures in `st.src` (after `sweepUp`) and the command (kind,
 * value): closure at the top, then the sweep down; writes each row's weighted channel temperature
 * (the ground's boundary value; the cell's own value where g = 0) into `out` and the inlet and outlet
 * temperatures into st.evalIn / st.evalOut.
 */
function evaluate(
  st: LoopState,
  kind: 'inlet' | 'outlet' | 'extraction',
  value: number,
  out: Float64Array,
): void {
  const { rows, dz, gc1, gc2, g12, alpha, beta, pivot, mc, src } = st;
  const a0 = alpha[0];
  const b0 = beta[0];
  let Tin: number;
  let Tout: number;
  if (kind === 'inlet') {
    Tin = value;
    Tout = a0 * Tin + b0;
  } else if (kind === 'outlet') {
    Tout = value;
    Tin = (Tout - b0) / a0;
  } else {
    // value = ṁc (T_out − T_in) with T_out = α₀ T_in + β₀.
    Tin = 1 - a0 > 1e-12 ? (b0 - value / mc) / (1 - a0) : src[0];
    Tout = a0 * Tin + b0;
  }
  let d = Tin;
  let u = Tout;
  for (let j = 0; j < rows; j++) {
    const a1 = 0.5 * dz[j] * gc1[j];
    const b = 0.5 * dz[j] * g12[j];
    const dn = ((mc - a1 - b) * d + b * u + 2 * a1 * src[j] + b * beta[j + 1]) / pivot[j];
    const un = alpha[j + 1] * dn + beta[j + 1];
    const g = gc1[j] + gc2[j];
    out[j] = g > 0 ? (gc1[j] * 0.5 * (d + dn) + gc2[j] * 0.5 * (u + un)) / g : src[j];
    d = dn;
    u = un;
  }
  st.evalIn = Tin;
  st.evalOut = Tout;
}
