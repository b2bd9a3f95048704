/**
 * A fast-check arbitrary of site-input drafts drawn from the schema's own field limits
 * (`siteFieldMeta()`: every number between the min and max the schema states for that path), for the
 * schema–simulator property test and the site fuzz bench. Each number is drawn uniformly, log-uniformly
 * (ranges spanning decades) or at one of its limits, so both typical values and the corners are hit.
 * Only the cost of a run is restricted (`short`): few years, coarse mesh, steps of at least `minStep_days`,
 * the default vertical and radial cells; everything else spans the schema. Drafts are not guaranteed
 * to pass the schema's cross-field rules: filter with `siteInputSchema.safeParse`.
 */
import fc from 'fast-check';
import { HeatPumpCurveSchema } from '../../layers/physics/heat-pump';
import { TEXTURE_CATALOGUE } from '../../layers/physics/soil-catalogue';
import { siteFieldMeta, type SiteInputDraft } from '../../layers/site/site-input-schema';

const META = siteFieldMeta();

function limits(path: string): { min: number; max: number } {
  const m = META[path];
  if (!m || m.min === undefined || m.max === undefined)
    throw new Error(`no limits in the schema for ${path}`);
  return { min: m.min, max: m.max };
}

/** A number within [min, max]: uniform, log-uniform over decades, or a limit. */
export function within(min: number, max: number): fc.Arbitrary<number> {
  const uniform = fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
  const options: fc.Arbitrary<number>[] = [uniform, uniform, fc.constant(min), fc.constant(max)];
  if (min > 0 && max / min > 100) {
    options.push(
      fc
        .double({ min: Math.log(min), max: Math.log(max), noNaN: true })
        .map((x) => Math.min(max, Math.max(min, Math.exp(x)))),
    );
  } else if (min < 0 && max > 0 && max / -min > 0.01 && max - min > 100) {
    // Signed ranges over decades (heat rates): log-uniform magnitude of either sign.
    const mag = fc.double({ min: 0, max: Math.log(Math.min(-min, max)), noNaN: true }).map(Math.exp);
    options.push(fc.tuple(mag, fc.boolean()).map(([m, neg]) => (neg ? -m : m)));
  }
  return fc.oneof(...options);
}

/** A number within the schema's limits for the field at `path`. */
export function field(path: string): fc.Arbitrary<number> {
  const { min, max } = limits(path);
  return within(min, max);
}

const opt = <T>(a: fc.Arbitrary<T>): fc.Arbitrary<T | undefined> => fc.option(a, { nil: undefined, freq: 2 });

const layerProps = fc.oneof(
  fc.record(
    {
      soil: fc.record(
        {
          texture: fc.constantFrom('gravel', 'sand', 'silt', 'clay', 'peat', 'bedrock'),
          // As fractions: of the porosity (water) and of the solids density (dry density), mapped below.
          waterContent_m3m3: fc.oneof(within(0, 1), fc.constant(1)),
          dryDensity_kg_m3: opt(within(0.01, 0.99)),
          quartzFraction: opt(field('ground.layers[].soil.quartzFraction')),
          specificSurface_m2_g: opt(field('ground.layers[].soil.specificSurface_m2_g')),
        },
        { requiredKeys: ['texture', 'waterContent_m3m3'] },
      ),
      freezingInterval_K: opt(field('ground.layers[].freezingInterval_K')),
    },
    { requiredKeys: ['soil'] },
  ),
  fc.record(
    {
      kFrozen_W_mK: field('ground.layers[].kFrozen_W_mK'),
      kThawed_W_mK: field('ground.layers[].kThawed_W_mK'),
      cFrozen_J_m3K: field('ground.layers[].cFrozen_J_m3K'),
      cThawed_J_m3K: field('ground.layers[].cThawed_J_m3K'),
      latent_J_m3: field('ground.layers[].latent_J_m3'),
      freezingPoint_C: field('ground.layers[].freezingPoint_C'),
      freezingInterval_K: opt(field('ground.layers[].freezingInterval_K')),
    },
    {
      requiredKeys: [
        'kFrozen_W_mK',
        'kThawed_W_mK',
        'cFrozen_J_m3K',
        'cThawed_J_m3K',
        'latent_J_m3',
        'freezingPoint_C',
      ],
    },
  ),
);

const uTube = fc.record({
  type: fc.constant('uTube' as const),
  pipeOuterDiameter_m: field('pile.loop.pipeOuterDiameter_m'),
  pipeInnerDiameter_m: field('pile.loop.pipeInnerDiameter_m'),
  pipeConductivity_W_mK: field('pile.loop.pipeConductivity_W_mK'),
  shankSpacing_m: field('pile.loop.shankSpacing_m'),
  fillConductivity_W_mK: field('pile.loop.fillConductivity_W_mK'),
});

const coaxial = fc.record({
  type: fc.constant('coaxial' as const),
  centreOuterDiameter_m: field('pile.loop.centreOuterDiameter_m'),
  centreInnerDiameter_m: field('pile.loop.centreInnerDiameter_m'),
  centreConductivity_W_mK: field('pile.loop.centreConductivity_W_mK'),
  downFlow: fc.constantFrom('annulus' as const, 'centre' as const),
});

/** A pipe geometry that fits the casing (fraction of the room the schema leaves), so most draws pass. */
const fittedUTube = fc
  .record({
    a: fc.double({ min: 0.05, max: 1, noNaN: true }),
    b: fc.double({ min: 0.5, max: 0.95, noNaN: true }),
  })
  .chain(({ a, b }) => uTube.map((u) => ({ ...u, fit: { a, b } })));

const fittedCoaxial = fc
  .record({
    a: fc.double({ min: 0.05, max: 0.98, noNaN: true }),
    b: fc.double({ min: 0.5, max: 0.95, noNaN: true }),
  })
  .chain(({ a, b }) => coaxial.map((c) => ({ ...c, fit: { a, b } })));

const pile = fc.record(
  {
    length_m: field('pile.length_m'),
    topDepth_m: opt(field('pile.topDepth_m')),
    outerDiameter_m: field('pile.outerDiameter_m'),
    // A fraction of the largest wall the schema leaves (mapped below).
    wallThickness_m: opt(within(0, 0.95)),
    steelConductivity_W_mK: opt(field('pile.steelConductivity_W_mK')),
    loop: fc.oneof(fittedUTube, fittedCoaxial, uTube, coaxial),
    fluid: fc.record({
      name: fc.constantFrom('water' as const, 'propyleneGlycol' as const, 'ethanol' as const),
      massFraction: field('pile.fluid.massFraction'),
    }),
    flow_L_min: opt(field('pile.flow_L_min')),
    resistance: opt(
      fc.record({ Rb_mK_W: field('pile.resistance.Rb_mK_W'), Ra_mK_W: field('pile.resistance.Ra_mK_W') }),
    ),
  },
  { requiredKeys: ['length_m', 'outerDiameter_m', 'loop', 'fluid'] },
);

const minEft = HeatPumpCurveSchema.shape.minEnteringFluid_C;

const heatPump = fc
  .record({
    minEnteringFluid_C: within(minEft.minValue ?? -30, minEft.maxValue ?? 20),
    shift_K: within(-15, 15),
  })
  .map(({ minEnteringFluid_C, shift_K }) => ({
    // The default curve's shape (layers/physics/heat-pump.ts) shifted along the EFT axis.
    enteringFluid_C: [-15, -10, -5, 0, 5, 10, 15].map((t) => Math.max(-30, Math.min(40, t + shift_K))),
    cop: [2.5, 2.85, 3.25, 3.7, 4.1, 4.5, 4.85],
    capacityRatio: [0.66, 0.77, 0.88, 1.0, 1.12, 1.24, 1.35],
    minEnteringFluid_C,
  }))
  .filter((c) => c.enteringFluid_C.every((t, i, a) => i === 0 || t > a[i - 1]));

const operation = fc.oneof(
  fc.record(
    {
      mode: fc.constant('heatRate' as const),
      extraction_W: field('operation.extraction_W'),
      monthlyFactors: opt(fc.array(field('operation.monthlyFactors[]'), { minLength: 12, maxLength: 12 })),
    },
    { requiredKeys: ['mode', 'extraction_W'] },
  ),
  fc.record(
    {
      mode: fc.constant('inletTemperature' as const),
      inlet_C: field('operation.inlet_C'),
      flow_L_min: field('operation.flow_L_min'),
      monthlyOn: opt(fc.array(fc.boolean(), { minLength: 12, maxLength: 12 })),
    },
    { requiredKeys: ['mode', 'inlet_C', 'flow_L_min'] },
  ),
  fc.record(
    {
      mode: fc.constant('building' as const),
      designLoad_W: field('operation.designLoad_W'),
      pileCount: field('operation.pileCount').map(Math.round),
      balancePoint_C: opt(field('operation.balancePoint_C')),
      heatPump: opt(heatPump),
    },
    { requiredKeys: ['mode', 'designLoad_W', 'pileCount'] },
  ),
);

export interface ShortRun {
  /** Simulated years (default 1). */
  years?: number;
  /** Shortest time step drawn, days (default 7). */
  minStep_days?: number;
}

/** Site drafts over the schema's limits, restricted to short coarse runs (see the module comment). */
export function siteDraftArbitrary(short: ShortRun = {}): fc.Arbitrary<SiteInputDraft> {
  const years = short.years ?? 1;
  const stepLimits = limits('timeStep_days');
  const minStep = Math.max(stepLimits.min, short.minStep_days ?? 7);
  return fc
    .record({
      timeStep_days: within(minStep, stepLimits.max),
      outputFactor: fc.double({ min: 1, max: 12, noNaN: true }),
      thickness: fc.array(fc.double({ min: 0.05, max: 1, noNaN: true }), { minLength: 1, maxLength: 3 }),
      layerProps: fc.array(layerProps, { minLength: 3, maxLength: 3 }),
      geothermalFlux_W_m2: opt(field('ground.geothermalFlux_W_m2')),
      initial: fc.oneof(
        fc.constant('equilibrium' as const),
        field('ground.initial.uniform_C').map((uniform_C) => ({ uniform_C })),
      ),
      climate: fc.record({
        meanAirTemp_C: field('climate.meanAirTemp_C'),
        amplitude_C: field('climate.amplitude_C'),
        warming_C_per_yr: field('climate.warming_C_per_yr'),
        nThaw: field('climate.nThaw'),
        nFreeze: field('climate.nFreeze'),
        coldestDay: opt(field('climate.coldestDay')),
      }),
      pile: fc.option(pile, { nil: null, freq: 5 }),
      operation,
      probes: fc.array(
        fc.record({
          r: fc.double({ min: 0, max: 1, noNaN: true }),
          z: fc.double({ min: 0, max: 1, noNaN: true }),
        }),
        { maxLength: 4 },
      ),
      domain: fc.record({ radius_m: field('domain.radius_m'), depth_m: field('domain.depth_m') }),
      tolerance_K: opt(field('numerics.tolerance_K')),
    })
    .map((d) => {
      const wallLimits = limits('pile.wallThickness_m');
      const pileIn = d.pile
        ? {
            ...d.pile,
            wallThickness_m:
              d.pile.wallThickness_m === undefined
                ? undefined
                : Math.max(
                    wallLimits.min,
                    Math.min(wallLimits.max, d.pile.wallThickness_m * (d.pile.outerDiameter_m / 2)),
                  ),
          }
        : null;
      // The domain holds the pile (2 m below it, ten pile radii around it), within the schema's limits.
      const depth = Math.min(
        limits('domain.depth_m').max,
        Math.max(d.domain.depth_m, pileIn ? (pileIn.topDepth_m ?? 1) + pileIn.length_m + 2 : 0),
      );
      const radius = Math.min(
        limits('domain.radius_m').max,
        Math.max(d.domain.radius_m, pileIn ? 5.01 * pileIn.outerDiameter_m : 0),
      );
      // Layers: fractions of the domain depth, contiguous from the surface (the last may end above it).
      const total = d.thickness.reduce((a, b) => a + b, 0);
      let top = 0;
      const layers = d.thickness.map((t, i) => {
        const bottom = i === d.thickness.length - 1 ? depth : Math.min(depth, top + (t / total) * depth);
        const props = d.layerProps[i];
        let layer: Record<string, unknown> = { top_m: top, bottom_m: bottom, ...props };
        if ('soil' in props && props.soil) {
          const t = TEXTURE_CATALOGUE[props.soil.texture];
          const dens = limits('ground.layers[].soil.dryDensity_kg_m3');
          const rhoD =
            props.soil.dryDensity_kg_m3 === undefined
              ? t.dryDensity_kg_m3
              : Math.max(dens.min, Math.min(dens.max, props.soil.dryDensity_kg_m3 * t.solidsDensity_kg_m3));
          const water = limits('ground.layers[].soil.waterContent_m3m3');
          const soil = {
            ...props.soil,
            ...(props.soil.dryDensity_kg_m3 === undefined ? {} : { dryDensity_kg_m3: rhoD }),
            waterContent_m3m3: Math.min(
              water.max,
              props.soil.waterContent_m3m3 * (1 - rhoD / t.solidsDensity_kg_m3),
            ),
          };
          layer = { ...layer, soil };
        }
        top = bottom;
        return layer;
      });
      let pileOut: unknown = null;
      if (pileIn) {
        const { loop, ...rest } = pileIn;
        let loopOut: Record<string, unknown> = loop;
        const ri = pileIn.outerDiameter_m / 2 - (pileIn.wallThickness_m ?? 0.0095);
        if ('fit' in loop && loop.type === 'coaxial') {
          const { fit, ...c } = loop;
          const co = limits('pile.loop.centreOuterDiameter_m');
          const ci = limits('pile.loop.centreInnerDiameter_m');
          const outer = Math.max(co.min, Math.min(co.max, fit.a * 2 * ri));
          loopOut = {
            ...c,
            centreOuterDiameter_m: outer,
            centreInnerDiameter_m: Math.max(ci.min, fit.b * outer),
          };
        } else if ('fit' in loop) {
          // Fit the U-tube into the casing: the pipe at a fraction of the largest the casing takes.
          const { fit, ...u } = loop;
          const po = Math.max(0.005, Math.min(0.2, fit.a * ri));
          loopOut = {
            ...u,
            pipeOuterDiameter_m: po,
            pipeInnerDiameter_m: Math.max(0.004, fit.b * po),
            shankSpacing_m: Math.max(0.005, po + fit.b * Math.max(0, 2 * ri - 2 * po)),
          };
        }
        pileOut = Object.fromEntries(
          Object.entries({ ...rest, loop: loopOut }).filter(([, v]) => v !== undefined),
        );
      }
      return {
        years,
        timeStep_days: d.timeStep_days,
        outputStep_days: Math.min(366, d.timeStep_days * d.outputFactor),
        ground: {
          layers,
          ...(d.geothermalFlux_W_m2 === undefined ? {} : { geothermalFlux_W_m2: d.geothermalFlux_W_m2 }),
          initial: d.initial,
        },
        climate: d.climate,
        pile: pileOut,
        operation: d.operation,
        probes: d.probes.map((p) => ({ r_m: p.r * radius, z_m: p.z * depth })),
        domain: { radius_m: radius, depth_m: depth },
        numerics: {
          fidelity: 'coarse',
          ...(d.tolerance_K === undefined ? {} : { tolerance_K: d.tolerance_K }),
        },
      } as SiteInputDraft;
    });
}
