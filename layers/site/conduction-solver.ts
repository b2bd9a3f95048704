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
 * unit response solved in the same pass over the factor (see `solveLinear`), so that a pass usually
 * needs one substitution for the field and the response and at most one correction.
 * Energy bookkeeping: every step adds the boundary heat flows at T* times Δt; the change of the stored
 * enthalpy (sensible + latent) must match their sum (checked by `energyBalance`).
 */
import { choleskyFactor, choleskySolve, choleskySolvePair, createBandMatrix } from './banded-cholesky';
import type { SiteMesh } from './site-mesh';
import {
  apparentCapacity,
  conductivityAt,
  enthalpyAt,
  temperatureAt,
  type MaterialTable,
} from './ground-enthalpy';

/** Pile wall coupling for the first `rows` rows of the inner column (see module comment). */
export interface InnerBoundary {
  rows: number;
  /** Conductance from the inner cell to the boundary temperature, W/K, per pile row. */
  g_W_K: Float64Array;
  /** Boundary (effective fluid) temperature, °C, per pile row. */
  T_C: Float64Array;
  /** Additional heat rate into the inner cell, W, per pile row. */
  q_W: Float64Array;
  /** Called once at the start of each step with the time at its end. */
  beginStep(time_s: number, dt_s: number): void;
  /**
   * Called after each sweep with the current inner-cell temperatures (length `rows`) and the per-metre
   * conductance of the half cell between the pile wall and the cell centre, W/m·K. Updates g, T, q and
   * returns the largest change of T_C made (K).
   */
  update(innerT_C: Float64Array, halfCell_W_mK: Float64Array): number;
  /**
   * Optional: the change of T_C that a change `dInnerT_C` of the inner-cell temperatures would cause
   * under the command and conductances of the latest `update` (the linear part of the boundary's
   * affine response; q and g are taken as independent of the cell temperatures). Written into `out`;
   * must not change the boundary's state. Lets the solver couple the boundary without extra solves.
   */
  linearResponse?(dInnerT_C: Float64Array, out: Float64Array): void;
  /** Called once the step is accepted, with the step length. */
  endStep(dt_s: number): void;
}

export interface ConductionSetup {
  mesh: SiteMesh;
  materials: MaterialTable;
  /** Material index for each row (layers are horizontal). */
  rowMaterial: ArrayLike<number>;
  surfaceTemperature_C: (time_s: number) => number;
  /** Geothermal heat flux entering through the bottom, W/m² (positive upward, into the domain). */
  bottomFlux_W_m2: number;
  /** Initial temperature per row (length nz, same in every column) or per cell (length nr*nz). */
  initialT_C: ArrayLike<number>;
  inner: InnerBoundary | null;
  tolerance_K?: number;
  maxSweeps?: number;
  /** Linear solves with re-linearised capacity per step (1 = Pham's single pass; default 2). */
  phaseIterations?: number;
  /** Relative change of a cell's apparent capacity below which no further pass is made. */
  phaseTolerance?: number;
}

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
  const { mesh, materials } = s;
  const { nr, nz, rFaces_m: rf, zFaces_m: zf, rCentres_m: rc } = mesh;
  const n = nr * nz;
  const tol = s.tolerance_K ?? 1e-4;
  const maxSweeps = s.maxSweeps ?? 200;
  const phaseIterations = s.phaseIterations ?? 2;
  const phaseTolerance = s.phaseTolerance ?? 1e-3;
  const mat = Int32Array.from(s.rowMaterial);
  if (mat.length !== nz) throw new RangeError(`rowMaterial must have ${nz} entries; received ${mat.length}`);

  const dz = new Float64Array(nz);
  for (let j = 0; j < nz; j++) dz[j] = zf[j + 1] - zf[j];
  const Az = new Float64Array(nr);
  const gOut = new Float64Array(nr); // ln(rf[i+1]/rc[i]) / 2π
  const gIn = new Float64Array(nr); // ln(rc[i]/rf[i]) / 2π
  for (let i = 0; i < nr; i++) {
    Az[i] = Math.PI * (rf[i + 1] * rf[i + 1] - rf[i] * rf[i]);
    gOut[i] = Math.log(rf[i + 1] / rc[i]) / (2 * Math.PI);
    gIn[i] = Math.log(rc[i] / rf[i]) / (2 * Math.PI);
  }
  const V = new Float64Array(n);
  for (let j = 0; j < nz; j++) for (let i = 0; i < nr; i++) V[j * nr + i] = Az[i] * dz[j];

  const T = new Float64Array(n);
  if (s.initialT_C.length === nz) {
    for (let j = 0; j < nz; j++) T.fill(s.initialT_C[j], j * nr, (j + 1) * nr);
  } else if (s.initialT_C.length === n) {
    T.set(s.initialT_C);
  } else {
    throw new RangeError(`initialT_C must have ${nz} or ${n} entries; received ${s.initialT_C.length}`);
  }
  const H = new Float64Array(n);
  for (let c = 0; c < n; c++) H[c] = enthalpyAt(materials, mat[(c / nr) | 0], T[c]);
  const Tprev = Float64Array.from(T);
  const Told = new Float64Array(n);
  const Tguess = new Float64Array(n);
  const k = new Float64Array(n);
  const rk = new Float64Array(n); // 1 / k
  const kRowChanged = new Uint8Array(nz);
  const cap = new Float64Array(n); // C V / Δt, W/K
  const capC = new Float64Array(n); // apparent capacity C, J/m³K
  const gSum = new Float64Array(n); // Σ conductances to neighbours and surface, W/K
  const bFixed = new Float64Array(n); // fixed heat inflow (surface, geothermal), W
  const aP = new Float64Array(n);
  const rhs = new Float64Array(n);
  const Gr = new Float64Array(Math.max(1, nz * (nr - 1)));
  const Gz = new Float64Array(Math.max(1, (nz - 1) * nr));
  const Gs = new Float64Array(nr);
  const inner = s.inner;
  const np = inner ? Math.min(inner.rows, nz) : 0;
  const innerT = new Float64Array(Math.max(1, np));
  const gUsed = new Float64Array(Math.max(1, np));
  const TbcUsed = new Float64Array(Math.max(1, np));
  const qUsed = new Float64Array(Math.max(1, np));
  const rPrev = new Float64Array(Math.max(1, np));
  const fPrev = new Float64Array(Math.max(1, np));
  const unitInner = new Float64Array(Math.max(1, np));
  const unitResponse = new Float64Array(Math.max(1, np));
  const A = createBandMatrix(n, nr);
  const curDiag = new Float64Array(n);
  const curLeft = new Float64Array(n);
  const curDown = new Float64Array(n);
  const factDiag = new Float64Array(n);
  const factLeft = new Float64Array(n);
  const factDown = new Float64Array(n);
  const xb = new Float64Array(n);
  const xr = new Float64Array(n);
  const xu = new Float64Array(n);
  const refactorTolerance = 1e-4;
  // Largest residual accepted, as a temperature (|residual| / diagonal). 1e-9 K (was 1e-7 K): solving
  // for the change from the latest solution leaves residuals of 1e-8 K or so after one substitution,
  // which 1e-7 K would accept; at 1e-9 K one more correction is made in about one pass in five and the
  // energy-balance error of the standard pair falls from 1.3e-8 to 3e-11 (the accepted residuals are
  // what remains of it).
  const solveTolerance_K = 1e-9;
  let factored = false;
  const x = new Float64Array(n);
  const halfCell = new Float64Array(Math.max(1, np));
  const qBottom = s.bottomFlux_W_m2;
  const ledger: EnergyLedger = { surface_J: 0, bottom_J: 0, pile_J: 0, gross_J: 0 };

  function updateInner(): number {
    if (!inner) return 0;
    for (let j = 0; j < np; j++) innerT[j] = T[j * nr];
    return inner.update(innerT, halfCell);
  }

  /**
   * Per step (conductances fixed): each cell's sum of conductances to its neighbours and the surface,
   * and its fixed heat inflow (surface temperature through the top half cell, geothermal flux).
   */
  function assembleConductances(Tsurf: number): void {
    for (let j = 0; j < nz; j++) {
      // Only rows next to a conductivity change, and the boundary rows (surface temperature), change.
      if (!(kRowChanged[j] || (j > 0 && kRowChanged[j - 1]) || (j < nz - 1 && kRowChanged[j + 1]))) {
        if (j !== 0 && j !== nz - 1) continue;
      }
      const last = j === nz - 1;
      for (let i = 0; i < nr; i++) {
        const c = j * nr + i;
        let g = 0;
        let b = 0;
        if (i > 0) g += Gr[j * (nr - 1) + i - 1];
        if (i < nr - 1) g += Gr[j * (nr - 1) + i];
        if (j > 0) g += Gz[c - nr];
        if (!last) g += Gz[c];
        else b += qBottom * Az[i];
        if (j === 0) {
          g += Gs[i];
          b += Gs[i] * Tsurf;
        }
        gSum[c] = g;
        bFixed[c] = b;
      }
    }
  }

  /** Per pass: capacities (secant between T^n and the guess), diagonal and right-hand side. */
  function assemble(dt_s: number): void {
    const { Ts, Tl, cF, cT } = materials;
    for (let j = 0; j < nz; j++) {
      const mj = mat[j];
      const ts = Ts[mj];
      const tl = Tl[mj];
      const cf = cF[mj];
      const ct = cT[mj];
      for (let c = j * nr; c < (j + 1) * nr; c++) {
        const t0 = Told[c];
        const t1 = Tguess[c];
        // Same value as apparentCapacity; its branch cases inline (most cells).
        const C = t0 < ts && t1 < ts ? cf : t0 > tl && t1 > tl ? ct : apparentCapacity(materials, mj, t0, t1);
        const cp = (C * V[c]) / dt_s;
        capC[c] = C;
        cap[c] = cp;
        aP[c] = cp + gSum[c];
        rhs[c] = cp * t0 + bFixed[c];
      }
    }
  }

  /**
   * Assembles the current band matrix (with the pile conductances of the moment) and re-factors it
   * from the first band row whose entries moved by more than `refactorTolerance` (relative) from those
   * the factor holds. Band rows are numbered from the bottom row of the mesh upwards
   * (b = (nz − 1 − j)·nr + i) so that the rows that change most (the active layer) come last and
   * re-factoring them is cheap. Smaller changes are corrected by defect correction in `solveLinear`.
   */
  function factor(): void {
    let from = factored ? n : 0;
    for (let j = 0; j < nz; j++) {
      const b0 = (nz - 1 - j) * nr;
      for (let i = 0; i < nr; i++) {
        const c = j * nr + i;
        const b = b0 + i;
        let diag = aP[c];
        if (i === 0 && j < np) diag += inner!.g_W_K[j];
        const left = i > 0 ? -Gr[j * (nr - 1) + i - 1] : 0;
        const down = j < nz - 1 ? -Gz[c] : 0;
        curDiag[b] = diag;
        curLeft[b] = left;
        curDown[b] = down;
        if (b < from) {
          const lim = refactorTolerance * diag;
          if (
            Math.abs(diag - factDiag[b]) > lim ||
            Math.abs(left - factLeft[b]) > lim ||
            Math.abs(down - factDown[b]) > lim
          ) {
            from = b;
          }
        }
      }
    }
    for (let j = 0; j < np; j++) gUsed[j] = inner!.g_W_K[j];
    if (from < n) refactorFrom(from);
  }

  function refactorFrom(from: number): void {
    const a = A.band;
    const w = nr + 1;
    a.fill(0, from * w, n * w);
    for (let b = from; b < n; b++) {
      const r0 = b * w - b + nr; // a[r0 + col] = A(b, col)
      factDiag[b] = curDiag[b];
      factLeft[b] = curLeft[b];
      factDown[b] = curDown[b];
      a[r0 + b] = curDiag[b];
      if (b % nr > 0) a[r0 + b - 1] = curLeft[b];
      if (b >= nr) a[r0 + b - nr] = curDown[b];
    }
    choleskyFactor(A, from);
    factored = true;
    solver.refactoredRows += n - from;
  }

  /**
   * Residual of the current band system at x (right-hand side xb) into xr; returns whether every
   * |residual_b| / diag_b (a temperature) is below `solveTolerance_K`. Entries outside the mesh are
   * zero in curLeft/curDown, so only the first and last nr band rows need the range checks.
   */
  function residual(): boolean {
    let small = true;
    for (let b = 0; b < n; b++) {
      let r = xb[b] - curDiag[b] * x[b];
      if (b >= nr && b < n - nr) {
        r -=
          curLeft[b] * x[b - 1] +
          curLeft[b + 1] * x[b + 1] +
          curDown[b] * x[b - nr] +
          curDown[b + nr] * x[b + nr];
      } else {
        if (b > 0) r -= curLeft[b] * x[b - 1];
        if (b < n - 1) r -= curLeft[b + 1] * x[b + 1];
        if (b >= nr) r -= curDown[b] * x[b - nr];
        if (b < n - nr) r -= curDown[b + nr] * x[b + nr];
      }
      xr[b] = r;
      if (small && !(Math.abs(r) < solveTolerance_K * curDiag[b])) small = false;
    }
    return small;
  }

  /** Right-hand side in band order with the pile's boundary values of the moment (recorded as used). */
  function buildRhs(): void {
    for (let j = 0; j < nz; j++) {
      const c = j * nr;
      const b = (nz - 1 - j) * nr;
      for (let i = 0; i < nr; i++) xb[b + i] = rhs[c + i];
    }
    for (let j = 0; j < np; j++) {
      TbcUsed[j] = inner!.T_C[j];
      qUsed[j] = inner!.q_W[j];
      xb[(nz - 1 - j) * nr] += gUsed[j] * TbcUsed[j] + qUsed[j];
    }
  }

  /** Copies the solution from band order into the cell temperatures. */
  function copyField(): void {
    for (let j = 0; j < nz; j++) {
      const c = j * nr;
      const b = (nz - 1 - j) * nr;
      for (let i = 0; i < nr; i++) T[c + i] = x[b + i];
    }
  }

  /** Whether the boundary can state its linear response and exchanges heat on some row. */
  function coupled(): boolean {
    if (!inner || !inner.linearResponse) return false;
    for (let j = 0; j < np; j++) if (gUsed[j] > 0) return true;
    return false;
  }

  /** Right-hand side of the unit response: every coupled row's boundary temperature raised by 1 K. */
  function unitResponseRhs(): void {
    xu.fill(0);
    for (let j = 0; j < np; j++) xu[(nz - 1 - j) * nr] = gUsed[j];
  }

  let unitValid = false;
  let history = false;
  let coarseDone = false;
  let stale = 0;

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
   * the system is below `solveTolerance_K`, as a temperature, so the field satisfies the system with
   * the boundary values recorded as used (which the energy ledger takes). `acceptStale`: see `iterate`;
   * `withUnit`: solve the unit response together with the field (otherwise only when step 2 needs it).
   */
  function solveLinear(acceptStale: boolean, withUnit: boolean): boolean {
    factor();
    buildRhs();
    // Solve for the change from the latest solution (the previous pass or step) rather than for the
    // field itself: the factor's staleness then only acts on that change, which is small where the
    // factor is stale (deep rows), so a correction is rarely needed.
    residual();
    unitValid = false;
    if (withUnit && coupled()) {
      unitResponseRhs();
      choleskySolvePair(A, xr, xu, (nz - np) * nr);
      solver.sweeps++;
      solver.rightHandSides += 2;
      unitValid = true;
    } else {
      choleskySolve(A, xr);
      solver.sweeps++;
      solver.rightHandSides++;
    }
    for (let b = 0; b < n; b++) x[b] += xr[b];
    coarseDone = false;
    history = false;
    stale = 0;
    return iterate(acceptStale);
  }

  /**
   * Steps 2 and 3 of `solveLinear`. With `acceptStale` it returns as soon as the coupling has
   * converged, leaving what the factor's staleness left of the residual uncorrected: used for a
   * pass whose T* only serves to re-linearise the capacities (its coupling error may be `tolerance_K`,
   * far larger); `iterate(false)` then finishes the pass if it turns out to be the last.
   */
  function iterate(acceptStale: boolean): boolean {
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
        factor();
        buildRhs();
        unitValid = false;
        history = false;
        residual();
      } else {
        if (worst >= tol && !coarseDone && coupled()) {
          coarseDone = true;
          if (!unitValid) {
            // The unit response was not solved with the field (see `step`): solve it now.
            unitResponseRhs();
            choleskySolve(A, xu);
            solver.sweeps++;
            solver.rightHandSides++;
            unitValid = true;
          }
          if (coarseCorrection()) continue;
        }
        if (worst < tol && acceptStale) return true;
        const small = residual();
        if (worst < tol && small) return true;
        if (!small && ++stale > 4) {
          // Defect correction not converging: re-factor everything that differs at all.
          refactorFrom(0);
          unitValid = false;
          stale = 0;
        }
        // Fixed-point step on what the fluid-level correction left, with Anderson mixing of depth 1
        // (a secant step on the residual F(y) − y, exact for the affine loop along the last direction).
        let theta = 0;
        if (inner && history) {
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
        history = true;
      }
      choleskySolve(A, xr);
      solver.sweeps++;
      solver.rightHandSides++;
      solver.refinements++;
      for (let b = 0; b < n; b++) x[b] += xr[b];
      coarseDone = false;
    }
    return false;
  }

  /**
   * Step 2 of `solveLinear`: shifts the pile's boundary temperatures by the s that best cancels the
   * coupling residual along the unit response, and the field by s·u. Returns false if there is no
   * such shift (no coupled row, or the response is degenerate).
   */
  function coarseCorrection(): boolean {
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
      for (let j = 0; j < nz; j++) {
        const mj = mat[j];
        let changed = 0;
        for (let c = j * nr; c < (j + 1) * nr; c++) {
          const kNew = conductivityAt(materials, mj, T[c]);
          if (kNew !== k[c]) {
            k[c] = kNew;
            rk[c] = 1 / kNew;
            changed = 1;
          }
        }
        kRowChanged[j] = changed;
      }
      for (let j = 0; j < nz; j++) {
        if (kRowChanged[j]) {
          for (let i = 0; i < nr - 1; i++) {
            const c = j * nr + i;
            Gr[j * (nr - 1) + i] = dz[j] / (gOut[i] * rk[c] + gIn[i + 1] * rk[c + 1]);
          }
        }
        if (j < nz - 1 && (kRowChanged[j] || kRowChanged[j + 1])) {
          const h0 = 0.5 * dz[j];
          const h1 = 0.5 * dz[j + 1];
          for (let i = 0; i < nr; i++) {
            const c = j * nr + i;
            Gz[c] = Az[i] / (h0 * rk[c] + h1 * rk[c + nr]);
          }
        }
      }
      for (let i = 0; i < nr; i++) Gs[i] = Az[i] / (0.5 * dz[0] * rk[i]);
      for (let j = 0; j < np; j++) halfCell[j] = k[j * nr] / gIn[0];
      assembleConductances(Tsurf);
      Told.set(T);
      if (inner) inner.beginStep(t1, dt_s);
      for (let c = 0; c < n; c++) {
        Tguess[c] = 2 * Told[c] - Tprev[c];
        T[c] = Tguess[c];
      }
      let converged = false;
      for (let outer = 0; outer < phaseIterations; outer++) {
        assemble(dt_s);
        if (outer === 0) updateInner();
        const last = outer + 1 === phaseIterations;
        // The first pass usually needs the pile coupling's unit response (solved in the same pass over
        // the factor); a re-linearisation pass starts from coupled boundary values and rarely does.
        converged = solveLinear(!last, outer === 0);
        copyField();
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
            converged = iterate(false);
            copyField();
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
