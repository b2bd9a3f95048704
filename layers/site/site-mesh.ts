/**
 * Graded axisymmetric (r, z) finite-volume mesh around one pile.
 *
 * Method: cell faces in r start at the pile's outer radius (the inner boundary of the ground domain) and
 * grow geometrically (ratio `radialGrowth`) from `firstRadialStep_m` up to the far radius; the last
 * cell is stretched or merged so that the outermost face lands exactly on `outerRadius_m`. Faces in z
 * start at the ground surface with `firstVerticalStep_m`, grow geometrically up to `pileStep_m` while
 * inside the pile length (plus one step), then up to `farStep_m` below; every mandatory depth (layer
 * boundaries, pile tip) becomes a face, so each cell holds one material and the pile ends on a face.
 * Cell centres are the arithmetic midpoints; radial conductances use the exact logarithmic resistance
 * of a cylindrical shell, so the centre position only sets where a temperature is reported.
 *
 * The ground below the pile tip and inside r < pile radius is not meshed (a thin cylinder, a few per
 * cent of one cell's volume); the inner face is adiabatic there.
 */
import { requirePositive, requireRange } from '../physics/validate';

export interface SiteMesh {
  /** Radial faces, m; rFaces_m[0] is the pile (inner) radius; length nr + 1. */
  rFaces_m: Float64Array;
  /** Vertical faces, depth below the surface, m; zFaces_m[0] = 0; length nz + 1. */
  zFaces_m: Float64Array;
  /** Cell centres, m. */
  rCentres_m: Float64Array;
  zCentres_m: Float64Array;
  nr: number;
  nz: number;
}

export interface SiteMeshOptions {
  innerRadius_m: number;
  outerRadius_m: number;
  depth_m: number;
  firstRadialStep_m: number;
  radialGrowth: number;
  firstVerticalStep_m: number;
  verticalGrowth: number;
  /** Largest vertical step down to `fineDepth_m` (pile tip), m. */
  pileStep_m: number;
  /**
   * Largest vertical step in the near-surface zone (the active layer and its deepening), m, and the
   * depth of that zone, m (optional: no such zone).
   */
  surfaceStep_m?: number;
  surfaceZone_m?: number;
  /** Depth to which `pileStep_m` applies (normally the pile length; 0 for no pile), m. */
  fineDepth_m: number;
  /** Largest vertical step below the fine zone, m. */
  farStep_m: number;
  /** Depths that must be faces (layer boundaries, pile tip), m. */
  mandatoryDepths_m: number[];
}

/** Builds a mesh from explicit face positions (used by tests and by `buildSiteMesh`). */
export function meshFromFaces(rFaces_m: ArrayLike<number>, zFaces_m: ArrayLike<number>): SiteMesh {
  const rf = Float64Array.from(rFaces_m);
  const zf = Float64Array.from(zFaces_m);
  if (rf.length < 2) throw new RangeError(`rFaces_m must hold at least 2 faces; received ${rf.length}`);
  if (zf.length < 2) throw new RangeError(`zFaces_m must hold at least 2 faces; received ${zf.length}`);
  if (!(rf[0] > 0)) throw new RangeError(`rFaces_m[0] (inner radius) must be > 0 m; received ${rf[0]}`);
  if (zf[0] !== 0) throw new RangeError(`zFaces_m[0] must be 0 (the surface); received ${zf[0]}`);
  for (let i = 1; i < rf.length; i++) {
    if (!(rf[i] > rf[i - 1])) throw new RangeError(`rFaces_m must increase; face ${i} is ${rf[i]}`);
  }
  for (let j = 1; j < zf.length; j++) {
    if (!(zf[j] > zf[j - 1])) throw new RangeError(`zFaces_m must increase; face ${j} is ${zf[j]}`);
  }
  const nr = rf.length - 1;
  const nz = zf.length - 1;
  const rc = new Float64Array(nr);
  const zc = new Float64Array(nz);
  for (let i = 0; i < nr; i++) rc[i] = 0.5 * (rf[i] + rf[i + 1]);
  for (let j = 0; j < nz; j++) zc[j] = 0.5 * (zf[j] + zf[j + 1]);
  return { rFaces_m: rf, zFaces_m: zf, rCentres_m: rc, zCentres_m: zc, nr, nz };
}

function gradedFaces(
  start: number,
  end: number,
  first: number,
  growth: number,
  maxStep: (x: number) => number,
  mandatory: number[],
): number[] {
  const stops = [...new Set(mandatory.filter((d) => d > start + 1e-9 && d < end - 1e-9)), end].sort(
    (a, b) => a - b,
  );
  const faces = [start];
  let x = start;
  let step = first;
  for (const stop of stops) {
    while (stop - x > 1e-9) {
      step = Math.min(step, maxStep(x));
      const remaining = stop - x;
      if (remaining <= step * 1.5) {
        // Finish this segment: one cell, or two equal cells if the remainder is long.
        if (remaining > step * 1.05) {
          faces.push(x + remaining / 2);
        }
        faces.push(stop);
        x = stop;
      } else {
        x += step;
        faces.push(x);
      }
      step *= growth;
    }
  }
  return faces;
}

/** Builds the graded mesh described in the module comment. */
export function buildSiteMesh(o: SiteMeshOptions): SiteMesh {
  const rIn = requirePositive('innerRadius_m', o.innerRadius_m, 'm');
  requireRange('outerRadius_m', o.outerRadius_m, rIn * 4, 1e4, 'm');
  requirePositive('depth_m', o.depth_m, 'm');
  requireRange('radialGrowth', o.radialGrowth, 1, 3);
  requireRange('verticalGrowth', o.verticalGrowth, 1, 3);
  requirePositive('firstRadialStep_m', o.firstRadialStep_m, 'm');
  requirePositive('firstVerticalStep_m', o.firstVerticalStep_m, 'm');
  requirePositive('pileStep_m', o.pileStep_m, 'm');
  requirePositive('farStep_m', o.farStep_m, 'm');
  const rFaces = gradedFaces(rIn, o.outerRadius_m, o.firstRadialStep_m, o.radialGrowth, () => Infinity, []);
  const fine = o.fineDepth_m;
  const zFaces = gradedFaces(
    0,
    o.depth_m,
    o.firstVerticalStep_m,
    o.verticalGrowth,
    (z) =>
      Math.min(
        z < fine + o.pileStep_m ? o.pileStep_m : o.farStep_m,
        z < (o.surfaceZone_m ?? 0) ? (o.surfaceStep_m ?? Infinity) : Infinity,
      ),
    o.mandatoryDepths_m,
  );
  return meshFromFaces(rFaces, zFaces);
}

/** Number of the first rows whose cells lie within depth `length_m` (the pile rows). */
export function rowsAbove(mesh: SiteMesh, length_m: number): number {
  let n = 0;
  while (n < mesh.nz && mesh.zFaces_m[n + 1] <= length_m + 1e-9) n++;
  return n;
}
