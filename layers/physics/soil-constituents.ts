/**
 * Properties of the constituents of soil used by the conductivity, heat-capacity and latent-heat
 * models. Each value names its source; "(recalled from memory)" marks values not re-read from the
 * source, "(common practice)" marks conventional engineering defaults.
 */
export const SOIL_CONSTITUENTS = {
  /** Density of liquid water, kg/m³ (common practice; 999.8 at 0 °C, CRC Handbook). */
  waterDensity_kg_m3: 1000,
  /** Latent heat of fusion of ice at 0 °C, J/kg: 333.6 kJ/kg, CRC Handbook of Chemistry and Physics, ice table. */
  latentHeatFusion_J_kg: 333.6e3,
  /** Liquid water conductivity used by Johansen (1975): 0.57 W/m·K (Farouki 1981, CRREL Monograph 81-1, ch. 7; recalled from memory). */
  waterConductivity_W_mK: 0.57,
  /** Ice conductivity used by Johansen (1975): 2.2 W/m·K (Farouki 1981; CRC gives 2.14 at 0 °C, 2.3 at −10 °C). */
  iceConductivity_W_mK: 2.2,
  /** Quartz conductivity in Johansen's solids model: 7.7 W/m·K (Johansen 1975 via Farouki 1981; recalled from memory). */
  quartzConductivity_W_mK: 7.7,
  /** Other minerals: 2.0 W/m·K, or 3.0 for coarse soils with quartz fraction ≤ 0.2 (Johansen 1975 via Farouki 1981; recalled from memory). */
  otherMineralsConductivity_W_mK: 2.0,
  otherMineralsCoarseLowQuartzConductivity_W_mK: 3.0,
  /** Organic matter conductivity 0.25 W/m·K (de Vries 1963, table of constituents; recalled from memory). */
  organicConductivity_W_mK: 0.25,
  /** Density of mineral solids, kg/m³ (common practice, quartz-feldspar soils). */
  mineralSolidsDensity_kg_m3: 2650,
  /** Density of organic solids, kg/m³ (de Vries 1963 gives about 1.3 g/cm³; recalled from memory). */
  organicSolidsDensity_kg_m3: 1300,
  /** Specific heat of mineral solids, J/kg·K: 840 (common practice; de Vries 1963 lists about 0.73-0.84 kJ/kg·K for soil minerals, recalled from memory). */
  mineralSpecificHeat_J_kgK: 840,
  /** Specific heat of organic solids, J/kg·K: 1920 (de Vries 1963, 1.92 kJ/kg·K; recalled from memory). */
  organicSpecificHeat_J_kgK: 1920,
  /** Specific heat of liquid water near 0 °C, J/kg·K (4218 at 0 °C, CRC Handbook; 4180 common practice used here). */
  waterSpecificHeat_J_kgK: 4180,
  /** Specific heat of ice near 0 °C, J/kg·K (CRC Handbook ice table: 2.11 kJ/kg·K at 0 °C, 2.03 at −10 °C; 2090 used). */
  iceSpecificHeat_J_kgK: 2090,
  /** Density of ice at 0 °C, kg/m³ (CRC Handbook ice table: 916.7). */
  iceDensity_kg_m3: 916.7,
} as const;
