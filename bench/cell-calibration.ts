/**
 * Calibration of the per-cell screening model against the transient site simulator (layers/site).
 *
 * For each sampled cell the model's metrics are computed, then `simulateSite` runs the same ground,
 * climate and standard pile (coaxial steel pile, the scenario's R_b), the pile extracting the
 * model's carried annual-average load with a monthly heating profile (monthly factors ∝ heating
 * degree-hours of the month's mean air temperature, mean 1), probes at the reference point and along
 * the pile. Compared:
 *  - thaw delay at the reference point: model thawDelay vs the simulator's thawDelay_yr, two-sided
 *    where the simulator thaws within the run in both cases; one-sided where only the no-pile run
 *    thaws (the simulated delay is then a lower bound, and the model's delay is only checked against
 *    it: below = certainly conservative, at or above = consistent);
 *  - pile count: piles scale with the fluid temperature drop per unit load (linearity), so the ratio
 *    (simulated drop)/(modelled drop) for the same monthly load history is the ratio of the pile count
 *    the simulator implies to the model's. The modelled drop is the three-pulse ground part without
 *    the 6-hour pulse the monthly simulator cannot resolve, plus the winter anomaly of the ground:
 *    ΔT_w + q'_a·R_ga + q'_peak-month·(R_b + R_gm).
 *    The simulated drop is the no-pile mean ground temperature along the pile (that year) minus the
 *    lowest monthly mean fluid temperature over the design life.
 */
import { simulateSite } from '../layers/site/simulate-site';
import { createRandom } from '../data-pipeline/demo/seeded-random';
import type { SiteInputDraft } from '../layers/site/site-input-schema';
import { cylinderSourceGBernier } from '../layers/physics/infinite-cylinder-source';
import { SECONDS_PER_YEAR } from '../layers/physics/surface-forcing';
import type { CellInputs } from '../layers/screening/screening-model';
import { TEXTURE_CODES, type TextureCode } from '../layers/screening/screening-model';
import { buildCellConstants, soilAt } from '../layers/screening/cell-constants';
import {
  createKernelScratch,
  evaluateCellMetrics,
  pileWinterAnomaly_K,
} from '../layers/screening/cell-kernel';
import { METRIC, METRIC_COUNT } from '../layers/screening/cell-layers';
import { flsResponse } from '../layers/screening/response-tables';
import { DEFAULT_SCENARIO, type Scenario } from '../layers/screening/scenario';

/** Demo-region input ranges (data-pipeline/demo/demo-region.ts) the sample spans. */
export const DEMO_RANGES = {
  meanAirTemp_C: [-12.5, -3.2],
  airAmplitude_C: [12.5, 21.8],
  warming_C_per_yr: [0.03, 0.08],
  /** Mineral and organic textures (bedrock cells are excluded from the pile metrics). */
  textures: [1, 2, 3, 4, 5],
  /** Water + ice content by texture, central demo values ± 15 %. */
  water: { 1: 0.15, 2: 0.24, 3: 0.45, 4: 0.45, 5: 0.8 } as Record<number, number>,
} as const;

/** A Latin-hypercube-like seeded sample of `n` cells over the demo ranges. */
export function sampleCalibrationCells(n: number, seed: number): CellInputs[] {
  const r = createRandom(seed);
  const strata = (k: number) => {
    const idx = Array.from({ length: n }, (_, i) => (i + r()) / n);
    for (let i = n - 1; i > 0; i--) {
      const j = Math.floor(r() * (i + 1));
      [idx[i], idx[j]] = [idx[j], idx[i]];
    }
    return idx.map((u) => u + 0 * k);
  };
  const [u1, u2, u3] = [strata(1), strata(2), strata(3)];
  const R = DEMO_RANGES;
  return Array.from({ length: n }, (_, i) => {
    const tex = R.textures[i % R.textures.length];
    const lerp = (range: readonly number[], u: number) => range[0] + (range[1] - range[0]) * u;
    return {
      meanAirTemp_C: lerp(R.meanAirTemp_C, u1[i]),
      airAmplitude_C: lerp(R.airAmplitude_C, u2[i]),
      warming_C_per_yr: lerp(R.warming_C_per_yr, u3[i]),
      textureClass: tex,
      waterContent_m3m3: R.water[tex] * (0.85 + 0.3 * r()),
      bedrockDepth_m: 40,
      groundTemp_C: NaN,
      geothermalFlux_W_m2: NaN,
      nFreeze: NaN,
      latitude_deg: NaN,
    };
  });
}

export interface CalibrationOptions {
  /** Simulated years (thaw delay needs thaw within the run). */
  years: number;
  timeStep_days: number;
  fidelity: 'coarse' | 'standard' | 'fine';
}

/**
 * The simulator at its own default numerics (7-day steps, standard mesh) over 196 years: 28 × 7 years,
 * so the step is exactly 7 days (the simulator rounds the step to fit the run) and a shorter run of a
 * multiple of 7 years marches the same steps, bit for bit (the live test's re-runs rely on this: the
 * simulated thaw time is so flat near 0 °C that a 1e-4 change of the step moved one delay by 0.8 yr).
 * 200 years is the schema's longest run. Pilot on the first 20 sample cells (bench/calibration-pilot.ts,
 * 14 simulated): two-sided thaw-delay comparisons 1 at 80 yr, 7 at 120, 8 at 160, 10 at 200 (3 cells
 * do not thaw even without the pile by 200 yr). Numerical resolution of the simulated delay on those
 * cells: 28-day → 7-day steps change it by up to 0.58 yr (so a 28-day step, let alone a coarser one, is
 * not within 0.2 yr), 7 → 3.5 days by ≤ 0.10 yr on 9 of 10 cells (0.58 on one), coarse → standard mesh
 * by up to 0.87 yr. Cost about 6 s a simulated cell.
 */
export const DEFAULT_CALIBRATION_OPTIONS: CalibrationOptions = {
  years: 196,
  timeStep_days: 7,
  fidelity: 'standard',
};

export interface CalibrationCase {
  cell: CellInputs;
  excluded: boolean;
  model: {
    /** Thaw time at the reference point without piles, yr from the start (the model's horizon caps it). */
    noPileThaw_yr: number;
    thawDelay_yr: number;
    pilesPerTon: number;
    fluidDrop_K: number;
    carried_W_m: number;
  };
  sim: {
    /** Thaw time at the reference point without and with the pile, yr from the start (null: not by the end). */
    noPileThaw_yr: number | null;
    pileThaw_yr: number | null;
    thawDelay_yr: number | null;
    lowerBound: boolean;
    fluidDrop_K: number | null;
    seconds: number;
  };
  /**
   * How the thaw delays compare: 'two-sided' when both simulator runs thaw within the run; 'lower-bound'
   * when only the no-pile run thaws (the simulated delay is then at least years − noPileThaw_yr);
   * 'none' otherwise (neither thaws, or the cell is excluded).
   */
  thawComparison: 'two-sided' | 'lower-bound' | 'none';
  /** model − simulator, yr ('two-sided' cases only, else null). */
  thawDelayError_yr: number | null;
  /**
   * model − the simulator's lower bound, yr ('lower-bound' cases only, else null). Negative: the model
   * is certainly below the simulated delay (conservative by at least this much); ≥ 0: consistent.
   */
  thawDelayOverLowerBound_yr: number | null;
  /** simulator-implied / model pile count − 1 (null when not comparable). */
  pileCountError: number | null;
}

const PILE_PROBES = [1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5, 8.5, 9.5, 10.5];

/** Monthly heating profile of the standard building (mean 1), January first (coldest mid-January). */
export function monthlyHeatingFactors(cell: CellInputs, s: Scenario): number[] {
  const f = Array.from({ length: 12 }, (_, mth) => {
    const T = cell.meanAirTemp_C - cell.airAmplitude_C * Math.cos((2 * Math.PI * (mth + 0.5 - 0.5)) / 12);
    return Math.max(0, s.building.balanceTemp_C - T);
  });
  const mean = f.reduce((a, b) => a + b, 0) / 12;
  return f.map((x) => (mean > 0 ? x / mean : 1));
}

/** Run one calibration case (model + simulator). */
export function calibrateCell(
  cell: CellInputs,
  s: Scenario = DEFAULT_SCENARIO,
  o: CalibrationOptions = DEFAULT_CALIBRATION_OPTIONS,
): CalibrationCase {
  const k = buildCellConstants(s);
  const m = new Float64Array(METRIC_COUNT);
  evaluateCellMetrics(cell, k, createKernelScratch(), m);
  const carried = m[METRIC.extractionCarried];
  const excluded = m[METRIC.exclusion] !== 0;
  const factors = monthlyHeatingFactors(cell, s);
  // Modelled fluid drop for this monthly load history (see module comment).
  const soil = soilAt(k.soil[cell.textureClass], cell.waterContent_m3m3, createKernelScratch().soil);
  const alpha = soil.kFrozen / soil.cFrozen;
  const lifeS = s.designLife_yr * SECONDS_PER_YEAR;
  const monthS = SECONDS_PER_YEAR / 12;
  const rGa =
    (flsResponse(k.tables.pileMean, alpha, lifeS) - flsResponse(k.tables.pileMean, alpha, monthS)) /
    (2 * Math.PI * soil.kFrozen);
  const rGm = cylinderSourceGBernier((alpha * monthS) / s.pile.radius_m ** 2) / soil.kFrozen;
  const peakFactor = Math.max(...factors);
  const winter = pileWinterAnomaly_K({
    surfaceAmplitude_C: s.ground.nFreeze * cell.airAmplitude_C,
    diffusivity_m2_s: alpha,
    top_m: s.pile.topDepth_m,
    bottom_m: s.pile.topDepth_m + s.pile.length_m,
  });
  const fluidDropModel = winter + carried * rGa + carried * peakFactor * (s.pile.resistance_mK_W + rGm);
  const model = {
    noPileThaw_yr: m[METRIC.thawYear] - s.startYear,
    thawDelay_yr: m[METRIC.thawDelay],
    pilesPerTon: m[METRIC.pilesPerTon],
    fluidDrop_K: fluidDropModel,
    carried_W_m: carried,
  };
  const empty: CalibrationCase = {
    cell,
    excluded,
    model,
    sim: {
      noPileThaw_yr: null,
      pileThaw_yr: null,
      thawDelay_yr: null,
      lowerBound: false,
      fluidDrop_K: null,
      seconds: 0,
    },
    thawComparison: 'none',
    thawDelayError_yr: null,
    thawDelayOverLowerBound_yr: null,
    pileCountError: null,
  };
  if (excluded || !(carried > 0)) return empty;
  const texture = TEXTURE_CODES[cell.textureClass as TextureCode];
  const input: SiteInputDraft = {
    years: o.years,
    timeStep_days: o.timeStep_days,
    outputStep_days: 365 / 12,
    ground: {
      layers: [
        {
          top_m: 0,
          bottom_m: 50,
          soil: {
            texture,
            waterContent_m3m3: Math.min(cell.waterContent_m3m3, k.soil[cell.textureClass].thetaMax),
          },
        },
      ],
      geothermalFlux_W_m2: s.ground.geothermalFlux_W_m2,
      initial: 'equilibrium',
    },
    climate: {
      meanAirTemp_C: cell.meanAirTemp_C,
      amplitude_C: cell.airAmplitude_C,
      warming_C_per_yr: cell.warming_C_per_yr,
      nThaw: s.ground.nThaw,
      nFreeze: s.ground.nFreeze,
    },
    pile: {
      length_m: s.pile.length_m,
      topDepth_m: s.pile.topDepth_m,
      outerDiameter_m: 2 * s.pile.radius_m,
      loop: {
        type: 'coaxial',
        centreOuterDiameter_m: 0.05,
        centreInnerDiameter_m: 0.044,
        centreConductivity_W_mK: 0.4,
        downFlow: 'annulus',
      },
      fluid: { name: 'propyleneGlycol', massFraction: 0.4 },
      resistance: { Rb_mK_W: s.pile.resistance_mK_W, Ra_mK_W: 1 },
    },
    operation: { mode: 'heatRate', extraction_W: carried * s.pile.length_m, monthlyFactors: factors },
    probes: [
      { r_m: s.referenceRadius_m, z_m: s.referenceDepth_m },
      ...PILE_PROBES.map((z) => ({ r_m: 0.5, z_m: z })),
    ],
    numerics: { fidelity: o.fidelity },
  };
  const t0 = performance.now();
  const r = simulateSite(input);
  const seconds = (performance.now() - t0) / 1000;
  // Simulated fluid drop: lowest monthly mean fluid over the design life vs that year's ground.
  const fl = r.fluid;
  let fluidDrop: number | null = null;
  if (fl) {
    let worst = Infinity;
    let worstMonth = -1;
    const months = Math.min(fl.month_yr.length, s.designLife_yr * 12);
    for (let i = 0; i < months; i++) {
      const a = fl.inlet_C[i];
      const b = fl.outlet_C[i];
      if (a === null || b === null) continue;
      const mean = 0.5 * (a + b);
      if (mean < worst) {
        worst = mean;
        worstMonth = i;
      }
    }
    if (worstMonth >= 0) {
      const y0 = Math.floor(worstMonth / 12) * 12;
      const probes = r.noPile.probes.slice(1);
      let sum = 0;
      let n = 0;
      for (const p of probes) {
        for (let i = y0; i < y0 + 12 && i < p.T_C.length; i++) {
          sum += p.T_C[i];
          n++;
        }
      }
      fluidDrop = sum / n - worst;
    }
  }
  const simDelay = r.thawDelay_yr[0];
  const lowerBound = r.thawDelayIsLowerBound[0];
  const noPileThaw = r.noPile.probes[0].thawYear;
  const pileThaw = r.withPile ? r.withPile.probes[0].thawYear : null;
  const modelFinite = Number.isFinite(model.thawDelay_yr);
  const thawComparison: CalibrationCase['thawComparison'] =
    !modelFinite || simDelay === null || noPileThaw === null
      ? 'none'
      : lowerBound
        ? 'lower-bound'
        : pileThaw !== null
          ? 'two-sided'
          : 'none';
  return {
    cell,
    excluded,
    model,
    sim: {
      noPileThaw_yr: noPileThaw,
      pileThaw_yr: pileThaw,
      thawDelay_yr: simDelay,
      lowerBound,
      fluidDrop_K: fluidDrop,
      seconds,
    },
    thawComparison,
    thawDelayError_yr: thawComparison === 'two-sided' ? model.thawDelay_yr - (simDelay as number) : null,
    thawDelayOverLowerBound_yr:
      thawComparison === 'lower-bound' ? model.thawDelay_yr - (simDelay as number) : null,
    pileCountError: fluidDrop !== null && fluidDropModel > 0 ? fluidDrop / fluidDropModel - 1 : null,
  };
}

/**
 * Median, 95th percentile (nearest rank) and maximum of |x|, and the median of the signed x
 * (the bias: > 0 when the model is above the simulator more often than not).
 */
export function errorSummary(xs: number[]): {
  n: number;
  median: number;
  p95: number;
  max: number;
  signedMedian: number;
} {
  const a = xs.map(Math.abs).sort((p, q) => p - q);
  const signed = [...xs].sort((p, q) => p - q);
  const rank = (v: number[], p: number) =>
    v[Math.min(v.length - 1, Math.max(0, Math.ceil(p * v.length) - 1))];
  return {
    n: a.length,
    median: a.length ? rank(a, 0.5) : NaN,
    p95: a.length ? rank(a, 0.95) : NaN,
    max: a.length ? a[a.length - 1] : NaN,
    signedMedian: signed.length ? rank(signed, 0.5) : NaN,
  };
}

/**
 * One-sided thaw-delay figures over the 'lower-bound' cases (the simulator's with-pile run had not thawed
 * by the end of the run), from model − bound: how many model delays fall below the bound (the model
 * is certainly conservative there) and how many at or above it (consistent with the simulator, not
 * checkable further), with the median and largest shortfall below the bound.
 */
export function lowerBoundSummary(overBound_yr: number[]): {
  n: number;
  belowBound: number;
  atOrAboveBound: number;
  medianShortfall_yr: number;
  maxShortfall_yr: number;
} {
  const short = overBound_yr
    .filter((d) => d < 0)
    .map((d) => -d)
    .sort((p, q) => p - q);
  return {
    n: overBound_yr.length,
    belowBound: short.length,
    atOrAboveBound: overBound_yr.length - short.length,
    medianShortfall_yr: short.length ? short[Math.ceil(0.5 * short.length) - 1] : NaN,
    maxShortfall_yr: short.length ? short[short.length - 1] : NaN,
  };
}
