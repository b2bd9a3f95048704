/**
 * Cross-field rules of the site input schema (site-input-schema.ts) that the simulator's physics would
 * otherwise enforce deep inside a run: one schema for what the simulator accepts (issue 20 item 6).
 * Each rule adds a zod issue at the path of the field the user gave, in the user's terms (diameters,
 * not the radii the physics takes). Where a rule is a physical plausibility limit rather than a model's
 * domain of validity, its source is given beside it. After the explicit rules, every soil layer and the
 * pile loop are resolved by the very functions the simulator calls (`soilThermalProperties`,
 * `loopResistances`), and anything those still refuse is reported at the layer's or the pile's path, so
 * the schema and the simulator cannot disagree.
 */
import type { z } from 'zod';
import { freezingPoint_C } from '../physics/fluids';
import { TEXTURE_CATALOGUE, soilThermalProperties } from '../physics/soil-catalogue';
import { loopResistances } from './site-operation';

type Ctx = z.RefinementCtx;
type Path = (string | number)[];

/** The fields of a parsed input the rules read (structurally typed to avoid a cycle with the schema). */
interface SoilIn {
  texture: keyof typeof TEXTURE_CATALOGUE;
  waterContent_m3m3: number;
  dryDensity_kg_m3?: number;
  quartzFraction?: number;
  specificSurface_m2_g?: number;
}
interface LayerIn {
  top_m: number;
  bottom_m: number;
  soil?: SoilIn;
  kFrozen_W_mK?: number;
  kThawed_W_mK?: number;
}

/** Porosity limits of the conductivity models (Johansen 1975; Côté & Konrad 2005 as coded in physics). */
const POROSITY_MIN = 0.01;
const POROSITY_MAX = 0.99;
/** Smallest non-zero specific surface of the Anderson & Tice (1972) unfrozen-water curve as coded. */
const SPECIFIC_SURFACE_MIN_m2_g = 0.1;

/**
 * Ranges of the explicit layer properties (the schema's fields use them too); a soil description must
 * resolve to properties inside them, so a layer given either way reaches the solver in the same range.
 */
export const LAYER_PROPERTY_LIMITS = {
  kFrozen_W_mK: { min: 0.02, max: 10, unit: 'W/m·K' },
  kThawed_W_mK: { min: 0.02, max: 10, unit: 'W/m·K' },
  cFrozen_J_m3K: { min: 1e5, max: 6e6, unit: 'J/m³·K' },
  cThawed_J_m3K: { min: 1e5, max: 6e6, unit: 'J/m³·K' },
  latent_J_m3: { min: 0, max: 3.4e8, unit: 'J/m³' },
  freezingPoint_C: { min: -10, max: 0.5, unit: '°C' },
} as const;

const add = (ctx: Ctx, path: Path, message: string): void => ctx.addIssue({ code: 'custom', path, message });
const f3 = (x: number): string => String(Math.round(x * 1000) / 1000);

/**
 * Soil description rules: porosity from the dry density within the models' range (water above the
 * porosity is excess ice and accepted), a specific surface of 0 (coarse) or within the unfrozen-water curve; then the catalogue
 * itself. Returns the layer's lower conductivity (frozen or thawed), W/m·K, or NaN if it has issues.
 */
export function soilRules(soil: SoilIn, path: Path, ctx: Ctx): number {
  const t = TEXTURE_CATALOGUE[soil.texture];
  const rhoS = t.solidsDensity_kg_m3;
  const rhoD = soil.dryDensity_kg_m3 ?? t.dryDensity_kg_m3;
  const given = soil.dryDensity_kg_m3 !== undefined ? '' : ' (the default for the texture)';
  const n = 1 - rhoD / rhoS;
  let ok = true;
  if (n < POROSITY_MIN || n > POROSITY_MAX) {
    ok = false;
    add(
      ctx,
      [...path, 'dryDensity_kg_m3'],
      `dry density ${f3(rhoD)} kg/m³${given} gives a porosity of ${f3(n)} for ${soil.texture} (solids ${rhoS} kg/m³); ` +
        `it must be between ${f3((1 - POROSITY_MAX) * rhoS)} and ${f3((1 - POROSITY_MIN) * rhoS)} kg/m³ (porosity ${POROSITY_MIN}–${POROSITY_MAX})`,
    );
  }
  // Water above the porosity is excess ice (segregated ice: the soil catalogue carries it in the
  // latent heat, capacity and conductivity), not an error; the field's own limit (0.95) caps it.
  const s = soil.specificSurface_m2_g;
  if (s !== undefined && s > 0 && s < SPECIFIC_SURFACE_MIN_m2_g) {
    ok = false;
    add(
      ctx,
      [...path, 'specificSurface_m2_g'],
      `specific surface ${s} m²/g must be 0 (a coarse soil without unfrozen water) or at least ${SPECIFIC_SURFACE_MIN_m2_g} m²/g`,
    );
  }
  if (!ok) return NaN;
  try {
    const p = soilThermalProperties(soil);
    for (const [key, lim] of Object.entries(LAYER_PROPERTY_LIMITS)) {
      const v = p[key as keyof typeof LAYER_PROPERTY_LIMITS];
      if (!(v >= lim.min && v <= lim.max)) {
        add(
          ctx,
          path,
          `the soil catalogue resolves this layer to ${key} = ${v.toPrecision(4)} ${lim.unit}, outside the range ` +
            `${lim.min}–${lim.max} ${lim.unit} the simulator accepts` +
            (key === 'freezingPoint_C'
              ? ' (too dry for the unfrozen-water curve: raise waterContent_m3m3 or give explicit properties)'
              : ''),
        );
        return NaN;
      }
    }
    return Math.min(p.kFrozen_W_mK, p.kThawed_W_mK);
  } catch (e) {
    add(ctx, path, `the soil catalogue cannot resolve this layer: ${(e as Error).message}`);
    return NaN;
  }
}

/**
 * Steady geothermal rise over the domain: q·Σ h/k_min must stay at most `GEOTHERMAL_RISE_MAX_K` (the
 * model has no boiling of pore water or other deep processes; at 0.06 W/m² and 2 W/m·K it is 30 K per km,
 * the continental average gradient, common practice).
 */
export const GEOTHERMAL_RISE_MAX_K = 100;

export function groundRules(
  layers: readonly LayerIn[],
  flux_W_m2: number,
  depth_m: number,
  kMin_W_mK: readonly number[],
  ctx: Ctx,
): void {
  let rise = 0;
  for (let i = 0; i < layers.length; i++) {
    const bottom = i === layers.length - 1 ? Math.max(layers[i].bottom_m, depth_m) : layers[i].bottom_m;
    rise += (flux_W_m2 * Math.max(0, bottom - layers[i].top_m)) / kMin_W_mK[i];
  }
  if (Number.isFinite(rise) && rise > GEOTHERMAL_RISE_MAX_K) {
    add(
      ctx,
      ['ground', 'geothermalFlux_W_m2'],
      `geothermal flux ${flux_W_m2} W/m² through the layers' conductivities would warm the ground by ${f3(rise)} K ` +
        `down to the domain depth ${depth_m} m (at most ${GEOTHERMAL_RISE_MAX_K} K): lower the flux or domain.depth_m`,
    );
  }
}

/**
 * Surface temperatures over the run within the range of the Earth's surface: the coldest n-factored
 * value at least `SURFACE_MIN_C`, the warmest at most `SURFACE_MAX_C`.
 * −89.2 °C: lowest air temperature measured (Vostok, 21 July 1983; WMO weather and climate extremes
 * archive, recalled from memory), rounded to −90 °C; +70 °C: about the hottest ground surfaces measured
 * (desert soil surfaces, recalled from memory).
 */
export const SURFACE_MIN_C = -90;
export const SURFACE_MAX_C = 70;

interface ClimateIn {
  meanAirTemp_C: number;
  amplitude_C: number;
  warming_C_per_yr: number;
  warmingPathway?: { time_yr: number; airWarming_K: number }[];
  nThaw: number;
  nFreeze: number;
}

export function climateRules(climate: ClimateIn, years: number, ctx: Ctx): void {
  const path = climate.warmingPathway;
  if (path) {
    for (let i = 1; i < path.length; i++) {
      if (!(path[i].time_yr > path[i - 1].time_yr)) {
        add(
          ctx,
          ['climate', 'warmingPathway', i, 'time_yr'],
          `must be after warmingPathway[${i - 1}].time_yr (${path[i - 1].time_yr}); received ${path[i].time_yr}`,
        );
      }
    }
  }
  const offsets = path ? path.map((p) => p.airWarming_K) : [climate.warming_C_per_yr * years];
  const low = Math.min(0, ...offsets);
  const high = Math.max(0, ...offsets);
  const drift = Math.abs(low) > Math.abs(high) ? low : high;
  const coldAir = climate.meanAirTemp_C - climate.amplitude_C + low;
  const warmAir = climate.meanAirTemp_C + climate.amplitude_C + high;
  const cold = coldAir < 0 ? climate.nFreeze * coldAir : climate.nThaw * coldAir;
  const warm = warmAir < 0 ? climate.nFreeze * warmAir : climate.nThaw * warmAir;
  const trend = drift !== 0 ? ` after ${f3(drift)} K of trend over ${years} years` : '';
  if (cold < SURFACE_MIN_C) {
    add(
      ctx,
      ['climate', 'nFreeze'],
      `the coldest surface temperature nFreeze × (mean − amplitude${trend}) = ${f3(cold)} °C is below ${SURFACE_MIN_C} °C ` +
        '(colder than any measured on Earth): check meanAirTemp_C, amplitude_C, warming_C_per_yr and nFreeze',
    );
  }
  if (warm > SURFACE_MAX_C) {
    add(
      ctx,
      ['climate', 'nThaw'],
      `the warmest surface temperature nThaw × (mean + amplitude${trend}) = ${f3(warm)} °C is above ${SURFACE_MAX_C} °C ` +
        '(hotter than ground surfaces get): check meanAirTemp_C, amplitude_C, warming_C_per_yr and nThaw',
    );
  }
}

interface PileIn {
  length_m: number;
  topDepth_m: number;
  outerDiameter_m: number;
  wallThickness_m: number;
  steelConductivity_W_mK: number;
  flow_L_min: number;
  fluid: { name: 'water' | 'propyleneGlycol' | 'ethanol'; massFraction: number };
  loop:
    | {
        type: 'uTube';
        pipeOuterDiameter_m: number;
        pipeInnerDiameter_m: number;
        pipeConductivity_W_mK: number;
        shankSpacing_m: number;
        fillConductivity_W_mK: number;
      }
    | {
        type: 'coaxial';
        centreOuterDiameter_m: number;
        centreInnerDiameter_m: number;
        centreConductivity_W_mK: number;
        downFlow: 'annulus' | 'centre';
      };
  resistance?: { Rb_mK_W: number; Ra_mK_W: number };
}

/** Centre pipe at most this fraction of the casing's inner diameter (pile-resistance.ts annulus limit). */
const CENTRE_PIPE_MAX_FRACTION = 0.98;

/**
 * Pipes that fit the casing (in diameters): U-tube legs side by side (outer diameter at most half the
 * casing's inner diameter, spacing between one pipe diameter and the inner diameter less one), inner
 * diameters below outer ones, a coaxial centre pipe inside the casing; then the resistance calculation
 * itself. The casing's inner diameter is outerDiameter_m − 2 wallThickness_m.
 */
export function pileRules(pile: PileIn, flow_L_min: number, ctx: Ctx): void {
  const Di = pile.outerDiameter_m - 2 * pile.wallThickness_m;
  if (!(Di > 0)) return; // reported by the wall-thickness rule
  const casing = `the casing's inner diameter (outerDiameter_m − 2 wallThickness_m = ${f3(Di)} m)`;
  const path: Path = ['pile', 'loop'];
  let bad = false;
  const add = (ctx2: Ctx, p: Path, message: string): void => {
    bad = true;
    ctx2.addIssue({ code: 'custom', path: p, message });
  };
  const l = pile.loop;
  if (l.type === 'uTube') {
    if (l.pipeOuterDiameter_m > Di / 2) {
      add(
        ctx,
        [...path, 'pipeOuterDiameter_m'],
        `U-tube pipe outer diameter ${l.pipeOuterDiameter_m} m must be at most half ${casing} so both legs fit`,
      );
    } else if (l.shankSpacing_m < l.pipeOuterDiameter_m || l.shankSpacing_m > Di - l.pipeOuterDiameter_m) {
      add(
        ctx,
        [...path, 'shankSpacing_m'],
        `leg spacing ${l.shankSpacing_m} m must lie between the pipe outer diameter ${l.pipeOuterDiameter_m} m (legs touching) ` +
          `and ${casing} less one pipe diameter, ${f3(Di - l.pipeOuterDiameter_m)} m (legs at the wall)`,
      );
    }
    if (!(l.pipeInnerDiameter_m < l.pipeOuterDiameter_m)) {
      add(
        ctx,
        [...path, 'pipeInnerDiameter_m'],
        `U-tube pipe inner diameter ${l.pipeInnerDiameter_m} m must be below its outer diameter ${l.pipeOuterDiameter_m} m`,
      );
    }
  } else {
    if (l.centreOuterDiameter_m > CENTRE_PIPE_MAX_FRACTION * Di) {
      add(
        ctx,
        [...path, 'centreOuterDiameter_m'],
        `centre pipe outer diameter ${l.centreOuterDiameter_m} m must be at most ${CENTRE_PIPE_MAX_FRACTION} × ${casing} to leave an annulus`,
      );
    }
    if (!(l.centreInnerDiameter_m < l.centreOuterDiameter_m)) {
      add(
        ctx,
        [...path, 'centreInnerDiameter_m'],
        `centre pipe inner diameter ${l.centreInnerDiameter_m} m must be below its outer diameter ${l.centreOuterDiameter_m} m`,
      );
    }
  }
  if (bad) return;
  try {
    loopResistances(pile as Parameters<typeof loopResistances>[0], flow_L_min);
  } catch (e) {
    add(ctx, ['pile'], `the pile's loop cannot be resolved: ${(e as Error).message}`);
  }
}

interface OperationIn {
  mode: 'heatRate' | 'inletTemperature' | 'building';
  inlet_C?: number;
  extraction_W?: number;
  monthlyFactors?: number[];
  heatPump?: { minEnteringFluid_C: number };
}

/**
 * Largest heat rate per metre of active pile the simulator accepts, W/m. Ground heat exchangers
 * deliver some 10–80 W/m (common practice); 2000 W/m would need a fluid hundreds of kelvin from the
 * ground in any soil, so a rate above it is a mistyped input, refused here by name rather than left to
 * a run that cannot converge.
 */
export const MAX_HEAT_RATE_W_PER_M = 2000;

/** Heat-rate mode: the peak monthly rate per metre of the active pile length within ±MAX_HEAT_RATE_W_PER_M. */
export function heatRateRules(length_m: number, op: OperationIn, ctx: Ctx): void {
  if (op.mode !== 'heatRate' || op.extraction_W === undefined || !(length_m > 0)) return;
  const factor = op.monthlyFactors ? Math.max(...op.monthlyFactors.map(Math.abs)) : 1;
  const peak = Math.abs(op.extraction_W) * factor;
  const perMetre = peak / length_m;
  if (perMetre > MAX_HEAT_RATE_W_PER_M) {
    add(
      ctx,
      ['operation', 'extraction_W'],
      `the peak heat rate ${f3(peak)} W over the pile's ${f3(length_m)} m is ${f3(perMetre)} W/m, above the ${MAX_HEAT_RATE_W_PER_M} W/m any ground can supply or take (10–80 W/m is usual)`,
    );
  }
}

/**
 * The fluid must not be frozen by the operation as given: an inlet temperature above the fluid's
 * freezing point; in building mode a lowest entering temperature of the heat pump above it (the heat
 * pump holds its entering fluid there and the fluid leaving it is colder still). `defaultMinEft_C` is the
 * default curve's lowest EFT.
 */
export function fluidRules(pile: PileIn, op: OperationIn, defaultMinEft_C: number, ctx: Ctx): void {
  let tf: number;
  try {
    tf = freezingPoint_C({
      fluid: pile.fluid.name,
      massFraction: pile.fluid.name === 'water' ? 0 : pile.fluid.massFraction,
    });
  } catch (e) {
    add(ctx, ['pile', 'fluid'], (e as Error).message);
    return;
  }
  const fluid = `the freezing point ${f3(tf)} °C of pile.fluid (${pile.fluid.name}${pile.fluid.name === 'water' ? '' : ` at ${pile.fluid.massFraction} by mass`})`;
  if (op.mode === 'inletTemperature' && op.inlet_C !== undefined && !(op.inlet_C > tf)) {
    add(
      ctx,
      ['operation', 'inlet_C'],
      `inlet temperature ${op.inlet_C} °C is not above ${fluid}: raise it or use more antifreeze`,
    );
  }
  if (op.mode === 'building') {
    const minEft = op.heatPump ? op.heatPump.minEnteringFluid_C : defaultMinEft_C;
    if (!(minEft > tf)) {
      add(
        ctx,
        op.heatPump ? ['operation', 'heatPump', 'minEnteringFluid_C'] : ['pile', 'fluid'],
        `the heat pump's lowest entering fluid temperature ${minEft} °C${op.heatPump ? '' : ' (default curve)'} is not above ${fluid}: ` +
          'the loop would freeze before the heat pump stops; use more antifreeze or a higher minEnteringFluid_C',
      );
    }
  }
}
