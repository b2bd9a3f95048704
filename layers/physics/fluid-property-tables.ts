/**
 * Property tables of the heat-transfer fluids: water and aqueous propylene glycol and ethanol.
 *
 * Layout: for each fluid, a list of mass fractions (kg solute per kg solution) and one row per mass
 * fraction giving the freezing point and, at the temperatures of `TABLE_TEMPERATURES_C`, density,
 * specific heat, thermal conductivity and dynamic viscosity. NaN marks a point too far below the
 * freezing point to be needed (never used: the entry points refuse a temperature below freezing).
 *
 * Provenance (every entry; the rule per entry is in tests/reference/fixtures/fluid-table-sources.ts,
 * and tests/reference/fluids-tables.test.ts checks each entry against it):
 * - Water (mass fraction 0 of every mixture): IAPWS formulations at 0.101325 MPa — density and
 *   specific heat from IAPWS-95 (Wagner & Pruss 2002, J. Phys. Chem. Ref. Data 31:387), viscosity from
 *   IAPWS 2008 (Huber et al. 2009, JPCRD 38:101), conductivity from IAPWS 2011 (Huber et al. 2012,
 *   JPCRD 41:033102), evaluated by tests/reference/fixtures/fluid-properties-reference.py. The −10 °C
 *   column is the supercooled liquid (IAPWS-95 extrapolated).
 * - Propylene glycol 20/30/40 %: freezing point, density and specific heat at 0–40 °C are read values
 *   of a handbook design table (reference-values.md §9c). Its densities lie 0.3–0.6 % above Melinder's
 *   for the pure solution, as expected if it is for industrially inhibited glycol (not confirmed).
 *   Below 0 °C: that table's 0 °C value plus the change from 0 °C of the Melinder (2010) correlation.
 *   Conductivity and viscosity, and the whole 10 % row: Melinder (2010) correlation.
 * - Ethanol, all entries: Melinder (2010) correlation.
 *   Melinder, Å. (2010), Properties of Secondary Working Fluids for Indirect Systems, IIR, Paris
 *   (polynomials in mass fraction and temperature, coefficients as reproduced in CoolProp's
 *   incompressible-fluid sources, fluids "MPG" and "MEA"); also Melinder (2007), KTH doctoral thesis.
 * Nothing in these tables is recalled from memory any more. Rounding: density 0.1 kg/m³, specific heat
 * 1 J/(kg·K), conductivity 1e-4 W/(m·K), viscosity 4 significant digits, freezing point 0.01 K.
 * Values below the freezing point (the first column under it, and for 20 % propylene glycol also the
 * −20 °C column) are the correlation extrapolated to the supercooled liquid, there only so that
 * interpolation works right down to the freezing point; the entry points never return a state below
 * the freezing point.
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

/** Water (mass fraction 0 of every mixture): IAPWS-95, IAPWS 2008 viscosity, IAPWS 2011 conductivity. */
const WATER_ROW: FluidRow = {
  massFraction: 0,
  freezingPoint_C: 0,
  density_kg_m3: [N, N, 998.1, 999.8, 999.7, 998.2, 995.6, 992.2],
  specificHeat_J_kgK: [N, N, 4272, 4219, 4195, 4184, 4180, 4179],
  conductivity_W_mK: [N, N, 0.5266, 0.5556, 0.5788, 0.598, 0.6144, 0.6285],
  viscosity_mPa_s: [N, N, 2.648, 1.792, 1.306, 1.002, 0.7972, 0.6527],
};

export const WATER_TABLE: FluidTable = { name: 'water', rows: [WATER_ROW] };

/** Propylene glycol by mass; provenance in the file comment. */
export const PROPYLENE_GLYCOL_TABLE: FluidTable = {
  name: 'propyleneGlycol',
  rows: [
    WATER_ROW,
    {
      massFraction: 0.1,
      freezingPoint_C: -2.87,
      density_kg_m3: [N, N, 1009.2, 1009.3, 1008.3, 1006.2, 1003.2, 999.4],
      specificHeat_J_kgK: [N, N, 4054, 4059, 4067, 4076, 4088, 4101],
      conductivity_W_mK: [N, N, 0.5001, 0.5155, 0.5301, 0.5438, 0.5567, 0.5688],
      viscosity_mPa_s: [N, N, 4.109, 2.745, 1.936, 1.432, 1.105, 0.8838],
    },
    {
      massFraction: 0.2,
      freezingPoint_C: -7.1,
      density_kg_m3: [N, 1027.3, 1027.1, 1025.8, 1022.7, 1019, 1014.8, 1010.2],
      specificHeat_J_kgK: [N, 3892, 3911, 3930, 3950, 3970, 3990, 4020],
      conductivity_W_mK: [N, 0.4493, 0.4603, 0.4711, 0.4818, 0.4922, 0.5024, 0.5123],
      viscosity_mPa_s: [N, 11.88, 6.903, 4.312, 2.875, 2.03, 1.508, 1.169],
    },
    {
      massFraction: 0.3,
      freezingPoint_C: -12.7,
      density_kg_m3: [N, 1040.7, 1038.9, 1036.2, 1032.6, 1028.4, 1023.6, 1018.4],
      specificHeat_J_kgK: [N, 3735, 3763, 3790, 3820, 3850, 3880, 3900],
      conductivity_W_mK: [N, 0.4129, 0.4206, 0.4285, 0.4364, 0.4444, 0.4525, 0.4606],
      viscosity_mPa_s: [N, 23.25, 12.33, 7.117, 4.438, 2.965, 2.104, 1.573],
    },
    {
      massFraction: 0.4,
      freezingPoint_C: -21.1,
      density_kg_m3: [1054.9, 1052.4, 1049.2, 1045.1, 1040.9, 1036.2, 1031, 1025.3],
      specificHeat_J_kgK: [3540, 3574, 3607, 3640, 3670, 3700, 3740, 3770],
      conductivity_W_mK: [0.3706, 0.3761, 0.3819, 0.3878, 0.394, 0.4003, 0.4067, 0.4132],
      viscosity_mPa_s: [105.7, 45.95, 22.24, 11.88, 6.935, 4.384, 2.972, 2.141],
    },
  ],
};

/** Ethanol by mass: Melinder (2010) correlation. */
export const ETHANOL_TABLE: FluidTable = {
  name: 'ethanol',
  rows: [
    WATER_ROW,
    {
      massFraction: 0.1,
      freezingPoint_C: -4.38,
      density_kg_m3: [N, N, 984.5, 985, 984, 981.8, 978.7, 974.7],
      specificHeat_J_kgK: [N, N, 4444, 4402, 4351, 4303, 4272, 4270],
      conductivity_W_mK: [N, N, 0.4894, 0.5027, 0.5158, 0.5285, 0.5409, 0.5528],
      viscosity_mPa_s: [N, N, 5.763, 3.317, 2.153, 1.529, 1.151, 0.8922],
    },
    {
      massFraction: 0.2,
      freezingPoint_C: -11.12,
      density_kg_m3: [N, 978.2, 977.6, 975.8, 972.8, 968.9, 964.2, 958.8],
      specificHeat_J_kgK: [N, 4381, 4383, 4369, 4349, 4329, 4316, 4320],
      conductivity_W_mK: [N, 0.4299, 0.4387, 0.4478, 0.4571, 0.4663, 0.4755, 0.4844],
      viscosity_mPa_s: [N, 19.95, 9.564, 5.249, 3.224, 2.165, 1.553, 1.164],
    },
    {
      massFraction: 0.3,
      freezingPoint_C: -20.14,
      density_kg_m3: [975.9, 973.1, 969.4, 965, 959.8, 954, 947.7, 941],
      specificHeat_J_kgK: [4001, 4072, 4124, 4163, 4193, 4216, 4238, 4261],
      conductivity_W_mK: [0.3792, 0.385, 0.3911, 0.3975, 0.4041, 0.4107, 0.4172, 0.4235],
      viscosity_mPa_s: [59.4, 25.21, 12.26, 6.705, 4.053, 2.66, 1.862, 1.365],
    },
    {
      massFraction: 0.4,
      freezingPoint_C: -29.53,
      density_kg_m3: [968.2, 962.3, 956, 949.4, 942.5, 935.3, 927.9, 920.3],
      specificHeat_J_kgK: [3584, 3702, 3804, 3893, 3967, 4029, 4080, 4120],
      conductivity_W_mK: [0.3395, 0.3436, 0.3479, 0.3523, 0.3568, 0.3612, 0.3654, 0.3693],
      viscosity_mPa_s: [53.93, 24.55, 12.54, 7.083, 4.357, 2.876, 2.006, 1.457],
    },
  ],
};
