/**
 * Implicit axisymmetric (r, z) finite-volume heat conduction with phase change (the site simulator core).
 *
 * Method. Cell balance over a time step Δt (backward Euler, fluxes at the new time):
 *   V (H_i^{n+1} − H_i^n)/Δt = Σ_nb G_i,nb (T_nb − T_i) + boundary terms,
 * with G the exact conductances of cylindrical shells in r, 2π Δz / (ln(r_f/r_c)/k_i + ln(r_c'/r_f)/k_j),
 * and of half-cells in series in z. Phase change uses the enthalpy-conserving apparent-capacity scheme of
 * Pham (1985, Int. J. Heat Mass Transfer 28:2079-2084): the capacity is the enthalpy secant between the
 * old temperature and a linear extrapolation of the last two steps; the linear system is solved for T*,
 * then the capacity is re-linearised as the secant between T^n and T* and the system solved again
 * (`phaseIterations`, default 2: the single pass showed a front error of about 2 % in the NEU-9 test
 * that did not vanish as Δt → 0; the second pass removes it); finally the enthalpy is advanced by
 * exactly C (T* − T^n) (which equals the flux divergence at T*) and the new temperature is T(H).
 * Latent heat is therefore conserved to round-off whatever the step, and the scheme stays stable for
 * steps of days. Conductivities are taken at the old temperature.
 * The linear system (5-point stencil, symmetric positive definite) is solved directly by a banded
 * Cholesky factorisation (bandwidth nr; rows numbered from the bottom up so that only the rows from
 * the deepest changed one upwards are re-factored: in most steps only the active layer changes).
 * Boundaries: surface temperature (Dirichlet through the top half-cell), a fixed upward heat flux at the
 * bottom (geothermal), zero flux at the far radius, and at the inner radius (the pile wall) either zero
 * flux or an `InnerBoundary` (pile rows) that supplies a conductance, a temperature and a heat rate per
 * row; the loop is re-evaluated from each new field until its boundary temperatures move less than
 * `tolerance_K`, with the fluid level (the dominant, uniform mode of the coupling) corrected through a
 * unit response solved in the same pass over the factor (see `solveCoupled`), so that a pass usually
 * needs one substitution for the field and the response and at most one correction.
 * Energy bookkeeping: every step adds the boundary heat flows at T* times Δt; the change of the stored
 * enthalpy (sensible + latent) must match their sum (checked by `energyBalance`).
 * Files: this one holds the public facade (`createConductionSolver` and its time step, `energyBalance`,
 * the exported types); the solver state and its factorisation and residual are conduction-system.ts, the
 * assembly of the system conduction-assembly.ts and the pile-loop coupling iteration
 * conduction-coupling.ts.
 */
import { createConductionCoupling, iterateCoupled, solveCoupled, updateInner } from './conduction-coupling';
import { assemble, updateConductances } from './conduction-assembly';
import { copyField, createConductionSystem } from './conduction-system';
import type { SiteMesh } from './site-mesh';
import { apparentCapacity, enthalpyAt, temperatureAt } from './ground-enthalpy';
import type { ConductionSetup } from './conduction-system';

export type { ConductionSetup, InnerBoundary } from './conduction-system';

export interface EnergyLedger {
  /** Heat into the ground through the surface, bottom and pile wall, J (sums over the run). */
  surface_J: number;
  bottom_J: number;
  pile_J: number;
  /** Sum of |heat flow| × Δt over all boundaries and steps, J (the denominator of the relative error). */
  gross_J: number;
}

export interface ConductionSolver {
  mesh: SiteMesh;
  /** Cell temperatures, row-major (index j * nr + i), °C. */
  T: Float64Array;
  /** Volumetric enthalpy per cell, J/m³. */
  H: Float64Array;
  volume_m3: Float64Array;
  time_s: number;
  ledger: EnergyLedger;
  /** Total passes of forward and back substitution so far (two right-hand sides in one pass count once). */
  sweeps: number;
  /** Total right-hand sides solved so far (for benchmarks). */
  rightHandSides: number;
  /** Total band rows re-factored so far (n per full factorisation; for benchmarks). */
  refactoredRows: number;
  /** Iterative-refinement corrections so far (for benchmarks). */
  refinements: number;
  /** Steps whose pile-coupling iteration stopped at maxSweeps before reaching the tolerance. */
  unconverged: number;
  step(dt_s: number): void;
  /** Stored enthalpy, J. */
  storedEnergy_J(): number;
}

/** Creates a solver in its initial state (time 0). Allocates everything once; `step` allocates nothing. */
export function createConductionSolver(s: ConductionSetup): ConductionSolver {
  const phaseIterations = s.phaseIterations ?? 2;
  const phaseTolerance = s.phaseTolerance ?? 1e-3;
  const st = createConductionSystem(s);
  const pc = createConductionCoupling(st, s.tolerance_K, s.maxSweeps);
  const { mesh, materials, mat, nr, nz, n, np, inner, qBottom, Az, V, T, H, Tprev, Told, Tguess, capC, Gs } =
    st;
  const { gUsed, TbcUsed, qUsed } = st;
  const ledger: EnergyLedger = { surface_J: 0, bottom_J: 0, pile_J: 0, gross_J: 0 };

  const solver: ConductionSolver = {
    mesh,
    T,
    H,
    volume_m3: V,
    time_s: 0,
    ledger,
    sweeps: 0,
    rightHandSides: 0,
    refactoredRows: 0,
    refinements: 0,
    unconverged: 0,
    storedEnergy_J() {
      // Recomputed from the temperatures (an independent path from the incremental H updates).
      let e = 0;
      for (let c = 0; c < n; c++) e += V[c] * enthalpyAt(materials, mat[(c / nr) | 0], T[c]);
      return e;
    },
    step(dt_s: number) {
      const t1 = solver.time_s + dt_s;
      const Tsurf = s.surfaceTemperature_C(t1);
      // Conductivities at the old temperature; conductances are recomputed only next to a change.
      updateConductances(st, Tsurf);
      Told.set(T);
      if (inner) inner.beginStep(t1, dt_s);
      for (let c = 0; c < n; c++) {
        Tguess[c] = 2 * Told[c] - Tprev[c];
        T[c] = Tguess[c];
      }
      let converged = false;
      for (let outer = 0; outer < phaseIterations; outer++) {
        assemble(st, dt_s);
        if (outer === 0) updateInner(st, pc);
        const last = outer + 1 === phaseIterations;
        // The first pass usually needs the pile coupling's unit response (solved in the same pass over
        // the factor); a re-linearisation pass starts from coupled boundary values and rarely does.
        converged = solveCoupled(st, pc, !last, outer === 0);
        copyField(st);
        // Re-linearise only if some cell's secant capacity between T^n and the new T* differs from the
        // one used (a cell crossing into or out of its freezing interval); otherwise T* is final.
        let relinearise = false;
        const { Ts, Tl, cF, cT } = materials;
        for (let j = 0; j < nz && !relinearise; j++) {
          const mj = mat[j];
          const ts = Ts[mj];
          const tl = Tl[mj];
          for (let c = j * nr; c < (j + 1) * nr; c++) {
            const used = capC[c];
            const t0 = Told[c];
            const t1 = T[c];
            const C =
              t0 < ts && t1 < ts
                ? cF[mj]
                : t0 > tl && t1 > tl
                  ? cT[mj]
                  : apparentCapacity(materials, mj, t0, t1);
            if (!(Math.abs(C - used) < phaseTolerance * used)) {
              relinearise = true;
              break;
            }
          }
        }
        Tguess.set(T);
        if (!relinearise) {
          if (!last) {
            converged = iterateCoupled(st, pc, false);
            copyField(st);
          }
          break;
        }
      }
      if (!converged) solver.unconverged++;
      // Boundary heat flows at T*, W (into the ground).
      let qs = 0;
      for (let i = 0; i < nr; i++) qs += Gs[i] * (Tsurf - T[i]);
      let qb = 0;
      for (let i = 0; i < nr; i++) qb += qBottom * Az[i];
      let qp = 0;
      for (let j = 0; j < np; j++) qp += gUsed[j] * (TbcUsed[j] - T[j * nr]) + qUsed[j];
      ledger.surface_J += qs * dt_s;
      ledger.bottom_J += qb * dt_s;
      ledger.pile_J += qp * dt_s;
      ledger.gross_J += (Math.abs(qs) + Math.abs(qb) + Math.abs(qp)) * dt_s;
      // Enthalpy update and latent correction (Pham 1985).
      for (let j = 0; j < nz; j++) {
        const mj = mat[j];
        for (let i = 0; i < nr; i++) {
          const c = j * nr + i;
          H[c] += capC[c] * (T[c] - Told[c]);
          T[c] = temperatureAt(materials, mj, H[c]);
        }
      }
      Tprev.set(Told);
      if (inner) inner.endStep(dt_s);
      solver.time_s = t1;
    },
  };
  // The linear system and the coupling count their work on the public solver object.
  st.work = solver;
  return solver;
}

/**
 * Relative energy-balance error of a run: |ΔE_stored − E_boundaries| / E_gross, where ΔE_stored is the
 * change of Σ V·H(T) (sensible + latent) between the start and now, E_boundaries the net heat that
 * entered through the surface, bottom and pile wall, and E_gross the sum of |heat flow|·Δt over all
 * boundaries and steps.
 */
export function energyBalance(
  initialStored_J: number,
  solver: ConductionSolver,
): { stored_J: number; boundaries_J: number; relativeError: number } {
  const stored = solver.storedEnergy_J() - initialStored_J;
  const L = solver.ledger;
  const boundaries = L.surface_J + L.bottom_J + L.pile_J;
  const denom = Math.max(L.gross_J, 1e-30);
  return { stored_J: stored, boundaries_J: boundaries, relativeError: Math.abs(stored - boundaries) / denom };
}
