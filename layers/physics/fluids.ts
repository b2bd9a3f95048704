/**
 * Heat-transfer fluid properties: water and aqueous propylene glycol or ethanol.
 *
 * Method: the property tables in `fluid-property-tables.ts` (IAPWS formulations for water; Melinder
 * 2010 correlations and a handbook propylene glycol table for the mixtures; every entry's source is in
 * its provenance note) are interpolated
 * - in temperature: linearly between table columns (10 K apart);
 * - in mass fraction: linearly between table rows (0.1 apart), except the freezing point, which uses
 *   a monotone cubic (Fritsch & Carlson 1980, SIAM J. Numer. Anal. 17:238) through the rows because
 *   it curves strongly with concentration;
 * - viscosity in the logarithm (it is close to exponential in both variables).
 * Validity: mass fraction 0–0.4, temperature from the freezing point to 40 °C. Accuracy: that of the
 * sources plus interpolation error, measured at the 25 % and 35 % rows that are not in the tables
 * (tests/reference/fluids-tables.test.ts): propylene glycol against the handbook, freezing point
 * within 0.3 K, density 0.2 kg/m³, specific heat 10 J/(kg·K); against Melinder, conductivity 0.13 %,
 * viscosity 0.5 %; ethanol against Melinder, freezing point 0.11 K, density 0.09 %, specific heat
 * 0.4 %, conductivity 0.2 %, viscosity 3.1 %; water at 25 °C against IAPWS, density 0.15 kg/m³,
 * viscosity 0.5 %. The sources themselves differ: the handbook propylene glycol densities lie
 * 0.3–0.6 % above Melinder's, and ethanol freezing points in Lange's Handbook lie up to 1.15 K above
 * Melinder's between 13 and 30 % by mass (choose the freeze-protection margin with that in mind).
 * Special cases: a temperature below the mixture's freezing point is refused (RangeError); water is
 * the row with mass fraction 0 of every mixture.
 */
import { requireFinite, requireOneOf, requireRange, requireNonNegative } from './validate';
import {
  ETHANOL_TABLE,
  PROPYLENE_GLYCOL_TABLE,
  TABLE_TEMPERATURES_C,
  WATER_TABLE,
  type FluidTable,
} from './fluid-property-tables';

export const FLUID_NAMES = ['water', 'propyleneGlycol', 'ethanol'] as const;
export type FluidName = (typeof FLUID_NAMES)[number];

/** Highest tabulated mass fraction of the mixtures. */
export const MAX_MASS_FRACTION = 0.4;
const T_MAX_C = 40;

export interface FluidSpec {
  fluid: FluidName;
  /** Mass fraction of glycol or ethanol, kg/kg (0 for water). */
  massFraction: number;
}

export interface FluidProperties {
  density_kg_m3: number;
  specificHeat_J_kgK: number;
  conductivity_W_mK: number;
  viscosity_Pa_s: number;
  freezingPoint_C: number;
}

function tableOf(fluid: FluidName): FluidTable {
  if (fluid === 'water') return WATER_TABLE;
  return fluid === 'propyleneGlycol' ? PROPYLENE_GLYCOL_TABLE : ETHANOL_TABLE;
}

function checkSpec(spec: FluidSpec): { table: FluidTable; x: number } {
  const fluid = requireOneOf('fluid', spec.fluid, FLUID_NAMES);
  const maxX = fluid === 'water' ? 0 : MAX_MASS_FRACTION;
  const x = requireRange('massFraction', spec.massFraction, 0, maxX, 'kg/kg');
  return { table: tableOf(fluid), x };
}

/** Monotone cubic Hermite interpolation (Fritsch–Carlson slopes) of y(x) at xq, xs ascending. */
function monotoneCubic(xs: readonly number[], ys: readonly number[], xq: number): number {
  const n = xs.length;
  if (n === 1) return ys[0];
  let i = 0;
  while (i < n - 2 && xq > xs[i + 1]) i++;
  const d: number[] = [];
  for (let k = 0; k < n - 1; k++) d.push((ys[k + 1] - ys[k]) / (xs[k + 1] - xs[k]));
  const m: number[] = new Array<number>(n);
  m[0] = d[0];
  m[n - 1] = d[n - 2];
  for (let k = 1; k < n - 1; k++) {
    if (d[k - 1] * d[k] <= 0) m[k] = 0;
    else {
      const h0 = xs[k] - xs[k - 1];
      const h1 = xs[k + 1] - xs[k];
      const w1 = 2 * h1 + h0;
      const w2 = h1 + 2 * h0;
      m[k] = (w1 + w2) / (w1 / d[k - 1] + w2 / d[k]);
    }
  }
  const h = xs[i + 1] - xs[i];
  const t = (xq - xs[i]) / h;
  const h00 = (1 + 2 * t) * (1 - t) * (1 - t);
  const h10 = t * (1 - t) * (1 - t);
  const h01 = t * t * (3 - 2 * t);
  const h11 = t * t * (t - 1);
  return h00 * ys[i] + h10 * h * m[i] + h01 * ys[i + 1] + h11 * h * m[i + 1];
}

function freezingPointOf(table: FluidTable, x: number): number {
  const xs = table.rows.map((r) => r.massFraction);
  const ys = table.rows.map((r) => r.freezingPoint_C);
  return monotoneCubic(xs, ys, x);
}

/** Freezing point of the mixture, °C (monotone cubic in mass fraction through the table rows). */
export function freezingPoint_C(spec: FluidSpec): number {
  const { table, x } = checkSpec(spec);
  return freezingPointOf(table, x);
}

function interpolateColumn(values: readonly number[], temperature_C: number, log: boolean): number {
  const ts = TABLE_TEMPERATURES_C;
  let j = 0;
  while (j < ts.length - 2 && temperature_C > ts[j + 1]) j++;
  const w = (temperature_C - ts[j]) / (ts[j + 1] - ts[j]);
  const a = values[j];
  const b = values[j + 1];
  return log ? Math.exp((1 - w) * Math.log(a) + w * Math.log(b)) : (1 - w) * a + w * b;
}

/**
 * Properties of a fluid at a temperature (see the module comment for the method and sources).
 * Throws RangeError below the freezing point or outside 0–0.4 mass fraction / up to 40 °C.
 */
export function fluidProperties(input: FluidSpec & { temperature_C: number }): FluidProperties {
  const { table, x } = checkSpec(input);
  const tf = freezingPointOf(table, x);
  const t = requireRange('temperature_C', input.temperature_C, Math.max(tf, -30), T_MAX_C, '°C');
  const rows = table.rows;
  let i = 0;
  while (i < rows.length - 2 && x > rows[i + 1].massFraction) i++;
  const lo = rows[i];
  const hi = rows[Math.min(i + 1, rows.length - 1)];
  const w = hi === lo ? 0 : (x - lo.massFraction) / (hi.massFraction - lo.massFraction);
  const blend = (pick: (r: typeof lo) => readonly number[], log: boolean): number => {
    // Rows below their own freezing point hold NaN; fall back to the other row's value there.
    const a = interpolateColumn(pick(lo), t, log);
    const b = interpolateColumn(pick(hi), t, log);
    if (!Number.isFinite(a)) return b;
    if (!Number.isFinite(b)) return a;
    return log ? Math.exp((1 - w) * Math.log(a) + w * Math.log(b)) : (1 - w) * a + w * b;
  };
  const props: FluidProperties = {
    density_kg_m3: blend((r) => r.density_kg_m3, false),
    specificHeat_J_kgK: blend((r) => r.specificHeat_J_kgK, false),
    conductivity_W_mK: blend((r) => r.conductivity_W_mK, false),
    viscosity_Pa_s: blend((r) => r.viscosity_mPa_s, true) * 1e-3,
    freezingPoint_C: tf,
  };
  for (const [k, v] of Object.entries(props)) {
    if (!Number.isFinite(v)) throw new RangeError(`fluid table has no ${k} at ${t} °C for ${input.fluid}`);
  }
  return props;
}

/**
 * The least mass fraction (to 0.001) whose freezing point lies at least `margin_K` below
 * `lowestTemperature_C`, or null when even the strongest tabulated mixture does not.
 */
export function massFractionForFreezeProtection(input: {
  fluid: Exclude<FluidName, 'water'>;
  lowestTemperature_C: number;
  margin_K: number;
}): number | null {
  const fluid = requireOneOf('fluid', input.fluid, ['propyleneGlycol', 'ethanol'] as const);
  const target = requireFinite('lowestTemperature_C', input.lowestTemperature_C);
  const margin = requireNonNegative('margin_K', input.margin_K, 'K');
  const table = tableOf(fluid);
  const need = target - margin;
  if (freezingPointOf(table, MAX_MASS_FRACTION) > need) return null;
  let lo = 0;
  let hi = MAX_MASS_FRACTION;
  if (freezingPointOf(table, 0) <= need) return 0;
  for (let k = 0; k < 40; k++) {
    const mid = 0.5 * (lo + hi);
    if (freezingPointOf(table, mid) <= need) hi = mid;
    else lo = mid;
  }
  return Math.ceil(hi * 1000 - 1e-9) / 1000;
}

/**
 * Refuses a fluid that would freeze: throws RangeError unless the freezing point lies at least
 * `margin_K` below the lowest fluid temperature reached. The message names the least propylene
 * glycol and ethanol mass fractions that would do (or says none in the tables would).
 * Returns the freezing point, °C, when the fluid is acceptable.
 */
export function requireFluidAbove(
  input: FluidSpec & { lowestTemperature_C: number; margin_K: number },
): number {
  const tf = freezingPoint_C(input);
  const low = requireFinite('lowestTemperature_C', input.lowestTemperature_C);
  const margin = requireNonNegative('margin_K', input.margin_K, 'K');
  if (tf <= low - margin) return tf;
  const advice = (['propyleneGlycol', 'ethanol'] as const).map((fluid) => {
    const x = massFractionForFreezeProtection({ fluid, lowestTemperature_C: low, margin_K: margin });
    return x === null
      ? `no ${fluid} mixture up to ${MAX_MASS_FRACTION * 100} % by mass`
      : `${fluid} at ${(x * 100).toFixed(1)} % by mass or more`;
  });
  throw new RangeError(
    `fluid ${input.fluid} at massFraction ${input.massFraction} freezes at ${tf.toFixed(1)} °C, which is not ` +
      `at least ${margin} K below the lowest fluid temperature ${low.toFixed(1)} °C; use ${advice.join(' or ')}`,
  );
}
