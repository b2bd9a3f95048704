/**
 * The single-site simulation input: one zod schema for the CLI, the web form and imported files.
 *
 * Every numeric field carries `.meta({ title, unit, min, max, description })` so a form can render its
 * label, unit and limits (read them with `fieldMeta(schema)` or zod's `globalRegistry`). Cross-field
 * checks (layer gaps and overlaps, probes outside the domain, a pile longer than the domain, a mesh
 * or step that cannot resolve the pile) are reported as issues with the field path, and so is every rule
 * the simulator's physics enforces (site-input-rules.ts: soil porosity and water content, pipes that fit
 * the casing, fluid above its freezing point at the given inlet or heat-pump limit, plausible surface
 * temperatures and geothermal rise), so that every input the schema accepts runs.
 * Defaults are listed with their provenance in `SITE_DEFAULTS`.
 */
import { z } from 'zod';
import { DEFAULT_HEAT_PUMP_CURVE, HeatPumpCurveSchema } from '../physics/heat-pump';
import {
  climateRules,
  fluidRules,
  groundRules,
  heatRateRules,
  LAYER_PROPERTY_LIMITS,
  pileRules,
  soilRules,
} from './site-input-rules';
import { formatZodIssues } from '../validation-error';

/** Defaults and their provenance. */
export const SITE_DEFAULTS = {
  years: { value: 40, source: 'design life of public buildings on piles, 30–50+ yr (common practice)' },
  timeStep_days: {
    value: 3.5,
    source:
      'refinement study (docs/site-convergence.md): at 3.5 d the standard mesh is within 0.25 yr of the converged thaw year (7 d: +0.8 yr); 104 steps a year',
  },
  outputStep_days: { value: 365 / 12, source: 'monthly output' },
  geothermalFlux_W_m2: {
    value: 0.06,
    source: 'continental average about 0.06–0.07 W/m² (recalled from memory)',
  },
  freezingInterval_K: {
    value: 0.1,
    source:
      'numerical smoothing of the latent release (model choice): narrow enough that ground a few tenths of a kelvin below 0 °C is frozen and a front sits inside one cell; was 0.5 K before the converged enthalpy iteration',
  },
  domainRadius_m: { value: 20, source: 'model choice: far field for a single pile over decades' },
  domainDepth_m: { value: 50, source: 'model choice: below the 40-year warming signal at about 30–50 m' },
  coldestDay: { value: 15, source: 'mid-January (common practice)' },
  flow_L_min: { value: 12, source: 'turbulent flow in a 32 mm U-tube leg (common practice)' },
  steelConductivity_W_mK: { value: 45, source: 'carbon steel 45–50 W/m·K (common practice)' },
  balancePoint_C: { value: 15, source: 'heating balance-point temperature 15–18 °C (common practice)' },
  fluidMargin_K: {
    value: 3,
    source: 'antifreeze freezing point several K below the lowest fluid (common practice)',
  },
} as const;

interface FieldMeta {
  title: string;
  unit: string;
  min?: number;
  max?: number;
  description?: string;
}

function num(meta: FieldMeta): z.ZodNumber {
  let s = z.number().finite();
  if (meta.min !== undefined) s = s.min(meta.min);
  if (meta.max !== undefined) s = s.max(meta.max);
  return s.meta({ ...meta });
}

const soilDescriptionSchema = z
  .object({
    texture: z
      .enum(['gravel', 'sand', 'silt', 'clay', 'peat', 'bedrock'])
      .meta({ title: 'Texture', unit: '' }),
    waterContent_m3m3: num({ title: 'Water + ice content', unit: 'm³/m³', min: 0, max: 0.95 }),
    dryDensity_kg_m3: num({ title: 'Dry density', unit: 'kg/m³', min: 10, max: 2700 }).optional(),
    quartzFraction: num({ title: 'Quartz fraction of solids', unit: '', min: 0, max: 1 }).optional(),
    specificSurface_m2_g: num({ title: 'Specific surface', unit: 'm²/g', min: 0, max: 1000 }).optional(),
  })
  .strict()
  .meta({ title: 'Soil description', description: 'Resolved by the soil catalogue (Johansen / de Vries)' });

export const groundLayerSchema = z
  .object({
    top_m: num({ title: 'Layer top', unit: 'm', min: 0, max: 1000 }),
    bottom_m: num({ title: 'Layer bottom', unit: 'm', min: 0, max: 1000 }),
    soil: soilDescriptionSchema.optional(),
    kFrozen_W_mK: num({ title: 'Conductivity, frozen', ...LAYER_PROPERTY_LIMITS.kFrozen_W_mK }).optional(),
    kThawed_W_mK: num({ title: 'Conductivity, thawed', ...LAYER_PROPERTY_LIMITS.kThawed_W_mK }).optional(),
    cFrozen_J_m3K: num({ title: 'Heat capacity, frozen', ...LAYER_PROPERTY_LIMITS.cFrozen_J_m3K }).optional(),
    cThawed_J_m3K: num({ title: 'Heat capacity, thawed', ...LAYER_PROPERTY_LIMITS.cThawed_J_m3K }).optional(),
    latent_J_m3: num({ title: 'Volumetric latent heat', ...LAYER_PROPERTY_LIMITS.latent_J_m3 }).optional(),
    freezingPoint_C: num({ title: 'Freezing point', ...LAYER_PROPERTY_LIMITS.freezingPoint_C }).optional(),
    freezingInterval_K: num({
      title: 'Freezing interval',
      unit: 'K',
      min: 0.01,
      max: 5,
      description: 'Width over which latent heat is released',
    }).optional(),
  })
  .strict();

const EXPLICIT = [
  'kFrozen_W_mK',
  'kThawed_W_mK',
  'cFrozen_J_m3K',
  'cThawed_J_m3K',
  'latent_J_m3',
  'freezingPoint_C',
] as const;

const probeSchema = z
  .object({
    r_m: num({ title: 'Probe radius (from pile axis)', unit: 'm', min: 0, max: 1e4 }),
    z_m: num({ title: 'Probe depth', unit: 'm', min: 0, max: 1e4 }),
  })
  .strict();

const uTubeSchema = z
  .object({
    type: z.literal('uTube'),
    pipeOuterDiameter_m: num({ title: 'U-tube pipe outer diameter', unit: 'm', min: 0.005, max: 0.2 }),
    pipeInnerDiameter_m: num({ title: 'U-tube pipe inner diameter', unit: 'm', min: 0.004, max: 0.2 }),
    pipeConductivity_W_mK: num({ title: 'Pipe conductivity', unit: 'W/m·K', min: 0.05, max: 400 }),
    shankSpacing_m: num({ title: 'Leg centre-to-centre spacing', unit: 'm', min: 0.005, max: 1 }),
    fillConductivity_W_mK: num({ title: 'Casing fill conductivity', unit: 'W/m·K', min: 0.05, max: 5 }),
  })
  .strict();

const coaxialSchema = z
  .object({
    type: z.literal('coaxial'),
    centreOuterDiameter_m: num({ title: 'Centre pipe outer diameter', unit: 'm', min: 0.005, max: 0.5 }),
    centreInnerDiameter_m: num({ title: 'Centre pipe inner diameter', unit: 'm', min: 0.004, max: 0.5 }),
    centreConductivity_W_mK: num({ title: 'Centre pipe conductivity', unit: 'W/m·K', min: 0.01, max: 400 }),
    downFlow: z.enum(['annulus', 'centre']).meta({ title: 'Channel carrying the fluid down', unit: '' }),
  })
  .strict();

export const pileSchema = z
  .object({
    length_m: num({ title: 'Pile heat-exchange (active) length', unit: 'm', min: 1, max: 100 }),
    topDepth_m: num({
      title: 'Depth of the top of the active length',
      unit: 'm',
      min: 0,
      max: 20,
      description: 'the loop is insulated above it (common practice)',
    }).default(1),
    outerDiameter_m: num({ title: 'Pile outer diameter', unit: 'm', min: 0.03, max: 2 }),
    wallThickness_m: num({ title: 'Steel wall thickness', unit: 'm', min: 0.001, max: 0.1 }).default(0.0095),
    steelConductivity_W_mK: num({ title: 'Steel conductivity', unit: 'W/m·K', min: 5, max: 100 }).default(
      SITE_DEFAULTS.steelConductivity_W_mK.value,
    ),
    loop: z.discriminatedUnion('type', [uTubeSchema, coaxialSchema]),
    fluid: z
      .object({
        name: z.enum(['water', 'propyleneGlycol', 'ethanol']).meta({ title: 'Heat-carrier fluid', unit: '' }),
        massFraction: num({ title: 'Antifreeze mass fraction', unit: 'kg/kg', min: 0, max: 0.4 }),
      })
      .strict(),
    flow_L_min: num({
      title: 'Loop flow (heat-rate and building modes)',
      unit: 'L/min',
      min: 0.5,
      max: 500,
    }).default(SITE_DEFAULTS.flow_L_min.value),
    resistance: z
      .object({
        Rb_mK_W: num({ title: 'Pile resistance Rb (fluid to pile wall)', unit: 'm·K/W', min: 0.001, max: 2 }),
        Ra_mK_W: num({
          title: 'Internal resistance Ra (channel to channel)',
          unit: 'm·K/W',
          min: 0.01,
          max: 50,
        }),
      })
      .strict()
      .optional()
      .meta({ title: 'Measured resistances (override the computed ones)' }),
  })
  .strict();

const monthly = z
  .array(num({ title: 'Monthly factor', unit: '', min: 0, max: 10 }))
  .length(12)
  .meta({ title: 'Monthly factors, January first', unit: '' });

export const operationSchema = z.discriminatedUnion('mode', [
  z
    .object({
      mode: z.literal('heatRate'),
      extraction_W: num({ title: 'Heat extraction per pile', unit: 'W', min: -1e6, max: 1e6 }),
      monthlyFactors: monthly.optional(),
    })
    .strict(),
  z
    .object({
      mode: z.literal('inletTemperature'),
      inlet_C: num({ title: 'Fluid inlet temperature', unit: '°C', min: -30, max: 40 }),
      flow_L_min: num({ title: 'Loop flow', unit: 'L/min', min: 0.5, max: 500 }),
      monthlyOn: z.array(z.boolean()).length(12).optional().meta({ title: 'Pump running, by month' }),
    })
    .strict(),
  z
    .object({
      mode: z.literal('building'),
      designLoad_W: num({ title: 'Building heating load at the coldest air', unit: 'W', min: 0, max: 1e8 }),
      pileCount: num({ title: 'Piles sharing the load', unit: '', min: 1, max: 10000 }).int(),
      balancePoint_C: num({ title: 'Heating balance point', unit: '°C', min: -10, max: 25 }).default(
        SITE_DEFAULTS.balancePoint_C.value,
      ),
      heatPump: HeatPumpCurveSchema.optional().meta({
        title: 'Heat pump curve (COP and capacity against entering fluid temperature, lowest EFT)',
        description: 'default: DEFAULT_HEAT_PUMP_CURVE of layers/physics/heat-pump.ts',
      }),
    })
    .strict(),
]);

const siteInputObject = z
  .object({
    years: num({ title: 'Simulated years', unit: 'yr', min: 1, max: 200 })
      .int()
      .default(SITE_DEFAULTS.years.value),
    timeStep_days: num({ title: 'Time step', unit: 'day', min: 0.01, max: 31 }).default(
      SITE_DEFAULTS.timeStep_days.value,
    ),
    outputStep_days: num({ title: 'Output interval', unit: 'day', min: 0.01, max: 366 }).default(
      SITE_DEFAULTS.outputStep_days.value,
    ),
    ground: z
      .object({
        layers: z.array(groundLayerSchema).min(1),
        geothermalFlux_W_m2: num({ title: 'Geothermal heat flux', unit: 'W/m²', min: 0, max: 1 }).default(
          SITE_DEFAULTS.geothermalFlux_W_m2.value,
        ),
        initial: z.union([
          z.literal('equilibrium'),
          z
            .object({
              uniform_C: num({ title: 'Uniform initial temperature', unit: '°C', min: -40, max: 30 }),
            })
            .strict(),
        ]),
      })
      .strict(),
    climate: z
      .object({
        meanAirTemp_C: num({ title: 'Mean annual air temperature', unit: '°C', min: -40, max: 20 }),
        amplitude_C: num({ title: 'Annual air amplitude', unit: 'K', min: 0, max: 40 }),
        warming_C_per_yr: num({ title: 'Air warming trend', unit: 'K/yr', min: -0.5, max: 0.5 }),
        /**
         * Warming pathway: air-temperature change since the start against years since the start,
         * linearly interpolated and held after the last point (surface-forcing.ts, piecewise trend);
         * when given it replaces warming_C_per_yr. The map's scenario pathway converted to years since
         * its start year (layers/screening/warming-pathway.ts, pathwayKnots).
         */
        warmingPathway: z
          .array(
            z
              .object({
                time_yr: num({ title: 'Years since the start', unit: 'yr', min: 0, max: 500 }),
                airWarming_K: num({ title: 'Air warming since the start', unit: 'K', min: -15, max: 25 }),
              })
              .strict(),
          )
          .min(2)
          .max(61)
          .optional()
          .meta({ title: 'Warming pathway', unit: '' }),
        nThaw: num({ title: 'Thawing n-factor', unit: '', min: 0.05, max: 3 }),
        nFreeze: num({ title: 'Freezing n-factor', unit: '', min: 0.05, max: 3 }),
        coldestDay: num({ title: 'Day of coldest air', unit: 'day', min: 0, max: 365 }).default(
          SITE_DEFAULTS.coldestDay.value,
        ),
      })
      .strict(),
    pile: pileSchema.nullable(),
    operation: operationSchema,
    probes: z.array(probeSchema).max(50),
    domain: z
      .object({
        radius_m: num({ title: 'Domain radius', unit: 'm', min: 1, max: 500 }).default(
          SITE_DEFAULTS.domainRadius_m.value,
        ),
        depth_m: num({ title: 'Domain depth', unit: 'm', min: 2, max: 1000 }).default(
          SITE_DEFAULTS.domainDepth_m.value,
        ),
      })
      .strict()
      .default({ radius_m: SITE_DEFAULTS.domainRadius_m.value, depth_m: SITE_DEFAULTS.domainDepth_m.value }),
    numerics: z
      .object({
        fidelity: z.enum(['coarse', 'standard', 'fine']).default('standard').meta({
          title: 'Mesh fidelity',
          description: 'coarse for batch calibration, fine for checks',
        }),
        firstRadialStep_m: num({ title: 'First radial cell', unit: 'm', min: 0.001, max: 5 }).optional(),
        pileStep_m: num({ title: 'Vertical cell along the pile', unit: 'm', min: 0.01, max: 10 }).optional(),
        tolerance_K: num({
          title: 'Pile-loop coupling tolerance (fluid boundary temperature)',
          unit: 'K',
          min: 1e-9,
          max: 0.1,
          description: 'default 0.01 K',
        }).optional(),
      })
      .strict()
      .default({ fidelity: 'standard' }),
  })
  .strict();

type SiteInputObject = z.output<typeof siteInputObject>;
type PileObject = NonNullable<SiteInputObject['pile']>;

/** Each layer's extent and its soil or explicit properties; returns the lowest conductivity per layer. */
function layerRules(layers: SiteInputObject['ground']['layers'], ctx: z.RefinementCtx): number[] {
  const kMin: number[] = [];
  layers.forEach((layer, i) => {
    const path = ['ground', 'layers', i];
    if (!(layer.bottom_m > layer.top_m)) {
      ctx.addIssue({
        code: 'custom',
        path: [...path, 'bottom_m'],
        message: `bottom_m (${layer.bottom_m}) must be below top_m (${layer.top_m})`,
      });
    }
    const expected = i === 0 ? 0 : layers[i - 1].bottom_m;
    if (layer.top_m !== expected) {
      const what = layer.top_m > expected ? 'gap' : 'overlap';
      ctx.addIssue({
        code: 'custom',
        path: [...path, 'top_m'],
        message: `layer ${what}: top_m is ${layer.top_m} m but the ${i === 0 ? 'surface is 0' : `previous layer ends at ${expected}`} m`,
      });
    }
    const explicitCount = EXPLICIT.filter((k) => layer[k] !== undefined).length;
    kMin.push(
      layer.soil && explicitCount === 0
        ? soilRules(layer.soil, [...path, 'soil'], ctx)
        : Math.min(layer.kFrozen_W_mK ?? NaN, layer.kThawed_W_mK ?? NaN),
    );
    if (layer.soil && explicitCount > 0) {
      ctx.addIssue({
        code: 'custom',
        path: [...path, 'soil'],
        message: 'give either soil or the explicit properties, not both',
      });
    } else if (!layer.soil && explicitCount < EXPLICIT.length) {
      const missing = EXPLICIT.filter((k) => layer[k] === undefined);
      ctx.addIssue({
        code: 'custom',
        path: [...path, missing[0]],
        message: `layer needs soil or all of ${EXPLICIT.join(', ')}; missing ${missing.join(', ')}`,
      });
    }
  });
  return kMin;
}

/** The pile's loop, fluid and load, and its fit in the domain and mesh. */
function pileDomainRules(input: SiteInputObject, pile: PileObject, ctx: z.RefinementCtx): void {
  const depth = input.domain.depth_m;
  const op = input.operation;
  pileRules(pile, op.mode === 'inletTemperature' ? op.flow_L_min : pile.flow_L_min, ctx);
  fluidRules(pile, op, DEFAULT_HEAT_PUMP_CURVE.minEnteringFluid_C, ctx);
  heatRateRules(pile.length_m, op, ctx);
  if (pile.topDepth_m + pile.length_m > depth - 2) {
    ctx.addIssue({
      code: 'custom',
      path: ['pile', 'length_m'],
      message: `pile bottom (topDepth_m + length_m = ${pile.topDepth_m + pile.length_m} m) must lie at least 2 m above the domain depth ${depth} m`,
    });
  }
  if (pile.outerDiameter_m / 2 > input.domain.radius_m / 10) {
    ctx.addIssue({
      code: 'custom',
      path: ['pile', 'outerDiameter_m'],
      message: `pile radius must be under a tenth of the domain radius ${input.domain.radius_m} m`,
    });
  }
  if (pile.wallThickness_m >= pile.outerDiameter_m / 2) {
    ctx.addIssue({
      code: 'custom',
      path: ['pile', 'wallThickness_m'],
      message: 'wall thickness must be less than the pile radius',
    });
  }
  const step = input.numerics.pileStep_m;
  if (step !== undefined && step > pile.length_m / 4) {
    ctx.addIssue({
      code: 'custom',
      path: ['numerics', 'pileStep_m'],
      message: `vertical cell ${step} m cannot resolve a ${pile.length_m} m pile (at most a quarter of its length)`,
    });
  }
  const dr = input.numerics.firstRadialStep_m;
  if (dr !== undefined && dr > pile.outerDiameter_m) {
    ctx.addIssue({
      code: 'custom',
      path: ['numerics', 'firstRadialStep_m'],
      message: `first radial cell ${dr} m cannot resolve the pile wall (at most the pile diameter ${pile.outerDiameter_m} m)`,
    });
  }
}

/** Time and output steps, and every probe inside the ground domain. */
function stepAndProbeRules(input: SiteInputObject, ctx: z.RefinementCtx): void {
  const depth = input.domain.depth_m;
  const pile = input.pile;
  if (pile && input.timeStep_days > 31) {
    ctx.addIssue({ code: 'custom', path: ['timeStep_days'], message: 'time step must be at most 31 days' });
  }
  if (input.outputStep_days < input.timeStep_days) {
    ctx.addIssue({
      code: 'custom',
      path: ['outputStep_days'],
      message: `output interval ${input.outputStep_days} d must be at least the time step ${input.timeStep_days} d`,
    });
  }
  const rMin = pile ? pile.outerDiameter_m / 2 : 0;
  input.probes.forEach((p, i) => {
    if (p.r_m < rMin || p.r_m > input.domain.radius_m) {
      ctx.addIssue({
        code: 'custom',
        path: ['probes', i, 'r_m'],
        message: `probe radius ${p.r_m} m is outside the ground domain [${rMin}, ${input.domain.radius_m}] m`,
      });
    }
    if (p.z_m > depth) {
      ctx.addIssue({
        code: 'custom',
        path: ['probes', i, 'z_m'],
        message: `probe depth ${p.z_m} m is below the domain depth ${depth} m`,
      });
    }
  });
}

/** Cross-field rules of a site input, in the order their issues are listed. */
function siteInputRules(input: SiteInputObject, ctx: z.RefinementCtx): void {
  const layers = input.ground.layers;
  const kMin = layerRules(layers, ctx);
  groundRules(layers, input.ground.geothermalFlux_W_m2, input.domain.depth_m, kMin, ctx);
  climateRules(input.climate, input.years, ctx);
  if (input.pile) pileDomainRules(input, input.pile, ctx);
  stepAndProbeRules(input, ctx);
}

export const siteInputSchema = siteInputObject.superRefine(siteInputRules);

export type { SiteResult, SiteCaseResult, SiteProbeResult, SiteFluidResult } from './site-result';

/** The validated input (defaults filled in). */
export type SiteInput = z.output<typeof siteInputSchema>;
/** The input as written in a file or form (defaults optional). */
export type SiteInputDraft = z.input<typeof siteInputSchema>;

/** Formats zod issues as one line each: `path: message`. */
export function formatSiteInputIssues(error: z.ZodError): string[] {
  return formatZodIssues(error);
}

/**
 * Title, unit and limits of every field that carries them, by dotted path (array elements as `[]`,
 * union members merged), for forms: e.g. `siteFieldMeta()['climate.meanAirTemp_C']`.
 */
export function siteFieldMeta(): Record<string, FieldMeta> {
  const out: Record<string, FieldMeta> = {};
  const walk = (schema: z.ZodType, path: string): void => {
    if (typeof schema?.meta !== 'function') return;
    const meta = schema.meta() as FieldMeta | undefined;
    if (meta && typeof meta.title === 'string' && path) out[path] = { ...out[path], ...meta };
    const s = schema as unknown as {
      shape?: Record<string, z.ZodType>;
      unwrap?: () => z.ZodType;
      element?: z.ZodType;
      options?: z.ZodType[];
    };
    if (s.shape)
      for (const [key, child] of Object.entries(s.shape)) walk(child, path ? `${path}.${key}` : key);
    else if (s.element) walk(s.element, `${path}[]`);
    else if (s.options) for (const o of s.options) walk(o, path);
    else if (s.unwrap) walk(s.unwrap(), path);
  };
  walk(siteInputSchema, '');
  return out;
}
