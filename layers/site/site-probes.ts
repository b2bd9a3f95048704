/**
 * Reading a simulated temperature field: probes (bilinear interpolation between cell centres, held
 * constant beyond the outermost centres) and the permafrost-table tracker behind the thaw depth.
 */
import type { SiteMesh } from './site-mesh';
import { liquidFractionAt, type MaterialTable } from './ground-enthalpy';

export interface ProbeStencil {
  c00: number;
  c01: number;
  c10: number;
  c11: number;
  w00: number;
  w01: number;
  w10: number;
  w11: number;
  /** Freezing point of the material at the probe, °C. */
  freezingPoint_C: number;
  /** The cell row holding the probe, its material, the two columns about the probe and their weight. */
  row: number;
  material: number;
  col0: number;
  col1: number;
  colWeight1: number;
  /** Fraction of the row's height above the probe: the front passes the probe when f reaches it. */
  depthInRow: number;
  /** The probe's depth, m. */
  z_m: number;
}

function bracket(centres: Float64Array, x: number): [number, number, number] {
  const n = centres.length;
  if (n === 1 || x <= centres[0]) return [0, 0, 0];
  if (x >= centres[n - 1]) return [n - 1, n - 1, 0];
  let k = 0;
  while (centres[k + 1] < x) k++;
  return [k, k + 1, (x - centres[k]) / (centres[k + 1] - centres[k])];
}

/** Interpolation stencil for a probe at (r, z) on `mesh`. */
export function probeStencil(
  mesh: SiteMesh,
  materials: MaterialTable,
  rowMaterial: ArrayLike<number>,
  r_m: number,
  z_m: number,
): ProbeStencil {
  const [i0, i1, fr] = bracket(mesh.rCentres_m, r_m);
  const [j0, j1, fz] = bracket(mesh.zCentres_m, z_m);
  let row = 0;
  while (row < mesh.nz - 1 && mesh.zFaces_m[row + 1] < z_m) row++;
  const nr = mesh.nr;
  const z0 = mesh.zFaces_m[row];
  const z1 = mesh.zFaces_m[row + 1];
  return {
    c00: j0 * nr + i0,
    c01: j0 * nr + i1,
    c10: j1 * nr + i0,
    c11: j1 * nr + i1,
    w00: (1 - fz) * (1 - fr),
    w01: (1 - fz) * fr,
    w10: fz * (1 - fr),
    w11: fz * fr,
    freezingPoint_C: materials.Tf[rowMaterial[row]],
    row,
    material: rowMaterial[row],
    col0: i0,
    col1: i1,
    colWeight1: fr,
    depthInRow: Math.min(1, Math.max(0, (z_m - z0) / (z1 - z0))),
    z_m,
  };
}

/**
 * How far the thaw front has come down to a probe, m, over the current year: the year's thaw depth on the
 * probe's column (liquid fractions interpolated between the two columns about the probe) minus the
 * probe's depth. The year's thaw depth is continuous from the surface: the cells that have thawed through
 * (liquid fraction 1) at some time this year, from the top down, plus the part of the next ones that
 * thawed (in the enthalpy method a front inside a cell sits at its top face plus its liquid fraction f
 * times its height, e.g. Voller & Cross 1981; the same rule as the active layer). Cells that
 * thawed this year count although the surface may have refrozen since: in autumn the thaw front still
 * deepens below the refreezing crust. So the measure is ≥ 0 once the front has come down to the probe
 * (ground warmed into its freezing interval from the side or below is not a front), it resolves thaw
 * times inside a cell instead of at cell centres, it never falls within a year, and its yearly values
 * rise smoothly from year to year (the thaw-year trend in simulate-site.ts). `startYear` begins a new year.
 */
export interface ProbeThawTracker {
  observe(T: Float64Array): number;
  startYear(): void;
}

export function createProbeThawTracker(
  s: ProbeStencil,
  mesh: Pick<SiteMesh, 'zFaces_m' | 'nz'>,
  materials: MaterialTable,
  rowMaterial: ArrayLike<number>,
  nr: number,
): ProbeThawTracker {
  const nz = mesh.nz;
  const z = mesh.zFaces_m;
  const maxF = new Float64Array(nz);
  const minF = new Float64Array(nz).fill(1);
  return {
    observe(T) {
      for (let row = 0; row < nz; row++) {
        const c = row * nr;
        const m = rowMaterial[row];
        const f0 = liquidFractionAt(materials, m, T[c + s.col0]);
        const f1 = liquidFractionAt(materials, m, T[c + s.col1]);
        const f = f0 + s.colWeight1 * (f1 - f0);
        if (f > maxF[row]) maxF[row] = f;
        if (f < minF[row]) minF[row] = f;
      }
      // As periodMaxDepth_m of the permafrost-table tracker: each cell from the surface down adds the
      // part of it that thawed this year (1 if it thawed through, else its rise of liquid fraction as a
      // share of what it could rise), so a front spread over two cells (the freezing interval) is
      // counted once; it stops at the first cell that did not thaw at all.
      let depth = 0;
      for (let row = 0; row < nz; row++) {
        const hi = maxF[row];
        const lo = minF[row];
        const part = hi >= 1 ? 1 : lo < 1 ? (hi - lo) / (1 - lo) : 0;
        if (!(part > 1e-9)) break;
        depth += part * (z[row + 1] - z[row]);
        if (part < 1 && row + 1 < nz && !(maxF[row + 1] > minF[row + 1])) break;
      }
      return depth - s.z_m;
    },
    startYear() {
      maxF.fill(0);
      minF.fill(1);
    },
  };
}

export function probeTemperature(s: ProbeStencil, T: Float64Array): number {
  return s.w00 * T[s.c00] + s.w01 * T[s.c01] + s.w10 * T[s.c10] + s.w11 * T[s.c11];
}

/**
 * Tracks the permafrost table on one column. A cell's thawed part is its liquid fraction f of its height
 * from the top (the front inside a cell, as in the enthalpy method); the thaw depth is the deepest point
 * reached by thaw within the last `memory_s` (365 days), continuous from the surface: cells that were
 * wholly thawed (f = 1) within the memory are passed from the surface down, and the first that was not
 * adds its largest liquid fraction within the memory times its height (resolved inside the cell, not at
 * its faces). The largest fraction is held until it is a memory old, then restarts from the current
 * value (a sliding maximum kept with one sample per cell). Cells thawed in the spin-up (liquid fraction
 * above 1/2 within its last year) count as wholly thawed until the run's own history replaces them.
 */
export interface PermafrostTableTracker {
  /** Records cell j's temperature T[j * stride + offset] at `time_s` (times may be negative: spin-up). */
  observe(T: Float64Array, stride: number, offset: number, time_s: number): void;
  depth_m(time_s: number): number;
  /**
   * Deepest thaw since the last call (or the start), with sub-cell resolution (the active layer when
   * the period is a year): the depth where the period's largest liquid fraction falls through 1/2,
   * from the part of each cell that thawed (see the implementation). Resets.
   */
  periodMaxDepth_m(): number;
}

export function createPermafrostTableTracker(
  mesh: SiteMesh,
  materials: MaterialTable,
  rowMaterial: ArrayLike<number>,
  memory_s: number,
  initialLastThawed_s?: Float64Array,
): PermafrostTableTracker {
  const nz = mesh.nz;
  const lastFull = initialLastThawed_s
    ? Float64Array.from(initialLastThawed_s)
    : new Float64Array(nz).fill(-Infinity);
  const recentMax = new Float64Array(nz);
  const recentMaxAt = new Float64Array(nz).fill(-Infinity);
  const periodMax = new Float64Array(nz);
  const periodMin = new Float64Array(nz).fill(1);
  return {
    observe(T, stride, offset, time_s) {
      for (let j = 0; j < nz; j++) {
        const f = liquidFractionAt(materials, rowMaterial[j], T[j * stride + offset]);
        if (f >= 1) lastFull[j] = time_s;
        if (f >= recentMax[j] || recentMaxAt[j] < time_s - memory_s) {
          recentMax[j] = f;
          recentMaxAt[j] = time_s;
        }
        if (f > periodMax[j]) periodMax[j] = f;
        if (f < periodMin[j]) periodMin[j] = f;
      }
    },
    periodMaxDepth_m() {
      // Σ over the cells from the surface down of the part of each that thawed in the period: 1 for a
      // cell that thawed through, else its rise of liquid fraction in the period as a share of what it
      // could rise ((max − min)/(1 − min)); it stops at the first cell that did not thaw at all. For a
      // sharp front this is the front's deepest position; for a front spread over cells (the freezing
      // interval) it is the depth where the liquid fraction reached 1/2; ground that stays partly
      // frozen all year (warm permafrost inside its interval) adds nothing.
      let depth = 0;
      for (let j = 0; j < nz; j++) {
        const hi = periodMax[j];
        const lo = periodMin[j];
        const part = hi >= 1 ? 1 : lo < 1 ? (hi - lo) / (1 - lo) : 0;
        if (!(part > 1e-9)) break;
        depth += part * (mesh.zFaces_m[j + 1] - mesh.zFaces_m[j]);
        if (part < 1 && j + 1 < nz && !(periodMax[j + 1] > periodMin[j + 1])) break;
      }
      periodMax.fill(0);
      periodMin.fill(1);
      return depth;
    },
    depth_m(time_s) {
      const since = time_s - memory_s;
      for (let j = 0; j < nz; j++) {
        if (lastFull[j] < since) {
          const f = recentMaxAt[j] >= since ? recentMax[j] : 0;
          return mesh.zFaces_m[j] + f * (mesh.zFaces_m[j + 1] - mesh.zFaces_m[j]);
        }
      }
      return mesh.zFaces_m[nz];
    },
  };
}
