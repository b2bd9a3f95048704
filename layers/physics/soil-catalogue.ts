import { TEXTURE_CODES, type TextureName } from './texture-codes';
import { SOIL_CONSTITUENTS as S } from './soil-constituents';
import {
  johansenConductivity_W_mK,
  johansenDryConductivity_W_mK,
  johansenSaturatedConductivity_W_mK,
  johansenSolidsConductivity_W_mK,
  type Grading,
} from './johansen-conductivity';
import { coteKonradConductivity_W_mK } from './cote-konrad-conductivity';
import { deVriesHeatCapacity_J_m3K, volumetricLatentHeat_J_m3 } from './soil-heat-capacity';
import { freezingPoint_C, unfrozenWaterContent_m3m3 } from './unfrozen-water';
import { requireFinite, requireOneOf, requireRange } from './validate';

/**
 * The texture catalogue: default parameters per texture class (codes in TEXTURE_CODES) and the resolver
 * `soilThermalProperties` that turns a layer description into thermal properties through the Johansen
 * (1975) conductivity (Côté & Konrad 2005 for peat), the de Vries (1963) heat capacity, the latent heat
 * of the pore water and the Anderson & Tice (1972) unfrozen-water curve. Defaults are typical values,
 * not measurements: replace them with site data where known.
 */
export interface TextureDefaults {
  kind: 'mineral' | 'organic' | 'rock';
  grading: Grading;
  /** Dry bulk density, kg/m³. */
  dryDensity_kg_m3: number;
  /** Density of the solids, kg/m³. */
  solidsDensity_kg_m3: number;
  /** Quartz fraction of the solids (mineral soils). */
  quartzFraction: number;
  /** Specific surface area, m²/g (fine soils; 0 = freezes completely at 0 °C). */
  specificSurface_m2_g: number;
  /** Conductivity of the solids (rock: the rock matrix), W/m·K; 0 = from quartz fraction (Johansen). */
  solidsConductivity_W_mK: number;
  /** Specific heat of the solids, J/kg·K. */
  solidsSpecificHeat_J_kgK: number;
  source: string;
}

const MINERAL_SOURCE =
  'densities and quartz fractions: typical values (common practice, cf. Farouki 1981 ch. 7); ' +
  'specific surface: Anderson & Tice (1972) range for the class (recalled from memory)';

export const TEXTURE_CATALOGUE: Record<TextureName, TextureDefaults> = {
  gravel: {
    kind: 'mineral',
    grading: 'coarse',
    dryDensity_kg_m3: 1900,
    solidsDensity_kg_m3: S.mineralSolidsDensity_kg_m3,
    quartzFraction: 0.6,
    specificSurface_m2_g: 0,
    solidsConductivity_W_mK: 0,
    solidsSpecificHeat_J_kgK: S.mineralSpecificHeat_J_kgK,
    source: MINERAL_SOURCE,
  },
  sand: {
    kind: 'mineral',
    grading: 'coarse',
    dryDensity_kg_m3: 1600,
    solidsDensity_kg_m3: S.mineralSolidsDensity_kg_m3,
    quartzFraction: 0.6,
    specificSurface_m2_g: 0,
    solidsConductivity_W_mK: 0,
    solidsSpecificHeat_J_kgK: S.mineralSpecificHeat_J_kgK,
    source: MINERAL_SOURCE,
  },
  silt: {
    kind: 'mineral',
    grading: 'fine',
    dryDensity_kg_m3: 1400,
    solidsDensity_kg_m3: S.mineralSolidsDensity_kg_m3,
    quartzFraction: 0.3,
    specificSurface_m2_g: 20,
    solidsConductivity_W_mK: 0,
    solidsSpecificHeat_J_kgK: S.mineralSpecificHeat_J_kgK,
    source: MINERAL_SOURCE,
  },
  clay: {
    kind: 'mineral',
    grading: 'fine',
    dryDensity_kg_m3: 1300,
    solidsDensity_kg_m3: S.mineralSolidsDensity_kg_m3,
    quartzFraction: 0.2,
    specificSurface_m2_g: 100,
    solidsConductivity_W_mK: 0,
    solidsSpecificHeat_J_kgK: S.mineralSpecificHeat_J_kgK,
    source: MINERAL_SOURCE,
  },
  peat: {
    kind: 'organic',
    grading: 'fine',
    dryDensity_kg_m3: 150,
    solidsDensity_kg_m3: S.organicSolidsDensity_kg_m3,
    quartzFraction: 0,
    specificSurface_m2_g: 0,
    solidsConductivity_W_mK: S.organicConductivity_W_mK,
    solidsSpecificHeat_J_kgK: S.organicSpecificHeat_J_kgK,
    source:
      'Côté & Konrad (2005) organic fibrous parameters; organic solids 0.25 W/m·K, 1300 kg/m³, 1920 J/kg·K ' +
      '(de Vries 1963, recalled from memory); dry density 150 kg/m³ (common practice for fibric peat)',
  },
  bedrock: {
    kind: 'rock',
    grading: 'coarse',
    dryDensity_kg_m3: 2600,
    solidsDensity_kg_m3: 2700,
    quartzFraction: 0,
    specificSurface_m2_g: 0,
    solidsConductivity_W_mK: 3.0,
    solidsSpecificHeat_J_kgK: 800,
    source:
      'crystalline rock matrix 3.0 W/m·K, 2700 kg/m³, 800 J/kg·K, porosity ≈ 0.04 (common practice; ' +
      'measured rock values vary from about 2 to 4 W/m·K)',
  },
};

/**
 * Largest total water + ice content accepted, m³/m³: above the texture's porosity the excess is carried
 * as excess ice (soilThermalProperties); 0.99 keeps a solids fraction (common practice: ice-rich
 * permafrost with massive ice runs to 0.9 and more by volume).
 */
export const MAX_WATER_CONTENT_M3M3 = 0.99;

export interface SoilLayerDescription {
  texture: TextureName;
  /**
   * Total volumetric water + ice content, m³/m³ (0 … MAX_WATER_CONTENT_M3M3); above the porosity the
   * excess is excess ice.
   */
  waterContent_m3m3: number;
  dryDensity_kg_m3?: number;
  quartzFraction?: number;
  specificSurface_m2_g?: number;
  /** Temperature at which the frozen properties are evaluated (unfrozen water), °C; default −2. */
  frozenTemperature_C?: number;
  /** Conductivity model for mineral soils; default 'johansen'. */
  conductivityModel?: 'johansen' | 'cote-konrad';
}

export interface SoilThermalProperties {
  kFrozen_W_mK: number;
  kThawed_W_mK: number;
  cFrozen_J_m3K: number;
  cThawed_J_m3K: number;
  /** Volumetric latent heat of all pore water and excess ice, J/m³ (ρ_w·L_f·θ). */
  latent_J_m3: number;
  freezingPoint_C: number;
  /** Porosity of the texture at its dry density (before any excess ice). */
  porosity: number;
  /**
   * Excess ice: volume of ice beyond the pore space per volume of frozen ground, counted as its water
   * volume (as θ is), e = (θ − n)/(1 − n) for θ > n, else 0, m³/m³. Draining, its meltwater leaves a
   * thaw strain of about e (settlement per metre of thawed ground).
   */
  excessIce_m3m3: number;
  /** Unfrozen volumetric water at frozenTemperature_C, m³/m³. */
  unfrozenWater_m3m3: number;
  /** Dry bulk density of the ground as resolved (lowered by excess ice: ρ_s·(1 − θ)), kg/m³. */
  dryDensity_kg_m3: number;
}

const TEXTURE_NAMES = Object.values(TEXTURE_CODES) as TextureName[];

/** A soil layer description checked and resolved against its texture's defaults (excess ice included). */
interface ResolvedSoil {
  texture: TextureName;
  d: TextureDefaults;
  /** Porosity of the soil itself, and of the ground with its excess ice (n → θ). */
  n0: number;
  n: number;
  theta: number;
  excess: number;
  /** Dry density of the ground, kg/m³ (ρ_s(1 − θ) with excess ice). */
  rhoDGround: number;
  q: number;
  sArea: number;
  tFrozen: number;
  model: 'johansen' | 'cote-konrad';
}

/** Checks every field of `layer` (RangeError naming it) and resolves the defaults and excess ice. */
function resolveSoil(layer: SoilLayerDescription): ResolvedSoil {
  const texture = requireOneOf('texture', layer.texture, TEXTURE_NAMES);
  const d = TEXTURE_CATALOGUE[texture];
  const rhoD = requireRange(
    'dryDensity_kg_m3',
    layer.dryDensity_kg_m3 ?? d.dryDensity_kg_m3,
    10,
    d.solidsDensity_kg_m3 - 10,
    'kg/m3',
  );
  const n0 = 1 - rhoD / d.solidsDensity_kg_m3;
  const theta = requireRange(
    'waterContent_m3m3',
    layer.waterContent_m3m3,
    0,
    MAX_WATER_CONTENT_M3M3,
    `m3/m3 (above the porosity ${n0.toFixed(3)} of ${texture}: excess ice)`,
  );
  // Excess ice: the soil expanded by the ice beyond its pores (porosity n → θ, ρd → ρs(1 − θ)).
  const excess = theta > n0 ? (theta - n0) / (1 - n0) : 0;
  const n = theta > n0 ? theta : n0;
  const rhoDGround = theta > n0 ? d.solidsDensity_kg_m3 * (1 - theta) : rhoD;
  const q = requireRange('quartzFraction', layer.quartzFraction ?? d.quartzFraction, 0, 1);
  const sArea = requireRange(
    'specificSurface_m2_g',
    layer.specificSurface_m2_g ?? d.specificSurface_m2_g,
    0,
    1000,
    'm2/g',
  );
  const tFrozen = requireRange('frozenTemperature_C', layer.frozenTemperature_C ?? -2, -60, -0.01, 'C');
  const model = requireOneOf('conductivityModel', layer.conductivityModel ?? 'johansen', [
    'johansen',
    'cote-konrad',
  ] as const);

  return { texture, d, n0, n, theta, excess, rhoDGround, q, sArea, tFrozen, model };
}

/** Thawed and frozen conductivities, W/m·K: rock saturated, Côté & Konrad (peat or chosen), Johansen. */
function soilConductivities(r: ResolvedSoil, thetaU: number): { kThawed: number; kFrozen: number } {
  const { texture, d, n, theta, rhoDGround, q, model } = r;
  if (d.kind === 'rock') {
    const ks = d.solidsConductivity_W_mK;
    const kThawed = johansenSaturatedConductivity_W_mK({
      porosity: n,
      solidsConductivity_W_mK: ks,
      state: 'thawed',
    });
    const kFrozen = johansenSaturatedConductivity_W_mK({
      porosity: n,
      solidsConductivity_W_mK: ks,
      state: 'frozen',
    });
    return { kThawed, kFrozen };
  }
  if (d.kind === 'organic' || model === 'cote-konrad') {
    const organic = d.kind === 'organic';
    const ks = organic ? d.solidsConductivity_W_mK : johansenSolidsConductivity_W_mK(q, d.grading);
    const group = organic
      ? 'organicFibrous'
      : texture === 'gravel'
        ? 'gravelCoarseSand'
        : texture === 'sand'
          ? 'mediumFineSand'
          : 'siltClay';
    const base = {
      porosity: n,
      waterContent_m3m3: theta,
      solidsConductivity_W_mK: ks,
      group,
      dryClass: organic ? 'organicFibrous' : 'naturalMineral',
    } as const;
    const kThawed = coteKonradConductivity_W_mK({ ...base, state: 'thawed' });
    const kFrozen = coteKonradConductivity_W_mK({ ...base, state: 'frozen' });
    return { kThawed, kFrozen };
  }
  const base = {
    porosity: n,
    waterContent_m3m3: theta,
    solidsConductivity_W_mK: johansenSolidsConductivity_W_mK(q, d.grading),
    dryConductivity_W_mK: johansenDryConductivity_W_mK(rhoDGround),
    grading: d.grading,
  };
  const kThawed = johansenConductivity_W_mK({ ...base, state: 'thawed' });
  const kFrozen = johansenConductivity_W_mK({ ...base, state: 'frozen', unfrozenWater_m3m3: thetaU });
  return { kThawed, kFrozen };
}

/** Thawed and frozen heat capacities, J/m³·K (de Vries; the ice as frozen water mass × c_ice). */
function soilHeatCapacities(r: ResolvedSoil, thetaU: number): { cThawed: number; cFrozen: number } {
  const { d, n, theta } = r;
  const solidsFraction = 1 - n;
  const solidsC = d.solidsDensity_kg_m3 * d.solidsSpecificHeat_J_kgK;
  const capacity = (liquid: number, ice: number): number =>
    d.kind === 'organic'
      ? deVriesHeatCapacity_J_m3K({
          mineralFraction: 0,
          organicFraction: solidsFraction,
          liquidWater_m3m3: liquid,
          ice_m3m3: ice,
        })
      : deVriesHeatCapacity_J_m3K({
          mineralFraction: solidsFraction,
          liquidWater_m3m3: liquid,
          ice_m3m3: ice,
          mineralHeatCapacity_J_m3K: solidsC,
        });
  // The ice term uses the mass of the frozen water, ρ_w·(θ − θu), times c_ice (equivalent to de Vries'
  // ρ_ice·c_ice·θ_ice with the ice volume θ_ice = ρ_w(θ − θu)/ρ_ice, without the 9 % expansion clipping
  // the volume budget of a saturated soil).
  const cThawed = capacity(theta, 0);
  const cFrozen = capacity(thetaU, 0) + (theta - thetaU) * S.waterDensity_kg_m3 * S.iceSpecificHeat_J_kgK;
  return { cThawed, cFrozen };
}

/**
 * Resolves a soil layer description to thermal properties. Porosity n = 1 − ρd/ρs; water content in
 * [0, MAX_WATER_CONTENT_M3M3]. Water above the porosity is excess ice (segregated or disseminated ice
 * of ice-rich permafrost), never clipped: the ground is taken as the soil expanded by that ice, solids
 * fraction (1 − e)(1 − n) = 1 − θ, i.e. porosity raised to the water content and dry density lowered
 * to ρ_s(1 − θ), saturated. Then the latent heat counts all of θ; the de Vries heat capacity the ice
 * and the reduced solids; and the conductivity is the Johansen (1975) saturated value, the geometric
 * mean k_s^(1−θ)·k_ice^(θ−θu)·k_w^θu (Côté & Konrad 2005 likewise with n → θ for peat), which lies
 * between the series (vertical flow across horizontal ice lenses) and parallel (radial flow into a pile
 * along them) bounds of segregated ice (layered-medium bounds, e.g. Farouki 1981 ch. 5, recalled from
 * memory). Frozen properties count the Anderson–Tice unfrozen water at frozenTemperature_C (fine
 * soils only) as liquid. Bedrock: k = k_sat (geometric mean with the rock matrix, pores taken as filled:
 * < 2 % error for n ≤ 0.05). Peat: Côté & Konrad (2005) organic parameters.
 */
export function soilThermalProperties(layer: SoilLayerDescription): SoilThermalProperties {
  const r = resolveSoil(layer);
  const { n0, theta, excess, rhoDGround, sArea, tFrozen } = r;
  const fine = sArea > 0;
  const thetaU = fine
    ? unfrozenWaterContent_m3m3({
        temperature_C: tFrozen,
        specificSurface_m2_g: sArea,
        dryDensity_kg_m3: rhoDGround,
        waterContent_m3m3: theta,
      })
    : 0;
  const fp = fine
    ? freezingPoint_C({ specificSurface_m2_g: sArea, dryDensity_kg_m3: rhoDGround, waterContent_m3m3: theta })
    : 0;
  const { kThawed, kFrozen } = soilConductivities(r, thetaU);
  const { cThawed, cFrozen } = soilHeatCapacities(r, thetaU);

  return {
    kFrozen_W_mK: requireFinite('kFrozen_W_mK', kFrozen),
    kThawed_W_mK: requireFinite('kThawed_W_mK', kThawed),
    cFrozen_J_m3K: cFrozen,
    cThawed_J_m3K: cThawed,
    latent_J_m3: volumetricLatentHeat_J_m3(theta),
    freezingPoint_C: fp,
    porosity: n0,
    excessIce_m3m3: excess,
    unfrozenWater_m3m3: thetaU,
    dryDensity_kg_m3: rhoDGround,
  };
}
