/**
 * The unit systems' conversion tables, one source of truth for every edge that shows or writes a
 * figure: the web's display (web/src/units/display-units.ts re-exports them) and the shortlist exports
 * of the web and the CLI (layers/screening/export-schema.ts). SI inside, conversions only at the edges
 * (style.md habit 2). The North American system shows tons of refrigeration, feet, °F and Btu/h.
 *
 * Method: value_display = value_SI * factor + offset, with the exact definitions
 *   1 ft = 0.3048 m and 1 in = 0.0254 m (international yard and pound agreement, 1959),
 *   1 Btu_IT = 1055.05585262 J (International Steam Table calorie definition, 1956),
 *   1 ton of refrigeration = 12 000 Btu_IT/h = 3516.8528421 W (definition: 1 short ton of ice melted
 *   per 24 h, rounded by convention to 12 000 Btu/h),
 *   °F = °C * 9/5 + 32 (absolute temperatures); a temperature difference or rate: 1 K = 1.8 °F,
 *   1 US gal = 3.785411784 L, 1 mi = 1609.344 m, 1 lb = 0.45359237 kg (same 1959 agreement),
 *   1 lbf = 1 lb × 9.80665 m/s² (standard gravity) = 4.4482216152605 N, 1 kip = 1000 lbf, 1 psi = 1 lbf/in².
 * Units not in the table (yr, %, classes, counts, currency) are shown unchanged in both systems.
 * A band delivered in a North American unit (e.g. 'piles/ton') is shown in SI ('piles/kW') in the SI
 * system and unchanged in the North American one.
 */
export type UnitSystem = 'SI' | 'NA';

export interface UnitConversion {
  /** Unit label to print. */
  unit: string;
  factor: number;
  offset: number;
}

const FT_PER_M = 1 / 0.3048;
const BTU_H_PER_W = 3600 / 1055.05585262;
const W_PER_TON = (12000 * 1055.05585262) / 3600;

/** SI unit label (as printed in the manifest) -> North American display unit. */
const NORTH_AMERICAN: Record<string, UnitConversion> = {
  '°C': { unit: '°F', factor: 1.8, offset: 32 },
  K: { unit: '°F (difference)', factor: 1.8, offset: 0 },
  'K/yr': { unit: '°F/yr', factor: 1.8, offset: 0 },
  '°C/yr': { unit: '°F/yr', factor: 1.8, offset: 0 },
  'K/decade': { unit: '°F/decade', factor: 1.8, offset: 0 },
  m: { unit: 'ft', factor: FT_PER_M, offset: 0 },
  mm: { unit: 'in', factor: 1 / 25.4, offset: 0 },
  km: { unit: 'mi', factor: 1000 / 1609.344, offset: 0 },
  'm²': { unit: 'ft²', factor: FT_PER_M * FT_PER_M, offset: 0 },
  'm³': { unit: 'ft³', factor: FT_PER_M ** 3, offset: 0 },
  'km²': { unit: 'mi²', factor: 1e6 / (1609.344 * 1609.344), offset: 0 },
  W: { unit: 'Btu/h', factor: BTU_H_PER_W, offset: 0 },
  kW: { unit: 'ton', factor: 1000 / W_PER_TON, offset: 0 },
  'W/m': { unit: 'Btu/h·ft', factor: BTU_H_PER_W / FT_PER_M, offset: 0 },
  'W/m²': { unit: 'Btu/h·ft²', factor: BTU_H_PER_W / (FT_PER_M * FT_PER_M), offset: 0 },
  'W/m·K': { unit: 'Btu/h·ft·°F', factor: BTU_H_PER_W / FT_PER_M / 1.8, offset: 0 },
  'W/(m·K)': { unit: 'Btu/h·ft·°F', factor: BTU_H_PER_W / FT_PER_M / 1.8, offset: 0 },
  'piles/kW': { unit: 'piles/ton', factor: W_PER_TON / 1000, offset: 0 },
  'kW/pile': { unit: 'ton/pile', factor: 1000 / W_PER_TON, offset: 0 },
  'm/kW': { unit: 'ft/ton', factor: (FT_PER_M * W_PER_TON) / 1000, offset: 0 },
  L: { unit: 'US gal', factor: 1 / 3.785411784, offset: 0 },
  'L/min': { unit: 'US gal/min', factor: 1 / 3.785411784, offset: 0 },
  // Thermal resistance per length: 1 m·K/W = (1/0.3048) ft × 1.8 °F/K ÷ (3600/1055.05585262) Btu/h per W.
  'm·K/W': { unit: 'h·ft·°F/Btu', factor: (FT_PER_M * 1.8) / BTU_H_PER_W, offset: 0 },
  'kg/m³': { unit: 'lb/ft³', factor: 0.3048 ** 3 / 0.45359237, offset: 0 },
  'J/m³·K': { unit: 'Btu/ft³·°F', factor: 0.3048 ** 3 / 1055.05585262 / 1.8, offset: 0 },
  'J/m³': { unit: 'Btu/ft³', factor: 0.3048 ** 3 / 1055.05585262, offset: 0 },
  'L/yr': { unit: 'US gal/yr', factor: 1 / 3.785411784, offset: 0 },
  kg: { unit: 'lb', factor: 1 / 0.45359237, offset: 0 },
  't/yr': { unit: 'short ton/yr', factor: 1000 / 0.45359237 / 2000, offset: 0 },
  't CO2/yr': { unit: 'short ton CO2/yr', factor: 1000 / 0.45359237 / 2000, offset: 0 },
  // 1 lbf = 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N; 1 kip = 1000 lbf; 1 psi = 1 lbf/in².
  kN: { unit: 'kip', factor: 1 / 4.4482216152605, offset: 0 },
  kPa: { unit: 'psi', factor: 0.0254 ** 2 / 4.4482216152605e-3, offset: 0 },
  Pa: { unit: 'psi', factor: 0.0254 ** 2 / 4.4482216152605, offset: 0 },
};

/** Non-SI unit label used by a band -> its SI display. */
const SI_FROM_OTHER: Record<string, UnitConversion> = {
  'piles/ton': { unit: 'piles/kW', factor: 1000 / W_PER_TON, offset: 0 },
  'ton/pile': { unit: 'kW/pile', factor: W_PER_TON / 1000, offset: 0 },
  ton: { unit: 'kW', factor: W_PER_TON / 1000, offset: 0 },
  'Btu/h': { unit: 'W', factor: 1 / BTU_H_PER_W, offset: 0 },
  ft: { unit: 'm', factor: 1 / FT_PER_M, offset: 0 },
};

/**
 * The conversion from a band's unit label (as stored: SI, or a North American unit where the trade
 * uses one) to the chosen display system; identity for units that need no conversion.
 */
export function displayConversion(siUnit: string, system: UnitSystem): UnitConversion {
  const table = system === 'NA' ? NORTH_AMERICAN : SI_FROM_OTHER;
  const c = table[siUnit];
  if (c) return c;
  return { unit: siUnit, factor: 1, offset: 0 };
}

/** SI value -> display value (NaN stays NaN: nodata). */
export function toDisplay(value_SI: number, siUnit: string, system: UnitSystem): number {
  const c = displayConversion(siUnit, system);
  return value_SI * c.factor + c.offset;
}

/** Display value -> SI value (inverse of toDisplay). */
export function fromDisplay(value: number, siUnit: string, system: UnitSystem): number {
  const c = displayConversion(siUnit, system);
  return (value - c.offset) / c.factor;
}
