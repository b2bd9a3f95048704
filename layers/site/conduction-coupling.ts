/**
 * The pile-loop coupling of the site conduction solver (conduction-solver.ts): one pass of the step's
 * linear system solved together with the `InnerBoundary` by defect correction over the (possibly
 * slightly stale) banded factor of conduction-system.ts, with the fluid level corrected through a unit
 * response (`solveCoupled`), the fixed-point iteration with Anderson mixing of depth 1 that finishes it
 * (`iterateCoupled`) and the coarse correction along the unit response (`coarseCorrection`).
 * `createConductionCoupling` allocates the iteration's state once; nothing here allocates per step.
 */
import { choleskySolve, choleskySolvePair } from './banded-cholesky';
import { buildRhs, factor, refactorFrom, residual, type ConductionSystem } from './conduction-system';

/** State of the coupling iteration (per pile row arrays have length max(1, np)). */
export interface ConductionCoupling {
  /** Pile-loop coupling tolerance on the boundary temperatures, K. */
  tol: number;
  maxSweeps: number;
  /** Inner-cell temperatures handed to the boundary. */
  innerT: Float64Array;
  /** Coupling residual and boundary temperature of the previous fixed-point step (Anderson mixing). */
  rPrev: Float64Array;
  fPrev: Float64Array;
  /** Unit response at the inner cells and the boundary's linear response to it. */
  unitInner: Float64Array;
  unitResponse: Float64Array;
  /** Whether xu holds the unit response for the current factor. */
  unitValid: boolean;
  /** Whether rPrev/fPrev hold a previous fixed-point step. */
  history: boolean;
  /** Whether the coarse correction was made since the last substitution. */
  coarseDone: boolean;
  /** Consecutive corrections whose residual stayed above tolerance. */
  stale: number;
}

/** Allocates the coupling state for `st` (tolerance_K default 1e-4 K, maxSweeps default 200). */
export function createConductionCoupling(
  st: ConductionSystem,
  tolerance_K: number | undefined,
  maxSweeps: number | undefined,
): ConductionCoupling {
  const p = Math.max(1, st.np);
  return {
    tol: tolerance_K ?? 1e-4,
    maxSweeps: maxSweeps ?? 200,
    innerT: new Float64Array(p),
    rPrev: new Float64Array(p),
    fPrev: new Float64Array(p),
    unitInner: new Float64Array(p),
    unitResponse: new Float64Array(p),
    unitValid: false,
    history: false,
    coarseDone: false,
    stale: 0,
  };
}

/** Hands the current inner-column cell temperatures to the boundary; returns its largest T_C change. */
export function updateInner(st: ConductionSystem, pc: ConductionCoupling): number {
  const { inner, np, nr, T, halfCell } = st;
  const { innerT } = pc;
  if (!inner) return 0;
  for (let j = 0; j < np; j++) innerT[j] = T[j * nr];
  return inner.update(innerT, halfCell);
}

/** Whether the boundary can state its linear response and exchanges heat on some row. */
function coupled(st: ConductionSystem): boolean {
  const { inner, np, gUsed } = st;
  if (!inner || !inner.linearResponse) return false;
  for (let j = 0; j < np; j++) if (gUsed[j] > 0) return true;
  return false;
}

/** Right-hand side of the unit response: every coupled row's boundary temperature raised by 1 K. */
function unitResponseRhs(st: ConductionSystem): void {
  const { np, nz, nr, xu, gUsed } = st;
  xu.fill(0);
  for (let j = 0; j < np; j++) xu[(nz - 1 - j) * nr] = gUsed[j];
}

/**
 * Solves the step's linear system together with the pile loop, by defect correction with the
 * (possibly slightly stale) factor:
 * 1. One pass over the factor solves for the field x at the loop's current boundary values and, when
 *    the loop can state its linear response, for the unit response u (the field change when every
 *    pile-row boundary temperature rises by 1 K).
 * 2. The loop is evaluated at x. Its boundary temperatures depend on the inner cells mainly through
 *    one mode, the level of the fluid (for a given extraction the whole profile shifts with the
 *    ground), so the residual r = F(x) − y of the coupling is first reduced along that mode without
 *    another solve: y ← y + s, x ← x + s·u, with s the conductance-weighted least-squares root of
 *    r + s·(P·u − 1) (P the loop's linear response). Since the loop is affine for a fixed command,
 *    this is exact for the fluid level; what is left is the weak row-to-row part.
 * 3. Otherwise one substitution with the current residual of the system (the factor's staleness) plus
 *    the remaining boundary change (a fixed-point step y ← F(x) with Anderson mixing of depth 1)
 *    corrects x, and 2 is repeated.
 * It stops when the loop's boundary temperatures move less than `tolerance_K` and the residual of
 * the system is below the solve tolerance, as a temperature, so the field satisfies the system with
 * the boundary values recorded as used (which the energy ledger takes). `acceptStale`: see
 * `iterateCoupled`; `withUnit`: solve the unit response together with the field (otherwise only when
 * step 2 needs it).
 */
export function solveCoupled(
  st: ConductionSystem,
  pc: ConductionCoupling,
  acceptStale: boolean,
  withUnit: boolean,
): boolean {
  const { A, n, nz, np, nr, x, xr, xu, work } = st;
  factor(st);
  buildRhs(st);
  // Solve for the change from the latest solution (the previous pass or step) rather than for the
  // field itself: the factor's staleness then only acts on that change, which is small where the
  // factor is stale (deep rows), so a correction is rarely needed.
  residual(st);
  pc.unitValid = false;
  if (withUnit && coupled(st)) {
    unitResponseRhs(st);
    choleskySolvePair(A, xr, xu, (nz - np) * nr);
    work.sweeps++;
    work.rightHandSides += 2;
    pc.unitValid = true;
  } else {
    choleskySolve(A, xr);
    work.sweeps++;
    work.rightHandSides++;
  }
  for (let b = 0; b < n; b++) x[b] += xr[b];
  pc.coarseDone = false;
  pc.history = false;
  pc.stale = 0;
  return iterateCoupled(st, pc, acceptStale);
}

/**
 * Steps 2 and 3 of `solveCoupled`. With `acceptStale` it returns as soon as the coupling has
 * converged, leaving what the factor's staleness left of the residual uncorrected: used for a
 * pass whose T* only serves to re-linearise the capacities (its coupling error may be `tolerance_K`,
 * far larger); `iterateCoupled(st, pc, false)` then finishes the pass if it turns out to be the last.
 */
export function iterateCoupled(st: ConductionSystem, pc: ConductionCoupling, acceptStale: boolean): boolean {
  const { A, n, nz, np, nr, x, xr, xb, xu, inner, gUsed, TbcUsed, qUsed, halfCell, work } = st;
  const { tol, maxSweeps, innerT, rPrev, fPrev } = pc;
  for (let it = 0; it < maxSweeps; it++) {
    let worst = 0;
    let refactor = false;
    if (inner) {
      for (let j = 0; j < np; j++) innerT[j] = x[(nz - 1 - j) * nr];
      inner.update(innerT, halfCell);
      for (let j = 0; j < np; j++) {
        // Rows without conductance exchange nothing: their boundary temperature does not matter.
        const r = gUsed[j] > 0 ? inner.T_C[j] - TbcUsed[j] : 0;
        if (Math.abs(r) > worst) worst = Math.abs(r);
        if (inner.g_W_K[j] !== gUsed[j]) refactor = true;
      }
    }
    if (refactor) {
      // The loop changed its conductances (e.g. the pump switched): new matrix and right-hand side.
      factor(st);
      buildRhs(st);
      pc.unitValid = false;
      pc.history = false;
      residual(st);
    } else {
      if (worst >= tol && !pc.coarseDone && coupled(st)) {
        pc.coarseDone = true;
        if (!pc.unitValid) {
          // The unit response was not solved with the field (see the solver's `step`): solve it now.
          unitResponseRhs(st);
          choleskySolve(A, xu);
          work.sweeps++;
          work.rightHandSides++;
          pc.unitValid = true;
        }
        if (coarseCorrection(st, pc)) continue;
      }
      if (worst < tol && acceptStale) return true;
      const small = residual(st);
      if (worst < tol && small) return true;
      if (!small && ++pc.stale > 4) {
        // Defect correction not converging: re-factor everything that differs at all.
        refactorFrom(st, 0);
        pc.unitValid = false;
        pc.stale = 0;
      }
      // Fixed-point step on what the fluid-level correction left, with Anderson mixing of depth 1
      // (a secant step on the residual F(y) − y, exact for the affine loop along the last direction).
      let theta = 0;
      if (inner && pc.history) {
        let num = 0;
        let den = 0;
        for (let j = 0; j < np; j++) {
          if (!(gUsed[j] > 0)) continue;
          const r = inner.T_C[j] - TbcUsed[j];
          const dr = r - rPrev[j];
          num += r * dr;
          den += dr * dr;
        }
        theta = den > 0 ? num / den : 0;
      }
      for (let j = 0; j < np; j++) {
        const b = (nz - 1 - j) * nr;
        const f = inner!.T_C[j];
        rPrev[j] = f - TbcUsed[j];
        const y = theta !== 0 && gUsed[j] > 0 ? f - theta * (f - fPrev[j]) : f;
        fPrev[j] = f;
        const d = gUsed[j] * (y - TbcUsed[j]) + (inner!.q_W[j] - qUsed[j]);
        xr[b] += d;
        xb[b] += d;
        TbcUsed[j] = y;
        qUsed[j] = inner!.q_W[j];
      }
      pc.history = true;
    }
    choleskySolve(A, xr);
    work.sweeps++;
    work.rightHandSides++;
    work.refinements++;
    for (let b = 0; b < n; b++) x[b] += xr[b];
    pc.coarseDone = false;
  }
  return false;
}

/**
 * Step 2 of `solveCoupled`: shifts the pile's boundary temperatures by the s that best cancels the
 * coupling residual along the unit response, and the field by s·u. Returns false if there is no
 * such shift (no coupled row, or the response is degenerate).
 */
function coarseCorrection(st: ConductionSystem, pc: ConductionCoupling): boolean {
  const { n, nz, np, nr, x, xb, xu, inner, gUsed, TbcUsed } = st;
  const { unitInner, unitResponse } = pc;
  for (let j = 0; j < np; j++) unitInner[j] = xu[(nz - 1 - j) * nr];
  inner!.linearResponse!(unitInner, unitResponse);
  let num = 0;
  let den = 0;
  for (let j = 0; j < np; j++) {
    const g = gUsed[j];
    if (!(g > 0)) continue;
    const v = 1 - unitResponse[j];
    num += g * v * (inner!.T_C[j] - TbcUsed[j]);
    den += g * v * v;
  }
  const s = num / den;
  if (!(den > 0) || !Number.isFinite(s)) return false;
  for (let j = 0; j < np; j++) {
    if (!(gUsed[j] > 0)) continue;
    TbcUsed[j] += s;
    xb[(nz - 1 - j) * nr] += gUsed[j] * s;
  }
  for (let b = 0; b < n; b++) x[b] += s * xu[b];
  return true;
}
