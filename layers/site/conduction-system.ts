/**
 * The linear system of the site conduction solver (conduction-solver.ts): the solver's state, banded
 * factorisation, partial re-factorisation and residual (its assembly is conduction-assembly.ts).
 *
 * Holds the `ConductionSetup` and `InnerBoundary` contracts, the `ConductionSystem` state (mesh
 * geometry, cell fields, conductances, band matrix and its factor, band-order work vectors, the pile
 * boundary values the right-hand side was built with) and the functions that act on it:
 * - `factor` / `refactorFrom`: the band matrix in bottom-up row order and its banded Cholesky factor,
 *   re-factored only from the first band row that moved by more than `REFACTOR_TOLERANCE`;
 * - `residual`, `buildRhs`, `copyField`: defect-correction residual, right-hand side in band order,
 *   and the solution copied back to the cell temperatures.
 */
import { choleskyFactor, createBandMatrix, type BandMatrix } from './banded-cholesky';
import type { SiteMesh } from './site-mesh';
import { enthalpyAt, type MaterialTable } from './ground-enthalpy';

/** Pile wall coupling for the first `rows` rows of the inner column (see conduction-solver.ts). */
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
  /** Most passes of the enthalpy Newton iteration in one step before the step is halved (default 16). */
  phaseIterations?: number;
  /** Largest |T(H) − T*| accepted at the end of the Newton iteration, K (default 1e-4). */
  phaseTolerance_K?: number;
}

/** Work counters (the public solver object carries them; see `ConductionSolver`). */
export interface SolverWork {
  sweeps: number;
  rightHandSides: number;
  refactoredRows: number;
  refinements: number;
}

/**
 * Relative change of a band entry from the one the factor holds above which `factor` re-factors from
 * that row; smaller changes are corrected by defect correction in the coupled solve.
 */
const REFACTOR_TOLERANCE = 1e-4;

/**
 * Largest residual accepted, as a temperature (|residual| / diagonal). 1e-9 K (was 1e-7 K): solving
 * for the change from the latest solution leaves residuals of 1e-8 K or so after one substitution,
 * which 1e-7 K would accept; at 1e-9 K one more correction is made in about one pass in five and the
 * energy-balance error of the standard pair falls from 1.3e-8 to 3e-11 (the accepted residuals are
 * what remains of it).
 */
const SOLVE_TOLERANCE_K = 1e-9;

/** State of the linear system. Cell arrays are row-major (index j * nr + i); band arrays bottom-up. */
export interface ConductionSystem {
  mesh: SiteMesh;
  materials: MaterialTable;
  /** Material index per row. */
  mat: Int32Array;
  nr: number;
  nz: number;
  /** Number of cells, nr * nz. */
  n: number;
  /** Pile rows coupled to `inner` (0 without it). */
  np: number;
  inner: InnerBoundary | null;
  /** Geothermal flux, W/m². */
  qBottom: number;
  dz: Float64Array;
  /** Horizontal face area of each ring, m². */
  Az: Float64Array;
  /** ln(rf[i+1]/rc[i]) / 2π. */
  gOut: Float64Array;
  /** ln(rc[i]/rf[i]) / 2π. */
  gIn: Float64Array;
  V: Float64Array;
  T: Float64Array;
  H: Float64Array;
  Tprev: Float64Array;
  Told: Float64Array;
  Tguess: Float64Array;
  k: Float64Array;
  /** 1 / k. */
  rk: Float64Array;
  /**
   * Vertical thermal resistance of each cell's upper and lower half per unit area, m²·K/W: h/(2k) for a
   * cell wholly frozen or thawed, the thawed and frozen layers in series for a cell the front is in
   * (see `halfCellResistances` in conduction-assembly.ts).
   */
  rUp: Float64Array;
  rLow: Float64Array;
  kRowChanged: Uint8Array;
  /** C V / Δt, W/K. */
  cap: Float64Array;
  /** Tangent capacity C = dH/dT at the linearisation state, J/m³K. */
  capC: Float64Array;
  /** Σ conductances to neighbours and surface, W/K. */
  gSum: Float64Array;
  /** Fixed heat inflow (surface, geothermal), W. */
  bFixed: Float64Array;
  aP: Float64Array;
  rhs: Float64Array;
  Gr: Float64Array;
  Gz: Float64Array;
  Gs: Float64Array;
  /** Per-metre conductance of the half cell between the pile wall and the inner cell centre, W/m·K. */
  halfCell: Float64Array;
  /** Pile conductances, boundary temperatures and heat rates the system was built with, per pile row. */
  gUsed: Float64Array;
  TbcUsed: Float64Array;
  qUsed: Float64Array;
  A: BandMatrix;
  curDiag: Float64Array;
  curLeft: Float64Array;
  curDown: Float64Array;
  factDiag: Float64Array;
  factLeft: Float64Array;
  factDown: Float64Array;
  /** Right-hand side, residual / correction and unit response, band order. */
  xb: Float64Array;
  xr: Float64Array;
  xu: Float64Array;
  /** Current solution, band order. */
  x: Float64Array;
  factored: boolean;
  work: SolverWork;
}

/** Cell heights, plan areas, radial half-cell shape factors ln(r_out/r_c)/2π and ln(r_c/r_in)/2π, volumes. */
function cellGeometry(mesh: SiteMesh) {
  const { nr, nz, rFaces_m: rf, zFaces_m: zf, rCentres_m: rc } = mesh;
  const dz = new Float64Array(nz);
  for (let j = 0; j < nz; j++) dz[j] = zf[j + 1] - zf[j];
  const Az = new Float64Array(nr);
  const gOut = new Float64Array(nr);
  const gIn = new Float64Array(nr);
  for (let i = 0; i < nr; i++) {
    Az[i] = Math.PI * (rf[i + 1] * rf[i + 1] - rf[i] * rf[i]);
    gOut[i] = Math.log(rf[i + 1] / rc[i]) / (2 * Math.PI);
    gIn[i] = Math.log(rc[i] / rf[i]) / (2 * Math.PI);
  }
  const V = new Float64Array(nr * nz);
  for (let j = 0; j < nz; j++) for (let i = 0; i < nr; i++) V[j * nr + i] = Az[i] * dz[j];
  return { dz, Az, gOut, gIn, V };
}

/** Initial temperatures (one per row or one per cell) and their enthalpies; RangeError on a wrong length. */
function initialField(s: ConductionSetup, mat: Int32Array, nr: number, nz: number) {
  const n = nr * nz;
  const T = new Float64Array(n);
  if (s.initialT_C.length === nz) {
    for (let j = 0; j < nz; j++) T.fill(s.initialT_C[j], j * nr, (j + 1) * nr);
  } else if (s.initialT_C.length === n) {
    T.set(s.initialT_C);
  } else {
    throw new RangeError(`initialT_C must have ${nz} or ${n} entries; received ${s.initialT_C.length}`);
  }
  const H = new Float64Array(n);
  for (let c = 0; c < n; c++) H[c] = enthalpyAt(s.materials, mat[(c / nr) | 0], T[c]);
  return { T, H };
}

/** Allocates the system in its initial state (time 0); throws RangeError on mismatched lengths. */
export function createConductionSystem(s: ConductionSetup): ConductionSystem {
  const { mesh, materials } = s;
  const { nr, nz } = mesh;
  const n = nr * nz;
  const mat = Int32Array.from(s.rowMaterial);
  if (mat.length !== nz) throw new RangeError(`rowMaterial must have ${nz} entries; received ${mat.length}`);
  const { dz, Az, gOut, gIn, V } = cellGeometry(mesh);
  const { T, H } = initialField(s, mat, nr, nz);
  const inner = s.inner;
  const np = inner ? Math.min(inner.rows, nz) : 0;
  const p = Math.max(1, np);
  return {
    mesh,
    materials,
    mat,
    nr,
    nz,
    n,
    np,
    inner,
    qBottom: s.bottomFlux_W_m2,
    dz,
    Az,
    gOut,
    gIn,
    V,
    T,
    H,
    Tprev: Float64Array.from(T),
    Told: new Float64Array(n),
    Tguess: new Float64Array(n),
    k: new Float64Array(n),
    rk: new Float64Array(n),
    rUp: new Float64Array(n),
    rLow: new Float64Array(n),
    kRowChanged: new Uint8Array(nz),
    cap: new Float64Array(n),
    capC: new Float64Array(n),
    gSum: new Float64Array(n),
    bFixed: new Float64Array(n),
    aP: new Float64Array(n),
    rhs: new Float64Array(n),
    Gr: new Float64Array(Math.max(1, nz * (nr - 1))),
    Gz: new Float64Array(Math.max(1, (nz - 1) * nr)),
    Gs: new Float64Array(nr),
    halfCell: new Float64Array(p),
    gUsed: new Float64Array(p),
    TbcUsed: new Float64Array(p),
    qUsed: new Float64Array(p),
    A: createBandMatrix(n, nr),
    curDiag: new Float64Array(n),
    curLeft: new Float64Array(n),
    curDown: new Float64Array(n),
    factDiag: new Float64Array(n),
    factLeft: new Float64Array(n),
    factDown: new Float64Array(n),
    xb: new Float64Array(n),
    xr: new Float64Array(n),
    xu: new Float64Array(n),
    x: new Float64Array(n),
    factored: false,
    work: { sweeps: 0, rightHandSides: 0, refactoredRows: 0, refinements: 0 },
  };
}

/**
 * Assembles the current band matrix (with the pile conductances of the moment) and re-factors it
 * from the first band row whose entries moved by more than `REFACTOR_TOLERANCE` (relative) from those
 * the factor holds. Band rows are numbered from the bottom row of the mesh upwards
 * (b = (nz − 1 − j)·nr + i) so that the rows that change most (the active layer) come last and
 * re-factoring them is cheap. Smaller changes are corrected by defect correction in the coupled solve.
 */
export function factor(st: ConductionSystem): void {
  const { nr, nz, n, np, inner, aP, Gr, Gz, curDiag, curLeft, curDown, factDiag, factLeft, factDown } = st;
  const { gUsed } = st;
  let from = st.factored ? n : 0;
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
        const lim = REFACTOR_TOLERANCE * diag;
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
  if (from < n) refactorFrom(st, from);
}

/** Copies the current band entries into the factor's record and re-factors band rows from `from` on. */
export function refactorFrom(st: ConductionSystem, from: number): void {
  const { nr, n, A, curDiag, curLeft, curDown, factDiag, factLeft, factDown } = st;
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
  st.factored = true;
  st.work.refactoredRows += n - from;
}

/**
 * Residual of the current band system at x (right-hand side xb) into xr; returns whether every
 * |residual_b| / diag_b (a temperature) is below `SOLVE_TOLERANCE_K`. Entries outside the mesh are
 * zero in curLeft/curDown, so only the first and last nr band rows need the range checks.
 */
export function residual(st: ConductionSystem): boolean {
  const { nr, n, xb, xr, x, curDiag, curLeft, curDown } = st;
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
    if (small && !(Math.abs(r) < SOLVE_TOLERANCE_K * curDiag[b])) small = false;
  }
  return small;
}

/** Right-hand side in band order with the pile's boundary values of the moment (recorded as used). */
export function buildRhs(st: ConductionSystem): void {
  const { nr, nz, np, inner, rhs, xb, gUsed, TbcUsed, qUsed } = st;
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
export function copyField(st: ConductionSystem): void {
  const { nr, nz, x, T } = st;
  for (let j = 0; j < nz; j++) {
    const c = j * nr;
    const b = (nz - 1 - j) * nr;
    for (let i = 0; i < nr; i++) T[c + i] = x[b + i];
  }
}
