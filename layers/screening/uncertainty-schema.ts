/**
 * Uncertainty declarations of the screening inputs (zod, style.md habit 7): the spread of each input
 * grid and the distribution of each uncertain scenario parameter, with the ensemble's settings. The
 * scenario carries them under `uncertainty` (scenario.ts); an input grid may declare its own spread in
 * the inputs config (`grids[].uncertainty`, the same `gridSpreadSchema`), which then replaces the
 * scenario's default for that grid. Both are recorded in the build's manifest.
 *
 * Provenance tags: (common practice), (judgement), (recalled from memory), [R] read from the named work.
 * Every default below is a stated judgement unless a source is named: no regional error model of these
 * inputs was at hand, so the spreads are set to the size of the disagreements the domain notes and the
 * reference values describe.
 */
import { z } from 'zod';
// Grid roles that the build also echoes as bands share the band's id (band-ids.ts).
import { BAND } from './band-ids';

/**
 * A distribution of one scalar, sampled through its inverse CDF (latin-hypercube.ts):
 * `normal` (mean 0 for an offset, 1 for a factor, standard deviation `sd`), `uniform` on [min, max],
 * `triangular` on [min, max] with its mode. `fixed` switches the parameter's uncertainty off.
 */
export const distributionSchema = z
  .discriminatedUnion('dist', [
    z.strictObject({ dist: z.literal('normal'), sd: z.number().min(0).max(100) }),
    z.strictObject({ dist: z.literal('uniform'), min: z.number(), max: z.number() }),
    z.strictObject({ dist: z.literal('triangular'), min: z.number(), mode: z.number(), max: z.number() }),
    z.strictObject({ dist: z.literal('fixed') }),
  ])
  .superRefine((d, ctx) => {
    if (d.dist === 'uniform' && !(d.min <= d.max))
      ctx.addIssue({
        code: 'custom',
        path: ['max'],
        message: `must be >= min (${d.min}); received ${d.max}`,
      });
    if (d.dist === 'triangular' && !(d.min <= d.mode && d.mode <= d.max))
      ctx.addIssue({
        code: 'custom',
        path: ['mode'],
        message: `must lie in [min, max] = [${d.min}, ${d.max}]; received ${d.mode}`,
      });
  });
export type Distribution = z.infer<typeof distributionSchema>;

/**
 * Spread of one input grid: a constant standard deviation in the role's SI unit (`sd`), a relative
 * standard deviation (`relativeSd`, a fraction of the cell's value), or for class grids the probability
 * that the cell's class is wrong (`confusion`: the true class is then one of the other classes, each
 * equally likely). Perturbed values are normal around the grid's value and clipped to the model's
 * valid input range.
 */
export const gridSpreadSchema = z.union([
  z.strictObject({ sd: z.number().min(0).max(1000) }),
  z.strictObject({ relativeSd: z.number().min(0).max(2) }),
  z.strictObject({ confusion: z.number().min(0).max(1) }),
]);
export type GridSpread = z.infer<typeof gridSpreadSchema>;

/** The CellInputs fields a grid spread may apply to (the inputs config's grid roles). */
export const SPREAD_ROLES = [
  BAND.meanAirTemp_C,
  BAND.airAmplitude_C,
  BAND.warming_C_per_yr,
  BAND.textureClass,
  BAND.waterContent_m3m3,
  'bedrockDepth_m',
  'groundTemp_C',
  'geothermalFlux_W_m2',
  'nFreeze',
] as const;
export type SpreadRole = (typeof SPREAD_ROLES)[number];

const normal = (sd: number) => ({ dist: 'normal' as const, sd });

/**
 * Default spreads of the input grids where the inputs config declares none (judgement unless named):
 * - mean air temperature sd 0.5 K, amplitude sd 0.5 K: the size of the disagreement between gridded
 *   climatologies at 1 km in sparse station networks (recalled from memory);
 * - warming trend: carried by the scenario's `warmingScale` instead (0 here);
 * - texture: 15 % chance the mapped class is wrong (judgement: 250 m soil-class maps are commonly
 *   quoted at 50-70 % overall accuracy in the north, recalled from memory; 15 % is a single-class
 *   confusion between the dominant and the next texture);
 * - water + ice content relative sd 20 % (judgement: ground ice varies by tens of percent within a
 *   cell); depth to bedrock relative sd 30 % (judgement: censored and interpolated products);
 * - ground temperature sd 0.5 K (judgement: the spread of modelled MAGT products against boreholes is
 *   about 1 K, recalled from memory; half of it for a grid calibrated to the region);
 * - geothermal flux relative sd 20 % (judgement; continental heat-flow maps);
 * - snow n-factor grid sd 0.1 (judgement; snow-cover variability between years and within a cell).
 */
export const DEFAULT_GRID_SPREADS: Record<SpreadRole, GridSpread> = {
  meanAirTemp_C: { sd: 0.5 },
  airAmplitude_C: { sd: 0.5 },
  warming_C_per_yr: { sd: 0 },
  textureClass: { confusion: 0.15 },
  waterContent_m3m3: { relativeSd: 0.2 },
  bedrockDepth_m: { relativeSd: 0.3 },
  groundTemp_C: { sd: 0.5 },
  geothermalFlux_W_m2: { relativeSd: 0.2 },
  nFreeze: { sd: 0.1 },
};

const gridSpreadsSchema = z.strictObject(
  Object.fromEntries(SPREAD_ROLES.map((r) => [r, gridSpreadSchema.default(DEFAULT_GRID_SPREADS[r])])) as {
    [K in SpreadRole]: z.ZodDefault<typeof gridSpreadSchema>;
  },
);

/**
 * The uncertain scenario parameters and their default distributions. Offsets add to the scenario's
 * value, factors multiply it (a factor's normal has mean 1).
 */
export const parameterDistributionsSchema = z.strictObject({
  /**
   * Offset of the thawing n-factor, normal sd 0.1 (judgement: tundra n_t about 0.8-1.2, reference
   * values §11 [M, medium]).
   */
  nThaw: distributionSchema.default(normal(0.1)),
  /**
   * Offset of the freezing n-factor where no snow grid is given, normal sd 0.1 (judgement: snow-covered
   * natural ground n_f 0.3-0.6, reference values §11 [M, medium]; a sd of 0.1 keeps ±2 sd inside it).
   */
  nFreeze: distributionSchema.default(normal(0.1)),
  /**
   * Factor on every COP of the heat-pump curve, normal sd 0.08 (judgement: rated and field COPs of
   * brine-to-water units commonly differ by 5-10 %, recalled from memory).
   */
  copScale: distributionSchema.default(normal(0.08)),
  /**
   * Offset of the lowest entering fluid temperature, uniform −1.5 to +1.5 K (common practice: limits of
   * common units run from −5 to −8 °C, domain notes).
   */
  minEnteringFluid_C: distributionSchema.default({ dist: 'uniform', min: -1.5, max: 1.5 }),
  /**
   * Factor on the frozen and thawed soil conductivities, normal sd 0.1 (judgement: Johansen's method
   * fits measured soils to about ±10-20 %, Farouki 1981 [M, medium]).
   */
  conductivityScale: distributionSchema.default(normal(0.1)),
  /**
   * Factor on the warming-trend grid, uniform 0.7 to 1.3 (judgement: the spread between moderate and
   * high emission pathways over the design life is of this order, recalled from memory).
   */
  warmingScale: distributionSchema.default({ dist: 'uniform', min: 0.7, max: 1.3 }),
  /**
   * Factor on the standard building's heat-loss coefficient (the design load), normal sd 0.15
   * (judgement: envelope quality, ventilation and occupants).
   */
  designLoadScale: distributionSchema.default(normal(0.15)),
});
export type ParameterDistributions = z.infer<typeof parameterDistributionsSchema>;
export type UncertainParameter = keyof ParameterDistributions;
export const UNCERTAIN_PARAMETERS = Object.keys(parameterDistributionsSchema.shape) as UncertainParameter[];

/** Ensemble settings and the uncertainty declarations (the scenario's `uncertainty` field). */
export const scenarioUncertaintySchema = z.strictObject({
  /**
   * Ensemble members per cell. 32 was chosen by the convergence study (bench/ensemble-convergence.ts,
   * table in the README and bench/ensemble-convergence.md): the smallest N at which, on 300 demo cells
   * against a 1024-member reference, the median error of P10 and of P90 is below a tenth of the cell's
   * P10-P90 range and the robust class agrees with the reference's on at least 90 % of cells.
   */
  members: z.number().int().min(1).max(1024).default(32),
  /** Seed of the Latin hypercube: the same seed gives byte-identical builds. */
  seed: z.number().int().min(0).max(0xffffffff).default(1),
  /**
   * Share of members that must agree on the class for it to be robust; otherwise the robust class is
   * "uncertain" (judgement: 0.8, four in five).
   */
  robustShare: z.number().gt(0.5).lte(1).default(0.8),
  /**
   * Share of the standard building's heat the foundation piles must carry for a member to count as a
   * success (judgement: a quarter, a hybrid with a backup heater, which is normal (domain notes); the
   * demo's non-excluded cells carry 0.11-0.41 between their 10th and 90th percentiles, median 0.19).
   */
  successLoadShare: z.number().min(0).max(1).default(0.25),
  parameters: parameterDistributionsSchema.default(parameterDistributionsSchema.parse({})),
  grids: gridSpreadsSchema.default(gridSpreadsSchema.parse({})),
});
export type ScenarioUncertainty = z.infer<typeof scenarioUncertaintySchema>;
export type ScenarioUncertaintyInput = z.input<typeof scenarioUncertaintySchema>;

/** Every distribution and spread switched off (the zero-spread ensemble). */
export function zeroSpread(u: ScenarioUncertainty): ScenarioUncertainty {
  const fixed = { dist: 'fixed' as const };
  return {
    ...u,
    parameters: Object.fromEntries(UNCERTAIN_PARAMETERS.map((p) => [p, fixed])) as ParameterDistributions,
    grids: Object.fromEntries(
      SPREAD_ROLES.map((r) => [r, r === BAND.textureClass ? { confusion: 0 } : { sd: 0 }]),
    ) as Record<SpreadRole, GridSpread>,
  };
}
