/**
 * Property tables of the heat-transfer fluids: water and aqueous propylene glycol and ethanol.
 *
 * Layout: for each fluid, a list of mass fractions (kg solute per kg solution) and one row per mass
 * fraction giving the freezing point and, at the temperatures of `TABLE_TEMPERATURES_C`, density,
 * specific heat, thermal conductivity and dynamic viscosity. NaN marks a point below the freezing point
 * by more than one table step (never used: the entry points refuse a temperature below freezing).
 *
 * Provenance (be honest about it, see the notes on each table):
 * - Water: Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table A.6, and the CRC
 *   Handbook of Chemistry and Physics (saturated water) — values recalled from memory.
 * - Propylene glycol: ASHRAE Handbook—Fundamentals, ch. 31 (secondary coolants), propylene glycol
 *   tables by mass. Freezing points at 0/20/30/40 % and the 0 °C density and specific heat columns at
 *   0/20/30/40 % are read values (reference-values.md section 9c); the 10 % row, the other
 *   temperatures, conductivity and viscosity are recalled from memory (approximate, +-3 % for
 *   density/specific heat/conductivity and +-15 % for viscosity).
 * - Ethanol: CRC Handbook (concentrative properties of aqueous solutions: density at 20 °C, freezing
 *   point) and Melinder (2007), Thermophysical properties of aqueous solutions used as secondary
 *   working fluids (KTH doctoral thesis) — all values recalled from memory, approximate as above.
 * Values at -10 K below the freezing point (the first column under it) are short extrapolations of
 * the supercooled liquid so that linear interpolation works right down to the freezing point.
 */

/** Temperatures of the table columns, °C. */
export const TABLE_TEMPERATURES_C = [-30, -20, -10, 0, 10, 20, 30, 40] as const;

export interface FluidRow {
  massFraction: number;
  freezingPoint_C: number;
  density_kg_m3: readonly number[];
  specificHeat_J_kgK: readonly number[];
  conductivity_W_mK: readonly number[];
  /** Dynamic viscosity, mPa·s (the entry point converts to Pa·s). */
  viscosity_mPa_s: readonly number[];
}

export interface FluidTable {
  name: string;
  rows: readonly FluidRow[];
}

const N = NaN;

/** Water (mass fraction 0 of every mixture). Recalled from memory (Incropera Table A.6; CRC). */
const WATER_ROW: FluidRow = {
  massFraction: 0,
  freezingPoint_C: 0,
  density_kg_m3: [N, N, 999.3, 999.8, 999.7, 998.2, 995.7, 992.2],
  specificHeat_J_kgK: [N, N, 4260, 4217, 4193, 4182, 4178, 4179],
  conductivity_W_mK: [N, N, 0.541, 0.561, 0.58, 0.598, 0.615, 0.631],
  viscosity_mPa_s: [N, N, 2.6, 1.792, 1.306, 1.002, 0.797, 0.653],
};

export const WATER_TABLE: FluidTable = { name: 'water', rows: [WATER_ROW] };

/** Propylene glycol by mass; provenance in the file comment. */
export const PROPYLENE_GLYCOL_TABLE: FluidTable = {
  name: 'propyleneGlycol',
  rows: [
    WATER_ROW,
    {
      massFraction: 0.1,
      freezingPoint_C: -3.3,
      density_kg_m3: [N, N, 1014.0, 1013.1, 1011.8, 1009.6, 1006.6, 1003.0],
      specificHeat_J_kgK: [N, N, 4080, 4100, 4110, 4120, 4125, 4130],
      conductivity_W_mK: [N, N, 0.5, 0.517, 0.534, 0.549, 0.563, 0.576],
      viscosity_mPa_s: [N, N, 4.0, 2.6, 1.8, 1.35, 1.05, 0.85],
    },
    {
      massFraction: 0.2,
      freezingPoint_C: -7.1,
      density_kg_m3: [N, 1028.0, 1027.0, 1025.8, 1023.8, 1021.0, 1017.6, 1013.6],
      specificHeat_J_kgK: [N, 3890, 3910, 3930, 3950, 3970, 3990, 4010],
      conductivity_W_mK: [N, 0.45, 0.462, 0.476, 0.49, 0.503, 0.515, 0.526],
      viscosity_mPa_s: [N, 9.0, 5.8, 3.9, 2.7, 2.0, 1.55, 1.25],
    },
    {
      massFraction: 0.3,
      freezingPoint_C: -12.7,
      density_kg_m3: [N, 1039.6, 1038.1, 1036.2, 1033.6, 1030.4, 1026.6, 1022.4],
      specificHeat_J_kgK: [N, 3720, 3755, 3790, 3825, 3860, 3895, 3930],
      conductivity_W_mK: [N, 0.413, 0.424, 0.435, 0.446, 0.456, 0.466, 0.475],
      viscosity_mPa_s: [N, 17.0, 10.0, 6.3, 4.2, 3.0, 2.25, 1.75],
    },
    {
      massFraction: 0.4,
      freezingPoint_C: -21.1,
      density_kg_m3: [1051.0, 1049.0, 1047.1, 1045.1, 1042.2, 1038.6, 1034.6, 1030.3],
      specificHeat_J_kgK: [3520, 3560, 3600, 3640, 3680, 3720, 3760, 3800],
      conductivity_W_mK: [0.372, 0.38, 0.388, 0.396, 0.404, 0.412, 0.419, 0.426],
      viscosity_mPa_s: [60.0, 31.0, 17.0, 10.2, 6.6, 4.5, 3.25, 2.45],
    },
  ],
};

/** Ethanol by mass; all values recalled from memory (CRC; Melinder 2007). */
export const ETHANOL_TABLE: FluidTable = {
  name: 'ethanol',
  rows: [
    WATER_ROW,
    {
      massFraction: 0.1,
      freezingPoint_C: -4.4,
      density_kg_m3: [N, N, 985.0, 984.5, 983.6, 981.9, 979.4, 976.1],
      specificHeat_J_kgK: [N, N, 4310, 4300, 4290, 4270, 4260, 4250],
      conductivity_W_mK: [N, N, 0.488, 0.503, 0.518, 0.532, 0.545, 0.557],
      viscosity_mPa_s: [N, N, 5.3, 3.1, 2.1, 1.54, 1.16, 0.91],
    },
    {
      massFraction: 0.2,
      freezingPoint_C: -10.9,
      density_kg_m3: [N, 977.0, 975.5, 973.7, 971.4, 968.6, 965.3, 961.6],
      specificHeat_J_kgK: [N, 4170, 4180, 4190, 4195, 4190, 4190, 4190],
      conductivity_W_mK: [N, 0.434, 0.445, 0.456, 0.467, 0.478, 0.488, 0.497],
      viscosity_mPa_s: [N, 13.0, 8.3, 5.3, 3.3, 2.18, 1.6, 1.2],
    },
    {
      massFraction: 0.3,
      freezingPoint_C: -20.5,
      density_kg_m3: [967.0, 964.8, 962.3, 959.6, 956.8, 953.8, 950.5, 946.9],
      specificHeat_J_kgK: [3930, 3960, 3990, 4020, 4040, 4050, 4060, 4070],
      conductivity_W_mK: [0.386, 0.395, 0.404, 0.413, 0.422, 0.43, 0.438, 0.445],
      viscosity_mPa_s: [32.0, 18.5, 11.3, 6.9, 4.1, 2.71, 1.95, 1.45],
    },
    {
      massFraction: 0.4,
      freezingPoint_C: -29.0,
      density_kg_m3: [954.0, 951.0, 947.8, 944.4, 939.9, 935.2, 930.8, 926.3],
      specificHeat_J_kgK: [3620, 3660, 3700, 3740, 3780, 3820, 3850, 3880],
      conductivity_W_mK: [0.348, 0.356, 0.363, 0.37, 0.376, 0.382, 0.388, 0.393],
      viscosity_mPa_s: [30.0, 18.0, 11.5, 7.1, 4.4, 2.91, 2.1, 1.58],
    },
  ],
};
