/**
 * Implicit axisymmetric (r, z) finite-volume heat conduction with phase change (the site simulator core).
 *
 * Method. Cell balance over a time step Δt (backward Euler, fluxes at the new time):
 *   V (H_i^{n+1} − H_i^n)/Δt = Σ_nb G_i,nb (T_nb − T_i) + boundary terms,
 * with G the exact conductances of cylindrical shells in r, 2π Δz / (ln(r_f/r_c)/k_i + ln(r_c'/r_f)/k_j),
 * and of half-cells in series in z, and H = H(T) the enthalpy of ground-enthalpy.ts. This fully
 * implicit enthalpy equation is solved to convergence in every step by the Newton linearisation of the
 * enthalpy with the monotone enthalpy update of Swaminathan & Voller (1992, Metall. Trans. B 23:651-664,
 * "A general enthalpy method for modeling solidification processes"): from a state (T^k, H^k = H(T^k)),
 *   V (H^k + C^k (T − T^k) − H^n)/Δt = fluxes(T),   C^k = dH/dT at T^k,
 * is solved for T*, the enthalpy is advanced to H^{k+1} = H^k + C^k (T* − T^k) and the next state is
 * T^{k+1} = T(H^{k+1}) (the step projected back onto the enthalpy curve, which is what keeps the
 * iteration from overshooting across the freezing interval); it stops when |T(H^{k+1}) − T*| is below
 * `phaseTolerance_K` (1e-4 K) in every cell. The accepted H^{k+1} balances the fluxes at T* exactly, so
 * latent and sensible heat are conserved to round-off, and because H(T) is increasing and the matrix is
 * an M-matrix, the converged solution obeys the discrete maximum principle: no cell leaves the range of
 * its boundary values (the earlier fixed two-pass secant scheme of Pham 1985 did not converge across
 * the interval under seasonal forcing and let near-surface cells fall 20+ K below the coldest surface
 * temperature with 7-day steps). A step that does not converge in 16 passes, or whose pile coupling
 * does not, is halved (up to 10 times, counted in `refinedSteps`); a step that still cannot converge
 * throws a `SiteStepError` with the reason. Conductivities are re-evaluated at each pass's state (the
 * iteration is fully implicit in k as well; taking them at T^n thawed the active layer of the demo site
 * 4 % too deep with 7-day steps).
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
import { copyField, createConductionSystem, type ConductionSystem } from './conduction-system';
import type { SiteMesh } from './site-mesh';
import { enthalpyAt, temperatureAt } from './ground-enthalpy';
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
  /** Steps accepted with the pile coupling stopped at maxSweeps (always 0: such a step is halved). */
  unconverged: number;
  /** Steps that were halved because an attempt did not converge (each halving counts once). */
  refinedSteps: number;
  /** Passes of the enthalpy Newton iteration so far (for benchmarks). */
  phasePasses: number;
  step(dt_s: number): void;
  /** Stored enthalpy, J. */
  storedEnergy_J(): number;
}

/** Why a step could not be completed (thrown as the message of a RangeError). */
export class SiteStepError extends RangeError {
  constructor(message: string) {
    super(message);
    this.name = 'SiteStepError';
  }
}

/** Passes of the enthalpy Newton iteration before the step is halved (model choice). */
const MAX_PHASE_PASSES = 16;
/** Passes whose state updates the conductivities (Picard on k), then held (model choice). */
const PICARD_PASSES = 4;
/** Passes after which the next linearisation state is relaxed by half (model choice). */
const DAMP_AFTER = 8;
/** Halvings of one step before the run stops with an error (a step of Δt / 2^10). */
const MAX_STEP_HALVINGS = 10;

/** The Newton iteration's work arrays: linearisation enthalpy and the updated enthalpy. */
interface NewtonState {
  Hk: Float64Array;
  Hnew: Float64Array;
}

/**
 * Starting state of the iteration: the last steps' trend carried forward (any consistent (T, H(T))
 * pair is a valid start; this one usually lands in the right branch of every cell).
 */
function startingGuess(st: ConductionSystem, ns: NewtonState, ratio: number): void {
  const { materials, mat, nr, nz, T, Told, Tprev, Tguess } = st;
  for (let j = 0; j < nz; j++) {
    const mj = mat[j];
    for (let c = j * nr; c < (j + 1) * nr; c++) {
      const g = Told[c] + ratio * (Told[c] - Tprev[c]);
      Tguess[c] = g;
      T[c] = g;
      ns.Hk[c] = enthalpyAt(materials, mj, g);
    }
  }
}

/** Hnew = H^k + C (T* − T^k) for every cell; returns max |T(Hnew) − T*| (K), NaN if not finite. */
function newtonUpdate(st: ConductionSystem, ns: NewtonState): number {
  const { materials, mat, nr, nz, T, Tguess, capC } = st;
  const { Hk, Hnew } = ns;
  let worst = 0;
  for (let j = 0; j < nz; j++) {
    const mj = mat[j];
    for (let c = j * nr; c < (j + 1) * nr; c++) {
      const h = Hk[c] + capC[c] * (T[c] - Tguess[c]);
      Hnew[c] = h;
      const d = Math.abs(temperatureAt(materials, mj, h) - T[c]);
      if (!(d <= worst)) worst = d; // NaN propagates
    }
  }
  return worst;
}

/**
 * Next linearisation state: the Newton step projected onto the enthalpy curve, relaxed by `omega`
 * (1, or 0.5 after DAMP_AFTER passes, which breaks the rare two-cycle of a cell whose capacities differ
 * by orders of magnitude across its interval; the fixed point is the same).
 */
function relaxLinearisation(st: ConductionSystem, ns: NewtonState, omega: number): void {
  const { materials, mat, nr, nz, Tguess } = st;
  const { Hk, Hnew } = ns;
  for (let j = 0; j < nz; j++) {
    const mj = mat[j];
    for (let c = j * nr; c < (j + 1) * nr; c++) {
      const h = Hk[c] + omega * (Hnew[c] - Hk[c]);
      Hk[c] = h;
      Tguess[c] = temperatureAt(materials, mj, h);
    }
  }
}

/**
 * The enthalpy iteration of one step (assemble, solve with the pile coupling, Newton update) until the
 * enthalpy and temperature agree; returns null when converged, else the reason.
 */
function iteratePhase(
  st: ConductionSystem,
  pc: ReturnType<typeof createConductionCoupling>,
  ns: NewtonState,
  dt_s: number,
  Tsurf: number,
  limits: { maxPasses: number; tolerance_K: number; work: { phasePasses: number } },
): string | null {
  let coupledOk = false;
  let worst = 0;
  for (let pass = 0; pass < limits.maxPasses; pass++) {
    limits.work.phasePasses++;
    assemble(st, dt_s, st.H, ns.Hk);
    if (pass === 0) updateInner(st, pc);
    coupledOk = solveCoupled(st, pc, true, pass === 0);
    copyField(st);
    worst = newtonUpdate(st, ns);
    if (!Number.isFinite(worst)) return `temperatures not finite`;
    if (worst < limits.tolerance_K) {
      // Finish the pass: the coupling and the factor's staleness to the full tolerance.
      coupledOk = iterateCoupled(st, pc, false);
      copyField(st);
      newtonUpdate(st, ns);
      return coupledOk ? null : 'the pile-loop coupling did not converge';
    }
    relaxLinearisation(st, ns, pass >= DAMP_AFTER ? 0.5 : 1);
    // Conductivities at the new state too (Picard on k inside the Newton iteration): lagging them
    // at T^n was a first-order error that thawed the active layer 4 % too deep with 7-day steps.
    // After PICARD_PASSES they are held, so that a cell whose k jumps across its interval cannot
    // keep the iteration cycling (any fixed k conserves energy exactly).
    if (pass + 1 < PICARD_PASSES) {
      st.T.set(st.Tguess);
      updateConductances(st, Tsurf);
    }
  }
  return `the phase-change iteration did not converge in ${limits.maxPasses} passes (largest enthalpy/temperature mismatch ${worst.toExponential(2)} K)`;
}

/** Boundary heat flows at the solved temperatures T*, W (into the ground), added to the ledger over dt_s. */
function recordBoundaryFlows(st: ConductionSystem, ledger: EnergyLedger, Tsurf: number, dt_s: number): void {
  const { nr, np, T, Gs, Az, qBottom, gUsed, TbcUsed, qUsed } = st;
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
}

/** Accepts the step: the enthalpy that balances the fluxes at T* exactly, and the temperature it implies. */
function acceptEnthalpy(st: ConductionSystem, ns: NewtonState): void {
  const { materials, mat, nr, nz, T, H } = st;
  for (let j = 0; j < nz; j++) {
    const mj = mat[j];
    for (let c = j * nr; c < (j + 1) * nr; c++) {
      H[c] = ns.Hnew[c];
      T[c] = temperatureAt(materials, mj, ns.Hnew[c]);
    }
  }
}

/** What a step changes, saved before an attempt so that a failed attempt can be undone. */
function createCheckpoint(st: ConductionSystem, ledger: EnergyLedger) {
  const saveT = new Float64Array(st.n);
  const saveH = new Float64Array(st.n);
  const saveTprev = new Float64Array(st.n);
  const mark = { time_s: 0, dtPrev: 0, surface: 0, bottom: 0, pile: 0, gross: 0 };
  return {
    save(time_s: number, dtPrev: number): void {
      saveT.set(st.T);
      saveH.set(st.H);
      saveTprev.set(st.Tprev);
      Object.assign(mark, { time_s, dtPrev });
      Object.assign(mark, { surface: ledger.surface_J, bottom: ledger.bottom_J, pile: ledger.pile_J });
      mark.gross = ledger.gross_J;
    },
    /** Restores the saved fields and ledger; returns the saved time and previous step. */
    restore(): { time_s: number; dtPrev: number } {
      st.T.set(saveT);
      st.H.set(saveH);
      st.Tprev.set(saveTprev);
      ledger.surface_J = mark.surface;
      ledger.bottom_J = mark.bottom;
      ledger.pile_J = mark.pile;
      ledger.gross_J = mark.gross;
      return { time_s: mark.time_s, dtPrev: mark.dtPrev };
    },
  };
}

/** Creates a solver in its initial state (time 0). Allocates everything once; `step` allocates nothing. */
export function createConductionSolver(s: ConductionSetup): ConductionSolver {
  const st = createConductionSystem(s);
  const pc = createConductionCoupling(st, s.tolerance_K, s.maxSweeps);
  const { mesh, materials, mat, nr, n, inner, V, T, H, Tprev, Told } = st;
  const ledger: EnergyLedger = { surface_J: 0, bottom_J: 0, pile_J: 0, gross_J: 0 };
  const ns: NewtonState = { Hk: new Float64Array(n), Hnew: new Float64Array(n) };
  const checkpoint = createCheckpoint(st, ledger);
  let dtPrev = 0;

  /**
   * One attempt at a step of dt_s from the current state. Returns null when accepted (state advanced),
   * or the reason it could not converge (state unspecified: the caller restores it).
   */
  const attempt = (dt_s: number): string | null => {
    const t1 = solver.time_s + dt_s;
    const Tsurf = s.surfaceTemperature_C(t1);
    // Conductivities at the old temperature; conductances are recomputed only next to a change.
    updateConductances(st, Tsurf);
    Told.set(T);
    if (inner) inner.beginStep(t1, dt_s);
    startingGuess(st, ns, dtPrev > 0 ? dt_s / dtPrev : 0);
    const why = iteratePhase(st, pc, ns, dt_s, Tsurf, limits);
    if (why !== null) return why;
    recordBoundaryFlows(st, ledger, Tsurf, dt_s);
    acceptEnthalpy(st, ns);
    Tprev.set(Told);
    dtPrev = dt_s;
    if (inner) inner.endStep(dt_s);
    solver.time_s = t1;
    return null;
  };

  /** Advances by dt_s, halving the step where it does not converge (at most MAX_STEP_HALVINGS times). */
  const advance = (dt_s: number, depth: number): void => {
    checkpoint.save(solver.time_s, dtPrev);
    const why = attempt(dt_s);
    if (why === null) return;
    ({ time_s: solver.time_s, dtPrev } = checkpoint.restore());
    if (depth >= MAX_STEP_HALVINGS) {
      throw new SiteStepError(
        `site simulation: time step at t = ${(solver.time_s / 86400).toFixed(2)} d could not converge even at ${(dt_s / 86400).toPrecision(3)} d: ${why}`,
      );
    }
    solver.refinedSteps++;
    advance(dt_s / 2, depth + 1);
    advance(dt_s / 2, depth + 1);
  };

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
    refinedSteps: 0,
    phasePasses: 0,
    storedEnergy_J() {
      // Recomputed from the temperatures (an independent path from the incremental H updates).
      let e = 0;
      for (let c = 0; c < n; c++) e += V[c] * enthalpyAt(materials, mat[(c / nr) | 0], T[c]);
      return e;
    },
    step(dt_s: number) {
      advance(dt_s, 0);
    },
  };
  const limits = {
    maxPasses: s.phaseIterations ?? MAX_PHASE_PASSES,
    tolerance_K: s.phaseTolerance_K ?? 1e-4,
    work: solver,
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
