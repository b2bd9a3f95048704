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
 * is integrated over each row with the trapezoidal rule, with T_d = T_u at the bottom. All temperatures
 * are affine in (T_in, T_out), so one march gives the bottom condition and the extracted heat as affine
 * forms; the operating command then fixes T_in and T_out (given inlet; given extraction; given outlet;
 * or pump off, no exchange) and a second march gives each row's channel temperatures. Summing the two
 * channel equations shows ṁc (T_out − T_in) = extracted heat exactly (discrete energy balance).
 * The ground sees, per row, conductance Δz (g_cd + g_cu) to the weighted channel temperature.
 * For a fixed command these boundary temperatures are affine in the cell temperatures; `linearResponse`
 * returns their linear part (the same marches with the command's value set to zero), which the solver
 * uses to couple the loop without extra linear solves.
 * Validity: ṁc large enough that the counter-flow march is well conditioned (turbulent or transitional
 * flow in practice; NTU per row ≪ 10).
 */
import type { InnerBoundary } from './conduction-solver';

export type LoopCommand =
  | { kind: 'off' }
  | { kind: 'inlet'; inlet_C: number }
  | { kind: 'outlet'; outlet_C: number }
  | { kind: 'extraction'; extraction_W: number };

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
  linearResponse(dInnerT_C: Float64Array, out: Float64Array): void;
}

/** Creates the loop boundary for the first `rowLength_m.length` rows of the mesh. */
export function createPileLoop(spec: PileLoopSpec): PileLoop {
  const rows = spec.rowLength_m.length;
  const dz = Float64Array.from(spec.rowLength_m);
  const mc = spec.flowCapacity_W_K;
  if (!(mc > 0)) throw new RangeError(`flowCapacity_W_K must be > 0 W/K; received ${mc}`);
  const gc1 = new Float64Array(rows);
  const gc2 = new Float64Array(rows);
  const g12 = new Float64Array(rows);
  const Tc = new Float64Array(rows);
  let time = 0;
  // Affine coefficient vectors [const, Tin, Tout] for the two channels during the march.
  const d = new Float64Array(3);
  const u = new Float64Array(3);
  const dn = new Float64Array(3);
  const un = new Float64Array(3);
  const ext = new Float64Array(3);
  const Tb = new Float64Array(rows);
  let src: Float64Array = Tc;
  let lastKind: LoopCommand['kind'] = 'off';
  let evalIn = NaN;
  let evalOut = NaN;

  const loop: PileLoop = {
    rows,
    g_W_K: new Float64Array(rows),
    T_C: new Float64Array(rows),
    q_W: new Float64Array(rows),
    inlet_C: NaN,
    outlet_C: NaN,
    extraction_W: 0,
    running: false,
    beginStep(time_s: number) {
      time = time_s;
    },
    endStep() {},
    update(innerT: Float64Array, halfCell: Float64Array): number {
      for (let j = 0; j < rows; j++) {
        const ga = spec.rowActive[j] ? halfCell[j] : 0;
        const S = ga + spec.gDown_W_mK + spec.gUp_W_mK;
        gc1[j] = (ga * spec.gDown_W_mK) / S;
        gc2[j] = (ga * spec.gUp_W_mK) / S;
        // Insulated rows: no exchange at all (the channels are taken as insulated from each other too).
        g12[j] = ga > 0 ? spec.gChannels_W_mK + (spec.gDown_W_mK * spec.gUp_W_mK) / S : 0;
        Tc[j] = innerT[j];
      }
      const cmd = spec.command(time, Number.isFinite(loop.outlet_C) ? loop.outlet_C : innerT[0]);
      let change = 0;
      if (cmd.kind === 'off') {
        loop.running = false;
        loop.extraction_W = 0;
        lastKind = 'off';
        for (let j = 0; j < rows; j++) {
          change = Math.max(change, loop.g_W_K[j] > 0 ? Math.abs(loop.g_W_K[j]) : 0);
          loop.g_W_K[j] = 0;
          loop.T_C[j] = Tc[j];
        }
        return change;
      }
      loop.running = true;
      lastKind = cmd.kind;
      const value =
        cmd.kind === 'inlet' ? cmd.inlet_C : cmd.kind === 'outlet' ? cmd.outlet_C : cmd.extraction_W;
      src = Tc;
      evaluate(cmd.kind, value, Tb);
      for (let j = 0; j < rows; j++) {
        change = Math.max(change, Math.abs(Tb[j] - loop.T_C[j]));
        loop.T_C[j] = Tb[j];
        loop.g_W_K[j] = dz[j] * (gc1[j] + gc2[j]);
      }
      loop.inlet_C = evalIn;
      loop.outlet_C = evalOut;
      loop.extraction_W = mc * (evalOut - evalIn);
      return change;
    },
    linearResponse(dInnerT: Float64Array, out: Float64Array): void {
      if (lastKind === 'off') {
        for (let j = 0; j < rows; j++) out[j] = dInnerT[j];
        return;
      }
      // The map from cell temperatures to boundary temperatures is affine for a fixed command: its
      // linear part is the same march with the command's value set to zero.
      src = dInnerT;
      evaluate(lastKind, 0, out);
      src = Tc;
    },
  };

  /**
   * Fluid temperatures for the ground temperatures in `src` and the command (kind, value): first march
   * with affine forms, closure by the command, second march with numbers; writes each row's weighted
   * channel temperature (the ground's boundary value; the cell's own value where g = 0) into `out` and
   * the inlet and outlet temperatures into evalIn / evalOut.
   */
  function evaluate(kind: 'inlet' | 'outlet' | 'extraction', value: number, out: Float64Array): void {
    d.fill(0);
    u.fill(0);
    ext.fill(0);
    d[1] = 1;
    u[2] = 1;
    for (let j = 0; j < rows; j++) marchRow(j, 3);
    // Bottom: d - u = 0 (coefficients b), extraction = ext.
    const b0 = d[0] - u[0];
    const b1 = d[1] - u[1];
    const b2 = d[2] - u[2];
    let Tin: number;
    let Tout: number;
    if (kind === 'inlet') {
      Tin = value;
      Tout = -(b0 + b1 * Tin) / b2;
    } else if (kind === 'outlet') {
      Tout = value;
      Tin = -(b0 + b2 * Tout) / b1;
    } else {
      // b0 + b1 Tin + b2 Tout = 0;  ext0 + ext1 Tin + ext2 Tout = E
      const E = value;
      const det = b1 * ext[2] - b2 * ext[1];
      Tin = (-b0 * ext[2] - b2 * (E - ext[0])) / det;
      Tout = (b1 * (E - ext[0]) + b0 * ext[1]) / det;
    }
    // Second march with numbers: the channel means per row give the ground's boundary values.
    d[0] = Tin;
    u[0] = Tout;
    ext[0] = 0;
    for (let j = 0; j < rows; j++) {
      const meanD = marchRow(j, 1);
      const meanU = 0.5 * (u[0] + un[0]);
      d[0] = dn[0];
      u[0] = un[0];
      const g = gc1[j] + gc2[j];
      out[j] = g > 0 ? (gc1[j] * meanD + gc2[j] * meanU) / g : src[j];
    }
    evalIn = Tin;
    evalOut = Tout;
  }

  /**
   * Advances both channels over row j (trapezoidal rule) for the first `comps` affine components;
   * with comps === 3 updates d, u and ext in place; with comps === 1 writes dn/un and returns the down
   * channel's row mean.
   */
  function marchRow(j: number, comps: number): number {
    const a1 = 0.5 * dz[j] * gc1[j];
    const a2 = 0.5 * dz[j] * gc2[j];
    const b = 0.5 * dz[j] * g12[j];
    const m11 = mc + a1 + b;
    const m12 = -b;
    const m21 = -b;
    const m22 = a2 + b - mc;
    const det = m11 * m22 - m12 * m21;
    for (let k = 0; k < comps; k++) {
      const tc = k === 0 ? src[j] : 0;
      const r1 = (mc - a1 - b) * d[k] + b * u[k] + 2 * a1 * tc;
      const r2 = b * d[k] - (mc + a2 + b) * u[k] + 2 * a2 * tc;
      const dNew = (r1 * m22 - m12 * r2) / det;
      const uNew = (m11 * r2 - m21 * r1) / det;
      if (comps === 3) {
        // extraction over the row: Δz [g_cd (Tc − mean d) + g_cu (Tc − mean u)]
        ext[k] += 2 * a1 * (tc - 0.5 * (d[k] + dNew)) + 2 * a2 * (tc - 0.5 * (u[k] + uNew));
        d[k] = dNew;
        u[k] = uNew;
      } else {
        dn[k] = dNew;
        un[k] = uNew;
      }
    }
    return comps === 1 ? 0.5 * (d[0] + dn[0]) : 0;
  }

  return loop;
}
