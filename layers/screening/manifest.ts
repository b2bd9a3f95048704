/**
 * The tiles manifest (`manifest.json`): everything the web app may know about a build. The web reads
 * only what this schema describes (design.md section 5). Written by data-pipeline, validated on read.
 */
import { z } from 'zod';

/** A companion spread grid of an input, as read (data-pipeline/build/sd-grids.ts). */
const companionGridSchema = z.object({
  file: z.string(),
  unit: z.string(),
  crs: z.string(),
  width: z.number().int().positive(),
  height: z.number().int().positive(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  nodata: z.number().nullable(),
  scale: z.number(),
  offset: z.number(),
});

export const bandClassSchema = z.object({
  value: z.number().int(),
  label: z.string(),
  /** One-line plain explanation shown in the legend and the class card. */
  description: z.string().optional(),
});

export const bandSchema = z.object({
  id: z.string().regex(/^[a-zA-Z][a-zA-Z0-9_]*$/),
  title: z.string(),
  /** SI unit as printed in the legend, e.g. '°C', 'm', 'yr', 'piles/ton'; '' for classes and flags. */
  unit: z.string(),
  kind: z.enum(['continuous', 'class']),
  /** Quantisation (see tile-format.ts). */
  scale: z.number().positive(),
  offset: z.number(),
  /** Range of the finite values actually present in this build. */
  min: z.number(),
  max: z.number(),
  /** Colour ramp id from colour-ramps.ts (continuous bands). */
  ramp: z.string().optional(),
  /** Display range of the legend (defaults to min..max). */
  legendMin: z.number().optional(),
  legendMax: z.number().optional(),
  classes: z.array(bandClassSchema).optional(),
  description: z.string(),
  /** Published model or data the band comes from. */
  source: z.string(),
  /**
   * Thaw years and durations bounded by the scenario's climate horizon (climate-horizon.ts): the class
   * band `flagBand` says per cell whether this band's value is the horizon year standing for a thaw
   * "after <year>" (`after`), a lower bound (`atLeast`), or not determined within the horizon
   * (`undetermined`, value nodata). Readers must show those cells as such, never as a plain number.
   */
  horizon: z
    .object({
      year: z.number().int(),
      flagBand: z.string(),
      after: z.array(z.number().int()),
      atLeast: z.array(z.number().int()),
      undetermined: z.array(z.number().int()),
    })
    .optional(),
});

/**
 * One suitability criterion of the class card: the web reads the raw value from band `bandId` and
 * shows it with its unit, the threshold and the verdict `value <comparison> threshold` (pass/fail).
 * Exclusions are hard (any failure excludes the cell); soft criteria are weighted into the score,
 * scoring linearly from 0 at `poor` to 1 at `good`.
 */
export const criterionSchema = z.object({
  id: z.string(),
  title: z.string(),
  bandId: z.string(),
  unit: z.string(),
  kind: z.enum(['exclusion', 'soft']),
  comparison: z.enum(['<', '<=', '>', '>=', '!=']),
  threshold: z.number(),
  /** Normalised weight in the suitability score (0 for exclusions). */
  weight: z.number().min(0),
  good: z.number().optional(),
  poor: z.number().optional(),
  description: z.string(),
});

export const inputSourceSchema = z.object({
  file: z.string(),
  role: z.string(),
  crs: z.string(),
  width: z.number().int().positive(),
  height: z.number().int().positive(),
  unit: z.string(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  provenance: z.string(),
  licence: z.string(),
  /**
   * How the file was read: format (GDAL driver or NetCDF-4), the scale and offset applied (physical =
   * stored x scale + offset), the unit the file declares, nodata, and for NetCDF the variable, grid
   * mapping and time selection.
   */
  reading: z.record(z.string(), z.unknown()).optional(),
  /** Companion grid of this input's standard deviation, in the same unit (the ensemble's per-cell spread). */
  standardDeviation: companionGridSchema.optional(),
  /**
   * The companion grid of a class input's confusion probability (a fraction), read by nearest
   * neighbour; the ensemble's per-cell confusion (data-pipeline/build/sd-grids.ts).
   */
  confusionProbability: companionGridSchema.optional(),
});

export const manifestSchema = z.object({
  formatVersion: z.literal(1),
  tool: z.object({ name: z.literal('pile-atlas'), version: z.string() }),
  createdAt: z.string(),
  /** True when any input is invented demo data; the web shows it. */
  fictional: z.boolean(),
  notice: z.string(),
  region: z.object({
    name: z.string(),
    /** [west, south, east, north] in degrees, WGS 84. */
    bounds: z.tuple([z.number(), z.number(), z.number(), z.number()]),
  }),
  tiles: z.object({
    urlTemplate: z.string(),
    tileSize: z.number().int().positive(),
    minZoom: z.number().int().min(0),
    maxZoom: z.number().int().min(0),
    encoding: z.literal('uint16-planar-le'),
    nodataCode: z.number().int(),
  }),
  analysisGrid: z.object({
    crs: z.string(),
    proj4: z.string(),
    width: z.number().int().positive(),
    height: z.number().int().positive(),
    cellSize_m: z.number().positive(),
    geoTransform: z.tuple([z.number(), z.number(), z.number(), z.number(), z.number(), z.number()]),
  }),
  bands: z.array(bandSchema).min(1),
  sources: z.array(inputSourceSchema),
  /** Relative path of the settlements GeoJSON (points with a `name`), if any. */
  settlements: z.string().optional(),
  /** Relative path of the land (coastline) polygons GeoJSON for the offline base map, if any. */
  land: z.string().optional(),
  parameters: z.record(z.string(), z.unknown()),
  scenario: z.record(z.string(), z.unknown()).optional(),
  summary: z.record(z.string(), z.unknown()).optional(),
  /** Suitability criteria behind the class band (see criterionSchema), if the model provides them. */
  criteria: z.array(criterionSchema).optional(),
  /**
   * A build of several scenarios (scenario-set.ts): every scenario with its manifest (path from the
   * build's root directory; the first scenario's is the root manifest.json), its differences from the
   * first scenario and its key figures; `current` names the scenario this manifest describes and
   * `root` is the path from this manifest's directory back to the build's root ('' at the root).
   */
  scenarioSet: scenarioSetEntrySchemaList().optional(),
});

function scenarioSetEntrySchemaList() {
  return z.object({
    current: z.string(),
    root: z.string(),
    scenarios: z
      .array(
        z.object({
          name: z.string(),
          slug: z.string(),
          manifest: z.string(),
          /** Warming pathway label, or 'linear trend per cell'. */
          warming: z.string(),
          designLife_yr: z.number(),
          horizonYear: z.number(),
          differences: z.array(z.object({ path: z.string(), text: z.string() })),
          /** Share of screened cells per suitability class label, and other whole-region figures. */
          keyFigures: z.record(z.string(), z.number()),
        }),
      )
      .min(1),
  });
}

export type Manifest = z.infer<typeof manifestSchema>;
export type Band = z.infer<typeof bandSchema>;
export type InputSource = z.infer<typeof inputSourceSchema>;
export type Criterion = z.infer<typeof criterionSchema>;
export type ScenarioSetInfo = NonNullable<Manifest['scenarioSet']>;
