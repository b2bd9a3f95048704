/**
 * The interface between the pipeline and the per-cell screening physics.
 *
 * The pipeline reads and resamples the input grids onto the analysis grid, fills one `CellInputs` per
 * land cell and calls `model.evaluate(cell, out)`, which writes one value per output layer into `out`
 * (same order as `model.layers`; NaN = nodata). The model is pure and allocation-free on the hot path
 * so millions of cells run fast. The layer definitions become the manifest's bands.
 */
export interface CellInputs {
  /** Mean annual air temperature, °C. */
  meanAirTemp_C: number;
  /** Annual air temperature amplitude (half the warmest-minus-coldest monthly range), K. */
  airAmplitude_C: number;
  /** Linear warming trend of the air, K per year. */
  warming_C_per_yr: number;
  /** Soil texture class code (see TEXTURE_CODES in layers/physics/texture-codes.ts). */
  textureClass: number;
  /** Volumetric total water + ice content, m³/m³. */
  waterContent_m3m3: number;
  /** Depth to bedrock, m. */
  bedrockDepth_m: number;
  /** Optional measured/modelled mean annual ground temperature, °C (NaN when no grid). */
  groundTemp_C: number;
  /** Optional geothermal heat flux, W/m² (NaN when no grid: the model's default applies). */
  geothermalFlux_W_m2: number;
  /** Optional freezing-season n-factor from snow (NaN when no grid: scenario default applies). */
  nFreeze: number;
  /** Latitude of the cell centre, degrees (for reporting; no physics depends on it). */
  latitude_deg: number;
}

/** A cell with every input missing (NaN): the reusable record a hot loop fills field by field. */
export function emptyCellInputs(): CellInputs {
  return {
    meanAirTemp_C: NaN,
    airAmplitude_C: NaN,
    warming_C_per_yr: NaN,
    textureClass: NaN,
    waterContent_m3m3: NaN,
    bedrockDepth_m: NaN,
    groundTemp_C: NaN,
    geothermalFlux_W_m2: NaN,
    nFreeze: NaN,
    latitude_deg: NaN,
  };
}

/** Texture class codes (layers/physics/texture-codes.ts). */
export { TEXTURE_CODES, type TextureCode, type TextureName } from '../physics/texture-codes';

export interface ScreeningLayer {
  id: string;
  title: string;
  unit: string;
  kind: 'continuous' | 'class';
  ramp?: string;
  legendMin?: number;
  legendMax?: number;
  classes?: { value: number; label: string; description?: string }[];
  description: string;
  source: string;
  /** Climate-horizon qualifier of a thaw year or duration (manifest.ts bandSchema.horizon). */
  horizon?: HorizonQualifier;
}

export interface HorizonQualifier {
  year: number;
  flagBand: string;
  after: number[];
  atLeast: number[];
  undetermined: number[];
}

export interface ScreeningModel {
  layers: ScreeningLayer[];
  /**
   * `cellIndex`, the cell's index on the analysis grid (row-major), lets a model seed per-cell random
   * streams (cell-ensemble-model.ts) independently of how the grid is split into windows or workers.
   * `cellSd`, indexed as SPREAD_ROLES (uncertainty-schema.ts), carries the cell's spreads from
   * companion grids (standard deviations; the texture class's confusion probability; NaN where none);
   * models without an ensemble ignore it.
   */
  evaluate(cell: CellInputs, out: Float32Array, cellIndex?: number, cellSd?: Float64Array): void;
}
