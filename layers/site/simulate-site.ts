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
  createProbeThawTracker,
  type ProbeThawTracker,
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
  type SiteGround,
  type SiteMeshes,
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
  thawTrackers: ProbeThawTracker[];
  lastProbeT: Float64Array;
  /** First time the front passes each probe (interpolated within the step), s, or null. */
  thawTime_s: (number | null)[];
  /** The year's largest thaw measure per probe and its time; the previous year's (NaN before any). */
  yearMax: Float64Array;
  yearMaxAt: Float64Array;
  prevMax: Float64Array;
  prevMaxAt: Float64Array;
  /** Thaw-year trend per probe (see closeProbeYear), s, or null. */
  trendThaw_s: (number | null)[];
  tracker: ReturnType<typeof createPermafrostTableTracker>;
  trackerStride: number;
  trackerOffset: number;
  out: SiteCaseResult;
  stored0: number;
}

/** The run's fixed ingredients, resolved once from the validated input (site-setup.ts). */
interface RunContext {
  input: SiteInput;
  ground: SiteGround;
  meshes: SiteMeshes;
  rowMat: Int32Array;
  init: InitialState;
  surface: (time_s: number) => number;
}

/** The time grid: `steps` equal steps of `dt` seconds over the run, and the output interval. */
interface TimeGrid {
  steps: number;
  dt: number;
  outputEvery: number;
}

/** The events still to come in a run (times in s), advanced as the steps pass them. */
interface RunSchedule {
  nextOutput: number;
  nextYearEnd: number;
  nextWinter: number;
  nextWinterStart: number;
  winterYear: number;
}

/** Winter timing of a climate: the day winter ends (day of year, unwrapped) and its length, s. */
interface WinterTiming {
  endOfWinterDay: number;
  winterLength_s: number;
}

/**
 * Over-cooling bookkeeping of the pile case: which cells were unfrozen at the start of the current
 * winter, and per winter the volume the pile has frozen by its end that stays unfrozen without the pile.
 */
interface OverCooling {
  pileCase: CaseRun;
  noPileT: Float64Array;
  unfrozenAtWinterStart: Uint8Array;
  year: number[];
  frozenByPile_m3: number[];
}

/** Monthly fluid integrals (time-weighted sums, s·°C, J) and the lowest fluid temperature. */
interface FluidLedger {
  runTime: Float64Array;
  inletInt: Float64Array;
  outletInt: Float64Array;
  extracted: Float64Array;
  delivered: Float64Array;
  demanded: Float64Array;
  lowest: number;
  lowestAt: number;
}

/** Thaw delay per probe and whether it is only a lower or upper bound (see SiteResult). */
interface ThawDelays {
  thawDelay_yr: (number | null)[];
  lowerBound: boolean[];
  upperBound: boolean[];
}

/** Validates `draft` (throws RangeError listing every issue with its path) and runs the simulation. */
export function simulateSite(
  draft: SiteInputDraft | SiteInput,
  options: SimulateSiteOptions = {},
): SiteResult {
  const ctx = prepareRun(draft);
  const { input, meshes, ground } = ctx;
  const q = input.ground.geothermalFlux_W_m2;
  const warnings: string[] = [];
  const { cases, siteLoop } = createCases(ctx);
  const pileCase = cases.length > 1 ? cases[1] : null;
  const winter = winterTiming(input.climate);
  const overCooling = pileCase ? createOverCooling(pileCase, cases[0].solver.T) : null;
  if (overCooling) markUnfrozen(ctx, overCooling);
  const months = input.years * 12;
  const ledger = createFluidLedger(months);
  const grid = timeGrid(input);
  const schedule = createSchedule(winter, grid);
  for (const run of cases) {
    run.tracker.observe(run.solver.T, run.trackerStride, run.trackerOffset, 0);
    record(run, 0);
  }
  const extremes = startExtremes(cases, ctx.init);
  const fields = cases.map((run) => run.solver.T);

  let lastProgress = -1;
  for (let s = 1; s <= grid.steps; s++) {
    if (options.shouldCancel && (s & 15) === 0 && options.shouldCancel()) throw new SiteCancelledError();
    const t = s * grid.dt;
    stepCases(cases, t, grid.dt);
    observeSiteStep(extremes, fields, siteLoop ? siteLoop.loop : null, ctx.surface(t), t / SECONDS_PER_YEAR);
    if (siteLoop) accumulateFluid(ledger, siteLoop, months, t, grid.dt);
    advanceSchedule(ctx, cases, overCooling, schedule, t, grid);
    const progress = Math.floor((100 * s) / grid.steps);
    if (options.onProgress && progress !== lastProgress) {
      lastProgress = progress;
      options.onProgress(s / grid.steps);
    }
  }

  const worst = finishCases(cases);
  if (worst > 0.005) warnings.push(energyBalanceWarning(worst));
  const noPile = cases[0].out;
  const withPile = pileCase ? pileCase.out : null;
  const delays = thawDelays(input, noPile, withPile);
  const result: SiteResult = {
    noPile,
    withPile,
    thawDelay_yr: delays.thawDelay_yr,
    thawDelayIsLowerBound: delays.lowerBound,
    thawDelayIsUpperBound: delays.upperBound,
    energyBalance: { relativeError: worst },
    fluid: siteLoop && input.pile ? fluidResult(input, siteLoop, ledger, months) : null,
    overCooling: overCooling
      ? {
          year: overCooling.year,
          frozenByPile_m3: overCooling.frozenByPile_m3,
          endOfWinterDay: round4(winter.endOfWinterDay % 365),
        }
      : null,
    mesh: {
      nr: meshes.pile.nr,
      nz: meshes.pile.nz,
      timeSteps: grid.steps,
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

/** Validates the draft (RangeError listing every issue) and resolves ground, meshes and initial state. */
function prepareRun(draft: SiteInputDraft | SiteInput): RunContext {
  const parsed = siteInputSchema.safeParse(draft);
  if (!parsed.success) {
    throw new RangeError(`invalid site input: ${formatSiteInputIssues(parsed.error).join('; ')}`);
  }
  const input = parsed.data;
  const ground = resolveGround(input);
  const meshes = buildMeshes(input, ground);
  const rowMat = rowMaterials(meshes.pile, ground.bottoms_m);
  const init = initialState(input, ground, meshes.column, rowMat);
  return { input, ground, meshes, rowMat, init, surface: surfaceForcing(input, true) };
}

/**
 * The cases of a run: the no-pile column always, and with a pile the (r, z) mesh coupled to its loop
 * (the loop's air temperature has no n-factors: the building sees the air, not the ground surface).
 */
function createCases(ctx: RunContext): { cases: CaseRun[]; siteLoop: SiteLoop | null } {
  const { input, ground, meshes, rowMat, init, surface } = ctx;
  const tol = input.numerics.tolerance_K ?? 1e-2;
  const q = input.ground.geothermalFlux_W_m2;
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
  const cases: CaseRun[] = [makeCase(ctx, noPileSolver, 1, 0)];
  if (!input.pile) return { cases, siteLoop: null };
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
  const siteLoop = createSiteLoop(input, meshes.pile, pileRows, air);
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
  cases.push(makeCase(ctx, solver, meshes.pile.nr, meshes.pile.nr - 1));
  return { cases, siteLoop };
}

/** One case's probes, thaw bookkeeping, permafrost-table tracker and (empty) result. */
function makeCase(ctx: RunContext, solver: ConductionSolver, stride: number, offset: number): CaseRun {
  const { input, ground, rowMat, init } = ctx;
  const mesh = solver.mesh;
  const stencils = input.probes.map((p) => probeStencil(mesh, ground.table, rowMat, p.r_m, p.z_m));
  // Last thaw measure per probe (probeThawMeasure: ≥ 0 once the front has passed the probe).
  const thawTrackers = stencils.map((s) => createProbeThawTracker(s, mesh, ground.table, rowMat, mesh.nr));
  const lastProbeT = Float64Array.from(thawTrackers.map((tr) => tr.observe(solver.T)));
  const n = stencils.length;
  const thawed = stencils.map((_, i) => (lastProbeT[i] >= 0 ? 0 : null));
  return {
    solver,
    stencils,
    thawTrackers,
    lastProbeT,
    thawTime_s: thawed,
    yearMax: new Float64Array(n).fill(-Infinity),
    yearMaxAt: new Float64Array(n),
    prevMax: new Float64Array(n).fill(NaN),
    prevMaxAt: new Float64Array(n),
    trendThaw_s: [...thawed],
    tracker: createPermafrostTableTracker(mesh, ground.table, rowMat, SECONDS_PER_YEAR, init.lastThawed_s),
    trackerStride: stride,
    trackerOffset: offset,
    stored0: solver.storedEnergy_J(),
    out: emptyCaseResult(input),
  };
}

/** A case result with its final shape (filled during and after the run, so no object changes shape). */
function emptyCaseResult(input: SiteInput): SiteCaseResult {
  return {
    time_yr: [],
    thawDepth_m: [],
    annualThawDepth_m: [],
    probes: input.probes.map((p) => ({ r_m: p.r_m, z_m: p.z_m, T_C: [], thawYear: null })),
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
  };
}

/**
 * Winter = the part of the year with the air (and surface) below 0 °C, phase angle |φ| < θ = acos(T̄/A)
 * about the coldest day; the first winter starts before t = 0.
 */
function winterTiming(c: SiteInput['climate']): WinterTiming {
  const ratio = c.meanAirTemp_C / Math.max(c.amplitude_C, 1e-9);
  const theta = ratio <= -1 ? Math.PI : ratio >= 1 ? 0 : Math.acos(ratio);
  return {
    endOfWinterDay: c.coldestDay + (365 * theta) / (2 * Math.PI),
    winterLength_s: ((365 * theta) / Math.PI) * SECONDS_PER_DAY,
  };
}

/** The time grid of the input: whole steps close to `timeStep_days` that fill the run exactly. */
function timeGrid(input: SiteInput): TimeGrid {
  const total = input.years * SECONDS_PER_YEAR;
  const steps = Math.ceil(total / (input.timeStep_days * SECONDS_PER_DAY) - 1e-9);
  return { steps, dt: total / steps, outputEvery: input.outputStep_days * SECONDS_PER_DAY };
}

/** The events of a run from t = 0: the first output, year end, winter end and winter start. */
function createSchedule(winter: WinterTiming, grid: TimeGrid): RunSchedule {
  const nextWinter = winter.endOfWinterDay * SECONDS_PER_DAY;
  return {
    nextOutput: grid.outputEvery,
    nextYearEnd: SECONDS_PER_YEAR,
    nextWinter,
    nextWinterStart: nextWinter + SECONDS_PER_YEAR - winter.winterLength_s,
    winterYear: 1,
  };
}

/** Empty over-cooling bookkeeping for the pile case, against the no-pile column `noPileT`. */
function createOverCooling(pileCase: CaseRun, noPileT: Float64Array): OverCooling {
  return {
    pileCase,
    noPileT,
    unfrozenAtWinterStart: new Uint8Array(pileCase.solver.T.length),
    year: [],
    frozenByPile_m3: [],
  };
}

/** Marks the pile case's cells that are unfrozen (liquid fraction > 1/2) at the start of a winter. */
function markUnfrozen(ctx: RunContext, oc: OverCooling): void {
  const { ground, rowMat, meshes } = ctx;
  oc.pileCase.solver.T.forEach((T, cell) => {
    const m = rowMat[(cell / meshes.pile.nr) | 0];
    oc.unfrozenAtWinterStart[cell] = liquidFractionAt(ground.table, m, T) > 0.5 ? 1 : 0;
  });
}

/**
 * The volume at the end of a winter that the pile has frozen: unfrozen at the winter's start, frozen now,
 * and unfrozen in the same row of the no-pile column, m³.
 */
function frozenByPile_m3(ctx: RunContext, oc: OverCooling): number {
  const { ground, rowMat } = ctx;
  const pm = ctx.meshes.pile;
  const T = oc.pileCase.solver.T;
  let vol = 0;
  for (let j = 0; j < pm.nz; j++) {
    const mj = rowMat[j];
    if (liquidFractionAt(ground.table, mj, oc.noPileT[j]) <= 0.5) continue;
    for (let i = 0; i < pm.nr; i++) {
      const cell = j * pm.nr + i;
      if (oc.unfrozenAtWinterStart[cell] && liquidFractionAt(ground.table, mj, T[cell]) <= 0.5) {
        vol += oc.pileCase.solver.volume_m3[cell];
      }
    }
  }
  return vol;
}

/** Zeroed monthly fluid integrals, no lowest temperature yet. */
function createFluidLedger(months: number): FluidLedger {
  return {
    runTime: new Float64Array(months),
    inletInt: new Float64Array(months),
    outletInt: new Float64Array(months),
    extracted: new Float64Array(months),
    delivered: new Float64Array(months),
    demanded: new Float64Array(months),
    lowest: Infinity,
    lowestAt: NaN,
  };
}

/** Appends the output-time values of a case: time, thaw depth and probe temperatures. */
function record(run: CaseRun, t: number): void {
  run.out.time_yr.push(round4(t / SECONDS_PER_YEAR));
  run.out.thawDepth_m.push(round4(run.tracker.depth_m(t)));
  run.stencils.forEach((s, i) => run.out.probes[i].T_C.push(round4(probeTemperature(s, run.solver.T))));
}

/**
 * Advances every case by one step to time `t` and records the thaw at each probe: the first passage of
 * the year's thaw front past the probe's depth (interpolated linearly within the step) and the year's
 * largest reach of the front (for the thaw-year trend, closeProbeYear).
 */
function stepCases(cases: readonly CaseRun[], t: number, dt: number): void {
  for (const run of cases) {
    run.solver.step(dt);
    run.tracker.observe(run.solver.T, run.trackerStride, run.trackerOffset, t);
    run.thawTrackers.forEach((tr, i) => {
      const m = tr.observe(run.solver.T);
      if (run.thawTime_s[i] === null && m >= 0) {
        const prev = run.lastProbeT[i];
        const frac = m > prev ? -prev / (m - prev) : 1;
        run.thawTime_s[i] = t - dt + Math.min(1, Math.max(0, frac)) * dt;
      }
      if (m > run.yearMax[i]) {
        run.yearMax[i] = m;
        run.yearMaxAt[i] = t;
      }
      run.lastProbeT[i] = m;
    });
  }
}

/** Adds one step of the loop's fluid temperatures, extraction and building demand to its month. */
function accumulateFluid(
  ledger: FluidLedger,
  siteLoop: SiteLoop,
  months: number,
  t: number,
  dt: number,
): void {
  const year = SECONDS_PER_YEAR;
  const loop = siteLoop.loop;
  const m = Math.min(months - 1, Math.floor((t - dt / 2) / (year / 12)));
  if (loop.running) {
    ledger.runTime[m] += dt;
    ledger.inletInt[m] += loop.inlet_C * dt;
    ledger.outletInt[m] += loop.outlet_C * dt;
    ledger.extracted[m] += loop.extraction_W * dt;
    const low = Math.min(loop.inlet_C, loop.outlet_C);
    if (low < ledger.lowest) {
      ledger.lowest = low;
      ledger.lowestAt = t / year;
    }
  }
  const dem = siteLoop.demand_W();
  if (Number.isFinite(dem)) {
    ledger.demanded[m] += dem * dt;
    ledger.delivered[m] += siteLoop.delivered_W() * dt;
  }
}

/** Handles the events the step at time `t` reaches: winter start and end, year end, output time. */
function advanceSchedule(
  ctx: RunContext,
  cases: readonly CaseRun[],
  oc: OverCooling | null,
  sc: RunSchedule,
  t: number,
  grid: TimeGrid,
): void {
  const year = SECONDS_PER_YEAR;
  const dt = grid.dt;
  if (t >= sc.nextWinterStart - dt / 2) {
    if (oc) markUnfrozen(ctx, oc);
    sc.nextWinterStart += year;
  }
  if (oc && t >= sc.nextWinter - dt / 2) {
    const vol = frozenByPile_m3(ctx, oc);
    oc.year.push(sc.winterYear);
    oc.frozenByPile_m3.push(round4(vol));
    sc.winterYear++;
    sc.nextWinter += year;
  }
  if (t >= sc.nextYearEnd - dt / 2) {
    for (const run of cases) {
      run.out.annualThawDepth_m.push(round4(run.tracker.periodMaxDepth_m()));
      closeProbeYear(run);
    }
    sc.nextYearEnd += year;
  }
  if (t >= sc.nextOutput - dt / 2) {
    for (const run of cases) record(run, t);
    sc.nextOutput += grid.outputEvery;
  }
}

/**
 * Closes a year of each probe's thaw bookkeeping. The thaw year is the trend of the annual thaw: the time
 * at which the annual maximum of the thaw depth on the probe's column reaches the probe, interpolated
 * linearly between the two years' maxima (at the times they occur) when the front first passes the probe
 * in this year and fell short of it the year before. A first-passage time alone would jump by whole years
 * (the front passes in one summer or the next), however finely the step and mesh resolve the front; the
 * trend moves with the annual maxima, so it converges with them. The first year, or a front that came
 * from beyond the last year's reach, keeps the first-passage time.
 */
function closeProbeYear(run: CaseRun): void {
  run.stencils.forEach((_, i) => {
    const m = run.yearMax[i];
    const m0 = run.prevMax[i];
    if (run.trendThaw_s[i] === null && m >= 0) {
      const t0 = run.prevMaxAt[i];
      const t1 = run.yearMaxAt[i];
      run.trendThaw_s[i] =
        Number.isFinite(m0) && m0 < 0 && m > m0 ? t0 + (-m0 / (m - m0)) * (t1 - t0) : run.thawTime_s[i];
    }
    run.prevMax[i] = m;
    run.prevMaxAt[i] = run.yearMaxAt[i];
    run.yearMax[i] = -Infinity;
    run.thawTrackers[i].startYear();
    run.lastProbeT[i] = run.thawTrackers[i].observe(run.solver.T);
  });
}

/** Fills each case's energy balance, solver work and probe thaw years; returns the worst balance error. */
function finishCases(cases: readonly CaseRun[]): number {
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
      const tt = run.trendThaw_s[i] ?? run.thawTime_s[i];
      p.thawYear = tt === null ? null : round4(tt / SECONDS_PER_YEAR);
    });
    worst = Math.max(worst, eb.relativeError);
  }
  return worst;
}

/** The warning for an energy balance error above 0.5 %. */
function energyBalanceWarning(worst: number): string {
  return `energy balance error ${(worst * 100).toFixed(2)} % exceeds 0.5 %: refine the time step or mesh`;
}

/** The delay the pile buys at each probe, yr, with the cases where one of the two never thawed. */
function thawDelays(input: SiteInput, noPile: SiteCaseResult, withPile: SiteCaseResult | null): ThawDelays {
  const d: ThawDelays = { thawDelay_yr: [], lowerBound: [], upperBound: [] };
  input.probes.forEach((_, i) => {
    const a = noPile.probes[i].thawYear;
    const b = withPile ? withPile.probes[i].thawYear : null;
    if (!withPile || (a === null && b === null)) {
      d.thawDelay_yr.push(null);
      d.lowerBound.push(false);
      d.upperBound.push(false);
    } else if (a !== null && b === null) {
      // The pile case has not thawed by the end of the run: the delay is at least years − a.
      d.thawDelay_yr.push(round4(input.years - a));
      d.lowerBound.push(true);
      d.upperBound.push(false);
    } else if (a === null && b !== null) {
      // Only the pile case thawed (heat injected into the ground): the ground without the pile thaws
      // after the run, so the delay is at most b − years (negative: the pile brings the thaw forward).
      d.thawDelay_yr.push(round4(b - input.years));
      d.lowerBound.push(false);
      d.upperBound.push(true);
    } else {
      d.thawDelay_yr.push(round4((b as number) - (a as number)));
      d.lowerBound.push(false);
      d.upperBound.push(false);
    }
  });
  return d;
}

/** The monthly fluid result: mean running inlet/outlet temperatures, energies in kWh, loop figures. */
function fluidResult(
  input: SiteInput,
  siteLoop: SiteLoop,
  ledger: FluidLedger,
  months: number,
): SiteFluidResult {
  const kWh = (j: number) => round4(j / 3.6e6);
  const building = input.operation.mode === 'building';
  const { runTime, inletInt, outletInt, extracted, delivered, demanded, lowest, lowestAt } = ledger;
  return {
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
