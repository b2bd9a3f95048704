/**
 * `simulateSite`: one site simulated twice over the same years, without and with the pile, in lockstep.
 *
 * Without the pile every column sees the same surface, bottom and (zero) radial boundary conditions, so
 * the field is one-dimensional: that case runs on a single column with the same rows (exactly the
 * far-field column of a pile-free (r, z) run). With the pile the (r, z) mesh of `buildSiteMesh` is
 * coupled to the pile loop (pile-loop.ts, site-operation.ts). Both start from the same initial state
 * (site-setup.ts) and use the same surface forcing (n-factored sinusoid plus linear warming,
 * surface-forcing.ts: the trend is added to the air before the n-factors act, the surface-warming
 * transfer the per-cell model shares through surfaceMeanWarming_K) and geothermal flux; the solver is
 * conduction-solver.ts.
 * Reporting: probes (bilinear between cell centres), the year each probe first reaches its freezing
 * point (interpolated within the step) and the delay the pile buys, the thaw depth on the far-field
 * column (permafrost table, see SiteCaseResult), monthly fluid temperatures and energy, the lowest fluid
 * temperature, the volume the pile freezes by the end of each winter that was unfrozen at its start
 * and stays unfrozen without the pile, and the
 * energy balance of each case, with a warning above 0.5 %.
 * Pure: no I/O; `onProgress` and `shouldCancel` let a Web Worker or the CLI report and stop.
 */
import { GROUND_CAUTIONS, SCREENING_CAUTION } from '../cautions';
import { SECONDS_PER_DAY, SECONDS_PER_YEAR, surfaceTemperature_C } from '../physics/surface-forcing';
import { createConductionSolver, energyBalance, type ConductionSolver } from './conduction-solver';
import { liquidFractionAt } from './ground-enthalpy';
import {
  formatSiteInputIssues,
  siteInputSchema,
  type SiteInput,
  type SiteInputDraft,
} from './site-input-schema';
import {
  checkPhysicalBounds,
  createExtremesTracker,
  fluxRise_K,
  observeSiteStep,
  type ExtremesTracker,
} from './site-bounds';
import { rowsAbove } from './site-mesh';
import { createSiteLoop, type SiteLoop } from './site-operation';
import {
  createPermafrostTableTracker,
  probeStencil,
  probeTemperature,
  probeThawMeasure,
  type ProbeStencil,
} from './site-probes';
import type { SiteCaseResult, SiteFluidResult, SiteResult } from './site-result';
import {
  buildMeshes,
  initialState,
  resolveGround,
  rowMaterials,
  surfaceForcing,
  type InitialState,
  climateTrend,
} from './site-setup';

export interface SimulateSiteOptions {
  onProgress?(fraction: number): void;
  shouldCancel?(): boolean;
}

export class SiteCancelledError extends Error {
  constructor() {
    super('site simulation cancelled');
    this.name = 'SiteCancelledError';
  }
}

const round4 = (x: number): number => Math.round(x * 1e4) / 1e4;

interface CaseRun {
  solver: ConductionSolver;
  stencils: ProbeStencil[];
  lastProbeT: Float64Array;
  thawTime_s: (number | null)[];
  tracker: ReturnType<typeof createPermafrostTableTracker>;
  trackerStride: number;
  trackerOffset: number;
  out: SiteCaseResult;
  stored0: number;
}

/** Validates `draft` (throws RangeError listing every issue with its path) and runs the simulation. */
export function simulateSite(
  draft: SiteInputDraft | SiteInput,
  options: SimulateSiteOptions = {},
): SiteResult {
  const parsed = siteInputSchema.safeParse(draft);
  if (!parsed.success) {
    throw new RangeError(`invalid site input: ${formatSiteInputIssues(parsed.error).join('; ')}`);
  }
  const input = parsed.data;
  const ground = resolveGround(input);
  const meshes = buildMeshes(input, ground);
  const rowMat = rowMaterials(meshes.pile, ground.bottoms_m);
  const init = initialState(input, ground, meshes.column, rowMat);
  const surface = surfaceForcing(input, true);
  const tol = input.numerics.tolerance_K ?? 1e-2;
  const q = input.ground.geothermalFlux_W_m2;
  const warnings: string[] = [];
  const year = SECONDS_PER_YEAR;

  const makeCase = (solver: ConductionSolver, stride: number, offset: number): CaseRun => {
    const mesh = solver.mesh;
    const stencils = input.probes.map((p) => probeStencil(mesh, ground.table, rowMat, p.r_m, p.z_m));
    // Last thaw measure per probe (probeThawMeasure: ≥ 0 once the front has passed the probe).
    const lastProbeT = Float64Array.from(
      stencils.map((s) => probeThawMeasure(s, ground.table, rowMat, solver.T, mesh.nr)),
    );
    return {
      solver,
      stencils,
      lastProbeT,
      thawTime_s: stencils.map((_, i) => (lastProbeT[i] >= 0 ? 0 : null)),
      tracker: createPermafrostTableTracker(mesh, ground.table, rowMat, year, init.lastThawed_s),
      trackerStride: stride,
      trackerOffset: offset,
      stored0: solver.storedEnergy_J(),
      out: {
        time_yr: [],
        thawDepth_m: [],
        annualThawDepth_m: [],
        probes: input.probes.map((p) => ({ r_m: p.r_m, z_m: p.z_m, T_C: [], thawYear: null })),
        // Filled at the end; created with their final shape so that no object changes shape mid-run.
        energyBalance: {
          stored_J: 0,
          boundaries_J: 0,
          surface_J: 0,
          bottom_J: 0,
          pile_J: 0,
          relativeError: 0,
        },
        unconvergedSteps: 0,
        solverWork: {
          substitutions: 0,
          rightHandSides: 0,
          refactoredRows: 0,
          phasePasses: 0,
          halvedSteps: 0,
        },
      },
    };
  };

  const noPileSolver = createConductionSolver({
    mesh: meshes.column,
    materials: ground.table,
    rowMaterial: rowMat,
    surfaceTemperature_C: surface,
    bottomFlux_W_m2: q,
    initialT_C: init.rowT_C,
    inner: null,
    tolerance_K: tol,
  });
  const cases: CaseRun[] = [makeCase(noPileSolver, 1, 0)];
  let siteLoop: SiteLoop | null = null;
  if (input.pile) {
    const pileRows = rowsAbove(meshes.pile, input.pile.topDepth_m + input.pile.length_m);
    const c = input.climate;
    const air = (time_s: number) =>
      surfaceTemperature_C({
        meanAirTemp_C: c.meanAirTemp_C,
        amplitude_C: c.amplitude_C,
        nFreeze: 1,
        nThaw: 1,
        time_s,
        trend: climateTrend(c),
        coldestDay: c.coldestDay,
      });
    siteLoop = createSiteLoop(input, meshes.pile, pileRows, air);
    const solver = createConductionSolver({
      mesh: meshes.pile,
      materials: ground.table,
      rowMaterial: rowMat,
      surfaceTemperature_C: surface,
      bottomFlux_W_m2: q,
      initialT_C: init.rowT_C,
      inner: siteLoop.loop,
      tolerance_K: tol,
    });
    cases.push(makeCase(solver, meshes.pile.nr, meshes.pile.nr - 1));
  }

  // Over-cooling bookkeeping: winter = the part of the year with the air (and surface) below 0 °C,
  // phase angle |φ| < θ = acos(T̄/A) about the coldest day; the first winter starts before t = 0.
  const c = input.climate;
  const ratio = c.meanAirTemp_C / Math.max(c.amplitude_C, 1e-9);
  const theta = ratio <= -1 ? Math.PI : ratio >= 1 ? 0 : Math.acos(ratio);
  const endOfWinterDay = c.coldestDay + (365 * theta) / (2 * Math.PI);
  const winterLength_s = ((365 * theta) / Math.PI) * SECONDS_PER_DAY;
  const pileCase = cases[1];
  const unfrozenAtWinterStart = pileCase ? new Uint8Array(pileCase.solver.T.length) : null;
  const markUnfrozen = () => {
    if (!pileCase || !unfrozenAtWinterStart) return;
    pileCase.solver.T.forEach((T, cell) => {
      const m = rowMat[(cell / meshes.pile.nr) | 0];
      unfrozenAtWinterStart[cell] = liquidFractionAt(ground.table, m, T) > 0.5 ? 1 : 0;
    });
  };
  markUnfrozen();
  const overCooling = { year: [] as number[], frozenByPile_m3: [] as number[] };

  // Fluid bookkeeping by month.
  const months = input.years * 12;
  const runTime = new Float64Array(months);
  const inletInt = new Float64Array(months);
  const outletInt = new Float64Array(months);
  const extracted = new Float64Array(months);
  const delivered = new Float64Array(months);
  const demanded = new Float64Array(months);
  let lowest = Infinity;
  let lowestAt = NaN;

  const total = input.years * year;
  const steps = Math.ceil(total / (input.timeStep_days * SECONDS_PER_DAY) - 1e-9);
  const dt = total / steps;
  const outputEvery = input.outputStep_days * SECONDS_PER_DAY;
  let nextOutput = 0;
  let nextYearEnd = year;
  let nextWinter = endOfWinterDay * SECONDS_PER_DAY;
  let nextWinterStart = nextWinter + year - winterLength_s;
  let winterYear = 1;

  const record = (run: CaseRun, t: number) => {
    run.out.time_yr.push(round4(t / year));
    run.out.thawDepth_m.push(round4(run.tracker.depth_m(t)));
    run.stencils.forEach((s, i) => run.out.probes[i].T_C.push(round4(probeTemperature(s, run.solver.T))));
  };
  for (const run of cases) {
    run.tracker.observe(run.solver.T, run.trackerStride, run.trackerOffset, 0);
    record(run, 0);
  }
  nextOutput = outputEvery;
  const extremes = startExtremes(cases, init);
  const fields = cases.map((run) => run.solver.T);

  let lastProgress = -1;
  for (let s = 1; s <= steps; s++) {
    if (options.shouldCancel && (s & 15) === 0 && options.shouldCancel()) throw new SiteCancelledError();
    const t = s * dt;
    for (const run of cases) {
      run.solver.step(dt);
      run.tracker.observe(run.solver.T, run.trackerStride, run.trackerOffset, t);
      run.stencils.forEach((st, i) => {
        // Thaw at a probe: the front (liquid fraction of the probe's cell) passes the probe's depth,
        // interpolated linearly within the step.
        const m = probeThawMeasure(st, ground.table, rowMat, run.solver.T, run.solver.mesh.nr);
        if (run.thawTime_s[i] === null && m >= 0) {
          const prev = run.lastProbeT[i];
          const frac = m > prev ? -prev / (m - prev) : 1;
          run.thawTime_s[i] = t - dt + Math.min(1, Math.max(0, frac)) * dt;
        }
        run.lastProbeT[i] = m;
      });
    }
    observeSiteStep(extremes, fields, siteLoop ? siteLoop.loop : null, surface(t), t / year);
    if (siteLoop) {
      const loop = siteLoop.loop;
      const m = Math.min(months - 1, Math.floor((t - dt / 2) / (year / 12)));
      if (loop.running) {
        runTime[m] += dt;
        inletInt[m] += loop.inlet_C * dt;
        outletInt[m] += loop.outlet_C * dt;
        extracted[m] += loop.extraction_W * dt;
        const low = Math.min(loop.inlet_C, loop.outlet_C);
        if (low < lowest) {
          lowest = low;
          lowestAt = t / year;
        }
      }
      const dem = siteLoop.demand_W();
      if (Number.isFinite(dem)) {
        demanded[m] += dem * dt;
        delivered[m] += siteLoop.delivered_W() * dt;
      }
    }
    if (t >= nextWinterStart - dt / 2) {
      markUnfrozen();
      nextWinterStart += year;
    }
    if (pileCase && unfrozenAtWinterStart && t >= nextWinter - dt / 2) {
      const pm = meshes.pile;
      let vol = 0;
      for (let j = 0; j < pm.nz; j++) {
        const mj = rowMat[j];
        if (liquidFractionAt(ground.table, mj, noPileSolver.T[j]) <= 0.5) continue;
        for (let i = 0; i < pm.nr; i++) {
          const cell = j * pm.nr + i;
          if (
            unfrozenAtWinterStart[cell] &&
            liquidFractionAt(ground.table, mj, pileCase.solver.T[cell]) <= 0.5
          ) {
            vol += pileCase.solver.volume_m3[cell];
          }
        }
      }
      overCooling.year.push(winterYear);
      overCooling.frozenByPile_m3.push(round4(vol));
      winterYear++;
      nextWinter += year;
    }
    if (t >= nextYearEnd - dt / 2) {
      for (const run of cases) run.out.annualThawDepth_m.push(round4(run.tracker.periodMaxDepth_m()));
      nextYearEnd += year;
    }
    if (t >= nextOutput - dt / 2) {
      for (const run of cases) record(run, t);
      nextOutput += outputEvery;
    }
    const progress = Math.floor((100 * s) / steps);
    if (options.onProgress && progress !== lastProgress) {
      lastProgress = progress;
      options.onProgress(s / steps);
    }
  }

  let worst = 0;
  for (const run of cases) {
    const eb = energyBalance(run.stored0, run.solver);
    const L = run.solver.ledger;
    run.out.energyBalance = {
      stored_J: eb.stored_J,
      boundaries_J: eb.boundaries_J,
      surface_J: L.surface_J,
      bottom_J: L.bottom_J,
      pile_J: L.pile_J,
      relativeError: eb.relativeError,
    };
    run.out.unconvergedSteps = run.solver.unconverged;
    run.out.solverWork = {
      substitutions: run.solver.sweeps,
      rightHandSides: run.solver.rightHandSides,
      refactoredRows: run.solver.refactoredRows,
      phasePasses: run.solver.phasePasses,
      halvedSteps: run.solver.refinedSteps,
    };
    run.out.probes.forEach((p, i) => {
      const tt = run.thawTime_s[i];
      p.thawYear = tt === null ? null : round4(tt / year);
    });
    worst = Math.max(worst, eb.relativeError);
  }
  if (worst > 0.005) {
    warnings.push(
      `energy balance error ${(worst * 100).toFixed(2)} % exceeds 0.5 %: refine the time step or mesh`,
    );
  }

  const noPile = cases[0].out;
  const withPile = pileCase ? pileCase.out : null;
  const thawDelay_yr: (number | null)[] = [];
  const lowerBound: boolean[] = [];
  const upperBound: boolean[] = [];
  input.probes.forEach((_, i) => {
    const a = noPile.probes[i].thawYear;
    const b = withPile ? withPile.probes[i].thawYear : null;
    if (!withPile || (a === null && b === null)) {
      thawDelay_yr.push(null);
      lowerBound.push(false);
      upperBound.push(false);
    } else if (a !== null && b === null) {
      // The pile case has not thawed by the end of the run: the delay is at least years − a.
      thawDelay_yr.push(round4(input.years - a));
      lowerBound.push(true);
      upperBound.push(false);
    } else if (a === null && b !== null) {
      // Only the pile case thawed (heat injected into the ground): the ground without the pile thaws
      // after the run, so the delay is at most b − years (negative: the pile brings the thaw forward).
      thawDelay_yr.push(round4(b - input.years));
      lowerBound.push(false);
      upperBound.push(true);
    } else {
      thawDelay_yr.push(round4((b as number) - (a as number)));
      lowerBound.push(false);
      upperBound.push(false);
    }
  });

  let fluid: SiteFluidResult | null = null;
  if (siteLoop && input.pile) {
    const kWh = (j: number) => round4(j / 3.6e6);
    const building = input.operation.mode === 'building';
    fluid = {
      month_yr: Array.from({ length: months }, (_, m) => round4(m / 12)),
      inlet_C: Array.from(runTime, (r, m) => (r > 0 ? round4(inletInt[m] / r) : null)),
      outlet_C: Array.from(runTime, (r, m) => (r > 0 ? round4(outletInt[m] / r) : null)),
      extracted_kWh: Array.from(extracted, kWh),
      delivered_kWh: building ? Array.from(delivered, kWh) : null,
      unmet_kWh: building ? Array.from(demanded, (d, m) => kWh(Math.max(0, d - delivered[m]))) : null,
      lowest_C: Number.isFinite(lowest) ? round4(lowest) : null,
      lowestAt_yr: Number.isFinite(lowest) ? round4(lowestAt) : null,
      Rb_mK_W: round4(siteLoop.Rb_mK_W),
      Ra_mK_W: round4(siteLoop.Ra_mK_W),
      flow_L_min: siteLoop.flow_L_min,
    };
  }

  const result: SiteResult = {
    noPile,
    withPile,
    thawDelay_yr,
    thawDelayIsLowerBound: lowerBound,
    thawDelayIsUpperBound: upperBound,
    energyBalance: { relativeError: worst },
    fluid,
    overCooling: pileCase ? { ...overCooling, endOfWinterDay: round4(endOfWinterDay % 365) } : null,
    mesh: {
      nr: meshes.pile.nr,
      nz: meshes.pile.nz,
      timeSteps: steps,
      radius_m: input.domain.radius_m,
      depth_m: input.domain.depth_m,
    },
    warnings,
    cautions: [SCREENING_CAUTION, ...GROUND_CAUTIONS],
  };
  checkPhysicalBounds(result, {
    fluid: input.pile ? input.pile.fluid : null,
    extremes,
    fluxRise_K: fluxRise_K(q, ground.bottoms_m, ground.layers),
  });
  return result;
}

/**
 * The extremes tracker of a run: the starting profile as the initial value (before any spin-up), the
 * spin-up's surface values as boundary values and its fields as the no-pile case's (so that an overshoot
 * in the spin-up is caught rather than widening the bound), and every case's field at t = 0.
 */
function startExtremes(cases: readonly CaseRun[], init: InitialState): ExtremesTracker {
  const extremes = createExtremesTracker(cases.length);
  extremes.observeInitial(init.startRange_C);
  for (const v of init.spinUpSurfaceRange_C) if (Number.isFinite(v)) extremes.observeSurface(v, 0);
  extremes.observeGround(0, init.spinUpFieldRange_C, 0);
  cases.forEach((run, k) => extremes.observeGround(k, run.solver.T, 0));
  return extremes;
}
