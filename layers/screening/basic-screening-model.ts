/**
 * The basic per-cell screening model: mean annual ground temperature by TTOP and active-layer
 * thickness by Stefan, from the cell's climate and soil. It is the pipeline's fallback model (and the
 * one its tests use); the full screening model replaces it when a scenario is given.
 *
 * Method, per cell:
 *  1. Air freezing and thawing indices I_f, I_t of a sinusoidal year (degreeDays, surface-forcing.ts).
 *  2. Soil k_frozen, k_thawed and volumetric latent heat L from texture and water content
 *     (soilThermalProperties: Johansen 1975 / Côté & Konrad 2005, de Vries 1963). Ice-rich soil whose
 *     water content exceeds the catalogue porosity is taken as saturated with a lower dry density,
 *     ρd = ρs·(1 − θ) (excess ice treated as pore ice: an approximation that keeps L = ρw·Lf·θ exact).
 *  3. MAGT = TTOP (Smith & Riseborough 1996, 2002) with n-factors (cell's snow n_f if given, else the
 *     option default), or the cell's ground-temperature grid value when one exists.
 *  4. Active layer (thaw) depth X = √(2·k_t·n_t·I_t·86400 / L) (Stefan equation; stefan.ts), which
 *     over-predicts by a few per cent for Ste ≤ 0.1; reported where TTOP ≤ 0 (permafrost), else the
 *     same formula is the seasonal thaw depth in unfrozen ground and the cell is classed "no permafrost".
 *  5. Permafrost class from MAGT: cold ≤ −2 °C < warm ≤ 0 °C < none ("warm" threshold −2 °C, common
 *     practice, see domain notes; configurable).
 * Soil properties are cached per texture and water content rounded to 0.001 m³/m³ (the resulting
 * conductivity change is far below the input uncertainty). Cells whose inputs fall outside the
 * physics' domain get NaN in every layer (nodata), never a thrown error mid-run.
 */
import { soilThermalProperties, TEXTURE_CATALOGUE } from '../physics/soil-catalogue';
import { stefanDepth_m } from '../physics/stefan';
import { degreeDays } from '../physics/surface-forcing';
import { ttop_C } from '../physics/ttop';
import {
  TEXTURE_CODES,
  type CellInputs,
  type ScreeningLayer,
  type ScreeningModel,
  type TextureCode,
} from './screening-model';
import { BASIC_BAND_IDS } from './band-ids';
import { BAND_REGISTRY } from './band-registry';

export interface BasicScreeningOptions {
  /** Freezing-season n-factor where no snow grid exists; default 0.5 (tundra/organic cover, reference notes §11). */
  nFreeze?: number;
  /** Thawing-season n-factor; default 1.0 (same source). */
  nThaw?: number;
  /** Upper MAGT of "cold" permafrost, °C; default −2 (common practice). */
  warmPermafrostBelow_C?: number;
}

/** The three layers of the basic model, from the band registry (band-registry.ts). */
export const BASIC_MODEL_LAYERS: ScreeningLayer[] = BASIC_BAND_IDS.map((id) => {
  const { unitNA: _na, description = '', source = '', ...entry } = BAND_REGISTRY[id];
  return { id, ...entry, description, source };
});

interface SoilCacheEntry {
  kFrozen: number;
  kThawed: number;
  latent: number;
}

function soilFor(texture: TextureCode, water: number): SoilCacheEntry {
  const name = TEXTURE_CODES[texture];
  const d = TEXTURE_CATALOGUE[name];
  const saturatedDensity = d.solidsDensity_kg_m3 * (1 - water) - 1;
  const props = soilThermalProperties({
    texture: name,
    waterContent_m3m3: water,
    dryDensity_kg_m3: Math.min(d.dryDensity_kg_m3, saturatedDensity),
  });
  return { kFrozen: props.kFrozen_W_mK, kThawed: props.kThawed_W_mK, latent: props.latent_J_m3 };
}

/** Create the basic model; options are validated (RangeError names the option). */
export function createBasicScreeningModel(options: BasicScreeningOptions = {}): ScreeningModel {
  const nFreezeDefault = options.nFreeze ?? 0.5;
  const nThaw = options.nThaw ?? 1.0;
  const warmBelow = options.warmPermafrostBelow_C ?? -2;
  if (!(nFreezeDefault > 0 && nFreezeDefault <= 3))
    throw new RangeError(`nFreeze must be in (0, 3], got ${nFreezeDefault}`);
  if (!(nThaw > 0 && nThaw <= 3)) throw new RangeError(`nThaw must be in (0, 3], got ${nThaw}`);
  if (!(warmBelow >= -20 && warmBelow <= 0)) {
    throw new RangeError(`warmPermafrostBelow_C must be in [-20, 0] °C, got ${warmBelow}`);
  }
  const cache = new Map<number, SoilCacheEntry>();

  const evaluate = (cell: CellInputs, out: Float32Array): void => {
    out[0] = NaN;
    out[1] = NaN;
    out[2] = NaN;
    const texture = cell.textureClass as TextureCode;
    if (!(texture in TEXTURE_CODES)) return;
    const waterKey = Math.round(cell.waterContent_m3m3 * 1000);
    const key = texture * 10_000 + waterKey;
    let soil = cache.get(key);
    try {
      if (!soil) {
        soil = soilFor(texture, waterKey / 1000);
        cache.set(key, soil);
      }
      const nFreeze = Number.isFinite(cell.nFreeze) ? cell.nFreeze : nFreezeDefault;
      const air = degreeDays({ meanAirTemp_C: cell.meanAirTemp_C, amplitude_C: cell.airAmplitude_C });
      const magt = Number.isFinite(cell.groundTemp_C)
        ? cell.groundTemp_C
        : ttop_C({ ...air, nFreeze, nThaw, kThawed_W_mK: soil.kThawed, kFrozen_W_mK: soil.kFrozen });
      out[0] = magt;
      out[1] =
        soil.latent > 0
          ? stefanDepth_m({
              conductivity_W_mK: soil.kThawed,
              index_Cd: nThaw * air.thawingIndex_Cd,
              latent_J_m3: soil.latent,
            })
          : NaN;
      out[2] = magt > 0 ? 0 : magt > warmBelow ? 1 : 2;
    } catch {
      out[0] = NaN;
      out[1] = NaN;
      out[2] = NaN;
    }
  };

  return { layers: BASIC_MODEL_LAYERS, evaluate };
}
