/**
 * The inputs config (`pile-atlas-inputs.json`): which GeoTIFF plays which role, in which unit, and
 * whether it holds classes or continuous values. Validated with zod; unknown fields are rejected so a
 * misspelt field is reported rather than ignored.
 *
 * Each role has an SI unit (the CellInputs field it fills) and the units accepted for it, with the
 * conversion to SI and the plausible SI range that every finite value must fall in (a value outside
 * is a unit mistake or a corrupt file, reported with the file and role).
 */
import { z } from 'zod';
import { gridSpreadSchema } from '../layers/screening/uncertainty-schema';

export interface GridRole {
  kind: 'continuous' | 'class';
  required: boolean;
  title: string;
  /** Accepted unit -> conversion to the SI unit of the role. */
  units: Record<string, (v: number) => number>;
  /** Plausible SI range [min, max], inclusive. */
  range: [number, number];
  /** What applies when an optional grid is absent (recorded in the flags band). */
  fallback?: string;
}

const identity = (v: number): number => v;

/** The grid roles, keyed by the CellInputs field each one fills. */
export const GRID_ROLES = {
  meanAirTemp_C: {
    kind: 'continuous',
    required: true,
    title: 'Mean annual air temperature',
    units: { degC: identity, K: (v) => v - 273.15 },
    range: [-40, 25],
  },
  airAmplitude_C: {
    kind: 'continuous',
    required: true,
    title: 'Annual air temperature amplitude',
    units: { K: identity, degC: identity },
    range: [0, 40],
  },
  warming_C_per_yr: {
    kind: 'continuous',
    required: true,
    title: 'Air warming rate',
    units: { 'K/yr': identity, 'K/decade': (v) => v / 10 },
    range: [-0.1, 0.3],
  },
  textureClass: {
    kind: 'class',
    required: true,
    title: 'Soil texture class',
    units: { class: identity },
    range: [1, 6],
  },
  waterContent_m3m3: {
    kind: 'continuous',
    required: true,
    title: 'Volumetric water + ice content',
    units: { 'm3/m3': identity, percent: (v) => v / 100 },
    range: [0, 1],
  },
  bedrockDepth_m: {
    kind: 'continuous',
    required: true,
    title: 'Depth to bedrock',
    units: { m: identity, cm: (v) => v / 100 },
    range: [0, 1000],
  },
  groundTemp_C: {
    kind: 'continuous',
    required: false,
    title: 'Mean annual ground temperature',
    units: { degC: identity, K: (v) => v - 273.15 },
    range: [-30, 20],
    fallback: 'TTOP model (Smith & Riseborough 2002) from air temperature, n-factors and soil',
  },
  geothermalFlux_W_m2: {
    kind: 'continuous',
    required: false,
    title: 'Geothermal heat flux',
    units: { 'W/m2': identity, 'mW/m2': (v) => v / 1000 },
    range: [0, 0.5],
    fallback: 'model default flux',
  },
  nFreeze: {
    kind: 'continuous',
    required: false,
    title: 'Freezing-season n-factor (snow)',
    units: { '1': identity },
    range: [0.05, 1.5],
    fallback: 'scenario default n-factor',
  },
} satisfies Record<string, GridRole>;

export type GridRoleId = keyof typeof GRID_ROLES;
export const GRID_ROLE_IDS = Object.keys(GRID_ROLES) as GridRoleId[];

export const gridEntrySchema = z.strictObject({
  role: z.enum(GRID_ROLE_IDS as [GridRoleId, ...GridRoleId[]]),
  file: z.string().min(1),
  unit: z.string().min(1),
  kind: z.enum(['continuous', 'class']),
  /** Overrides the file's own nodata value. */
  nodata: z.number().optional(),
  /** NetCDF: the data variable (not needed when the file holds one). */
  variable: z.string().min(1).optional(),
  /** NetCDF with a time axis: how to reduce it to one field (read-netcdf.ts), over [from, to) months. */
  time: z
    .strictObject({
      reduce: z.enum(['mean', 'annualMean', 'annualAmplitude', 'trend']),
      from: z
        .string()
        .regex(/^\d{4}-\d{2}/, 'YYYY-MM')
        .optional(),
      to: z
        .string()
        .regex(/^\d{4}-\d{2}/, 'YYYY-MM')
        .optional(),
    })
    .optional(),
  /** Polygon input (GeoJSON, GeoPackage): the attribute that carries the role's value. */
  attribute: z.string().min(1).optional(),
  /** Polygon input: attribute value -> the role's value (in `unit`); without it the attribute is numeric. */
  values: z.record(z.string(), z.number()).optional(),
  /** Polygon input: the layer of a multi-layer GeoPackage. */
  layer: z.string().min(1).optional(),
  provenance: z.string().optional(),
  licence: z.string().optional(),
  /**
   * Spread of this grid for the ensemble build (layers/screening/uncertainty-schema.ts): `{ "sd": x }`
   * in the role's SI unit, `{ "relativeSd": f }`, or for a class grid `{ "confusion": p }`. Replaces the
   * scenario's default spread for this role.
   */
  uncertainty: gridSpreadSchema.optional(),
  /**
   * Companion raster of the standard deviation of this grid, cell by cell, in the same `unit`
   * (continuous grids only; band 1, its own nodata, which falls back to the role's declared spread).
   * Read and resampled like the grid itself (data-pipeline/build/sd-grids.ts); the ensemble build
   * uses it as each cell's standard deviation. Not together with `uncertainty`.
   */
  sdFile: z.string().min(1).optional(),
  /**
   * Companion raster of the probability, cell by cell, that this class grid's class is wrong (class
   * grids only; a fraction in [0, 1], band 1, its own nodata, which falls back to the role's declared
   * confusion). Read and resampled like the grid itself, by nearest neighbour
   * (data-pipeline/build/sd-grids.ts); the ensemble build uses it as each cell's confusion
   * probability. Not together with `uncertainty`.
   */
  confusionFile: z.string().min(1).optional(),
});

/** The companion spread grids' checks of one grid entry (sd-grids.ts). */
function companionIssues(g: GridEntry, i: number, ctx: z.RefinementCtx): void {
  const role: GridRole = GRID_ROLES[g.role];
  const issue = (field: 'sdFile' | 'confusionFile', message: string) =>
    ctx.addIssue({ code: 'custom', path: ['grids', i, field], message });
  if (g.sdFile !== undefined && role.kind === 'class') {
    issue(
      'sdFile',
      `${g.role} is a class grid: a standard-deviation grid applies to continuous grids (use "confusionFile" or "uncertainty": { "confusion": p })`,
    );
  } else if (g.sdFile !== undefined && g.uncertainty) {
    issue('sdFile', `${g.role}: give either "uncertainty" or "sdFile", not both`);
  }
  if (g.confusionFile !== undefined && role.kind !== 'class') {
    issue(
      'confusionFile',
      `${g.role} is a continuous grid: a confusion-probability grid applies to class grids (use "sdFile")`,
    );
  } else if (g.confusionFile !== undefined && g.uncertainty) {
    issue('confusionFile', `${g.role}: give either "uncertainty" or "confusionFile", not both`);
  }
}

export const inputsConfigSchema = z
  .strictObject({
    formatVersion: z.literal(1),
    region: z.strictObject({ name: z.string().min(1), fictional: z.boolean() }),
    provenance: z.string(),
    licence: z.string(),
    settlements: z.string().optional(),
    land: z.string().optional(),
    /** Optional GeoJSON of roads or other access lines/points: the build adds their distance band. */
    roads: z.string().optional(),
    /** Limits for this region's builds (command-line options override them). */
    budget: z
      .strictObject({
        maxInputMb: z.number().positive().optional(),
        maxCells: z.number().int().positive().optional(),
        maxMemoryMb: z.number().positive().optional(),
        maxDiskMb: z.number().positive().optional(),
        minLatitude_deg: z.number().min(-90).max(90).optional(),
      })
      .optional(),
    grids: z.array(gridEntrySchema).min(1),
  })
  .superRefine((config, ctx) => {
    const seen = new Set<string>();
    config.grids.forEach((g, i) => {
      const role: GridRole = GRID_ROLES[g.role];
      if (seen.has(g.role)) {
        ctx.addIssue({ code: 'custom', path: ['grids', i, 'role'], message: `role ${g.role} given twice` });
      }
      seen.add(g.role);
      if (!(g.unit in role.units)) {
        ctx.addIssue({
          code: 'custom',
          path: ['grids', i, 'unit'],
          message: `unit "${g.unit}" not accepted for ${g.role} (allowed: ${Object.keys(role.units).join(', ')})`,
        });
      }
      if (g.uncertainty && 'confusion' in g.uncertainty !== (role.kind === 'class')) {
        ctx.addIssue({
          code: 'custom',
          path: ['grids', i, 'uncertainty'],
          message:
            role.kind === 'class'
              ? `${g.role} is a class grid: expected { "confusion": p }`
              : `${g.role} is a continuous grid: expected { "sd": x } or { "relativeSd": f }`,
        });
      }
      companionIssues(g, i, ctx);
      if (g.kind !== role.kind) {
        ctx.addIssue({
          code: 'custom',
          path: ['grids', i, 'kind'],
          message: `${g.role} is a ${role.kind} grid, got "${g.kind}"`,
        });
      }
    });
    for (const id of GRID_ROLE_IDS) {
      if (GRID_ROLES[id].required && !seen.has(id)) {
        ctx.addIssue({ code: 'custom', path: ['grids'], message: `missing required role ${id}` });
      }
    }
  });

export type InputsConfig = z.infer<typeof inputsConfigSchema>;
export type GridEntry = z.infer<typeof gridEntrySchema>;

export const INPUTS_CONFIG_FILE = 'pile-atlas-inputs.json';
