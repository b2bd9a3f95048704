/**
 * The screening scenario: the standard pile, the standard building, the heat pump's limits, fuel
 * prices and efficiencies, design life, reference depth and radius, permafrost-class thresholds and the
 * suitability weights. One zod schema (style.md habit 7); every field has a documented default with its
 * source. The scenario is recorded in the tiles manifest so a map can be reproduced.
 *
 * Provenance tags used below: [R] read from the named published work or handbook table,
 * (common practice), (recalled from memory), [derived] computed from other defaults.
 */
import { z } from 'zod';
import { DEFAULT_HEAT_PUMP_CURVE, HeatPumpCurveSchema } from '../physics/heat-pump';
import { formatZodIssues } from '../validation-error';

const pos = () => z.number().positive();
const frac = () => z.number().gt(0).lte(1);
const weight = (w: number) => z.number().min(0).default(w);

/** The standard pile: one hollow steel screw pile carrying a fluid loop. */
export const standardPileSchema = z.strictObject({
  /** Heat-exchange (active) length, m. Embedment of screw piles is about 8-15 m (recalled from memory). */
  length_m: z.number().min(2).max(40).default(10),
  /** Depth of the top of the active length below the surface, m; the loop is insulated above (common practice). */
  topDepth_m: z.number().min(0).max(10).default(1),
  /** Outer radius of the steel shaft, m. Shafts 89-324 mm OD (recalled from memory); 168.3 mm OD chosen. */
  radius_m: z.number().min(0.02).max(0.5).default(0.08415),
  /**
   * Effective pile (borehole) thermal resistance fluid to pile wall, m·K/W. 0.15 lies between a
   * grout-filled U-tube (Hellström 1991 line-source resistance, about 0.19 for a 152 mm bore, reference
   * table RB-1) and a water-filled coaxial steel pile (lower) (common practice).
   */
  resistance_mK_W: z.number().min(0.01).max(1).default(0.15),
});

/** The standard building whose heating the piles serve. */
export const standardBuildingSchema = z.strictObject({
  /**
   * Overall heat-loss coefficient UA (envelope + ventilation), W/K. 150 W/K is a well-insulated
   * detached house of about 120 m² floor area (recalled from memory).
   */
  heatLossCoefficient_W_K: pos().default(150),
  /** Balance-point (heating base) temperature for degree-days, °C (common practice, 18 °C base). */
  balanceTemp_C: z.number().min(5).max(25).default(18),
  /**
   * Design outdoor temperature below the coldest monthly mean, K: the peak load is
   * UA·(balance − (MAAT − amplitude − margin)). 8 K (recalled from memory: the 99 % design temperature
   * of subarctic stations sits some 5-10 K below the January mean).
   */
  designMargin_K: z.number().min(0).max(30).default(8),
  /** Number of foundation piles of the building that carry a loop (4 x 4 grid) (common practice). */
  foundationPiles: z.number().int().min(1).max(400).default(16),
  /**
   * Centre-to-centre spacing of the foundation piles, m: about 3 m under a small building (common
   * practice, no published source). The piles form a rectangular group filled row by row
   * (layers/site/sizing-layout.ts), whose finite-line-source field response sizes them.
   */
  pileSpacing_m: z.number().min(0.2).max(50).default(3),
  /**
   * Piles per row of the group; omitted: ceil(√foundationPiles), as square as the count allows (16 → 4 × 4)
   * (common practice).
   */
  pileColumns: z.number().int().min(1).max(400).optional(),
});

/** Heat pump and fluid limits. */
export const heatPumpLimitsSchema = z.strictObject({
  /**
   * Lowest allowed entering fluid temperature, °C: −5 to −8 °C for common units (common practice);
   * the colder end for permafrost, with 30 % propylene glycol freezing at −12.7 °C (reference-values §9c).
   */
  minEnteringFluid_C: z.number().min(-20).max(5).default(-8),
  /**
   * Half the loop ΔT across the heat pump at peak, K (loop ΔT 3 K, common practice). In heating the
   * mean fluid is minEnteringFluid_C − fluidHalfDelta_K and the fluid entering the piles is
   * minEnteringFluid_C − 2·fluidHalfDelta_K (layers/physics/fluid-temperature-convention.ts).
   */
  fluidHalfDelta_K: z.number().min(0).max(10).default(1.5),
  /**
   * COP and capacity against entering fluid temperature: the science core's editable curve
   * (layers/physics/heat-pump.ts, DEFAULT_HEAT_PUMP_CURVE, common practice: COP about 3.7 at 0 °C EFT).
   */
  curve: HeatPumpCurveSchema.default(DEFAULT_HEAT_PUMP_CURVE),
});

/** Fuel, CO2 and cost on a diesel grid (reference-values.md §12; domain-notes "Fuel, CO2 and cost"). */
export const economicsSchema = z.strictObject({
  /** Oil furnace seasonal efficiency (AFUE). 0.80 = domain-notes central case; DOE rule minimum 0.83 [R]. */
  furnaceEfficiency: frac().default(0.8),
  /** Heat content of heating oil No. 2, kWh/L: 138 500 Btu/gal HHV = 10.72 kWh/L [R, EIA]. */
  heatingOilEnergy_kWh_L: pos().default(10.7),
  /** Diesel generator output, kWh per litre: 3.6 central case (Alaska PCE floors 2.5-3.6 kWh/L [R]). */
  generatorOutput_kWh_L: pos().default(3.6),
  /** Distribution line losses, fraction (domain-notes central case 7 %) (common practice). */
  lineLossFraction: z.number().min(0).lt(1).default(0.07),
  /** CO2 per litre of generator diesel, kg/L: 2.68 widely used; EPA 22.2 lb/gal = 2.660 [R]. */
  dieselCO2_kg_L: pos().default(2.68),
  /** CO2 per litre of heating oil No. 2, kg/L (same fuel grade as diesel, 2.68) [R]. */
  heatingOilCO2_kg_L: pos().default(2.68),
  /** Residential electricity tariff, currency/kWh (recalled from memory: 0.4-1.0 in diesel communities). */
  electricityPrice_per_kWh: pos().default(0.6),
  /** Heating-oil price, currency/L (recalled from memory: remote northern prices 1.5-2.5). */
  heatingOilPrice_per_L: pos().default(1.8),
  /** Currency label for the cost figures (display only). */
  currency: z.string().min(1).max(8).default('USD'),
  /**
   * Extra cost of making one foundation pile a heat exchanger (loop, fill, connection), currency per
   * pile: 1500 (recalled from memory: remote northern construction; editable). The piles themselves
   * are needed for the foundation anyway and are not counted.
   */
  loopCostPerPile: z.number().min(0).default(1500),
  /** Ground-source heat pump, currency per kW of heating capacity: 2000 (recalled from memory). */
  heatPumpCost_per_kW: z.number().min(0).default(2000),
  /** Installation, header piping, controls and commissioning, currency: 10 000 (recalled from memory). */
  installationCost: z.number().min(0).default(10000),
});

/** The heat-pump system around the unit: loop hydraulics, backup and auxiliaries (system-cop.ts). */
export const systemSchema = z.strictObject({
  /** Propylene glycol mass fraction of the loop fluid: 0.30, freezing at −12.7 °C [R, reference-values §9c]. */
  glycolMassFraction: z.number().min(0).max(0.4).default(0.3),
  /** Inner diameter of the loop pipe in each pile, m: PE 32 mm SDR 11, 26.2 mm (common practice). */
  loopPipeInnerDiameter_m: z.number().min(0.005).max(0.3).default(0.0262),
  /** Inner diameter of the supply and return header, m: PE 50 mm SDR 11, 40.8 mm (common practice). */
  headerInnerDiameter_m: z.number().min(0.01).max(0.5).default(0.0408),
  /** Length of header pipe, supply plus return, from the plant to the pile group, m (judgement). */
  headerLength_m: z.number().min(0).max(2000).default(30),
  /** Absolute roughness of polyethylene pipe, m: 1.5e-6 (drawn tubing; recalled from memory). */
  pipeRoughness_m: z.number().min(0).max(0.01).default(1.5e-6),
  /** Fittings, bends and the heat pump's evaporator as a share of the straight-pipe drop (common practice). */
  fittingsAllowance: z.number().min(0).max(5).default(0.3),
  /** Wire-to-water efficiency of the circulation pump: 0.30 (small circulators 0.2-0.5; recalled from memory). */
  pumpEfficiency: frac().default(0.3),
  /** Share of the piles-served heat from the electric backup element at COP 1 (peaks; judgement). */
  backupElectricShare: z.number().min(0).max(1).default(0.03),
  /** Electricity for defrost as a share of the compressor's: 0 (a ground-source unit has no defrost). */
  defrostShare: z.number().min(0).max(1).default(0),
  /** Controls and standby, W, all year: 15 (recalled from memory). */
  auxiliaryPower_W: z.number().min(0).max(2000).default(15),
});

/** Surface and subsurface defaults used where no grid is given. */
export const groundDefaultsSchema = z.strictObject({
  /** Thawing-season n-factor: tundra vegetative cover n_t = 1.0 [R, reference-values §11]. */
  nThaw: z.number().min(0.1).max(2.5).default(1.0),
  /** Freezing-season n-factor where no snow grid: 0.5 for organic/tundra cover [R, reference-values §11]. */
  nFreeze: z.number().min(0.05).max(1.5).default(0.5),
  /** Geothermal heat flux, W/m², where no grid: 0.06 (domain-notes 0.05-0.1) (common practice). */
  geothermalFlux_W_m2: z.number().min(0).max(0.5).default(0.06),
});

/** Permafrost temperature classes (Ran et al. 2022, ESSD: cold < −3, cool −3 to −1.5, warm > −1.5 °C). */
export const permafrostClassesSchema = z.strictObject({
  coldBelow_C: z.number().max(0).default(-3),
  warmAbove_C: z.number().max(0).default(-1.5),
});

/**
 * Hard foundation checks: a cell failing any of them is excluded, whatever its heat and money
 * (design.md "Safety before value"). Each default carries its reason.
 */
export const foundationChecksSchema = z.strictObject({
  /**
   * Warmest allowed end-of-life mean ground temperature in the adfreeze zone (the reference depth and
   * radius, between piles) with the piles operating, °C. −1 °C: the standard's long-term adfreeze
   * strength falls from 100 kPa at −1 °C to 40 kPa at −0.3 °C (SNiP 2.02.04-88 Table 3, recalled from
   * memory; adfreeze-strength.ts) and creep accelerates as unfrozen water rises; it lies inside the
   * "warm permafrost" band of domain-notes.md (above about −2 °C; Ran et al. 2022: above −1.5 °C).
   */
  maxAdfreezeTempEnd_C: z.number().min(-10).max(0).default(-1),
  /**
   * Soil needed below the pile tip over bedrock, m: bedrock shallower than tip + margin excludes (screw
   * piles are installed in soil, not rock; domain-notes "Installability"). 1 m: regional bedrock-depth
   * grids carry errors of metres (judgement, common practice).
   */
  rockMargin_m: z.number().min(0).max(20).default(1),
  /**
   * Excess ice above which the ground is thaw-unstable, m³/m³. 0: any excess ice settles on thaw
   * (thaw strain = excess ice, thaw-settlement.ts); cautious (judgement).
   */
  thawUnstableExcessIce_m3m3: z.number().min(0).max(1).default(0),
  /**
   * Thaw-unstable ground that thaws at the reference depth, with the piles operating, before the end
   * of the design life plus this margin, yr, is excluded. 10 yr: a third of the 30-year life, for the
   * spread of warming trends and of the thaw model (judgement).
   */
  thawMargin_yr: z.number().min(0).max(100).default(10),
  /**
   * Tangential frost-heave stress on a steel shaft in frost-susceptible soil (silt, clay, peat), kPa:
   * measured 150–350 kPa in freezing silt (domain-notes.md; e.g. Penner & Gold 1971); 200 kPa
   * (judgement inside the published range).
   */
  heaveStressFrostSusceptible_kPa: z.number().min(0).max(2000).default(200),
  /** The same in non-frost-susceptible gravel and sand, kPa: 50 (judgement, common practice: little heave). */
  heaveStressCoarse_kPa: z.number().min(0).max(2000).default(50),
  /** Dead load on each foundation pile resisting uplift, kN: 20 (a light building on 16 piles; judgement). */
  deadLoadPerPile_kN: z.number().min(0).max(10000).default(20),
  /** Factor of safety on frost-jacking uplift, 1.5 (common practice for uplift; recalled from memory). */
  jackingSafetyFactor: z.number().min(1).max(10).default(1.5),
});

/** Hard exclusions and soft-criterion thresholds (the "why" of every class). */
export const suitabilitySchema = z.strictObject({
  /** Hard foundation checks (exclusions), each with its sourced default. */
  foundation: foundationChecksSchema.default(foundationChecksSchema.parse({})),
  /**
   * Soft criteria: `good` scores 1, `poor` scores 0, linear between; weights are normalised.
   * coldness: adfreeze-zone temperature at the end of the life with the piles operating, −5.5 °C
   * (good: the standard's adfreeze strength is about 2.7 times its −1 °C value) to −2.5 °C (poor),
   * weight 2 (foundation life); the range spans the demo region with the default settings (−6.0 to
   * −2.5 °C), where the piles' cooling keeps every cell well below the −1 °C hard limit. energy:
   * community fuel saved per standard building at the system COP, 200 L/yr (good; the demo region
   * reaches about 230) to 0 (poor: no saving), weight 2 (the purpose of the system).
   * jackingMargin: frost-jacking demand over anchorage, 0.2 (good: five times the demand) to 1 (poor:
   * the hard limit), weight 1. thawStability: texture × ice factor, 1 to 0, weight 1. Ranges span the
   * demo region's values (judgement).
   */
  coldness: z
    .strictObject({ good_C: z.number().default(-5.5), poor_C: z.number().default(-2.5), weight: weight(2) })
    .default({ good_C: -5.5, poor_C: -2.5, weight: 2 }),
  energy: z
    .strictObject({ good_L: z.number().default(200), poor_L: z.number().default(0), weight: weight(2) })
    .default({ good_L: 200, poor_L: 0, weight: 2 }),
  jackingMargin: z
    .strictObject({ good: z.number().default(0.2), poor: z.number().default(1), weight: weight(1) })
    .default({ good: 0.2, poor: 1, weight: 1 }),
  thawStability: z.strictObject({ weight: weight(1) }).default({ weight: 1 }),
  /** Class robustness tests (class-robustness.ts). */
  robustness: z
    .strictObject({
      /**
       * Step of the heat pump's lowest entering fluid temperature, K: 1.5, half the −5 to −8 °C
       * range of common units (domain-notes).
       */
      fluidLimitStep_K: z.number().min(0).max(10).default(1.5),
      /** Relative change of the COP curve, up and down: 0.2 (the spread between units; judgement). */
      copScale: z.number().min(0).max(0.9).default(0.2),
    })
    .default({ fluidLimitStep_K: 1.5, copScale: 0.2 }),
  /**
   * Suitability score bounds: score >= good → class 'good', >= fair → 'fair', else 'poor'. Judgement:
   * about the upper and lower quartiles of the scores over the demo region's input ranges.
   */
  goodScore: z.number().min(0).max(1).default(0.65),
  fairScore: z.number().min(0).max(1).default(0.5),
});

export const scenarioSchema = z
  .strictObject({
    name: z.string().min(1).default('default'),
    /** Calendar year at which the input climate applies and the warming trend starts. */
    startYear: z.number().int().min(1900).max(2200).default(2025),
    /** Design life of the building and its piles, yr: public buildings 30-50+ (domain-notes). */
    designLife_yr: z.number().min(1).max(100).default(30),
    /** Depth at which thaw is tracked (the adfreeze zone of the foundation), m (common practice). */
    referenceDepth_m: z.number().min(0.5).max(40).default(6),
    /**
     * Radius from the pile axis at which thaw is tracked, m: half of the 3 m pile spacing, midway between
     * two foundation piles (common practice spacing). The point lies at this distance from the pile of
     * the group nearest its centre, along the row towards the centre (layers/screening/foundation-group.ts);
     * every pile of the group cools it.
     */
    referenceRadius_m: z.number().min(0.05).max(20).default(1.5),
    /**
     * Last year of the scenario's climate (its warming trend), calendar year: thaw later than this is
     * reported as "after <year>" (the thaw-year bands hold the year itself and the thawBeyondHorizon
     * flag says so), never as a year the linear trend would reach centuries on. 2100, the end of the
     * century to which published climate projections commonly run (common practice).
     */
    climateHorizonYear: z.number().int().min(1950).max(2500).default(2100),
    /**
     * Largest allowed cooling of the ground at the reference radius at the end of the design life for
     * frost-susceptible soils (silt, clay, peat), K: more freezes unfrozen pockets and the active layer
     * harder and increases frost jacking (domain-notes "over-cooling"; judgement, common practice).
     */
    maxOvercooling_K: z.number().min(0.1).max(30).default(2),
    /** The same for non-frost-susceptible soils (gravel, sand, bedrock), K (common practice). */
    maxOvercoolingCoarse_K: z.number().min(0.1).max(30).default(6),
    /** Margin below 0 °C the foundation ground must keep at the end of the design life, K. */
    frozenMargin_K: z.number().min(0).max(5).default(0.5),
    pile: standardPileSchema.default(standardPileSchema.parse({})),
    building: standardBuildingSchema.default(standardBuildingSchema.parse({})),
    heatPump: heatPumpLimitsSchema.default(heatPumpLimitsSchema.parse({})),
    economics: economicsSchema.default(economicsSchema.parse({})),
    system: systemSchema.default(systemSchema.parse({})),
    ground: groundDefaultsSchema.default(groundDefaultsSchema.parse({})),
    permafrostClasses: permafrostClassesSchema.default(permafrostClassesSchema.parse({})),
    suitability: suitabilitySchema.default(suitabilitySchema.parse({})),
  })
  .superRefine((s, ctx) => {
    if (s.permafrostClasses.coldBelow_C > s.permafrostClasses.warmAbove_C) {
      ctx.addIssue({
        code: 'custom',
        path: ['permafrostClasses', 'coldBelow_C'],
        message: `must be <= warmAbove_C (${s.permafrostClasses.warmAbove_C}); received ${s.permafrostClasses.coldBelow_C}`,
      });
    }
    if (s.suitability.fairScore > s.suitability.goodScore) {
      ctx.addIssue({
        code: 'custom',
        path: ['suitability', 'fairScore'],
        message: `must be <= goodScore (${s.suitability.goodScore}); received ${s.suitability.fairScore}`,
      });
    }
    if (s.building.pileSpacing_m < 2 * s.pile.radius_m) {
      ctx.addIssue({
        code: 'custom',
        path: ['building', 'pileSpacing_m'],
        message: `must be >= the pile diameter 2 × pile.radius_m (${2 * s.pile.radius_m}); received ${s.building.pileSpacing_m}`,
      });
    }
    if (s.climateHorizonYear <= s.startYear) {
      ctx.addIssue({
        code: 'custom',
        path: ['climateHorizonYear'],
        message: `must be after startYear (${s.startYear}); received ${s.climateHorizonYear}`,
      });
    }
    if (s.referenceRadius_m <= s.pile.radius_m) {
      ctx.addIssue({
        code: 'custom',
        path: ['referenceRadius_m'],
        message: `must exceed pile.radius_m (${s.pile.radius_m}); received ${s.referenceRadius_m}`,
      });
    }
  });

export type Scenario = z.infer<typeof scenarioSchema>;
export type ScenarioInput = z.input<typeof scenarioSchema>;

/** The scenario with every default (the documented defaults above). */
export const DEFAULT_SCENARIO: Scenario = scenarioSchema.parse({});

/**
 * Validate a scenario file's JSON; missing fields take their defaults. Throws a TypeError listing every
 * issue as `path: message` (all at once, style.md habit 6) on bad input.
 */
export function parseScenario(input: unknown): Scenario {
  const r = scenarioSchema.safeParse(input ?? {});
  if (r.success) return r.data;
  const lines = formatZodIssues(r.error);
  throw new TypeError(`invalid scenario: ${lines.join('; ')}`);
}
