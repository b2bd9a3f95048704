/**
 * Assembly of the site conduction solver's linear system (conduction-solver.ts) into the
 * `ConductionSystem` state of conduction-system.ts: per step the conductivities at the old temperature,
 * the exact conductances (cylindrical shells in series in r, half cells in series in z and to the
 * surface, recomputed only next to a conductivity change), each cell's conductance sum and fixed inflow
 * (surface temperature, geothermal flux); per pass the apparent capacities (the Pham 1985 secant between
 * T^n and the guess), the diagonal and the right-hand side.
 */
import type { ConductionSystem } from './conduction-system';
import { apparentCapacity, conductivityAt } from './ground-enthalpy';

/**
 * Per step: conductivities at the old temperature; conductances are recomputed only next to a change
 * (radial: cylindrical shells in series; vertical and surface: half cells in series), then the pile
 * wall's half-cell conductance and `assembleConductances`.
 */
export function updateConductances(st: ConductionSystem, Tsurf: number): void {
  const { materials, mat, nr, nz, np, T, k, rk, kRowChanged, Gr, Gz, Gs, dz, Az, gOut, gIn, halfCell } = st;
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

/** Per pass: capacities (secant between T^n and the guess), diagonal and right-hand side. */
export function assemble(st: ConductionSystem, dt_s: number): void {
  const { materials, mat, nr, nz, Told, Tguess, V, capC, cap, aP, rhs, gSum, bFixed } = st;
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
