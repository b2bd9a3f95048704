/**
 * Calibration of the per-cell screening model against the transient site simulator (layers/site).
 *
 * For each sampled cell the model's metrics are computed, then `simulateSite` runs the same ground,
 * climate and standard pile (coaxial steel pile, the scenario's R_b), the pile extracting the
 * model's carried annual-average load with a monthly heating profile (monthly factors ∝ heating
 * degree-hours of the month's mean air temperature, mean 1), probes at the reference point and along
 * the pile. Compared:
 *  - thaw delay at the reference point: model thawDelay vs the simulator's thawDelay_yr, where the
 *    simulator thaws within the run in both cases (not a lower bound);
 *  - pile count: piles scale with the fluid temperature drop per unit load (linearity), so the ratio
 *    (simulated drop)/(modelled drop) for the same monthly load history is the ratio of the pile count
 *    the simulator implies to the model's. The modelled drop is the three-pulse ground part without
 *    the 6-hour pulse the monthly simulator cannot resolve, plus the winter anomaly of the ground:
 *    ΔT_w + q'_a·R_ga + q'_peak-month·(R_b + R_gm).
 *    The simulated drop is the no-pile mean ground temperature along the pile (that year) minus the
 *    lowest monthly mean fluid temperature over the design life.
 */
import { simulateSite } from '../layers/site/simulate-site';
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

/** Small seeded generator (mulberry32). */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A Latin-hypercube-like seeded sample of `n` cells over the demo ranges. */
export function sampleCalibrationCells(n: number, seed: number): CellInputs[] {
  const r = rng(seed);
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

export const DEFAULT_CALIBRATION_OPTIONS: CalibrationOptions = {
  years: 80,
  timeStep_days: 28,
  fidelity: 'coarse',
};

export interface CalibrationCase {
  cell: CellInputs;
  excluded: boolean;
  model: { thawDelay_yr: number; pilesPerTon: number; fluidDrop_K: number; carried_W_m: number };
  sim: { thawDelay_yr: number | null; lowerBound: boolean; fluidDrop_K: number | null; seconds: number };
  /** model − simulator, yr (null when not comparable). */
  thawDelayError_yr: number | null;
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
    thawDelay_yr: m[METRIC.thawDelay],
    pilesPerTon: m[METRIC.pilesPerTon],
    fluidDrop_K: fluidDropModel,
    carried_W_m: carried,
  };
  const empty: CalibrationCase = {
    cell,
    excluded,
    model,
    sim: { thawDelay_yr: null, lowerBound: false, fluidDrop_K: null, seconds: 0 },
    thawDelayError_yr: null,
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
  const comparableThaw =
    simDelay !== null &&
    !lowerBound &&
    Number.isFinite(model.thawDelay_yr) &&
    r.noPile.probes[0].thawYear !== null;
  return {
    cell,
    excluded,
    model,
    sim: { thawDelay_yr: simDelay, lowerBound, fluidDrop_K: fluidDrop, seconds },
    thawDelayError_yr: comparableThaw ? model.thawDelay_yr - (simDelay as number) : null,
    pileCountError: fluidDrop !== null && fluidDropModel > 0 ? fluidDrop / fluidDropModel - 1 : null,
  };
}

/** Median and 95th percentile of |x| (nearest-rank). */
export function errorSummary(xs: number[]): { n: number; median: number; p95: number; max: number } {
  const a = xs.map(Math.abs).sort((p, q) => p - q);
  const rank = (p: number) => a[Math.min(a.length - 1, Math.max(0, Math.ceil(p * a.length) - 1))];
  return {
    n: a.length,
    median: a.length ? rank(0.5) : NaN,
    p95: a.length ? rank(0.95) : NaN,
    max: a.length ? a[a.length - 1] : NaN,
  };
}
