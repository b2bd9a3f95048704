/**
 * The site form in the chosen unit system: a field whose schema unit is SI shows and takes its value
 * in the North American unit when that switch is on, and the stored input stays SI (style.md habit 2:
 * conversions only at the edges). Conversions come from the one display-units table.
 *
 * Shown values keep 6 significant figures (12.192 m reads 40 ft, not 39.99999 ft); values typed in a
 * North American unit are stored to 12 significant figures, so that 40 ft is stored as 12.192 m and
 * not 12.191999999999998 m. A round trip SI -> shown -> SI therefore holds to 6 significant figures.
 */
import { displayConversion, type UnitSystem } from '../units/display-units';
import { parseNumberText } from './schema-form-model';

/** The schema's unit label as the display-units table spells it. */
function tableUnit(siUnit: string): string {
  return siUnit === 'W/m·K' ? 'W/(m·K)' : siUnit;
}

/** The unit a form field is shown and typed in. */
export function formFieldUnit(siUnit: string, system: UnitSystem): string {
  if (system !== 'NA') return siUnit;
  const c = displayConversion(tableUnit(siUnit), 'NA');
  return c.unit === tableUnit(siUnit) ? siUnit : c.unit;
}

/** Whether the field converts at all in this system. */
export function formFieldConverts(siUnit: string, system: UnitSystem): boolean {
  return formFieldUnit(siUnit, system) !== siUnit;
}

/** An SI value as shown in the field (6 significant figures when converted). */
export function formValueText(value_SI: number, siUnit: string, system: UnitSystem): string {
  if (!formFieldConverts(siUnit, system)) return String(value_SI);
  const c = displayConversion(tableUnit(siUnit), 'NA');
  return String(Number((value_SI * c.factor + c.offset).toPrecision(6)));
}

/** A shown SI limit or default in the field's unit (for placeholders and the allowed range). */
export function formValueNumber(value_SI: number, siUnit: string, system: UnitSystem): number {
  return Number(formValueText(value_SI, siUnit, system));
}

/**
 * Typed text -> the value stored in the input: a number in SI (converted from the field's unit), the
 * raw text when it is not a number (the schema then reports it), undefined when empty.
 */
export function formStoredValue(
  text: string,
  siUnit: string,
  system: UnitSystem,
): number | string | undefined {
  const v = parseNumberText(text);
  if (typeof v !== 'number' || !formFieldConverts(siUnit, system)) return v;
  const c = displayConversion(tableUnit(siUnit), 'NA');
  return Number(((v - c.offset) / c.factor).toPrecision(12));
}

/** Range messages ('must be ≥ 0.05') with the limit in the field's unit ('must be ≥ 0.164 ft'). */
export function formMessages(
  messages: string[] | undefined,
  siUnit: string,
  system: UnitSystem,
): string[] | undefined {
  if (!messages || !formFieldConverts(siUnit, system)) return messages;
  const unit = formFieldUnit(siUnit, system);
  return messages.map((m) =>
    m.replace(
      /^must be ([≥>≤<]) (-?[0-9.e+-]+)$/,
      (_, op: string, n: string) => `must be ${op} ${formValueText(Number(n), siUnit, system)} ${unit}`,
    ),
  );
}
