/**
 * Turns a validated `SiteInput` into the solver's ingredients: layer materials (soil descriptions
 * resolved by the soil catalogue), the graded meshes, the surface forcing, the initial state and the
 * pile loop with its operating controller.
 *
 * Equilibrium initial state: the steady profile below the temperature at the top of permafrost,
 * T(z) = TTOP + ∫ q/k dz (Smith & Riseborough 2002 TTOP with the first layer's conductivity ratio,
 * geothermal gradient q/k with the frozen or thawed k of each layer), then a spin-up of the ground
 * column under the starting climate (no trend) for `SPIN_UP_YEARS`, so the active layer and the upper
 * tens of metres carry the periodic state. The deepest part keeps the steady gradient.
 */
import { soilThermalProperties } from '../physics/soil-catalogue';
import {
  degreeDays,
  surfaceTemperature_C,
  SECONDS_PER_DAY,
  type WarmingTrend,
} from '../physics/surface-forcing';
import { ttop_C } from '../physics/ttop';
import { createConductionSolver } from './conduction-solver';
import { liquidFractionAt, materialTable, type GroundMaterial, type MaterialTable } from './ground-enthalpy';
import type { SiteInput } from './site-input-schema';
import { SITE_DEFAULTS } from './site-input-schema';
import { buildSiteMesh, meshFromFaces, type SiteMesh } from './site-mesh';

export const SPIN_UP_YEARS = 30;

/**
 * Mesh presets by fidelity (model choices; `numerics` fields override). `surfaceStep_m` caps the cell
 * height down to `surfaceZone_m`: the active layer and its deepening over a design life. Refining there
 * moved the winter minimum at 0.35 m in the demo peat by 0.4 K between 0.1 m and 0.025 m cells (the
 * freeze-back of ice-rich ground through a coarse cell is slow), far more than anything deeper.
 */
export const MESH_PRESETS = {
  coarse: {
    firstRadialStep_m: 0.05,
    radialGrowth: 1.5,
    firstVerticalStep_m: 0.2,
    verticalGrowth: 1.4,
    pileStep_m: 1,
    farStep_m: 10,
    surfaceStep_m: 0.1,
    surfaceZone_m: 3,
  },
  standard: {
    firstRadialStep_m: 0.03,
    radialGrowth: 1.4,
    firstVerticalStep_m: 0.1,
    verticalGrowth: 1.3,
    pileStep_m: 0.5,
    farStep_m: 5,
    surfaceStep_m: 0.05,
    surfaceZone_m: 3,
  },
  fine: {
    firstRadialStep_m: 0.01,
    radialGrowth: 1.15,
    firstVerticalStep_m: 0.05,
    verticalGrowth: 1.12,
    pileStep_m: 0.25,
    farStep_m: 2.5,
    surfaceStep_m: 0.025,
    surfaceZone_m: 4,
  },
} as const;

export interface SiteGround {
  layers: GroundMaterial[];
  /** Bottom of each layer, m (the last one extended to the domain depth). */
  bottoms_m: number[];
  table: MaterialTable;
}

type SiteLayer = SiteInput['ground']['layers'][number];

/**
 * The one soil resolver of the site study: a ground layer's frozen/thawed properties, from its explicit
 * values or from the soil catalogue (Johansen conductivity, de Vries heat capacity, soil-catalogue.ts).
 * Throws a RangeError naming `ground.layers.<index>.soil` when the catalogue rejects the soil.
 */
export function resolveLayer(layer: SiteLayer, index: number): GroundMaterial {
  const w = layer.freezingInterval_K ?? SITE_DEFAULTS.freezingInterval_K.value;
  if (layer.soil) {
    let p;
    try {
      p = soilThermalProperties({
        texture: layer.soil.texture,
        waterContent_m3m3: layer.soil.waterContent_m3m3,
        dryDensity_kg_m3: layer.soil.dryDensity_kg_m3,
        quartzFraction: layer.soil.quartzFraction,
        specificSurface_m2_g: layer.soil.specificSurface_m2_g,
      });
    } catch (e) {
      throw new RangeError(`ground.layers.${index}.soil: ${(e as Error).message}`);
    }
    return {
      kFrozen_W_mK: p.kFrozen_W_mK,
      kThawed_W_mK: p.kThawed_W_mK,
      cFrozen_J_m3K: p.cFrozen_J_m3K,
      cThawed_J_m3K: p.cThawed_J_m3K,
      latent_J_m3: p.latent_J_m3,
      freezingPoint_C: p.freezingPoint_C,
      freezingInterval_K: w,
    };
  }
  return {
    kFrozen_W_mK: layer.kFrozen_W_mK!,
    kThawed_W_mK: layer.kThawed_W_mK!,
    cFrozen_J_m3K: layer.cFrozen_J_m3K!,
    cThawed_J_m3K: layer.cThawed_J_m3K!,
    latent_J_m3: layer.latent_J_m3!,
    freezingPoint_C: layer.freezingPoint_C!,
    freezingInterval_K: w,
  };
}

/** Resolves each layer to frozen/thawed properties (resolveLayer). */
export function resolveGround(input: SiteInput): SiteGround {
  const layers = input.ground.layers.map(resolveLayer);
  const bottoms = input.ground.layers.map((l) => l.bottom_m);
  bottoms[bottoms.length - 1] = Math.max(bottoms[bottoms.length - 1], input.domain.depth_m);
  return { layers, bottoms_m: bottoms, table: materialTable(layers) };
}

/**
 * Conductivity, heat capacity and freezing point of the layer holding depth `z_m` (the last layer below
 * the deepest bottom), frozen or thawed, by resolveLayer; null when the layer cannot be resolved.
 */
export function groundPropertiesAt(
  input: SiteInput,
  z_m: number,
  frozen: boolean,
): { conductivity_W_mK: number; heatCapacity_J_m3K: number; freezingPoint_C: number } | null {
  const layers = input.ground.layers;
  let i = layers.findIndex((l) => l.top_m <= z_m && z_m < l.bottom_m);
  if (i < 0) i = layers.length - 1;
  let m: GroundMaterial;
  try {
    m = resolveLayer(layers[i], i);
  } catch {
    return null;
  }
  const k = frozen ? m.kFrozen_W_mK : m.kThawed_W_mK;
  const c = frozen ? m.cFrozen_J_m3K : m.cThawed_J_m3K;
  return Number.isFinite(k) && Number.isFinite(c)
    ? {
        conductivity_W_mK: k,
        heatCapacity_J_m3K: c,
        freezingPoint_C: Number.isFinite(m.freezingPoint_C) ? m.freezingPoint_C : 0,
      }
    : null;
}

/** Material index of each mesh row (by its centre depth). */
export function rowMaterials(mesh: SiteMesh, bottoms_m: number[]): Int32Array {
  const out = new Int32Array(mesh.nz);
  for (let j = 0; j < mesh.nz; j++) {
    let m = 0;
    while (m < bottoms_m.length - 1 && mesh.zCentres_m[j] > bottoms_m[m]) m++;
    out[j] = m;
  }
  return out;
}

export interface SiteMeshes {
  /** The (r, z) mesh around the pile. */
  pile: SiteMesh;
  /** One column with the same rows (the no-pile case is one-dimensional). */
  column: SiteMesh;
}

export function buildMeshes(input: SiteInput, ground: SiteGround): SiteMeshes {
  const preset = MESH_PRESETS[input.numerics.fidelity];
  const pileLength = input.pile ? input.pile.topDepth_m + input.pile.length_m : 0;
  const rIn = input.pile ? input.pile.outerDiameter_m / 2 : 0.1;
  const mandatory = [...ground.bottoms_m.slice(0, -1)];
  if (input.pile) mandatory.push(pileLength, input.pile.topDepth_m);
  const active = input.pile ? input.pile.length_m : 1;
  const pileStep = input.numerics.pileStep_m ?? Math.min(preset.pileStep_m, Math.max(0.05, active / 8));
  const pile = buildSiteMesh({
    innerRadius_m: rIn,
    outerRadius_m: input.domain.radius_m,
    depth_m: input.domain.depth_m,
    firstRadialStep_m: input.numerics.firstRadialStep_m ?? preset.firstRadialStep_m,
    radialGrowth: preset.radialGrowth,
    firstVerticalStep_m: Math.min(preset.firstVerticalStep_m, pileStep, preset.surfaceStep_m),
    verticalGrowth: preset.verticalGrowth,
    pileStep_m: pileStep,
    fineDepth_m: pileLength,
    farStep_m: preset.farStep_m,
    mandatoryDepths_m: mandatory,
    surfaceStep_m: preset.surfaceStep_m,
    surfaceZone_m: preset.surfaceZone_m,
  });
  const column = meshFromFaces([rIn, input.domain.radius_m], pile.zFaces_m);
  return { pile, column };
}

/**
 * The air-warming trend of a site's climate: its warming pathway when given (piecewise, offsets since
 * the start), else the linear trend warming_C_per_yr.
 */
export function climateTrend(c: SiteInput['climate']): WarmingTrend {
  return c.warmingPathway
    ? {
        kind: 'piecewise',
        points: c.warmingPathway.map((p) => ({ year: p.time_yr, offset_C: p.airWarming_K })),
      }
    : { kind: 'linear', rate_C_per_yr: c.warming_C_per_yr };
}

/**
 * Surface temperature function of the input's climate (with its warming trend), °C. The surface-warming
 * transfer shared with the per-cell model (surface-forcing.ts): the trend is added to the air, then the
 * n-factors act (nFactorTransfer_C), so the surface mean warms by surfaceMeanWarming_K, about
 * n_t·f_t + n_f·(1 − f_t) per K of air warming, not by the air trend itself.
 */
export function surfaceForcing(input: SiteInput, withTrend: boolean): (time_s: number) => number {
  const c = input.climate;
  const trend = withTrend ? climateTrend(c) : undefined;
  return (time_s: number) =>
    surfaceTemperature_C({
      meanAirTemp_C: c.meanAirTemp_C,
      amplitude_C: c.amplitude_C,
      nFreeze: c.nFreeze,
      nThaw: c.nThaw,
      time_s,
      trend,
      coldestDay: c.coldestDay,
    });
}

export interface InitialState {
  /** Temperature per row, °C. */
  rowT_C: Float64Array;
  /** Liquid fraction > 1/2 in the last spin-up year per row: times (s, negative) of the last thaw. */
  lastThawed_s: Float64Array;
  /**
   * For the physical-bounds check (site-bounds.ts): the range of the starting profile (uniform, or the
   * TTOP profile before the spin-up), and the ranges the field and the surface took during the spin-up
   * (equal to the profile's range and empty (±Infinity) without a spin-up), °C.
   */
  startRange_C: [number, number];
  spinUpFieldRange_C: [number, number];
  spinUpSurfaceRange_C: [number, number];
}

/** Min and max of a field, °C (NaN if any value is not finite). */
function rangeOf(T: ArrayLike<number>, into: [number, number]): void {
  for (let j = 0; j < T.length; j++) {
    const v = T[j];
    if (!Number.isFinite(v)) {
      into[0] = NaN;
      into[1] = NaN;
    }
    if (v < into[0]) into[0] = v;
    if (v > into[1]) into[1] = v;
  }
}

/** The initial temperature per row (see the module comment). */
export function initialState(
  input: SiteInput,
  ground: SiteGround,
  column: SiteMesh,
  rowMaterial: Int32Array,
): InitialState {
  const nz = column.nz;
  const lastThawed = new Float64Array(nz).fill(-Infinity);
  const init = input.ground.initial;
  if (init !== 'equilibrium') {
    const T = new Float64Array(nz).fill(init.uniform_C);
    for (let j = 0; j < nz; j++) {
      if (liquidFractionAt(ground.table, rowMaterial[j], T[j]) > 0.5) lastThawed[j] = 0;
    }
    const u = init.uniform_C;
    return {
      rowT_C: T,
      lastThawed_s: lastThawed,
      startRange_C: [u, u],
      spinUpFieldRange_C: [u, u],
      spinUpSurfaceRange_C: [Infinity, -Infinity],
    };
  }
  const T = ttopProfile(input, ground, column, rowMaterial);
  const startRange: [number, number] = [Infinity, -Infinity];
  rangeOf(T, startRange);
  const spun = spinUp(input, ground, column, rowMaterial, T, lastThawed);
  return {
    rowT_C: spun.T,
    lastThawed_s: lastThawed,
    startRange_C: startRange,
    spinUpFieldRange_C: [
      Math.min(startRange[0], spun.fieldRange[0]),
      Math.max(startRange[1], spun.fieldRange[1]),
    ],
    spinUpSurfaceRange_C: spun.surfaceRange,
  };
}

/** TTOP at the top of the column (Smith & Riseborough 2002) plus the geothermal gradient below, °C per row. */
function ttopProfile(
  input: SiteInput,
  ground: SiteGround,
  column: SiteMesh,
  rowMaterial: Int32Array,
): Float64Array {
  const c = input.climate;
  const dd = degreeDays({ meanAirTemp_C: c.meanAirTemp_C, amplitude_C: c.amplitude_C });
  const top = ground.layers[0];
  const ttop = ttop_C({
    ...dd,
    nFreeze: c.nFreeze,
    nThaw: c.nThaw,
    kThawed_W_mK: top.kThawed_W_mK,
    kFrozen_W_mK: top.kFrozen_W_mK,
  });
  const q = input.ground.geothermalFlux_W_m2;
  const T = new Float64Array(column.nz);
  let temp = ttop;
  let zPrev = 0;
  for (let j = 0; j < column.nz; j++) {
    const m = ground.layers[rowMaterial[j]];
    const k = temp < m.freezingPoint_C ? m.kFrozen_W_mK : m.kThawed_W_mK;
    temp += (q * (column.zCentres_m[j] - zPrev)) / k;
    zPrev = column.zCentres_m[j];
    T[j] = temp;
  }
  return T;
}

/**
 * SPIN_UP_YEARS of the column under the untrended surface from `T0`: the spun-up rows, the range the
 * field and the surface took, and (in `lastThawed`) the last time each row was mostly thawed, s (≤ 0).
 */
function spinUp(
  input: SiteInput,
  ground: SiteGround,
  column: SiteMesh,
  rowMaterial: Int32Array,
  T0: Float64Array,
  lastThawed: Float64Array,
) {
  const fieldRange: [number, number] = [Infinity, -Infinity];
  const surfaceRange: [number, number] = [Infinity, -Infinity];
  const spinSurface = surfaceForcing(input, false);
  const solver = createConductionSolver({
    mesh: column,
    materials: ground.table,
    rowMaterial,
    surfaceTemperature_C: spinSurface,
    bottomFlux_W_m2: input.ground.geothermalFlux_W_m2,
    initialT_C: T0,
    inner: null,
  });
  const dt = Math.min(input.timeStep_days, 15) * SECONDS_PER_DAY;
  const total = SPIN_UP_YEARS * 365 * SECONDS_PER_DAY;
  const steps = Math.ceil(total / dt);
  const dtExact = total / steps;
  for (let s = 1; s <= steps; s++) {
    solver.step(dtExact);
    rangeOf(solver.T, fieldRange);
    const Ts = spinSurface(s * dtExact);
    surfaceRange[0] = Math.min(surfaceRange[0], Ts);
    surfaceRange[1] = Math.max(surfaceRange[1], Ts);
    const t = s * dtExact - total;
    for (let j = 0; j < column.nz; j++) {
      if (liquidFractionAt(ground.table, rowMaterial[j], solver.T[j]) > 0.5) lastThawed[j] = t;
    }
  }
  return { T: Float64Array.from(solver.T), fieldRange, surfaceRange };
}
