/**
 * Assembly of the site conduction solver's linear system (conduction-solver.ts) into the
 * `ConductionSystem` state of conduction-system.ts: per step the conductivities at the old temperature,
 * the exact conductances (cylindrical shells in series in r, half cells in series in z and to the
 * surface, recomputed only next to a conductivity change), each cell's conductance sum and fixed inflow
 * (surface temperature, geothermal flux); per pass of the enthalpy Newton iteration the tangent capacities, the diagonal and the right-hand side.
 */
import type { ConductionSystem } from './conduction-system';
import { conductivityAt, liquidFractionAt, type MaterialTable } from './ground-enthalpy';

/**
 * Vertical resistances of the two halves of a cell of height h the front is in (liquid fraction f),
 * m²·K/W, into rUp[c] and rLow[c]. In the enthalpy method the front sits f·h below the cell's top face
 * when the ground thaws from above (the cell above warmer than the one below), or f·h above its bottom
 * face when it thaws from below; the thawed (k_t) and frozen (k_f) layers conduct vertically in series.
 * Taking the cell's conductivity as the linear mixture f·k_t + (1 − f)·k_f instead (right for heat
 * flowing along the layers, so the radial conductances keep it) misplaces the conductivity jump by up
 * to half a cell: measured on a thin-active-layer column, a first-order error in the mesh of 1.1 yr of
 * thaw year at 5 cm cells, which vanished when k_t = k_f (bench/site-convergence.ts).
 */
function layeredHalfCells(
  materials: MaterialTable,
  m: number,
  f: number,
  h: number,
  thawedOnTop: boolean,
  out: Float64Array,
  outLow: Float64Array,
  c: number,
): void {
  const rt = 1 / materials.kT[m];
  const rf = 1 / materials.kF[m];
  const half = 0.5 * h;
  // Thickness of the top layer (thawed when thawing from above, frozen when from below).
  const top = (thawedOnTop ? f : 1 - f) * h;
  const rTop = thawedOnTop ? rt : rf;
  const rBottom = thawedOnTop ? rf : rt;
  const a = Math.min(top, half);
  const b = Math.max(0, top - half);
  out[c] = a * rTop + (half - a) * rBottom;
  outLow[c] = b * rTop + (half - b) * rBottom;
}

/**
 * Per step: conductivities at the old temperature; conductances are recomputed only next to a change
 * (radial: cylindrical shells in series; vertical and surface: half cells in series), then the pile
 * wall's half-cell conductance and `assembleConductances`.
 */
export function updateConductances(st: ConductionSystem, Tsurf: number): void {
  const {
    materials,
    mat,
    nr,
    nz,
    np,
    T,
    k,
    rk,
    rUp,
    rLow,
    kRowChanged,
    Gr,
    Gz,
    Gs,
    dz,
    Az,
    gOut,
    gIn,
    halfCell,
  } = st;
  for (let j = 0; j < nz; j++) {
    const mj = mat[j];
    let changed = 0;
    for (let c = j * nr; c < (j + 1) * nr; c++) {
      const kNew = conductivityAt(materials, mj, T[c]);
      const f = liquidFractionAt(materials, mj, T[c]);
      if (f > 0 && f < 1) {
        const above = j > 0 ? T[c - nr] : Tsurf;
        const below = j < nz - 1 ? T[c + nr] : T[c];
        layeredHalfCells(materials, mj, f, dz[j], above >= below, rUp, rLow, c);
        k[c] = kNew;
        rk[c] = 1 / kNew;
        changed = 1;
      } else if (kNew !== k[c] || !(rUp[c] > 0)) {
        k[c] = kNew;
        rk[c] = 1 / kNew;
        rUp[c] = 0.5 * dz[j] * rk[c];
        rLow[c] = rUp[c];
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
      for (let i = 0; i < nr; i++) {
        const c = j * nr + i;
        Gz[c] = Az[i] / (rLow[c] + rUp[c + nr]);
      }
    }
  }
  for (let i = 0; i < nr; i++) Gs[i] = Az[i] / rUp[i];
  for (let j = 0; j < np; j++) halfCell[j] = k[j * nr] / gIn[0];
  assembleConductances(st, Tsurf);
}

/**
 * Per step (conductances fixed): each cell's sum of conductances to its neighbours and the surface,
 * and its fixed heat inflow (surface temperature through the top half cell, geothermal flux).
 */
function assembleConductances(st: ConductionSystem, Tsurf: number): void {
  const { nr, nz, kRowChanged, Gr, Gz, Gs, Az, qBottom, gSum, bFixed } = st;
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

/**
 * Per pass of the enthalpy Newton iteration (conduction-solver.ts): the tangent capacity C = dH/dT at the
 * linearisation state (Tguess, Hk), the diagonal and the right-hand side of
 *   (C V/Δt + ΣG) T − Σ G T_nb = b + (V/Δt)(H^n − H^k + C T^k),
 * i.e. the cell balance V (H^k + C (T − T^k) − H^n)/Δt = fluxes at the new time. `Hn` is the enthalpy at
 * the start of the step.
 */
export function assemble(st: ConductionSystem, dt_s: number, Hn: Float64Array, Hk: Float64Array): void {
  const { materials, mat, nr, nz, Tguess, V, capC, cap, aP, rhs, gSum, bFixed } = st;
  const { Ts, Tl, cF, cT, cMushy } = materials;
  const rdt = 1 / dt_s;
  for (let j = 0; j < nz; j++) {
    const mj = mat[j];
    const ts = Ts[mj];
    const tl = Tl[mj];
    const cf = cF[mj];
    const ct = cT[mj];
    const cm = cMushy[mj];
    for (let c = j * nr; c < (j + 1) * nr; c++) {
      const tk = Tguess[c];
      const C = tangentCapacity(tk, ts, tl, cf, cm, ct);
      const vdt = V[c] * rdt;
      const cp = C * vdt;
      capC[c] = C;
      cap[c] = cp;
      aP[c] = cp + gSum[c];
      rhs[c] = cp * tk + vdt * (Hn[c] - Hk[c]) + bFixed[c];
    }
  }
}

/**
 * dH/dT of the linear-interval enthalpy at T (frozen, mushy or thawed branch). At a kink the branch
 * on the side of the interval is taken (T = Ts or Tl counts as mushy), which makes the Newton step from
 * a frozen or thawed cell that reaches its interval land on the interval's edge and continue there.
 */
export function tangentCapacity(
  T: number,
  ts: number,
  tl: number,
  cf: number,
  cm: number,
  ct: number,
): number {
  return T < ts ? cf : T > tl ? ct : cm;
}
