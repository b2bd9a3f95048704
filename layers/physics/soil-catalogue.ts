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

export interface SoilLayerDescription {
  texture: TextureName;
  /** Total volumetric water + ice content, m³/m³ (0 … porosity). */
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
  /** Volumetric latent heat of all pore water, J/m³ (ρ_w·L_f·θ). */
  latent_J_m3: number;
  freezingPoint_C: number;
  porosity: number;
  /** Unfrozen volumetric water at frozenTemperature_C, m³/m³. */
  unfrozenWater_m3m3: number;
  dryDensity_kg_m3: number;
}

const TEXTURE_NAMES = Object.values(TEXTURE_CODES) as TextureName[];

/**
 * Resolves a soil layer description to thermal properties. Porosity n = 1 − ρd/ρs; water content must
 * lie in [0, n]. Frozen properties count the Anderson–Tice unfrozen water at frozenTemperature_C (fine
 * soils only) as liquid. Bedrock: k = k_sat (geometric mean with the rock matrix, pores taken as filled:
 * < 2 % error for n ≤ 0.05). Peat: Côté & Konrad (2005) organic parameters.
 */
export function soilThermalProperties(layer: SoilLayerDescription): SoilThermalProperties {
  const texture = requireOneOf('texture', layer.texture, TEXTURE_NAMES);
  const d = TEXTURE_CATALOGUE[texture];
  const rhoD = requireRange(
    'dryDensity_kg_m3',
    layer.dryDensity_kg_m3 ?? d.dryDensity_kg_m3,
    10,
    d.solidsDensity_kg_m3 - 10,
    'kg/m3',
  );
  const n = 1 - rhoD / d.solidsDensity_kg_m3;
  const theta = requireRange(
    'waterContent_m3m3',
    layer.waterContent_m3m3,
    0,
    n,
    `m3/m3 (0..porosity for ${texture})`,
  );
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

  const fine = sArea > 0;
  const thetaU = fine
    ? unfrozenWaterContent_m3m3({
        temperature_C: tFrozen,
        specificSurface_m2_g: sArea,
        dryDensity_kg_m3: rhoD,
        waterContent_m3m3: theta,
      })
    : 0;
  const fp = fine
    ? freezingPoint_C({ specificSurface_m2_g: sArea, dryDensity_kg_m3: rhoD, waterContent_m3m3: theta })
    : 0;

  let kThawed: number;
  let kFrozen: number;
  if (d.kind === 'rock') {
    const ks = d.solidsConductivity_W_mK;
    kThawed = johansenSaturatedConductivity_W_mK({
      porosity: n,
      solidsConductivity_W_mK: ks,
      state: 'thawed',
    });
    kFrozen = johansenSaturatedConductivity_W_mK({
      porosity: n,
      solidsConductivity_W_mK: ks,
      state: 'frozen',
    });
  } else if (d.kind === 'organic' || model === 'cote-konrad') {
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
    kThawed = coteKonradConductivity_W_mK({ ...base, state: 'thawed' });
    kFrozen = coteKonradConductivity_W_mK({ ...base, state: 'frozen' });
  } else {
    const base = {
      porosity: n,
      waterContent_m3m3: theta,
      solidsConductivity_W_mK: johansenSolidsConductivity_W_mK(q, d.grading),
      dryConductivity_W_mK: johansenDryConductivity_W_mK(rhoD),
      grading: d.grading,
    };
    kThawed = johansenConductivity_W_mK({ ...base, state: 'thawed' });
    kFrozen = johansenConductivity_W_mK({ ...base, state: 'frozen', unfrozenWater_m3m3: thetaU });
  }

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

  return {
    kFrozen_W_mK: requireFinite('kFrozen_W_mK', kFrozen),
    kThawed_W_mK: requireFinite('kThawed_W_mK', kThawed),
    cFrozen_J_m3K: cFrozen,
    cThawed_J_m3K: cThawed,
    latent_J_m3: volumetricLatentHeat_J_m3(theta),
    freezingPoint_C: fp,
    porosity: n,
    unfrozenWater_m3m3: thetaU,
    dryDensity_kg_m3: rhoD,
  };
}
