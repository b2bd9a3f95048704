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
  };
}

export function probeTemperature(s: ProbeStencil, T: Float64Array): number {
  return s.w00 * T[s.c00] + s.w01 * T[s.c01] + s.w10 * T[s.c10] + s.w11 * T[s.c11];
}

/**
 * Tracks the permafrost table on one column: a cell counts as thawed when its liquid fraction exceeds
 * 1/2, and as permafrost when it has not thawed within the last `memory_s` (365 days). The thaw depth is
 * the top face of the shallowest permafrost cell (the depth reached by thaw within the past year,
 * continuous from the surface), or the column depth when no cell is permafrost.
 */
export interface PermafrostTableTracker {
  /** Records cell j's temperature T[j * stride + offset] at `time_s` (times may be negative: spin-up). */
  observe(T: Float64Array, stride: number, offset: number, time_s: number): void;
  depth_m(time_s: number): number;
  /**
   * Deepest thaw since the last call (or the start), with sub-cell resolution: cells whose largest
   * liquid fraction in the period reached 1 are passed from the surface down; the first one that did
   * not adds its largest fraction of its height (the front's deepest position within it). Resets.
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
  const lastThawed = initialLastThawed_s
    ? Float64Array.from(initialLastThawed_s)
    : new Float64Array(nz).fill(-Infinity);
  const periodMax = new Float64Array(nz);
  return {
    observe(T, stride, offset, time_s) {
      for (let j = 0; j < nz; j++) {
        const f = liquidFractionAt(materials, rowMaterial[j], T[j * stride + offset]);
        if (f > 0.5) lastThawed[j] = time_s;
        if (f > periodMax[j]) periodMax[j] = f;
      }
    },
    periodMaxDepth_m() {
      let depth = mesh.zFaces_m[nz];
      for (let j = 0; j < nz; j++) {
        if (periodMax[j] < 1) {
          depth = mesh.zFaces_m[j] + periodMax[j] * (mesh.zFaces_m[j + 1] - mesh.zFaces_m[j]);
          break;
        }
      }
      periodMax.fill(0);
      return depth;
    },
    depth_m(time_s) {
      for (let j = 0; j < nz; j++) {
        if (lastThawed[j] < time_s - memory_s) return mesh.zFaces_m[j];
      }
      return mesh.zFaces_m[nz];
    },
  };
}
