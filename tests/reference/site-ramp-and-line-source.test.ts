/**
 * The site solver without phase change against closed-form conduction solutions.
 * - Linear surface warming of a semi-infinite solid (Carslaw & Jaeger 1959 §2.5): T − Ti =
 *   4bt·i²erfc(x/(2√(αt))); check values LR-2 of reference-values.md §7 (computed with mpmath):
 *   b = 0.05 K/yr, α = 1e-6 m²/s, t = 30 yr: x = 5 / 10 / 20 m → 1.2442 / 1.0243 / 0.6784 K. Heat taken
 *   in through the surface, ∫ q dt with q = 2kb√(t/(πα)) (same section, LR-5 flux form), is
 *   (4/3) k b t^{3/2}/√(πα).
 * - Constant heat extraction q' from a pile in permanently frozen ground (no phase change reached):
 *   early time at the pile wall against the infinite cylinder source (Carslaw & Jaeger 1959 ch. 13;
 *   `infiniteCylinderSource`, exact Bessel integral) and, at several radii and times, the mid-depth
 *   finite line source with the surface held at the initial temperature (Zeng, Diao & Fang 2002, eq. 10;
 *   `finiteLineSourceG`).
 */
import { describe, expect, it } from 'vitest';
import { finiteLineSourceG } from '../../layers/physics/finite-line-source';
import { infiniteCylinderSource } from '../../layers/physics/infinite-cylinder-source';
import type { InnerBoundary } from '../../layers/site/conduction-solver';
import { createConductionSolver, energyBalance } from '../../layers/site/conduction-solver';
import { materialTable } from '../../layers/site/ground-enthalpy';
import { buildSiteMesh, meshFromFaces, rowsAbove } from '../../layers/site/site-mesh';
import { probeStencil, probeTemperature } from '../../layers/site/site-probes';

const YEAR = 365.25 * 86400;
const k = 2;
const C = 2e6; // α = 1e-6 m²/s
const alpha = k / C;
/** A material that never changes phase in these tests (freezing point far below). */
const table = materialTable([
  {
    kFrozen_W_mK: k,
    kThawed_W_mK: k,
    cFrozen_J_m3K: C,
    cThawed_J_m3K: C,
    latent_J_m3: 1e8,
    freezingPoint_C: -100,
    freezingInterval_K: 0.5,
  },
]);

describe('linear surface warming (Carslaw & Jaeger §2.5, LR-2)', () => {
  it('matches 4bt·i²erfc at 5, 10 and 20 m after 30 years and the surface heat intake', () => {
    const f = [0];
    let step = 0.1;
    while (f[f.length - 1] < 300) {
      f.push(f[f.length - 1] + step);
      step = Math.min(step * 1.08, 5);
    }
    const mesh = meshFromFaces([1, 2], f);
    const Ti = -5;
    const b = 0.05 / YEAR;
    const s = createConductionSolver({
      mesh,
      materials: table,
      rowMaterial: new Array(mesh.nz).fill(0),
      surfaceTemperature_C: (t) => Ti + b * t,
      bottomFlux_W_m2: 0,
      initialT_C: new Array(mesh.nz).fill(Ti),
      inner: null,
    });
    const e0 = s.storedEnergy_J();
    const t = 30 * YEAR;
    const steps = 30 * 73; // 5-day steps
    for (let n = 0; n < steps; n++) s.step(t / steps);
    const at = (z: number) =>
      probeTemperature(probeStencil(mesh, table, new Array(mesh.nz).fill(0), 1.5, z), s.T);
    expect(at(5) - Ti).toBeCloseTo(1.2442, 2);
    expect(Math.abs((at(5) - Ti) / 1.2442 - 1)).toBeLessThan(0.005);
    expect(Math.abs((at(10) - Ti) / 1.0243 - 1)).toBeLessThan(0.005);
    expect(Math.abs((at(20) - Ti) / 0.6784 - 1)).toBeLessThan(0.005);
    const area = Math.PI * (4 - 1);
    const intake = s.ledger.surface_J / area;
    const expected = ((4 / 3) * k * b * Math.pow(t, 1.5)) / Math.sqrt(Math.PI * alpha);
    expect(Math.abs(intake / expected - 1)).toBeLessThan(0.01);
    expect(energyBalance(e0, s).relativeError).toBeLessThan(1e-9);
  });
});

/** Fixed extraction q' (W/m) along the first `rows` rows of the inner radius. */
function fixedExtraction(rows: number, dz: ArrayLike<number>, q_W_m: number): InnerBoundary {
  const q = new Float64Array(rows);
  for (let j = 0; j < rows; j++) q[j] = -q_W_m * dz[j];
  return {
    rows,
    g_W_K: new Float64Array(rows),
    T_C: new Float64Array(rows),
    q_W: q,
    beginStep() {},
    update: () => 0,
    endStep() {},
  };
}

describe('constant extraction in frozen ground (cylinder and finite line sources)', () => {
  const rb = 0.1;
  const H = 20;
  const qExtract = 30; // W/m
  const T0 = -5;
  const mesh = buildSiteMesh({
    innerRadius_m: rb,
    outerRadius_m: 40,
    depth_m: 80,
    firstRadialStep_m: 0.01,
    radialGrowth: 1.2,
    firstVerticalStep_m: 0.25,
    verticalGrowth: 1.2,
    pileStep_m: 0.5,
    fineDepth_m: H,
    farStep_m: 5,
    mandatoryDepths_m: [H],
  });
  const rows = rowsAbove(mesh, H);
  const dz = Array.from({ length: rows }, (_, j) => mesh.zFaces_m[j + 1] - mesh.zFaces_m[j]);
  const rowMat = new Array(mesh.nz).fill(0);
  const s = createConductionSolver({
    mesh,
    materials: table,
    rowMaterial: rowMat,
    surfaceTemperature_C: () => T0,
    bottomFlux_W_m2: 0,
    initialT_C: new Array(mesh.nz).fill(T0),
    inner: fixedExtraction(rows, dz, qExtract),
  });
  const e0 = s.storedEnergy_J();
  const mid = probeStencil(mesh, table, rowMat, rb, H / 2);
  let t = 0;
  const advance = (until_s: number, dt_s: number) => {
    const n = Math.max(1, Math.round((until_s - t) / dt_s));
    const d = (until_s - t) / n;
    for (let i = 0; i < n; i++) s.step(d);
    t = until_s;
  };
  /** Wall temperature: first-cell centre minus the steady half-cell drop q' ln(r_c/r_b)/(2πk). */
  const wall = () =>
    probeTemperature(mid, s.T) - (qExtract * Math.log(mesh.rCentres_m[0] / rb)) / (2 * Math.PI * k);

  it('pile wall at mid-depth follows the infinite cylinder source at early times (Fo = 8.6, 43)', () => {
    for (const days of [1, 5]) {
      advance(days * 86400, 0.02 * 86400);
      const drop = infiniteCylinderSource({
        heatRate_W_m: qExtract,
        conductivity_W_mK: k,
        diffusivity_m2_s: alpha,
        radius_m: rb,
        time_s: t,
      });
      expect(Math.abs((T0 - wall()) / drop - 1)).toBeLessThan(0.01);
    }
  });

  it('mid-depth field follows the finite line source at 0.5, 2 and 6 m after 30 days, 1 and 10 years (3 %)', () => {
    for (const [until, dt] of [
      [30 * 86400, 0.25 * 86400],
      [YEAR, 5 * 86400],
      [10 * YEAR, 30 * 86400],
    ]) {
      advance(until, dt);
      for (const r of [0.5, 2, 6]) {
        const probe = probeStencil(mesh, table, rowMat, r, H / 2);
        const g = finiteLineSourceG({
          radius_m: r,
          length_m: H,
          buriedDepth_m: 0,
          diffusivity_m2_s: alpha,
          time_s: t,
          point: 'midDepth',
        });
        const drop = (qExtract / (2 * Math.PI * k)) * g;
        const simulated = T0 - probeTemperature(probe, s.T);
        // 3 % of the drop, or 0.01 K where the drop itself is tiny (far probe, early time).
        const tolerance = Math.max(0.03 * drop, 0.01);
        expect(Math.abs(simulated - drop), `r = ${r} m, t = ${(t / YEAR).toFixed(2)} yr`).toBeLessThan(
          tolerance,
        );
      }
    }
    expect(energyBalance(e0, s).relativeError).toBeLessThan(1e-9);
  });
});
