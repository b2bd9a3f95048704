/**
 * Per-scenario constants of the per-cell model, computed once outside the per-cell loop: soil thermal
 * properties per texture tabulated against water content, the response tables, the economics
 * coefficients and break-evens, the normalised soft weights, the heat-pump curve (heatPumpAt of
 * layers/physics/heat-pump.ts every 0.1 K: the curve is piecewise linear, so this is exact at its knots
 * and within 0.1 K of them).
 *
 * Soil table: `soilThermalProperties` (layers/physics/soil-catalogue.ts: Johansen 1975 / Côté & Konrad
 * 2005 conductivity, de Vries 1963 heat capacity, latent heat of the pore water) evaluated at 65 water
 * contents from 1 % to 100 % of the texture's porosity with the catalogue's default densities; a cell
 * interpolates linearly (error < 1 % of k, measured against direct calls, tests/unit/screening-cell-model).
 * Above the porosity the water is excess ice (soil-catalogue.ts: porosity raised to the water content,
 * all of it latent heat and ice conductivity), tabulated at EXCESS_TABLE_POINTS more water contents from
 * the porosity to MAX_WATER_CONTENT_M3M3 (0.99); the excess-ice fraction e = (θ − n)/(1 − n) is exact.
 * Only water contents above 0.99 (massive ice) take the properties at 0.99.
 */
import { MAX_WATER_CONTENT_M3M3, soilThermalProperties } from '../physics/soil-catalogue';
import { heatPumpAt } from '../physics/heat-pump';
import { TEXTURE_CODES, type TextureCode } from './screening-model';
import type { Scenario } from './scenario';
import { buildResponseTables, type ResponseTables } from './response-tables';
import {
  breakEvenCops,
  economicsCoefficients,
  type BreakEvenCops,
  type EconomicsCoefficients,
} from './economics';
import { softWeights } from './suitability';
import { systemConstants, type SystemConstants } from './system-cop';

export const SOIL_TABLE_POINTS = 65;
/** Table points from the porosity to MAX_WATER_CONTENT_M3M3 (excess ice), the porosity included. */
export const EXCESS_TABLE_POINTS = 33;

export interface SoilTable {
  thetaMin: number;
  /** The texture's porosity (end of the pore-water part of the table). */
  thetaMax: number;
  step: number;
  /** Step of the excess-ice part, from thetaMax to MAX_WATER_CONTENT_M3M3. */
  excessStep: number;
  kFrozen: Float64Array;
  kThawed: Float64Array;
  cFrozen: Float64Array;
  cThawed: Float64Array;
  latent: Float64Array;
}

export interface CellConstants {
  scenario: Scenario;
  tables: ResponseTables;
  /** Indexed by texture code (index 0 unused). */
  soil: SoilTable[];
  econ: EconomicsCoefficients;
  breakEven: BreakEvenCops;
  weights: Float64Array;
  pileMidDepth_m: number;
  /** COP of the scenario's heat-pump curve at EFT = COP_EFT_MIN + i·COP_EFT_STEP. */
  cop: Float64Array;
  /** Loop-fluid properties of the system model (system-cop.ts). */
  system: SystemConstants;
}

export const COP_EFT_MIN = -40;
export const COP_EFT_STEP = 0.1;

/** COP at an entering fluid temperature from the precomputed curve (linear between 0.1 K points). */
export function copFromTable(cop: Float64Array, eft_C: number): number {
  const u = (eft_C - COP_EFT_MIN) / COP_EFT_STEP;
  if (!(u > 0)) return cop[0];
  if (u >= cop.length - 1) return cop[cop.length - 1];
  const i = Math.floor(u);
  return cop[i] + (cop[i + 1] - cop[i]) * (u - i);
}

const soilCache = new Map<number, SoilTable>();

function soilTable(code: TextureCode): SoilTable {
  const hit = soilCache.get(code);
  if (hit) return hit;
  const texture = TEXTURE_CODES[code];
  const porosity = soilThermalProperties({ texture, waterContent_m3m3: 0 }).porosity;
  const thetaMin = 0.01 * porosity;
  const step = (porosity - thetaMin) / (SOIL_TABLE_POINTS - 1);
  const excessStep = (MAX_WATER_CONTENT_M3M3 - porosity) / (EXCESS_TABLE_POINTS - 1);
  const n = SOIL_TABLE_POINTS + EXCESS_TABLE_POINTS - 1;
  const t: SoilTable = {
    thetaMin,
    thetaMax: porosity,
    step,
    excessStep,
    kFrozen: new Float64Array(n),
    kThawed: new Float64Array(n),
    cFrozen: new Float64Array(n),
    cThawed: new Float64Array(n),
    latent: new Float64Array(n),
  };
  for (let i = 0; i < n; i++) {
    const theta =
      i < SOIL_TABLE_POINTS
        ? Math.min(porosity, thetaMin + i * step)
        : Math.min(MAX_WATER_CONTENT_M3M3, porosity + (i - SOIL_TABLE_POINTS + 1) * excessStep);
    const p = soilThermalProperties({ texture, waterContent_m3m3: theta });
    t.kFrozen[i] = p.kFrozen_W_mK;
    t.kThawed[i] = p.kThawed_W_mK;
    t.cFrozen[i] = p.cFrozen_J_m3K;
    t.cThawed[i] = p.cThawed_J_m3K;
    t.latent[i] = p.latent_J_m3;
  }
  soilCache.set(code, t);
  return t;
}

/** Soil properties at a water content, written into `out` (allocation-free). */
export interface SoilPoint {
  kFrozen: number;
  kThawed: number;
  cFrozen: number;
  cThawed: number;
  latent: number;
}

export function soilAt(t: SoilTable, waterContent_m3m3: number, out: SoilPoint): SoilPoint {
  let i: number;
  let f: number;
  if (waterContent_m3m3 > t.thetaMax) {
    // Excess ice: the second part of the table.
    const th = waterContent_m3m3 > MAX_WATER_CONTENT_M3M3 ? MAX_WATER_CONTENT_M3M3 : waterContent_m3m3;
    const u = (th - t.thetaMax) / t.excessStep;
    const j = Math.min(EXCESS_TABLE_POINTS - 2, Math.floor(u));
    i = SOIL_TABLE_POINTS - 1 + j;
    f = u - j;
  } else {
    const th = waterContent_m3m3 < t.thetaMin ? t.thetaMin : waterContent_m3m3;
    const u = (th - t.thetaMin) / t.step;
    i = Math.min(SOIL_TABLE_POINTS - 2, Math.floor(u));
    f = u - i;
  }
  out.kFrozen = t.kFrozen[i] + (t.kFrozen[i + 1] - t.kFrozen[i]) * f;
  out.kThawed = t.kThawed[i] + (t.kThawed[i + 1] - t.kThawed[i]) * f;
  out.cFrozen = t.cFrozen[i] + (t.cFrozen[i + 1] - t.cFrozen[i]) * f;
  out.cThawed = t.cThawed[i] + (t.cThawed[i + 1] - t.cThawed[i]) * f;
  out.latent = t.latent[i] + (t.latent[i + 1] - t.latent[i]) * f;
  return out;
}

export function buildCellConstants(scenario: Scenario): CellConstants {
  const soil: SoilTable[] = [];
  for (const code of Object.keys(TEXTURE_CODES)) {
    const c = Number(code) as TextureCode;
    soil[c] = soilTable(c);
  }
  return {
    scenario,
    tables: buildResponseTables(scenario),
    soil,
    econ: economicsCoefficients(scenario.economics),
    breakEven: breakEvenCops(scenario.economics),
    weights: softWeights(scenario),
    pileMidDepth_m: scenario.pile.topDepth_m + scenario.pile.length_m / 2,
    cop: Float64Array.from(
      { length: 801 },
      (_, i) =>
        heatPumpAt({ enteringFluid_C: COP_EFT_MIN + i * COP_EFT_STEP, curve: scenario.heatPump.curve }).cop,
    ),
    system: systemConstants(scenario),
  };
}
