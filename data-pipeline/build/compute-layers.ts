/**
 * Screens every analysis cell: resamples the inputs window by window (rows), fills CellInputs and
 * calls the ScreeningModel. Output bands: the model's layers, then a few input layers echoed for the
 * map (texture, bedrock depth, water content, air temperature), then `inputFlags`, a bit mask saying
 * which optional inputs fell back to a model or default in that cell.
 */
import type { CellInputs, ScreeningLayer, ScreeningModel } from '../../layers/screening/screening-model';
import { TEXTURE_CODES } from '../../layers/screening/screening-model';
import { GRID_ROLES, type GridRoleId } from '../inputs-config';
import type { AnalysisGrid } from './analysis-grid';
import type { LoadedInput } from './load-inputs';
import { cellCentresIn, resampleAt } from './resample-to-grid';

/** Flag bits of the inputFlags band: which optional input was absent in the cell. */
export const INPUT_FLAG_BITS = { groundTemp_C: 1, geothermalFlux_W_m2: 2, nFreeze: 4 } as const;

const ECHO_LAYERS: { role: GridRoleId; layer: ScreeningLayer }[] = [
  {
    role: 'textureClass',
    layer: {
      id: 'textureClass',
      title: 'Soil texture class',
      unit: '',
      kind: 'class',
      classes: Object.entries(TEXTURE_CODES).map(([value, label]) => ({ value: Number(value), label })),
      description: 'Dominant soil texture of the cell (input grid, nearest neighbour).',
      source: 'input grid',
    },
  },
  {
    role: 'bedrockDepth_m',
    layer: {
      id: 'bedrockDepth_m',
      title: 'Depth to bedrock',
      unit: 'm',
      kind: 'continuous',
      ramp: 'cividis',
      legendMin: 0,
      legendMax: 40,
      description: 'Depth to bedrock (input grid, bilinear).',
      source: 'input grid',
    },
  },
  {
    role: 'waterContent_m3m3',
    layer: {
      id: 'waterContent_m3m3',
      title: 'Volumetric water + ice content',
      unit: 'm³/m³',
      kind: 'continuous',
      ramp: 'viridis',
      legendMin: 0,
      legendMax: 1,
      description: 'Total volumetric water and ice content (input grid, bilinear).',
      source: 'input grid',
    },
  },
  {
    role: 'meanAirTemp_C',
    layer: {
      id: 'meanAirTemp_C',
      title: 'Mean annual air temperature',
      unit: '°C',
      kind: 'continuous',
      ramp: 'blueOrange',
      legendMin: -14,
      legendMax: 2,
      description: 'Mean annual air temperature (input grid, bilinear).',
      source: 'input grid',
    },
  },
];

function flagsLayer(): ScreeningLayer {
  const names = Object.keys(INPUT_FLAG_BITS) as (keyof typeof INPUT_FLAG_BITS)[];
  const classes = [];
  for (let v = 0; v < 8; v++) {
    const missing = names.filter((n) => v & INPUT_FLAG_BITS[n]);
    classes.push({
      value: v,
      label: missing.length === 0 ? 'all optional grids given' : `default for ${missing.join(', ')}`,
      description:
        missing.length === 0
          ? 'Every optional input came from a grid.'
          : missing.map((n) => `${n}: ${GRID_ROLES[n].fallback}`).join('; '),
    });
  }
  return {
    id: 'inputFlags',
    title: 'Input fallbacks',
    unit: '',
    kind: 'class',
    classes,
    description: 'Which optional inputs were absent in the cell and fell back to a model or default.',
    source: 'pipeline',
  };
}

export interface ComputeResult {
  layers: ScreeningLayer[];
  bands: Float32Array[];
  /** [west, south, east, north] degrees of the screened cells. */
  bounds: [number, number, number, number];
  cellsTotal: number;
  cellsScreened: number;
  /** Land cells (texture known) lacking another required input (e.g. coast mismatch between grids). */
  cellsMissingInput: number;
  /** Screened cells where the model returned nodata (inputs outside the physics' domain). */
  cellsModelNodata: number;
}

export interface ComputeOptions {
  grid: AnalysisGrid;
  inputs: LoadedInput[];
  model: ScreeningModel;
  windowRows?: number;
  onProgress?: (done: number, total: number) => void;
}

/** Screen every cell of the analysis grid. */
export function computeLayers(options: ComputeOptions): ComputeResult {
  const { grid, inputs, model, windowRows = 64, onProgress } = options;
  const echo = ECHO_LAYERS.filter(
    (e) => inputs.some((i) => i.entry.role === e.role) && !model.layers.some((l) => l.id === e.layer.id),
  );
  const layers = [...model.layers, ...echo.map((e) => e.layer), flagsLayer()];
  const n = grid.width * grid.height;
  const bands = layers.map(() => new Float32Array(n).fill(NaN));
  const nModel = model.layers.length;
  const out = new Float32Array(nModel);
  const byRole = new Map(inputs.map((i) => [i.entry.role, i]));
  const roles = Object.keys(GRID_ROLES) as GridRoleId[];
  const required = roles.filter((r) => GRID_ROLES[r].required);
  const bounds: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
  let cellsScreened = 0;
  let cellsMissingInput = 0;
  let cellsModelNodata = 0;
  const cell: CellInputs = {
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

  for (let row0 = 0; row0 < grid.height; row0 += windowRows) {
    const row1 = Math.min(grid.height, row0 + windowRows);
    const coordsByCrs = new Map<string, Float64Array>();
    const coordsFor = (crs: string) => {
      let c = coordsByCrs.get(crs);
      if (!c) {
        c = cellCentresIn(grid, row0, row1, crs);
        coordsByCrs.set(crs, c);
      }
      return c;
    };
    const lonLat = coordsFor('EPSG:4326');
    const sampled = new Map<GridRoleId, Float32Array>();
    for (const [role, input] of byRole) {
      const method = input.role.kind === 'class' ? 'nearest' : 'bilinear';
      sampled.set(role, resampleAt(input.source.grid, coordsFor(input.source.grid.crs), method));
    }
    const count = (row1 - row0) * grid.width;
    for (let k = 0; k < count; k++) {
      let missing = 0;
      for (const r of required) {
        const v = (sampled.get(r) as Float32Array)[k];
        if (v !== v) missing++;
      }
      if (missing > 0) {
        // Land (texture known) without some other required input: a gap between the grids.
        const texture = sampled.get('textureClass')?.[k] ?? NaN;
        if (texture === texture) cellsMissingInput++;
        continue;
      }
      let flags = 0;
      for (const r of roles) {
        const v = sampled.get(r)?.[k] ?? NaN;
        (cell as unknown as Record<string, number>)[r] = v;
        if (!GRID_ROLES[r].required && v !== v) flags |= INPUT_FLAG_BITS[r as keyof typeof INPUT_FLAG_BITS];
      }
      const lon = lonLat[2 * k];
      const lat = lonLat[2 * k + 1];
      cell.latitude_deg = lat;
      model.evaluate(cell, out);
      const index = row0 * grid.width + k;
      let anyFinite = false;
      for (let b = 0; b < nModel; b++) {
        bands[b][index] = out[b];
        if (out[b] === out[b]) anyFinite = true;
      }
      if (!anyFinite) cellsModelNodata++;
      echo.forEach((e, j) => {
        bands[nModel + j][index] = (sampled.get(e.role) as Float32Array)[k];
      });
      bands[layers.length - 1][index] = flags;
      cellsScreened++;
      if (lon < bounds[0]) bounds[0] = lon;
      if (lat < bounds[1]) bounds[1] = lat;
      if (lon > bounds[2]) bounds[2] = lon;
      if (lat > bounds[3]) bounds[3] = lat;
    }
    onProgress?.(row1, grid.height);
  }
  return {
    layers,
    bands,
    bounds,
    cellsTotal: n,
    cellsScreened,
    cellsMissingInput,
    cellsModelNodata,
  };
}
