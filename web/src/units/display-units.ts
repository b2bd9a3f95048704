/**
 * Display-unit conversions at the edge of the app (style.md habit 2: SI inside, conversions only at
 * the edges). The conversion tables live in layers/unit-systems.ts (shared with the exports of the
 * web and the CLI); this module adds the display's formatting.
 */
import { displayConversion, type UnitSystem } from '../../../layers/unit-systems';
import { siQuantityText, type NotePart } from '../../../layers/note-parts';

export {
  displayConversion,
  fromDisplay,
  toDisplay,
  type UnitConversion,
  type UnitSystem,
} from '../../../layers/unit-systems';

/** Significant-figure formatting that keeps small and large values readable; 'no data' for NaN. */
export function formatNumber(value: number, significant = 3): string {
  if (!Number.isFinite(value)) return 'no data';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  // Group thousands only from 10 000 up, so calendar years read as years (2094, not 2,094).
  if (abs >= 10 ** significant)
    return abs >= 1e4 ? Math.round(value).toLocaleString('en-US') : String(Math.round(value));
  const digits = Math.max(0, significant - 1 - Math.floor(Math.log10(abs)));
  return value.toFixed(Math.min(digits, 6));
}

/** A value with its display unit, e.g. '−3.2 °C' or '26.2 °F'. */
export function formatQuantity(
  value_SI: number,
  siUnit: string,
  system: UnitSystem,
  significant = 3,
): string {
  if (!Number.isFinite(value_SI)) return 'no data';
  const c = displayConversion(siUnit, system);
  const text = formatNumber(value_SI * c.factor + c.offset, significant);
  return c.unit ? `${text} ${c.unit}` : text;
}

/** '75.123° N, 3.456° W' style position text. */
export function formatLonLat(lon: number, lat: number, digits = 3): string {
  const ns = lat >= 0 ? 'N' : 'S';
  const ew = lon >= 0 ? 'E' : 'W';
  return `${Math.abs(lat).toFixed(digits)}° ${ns}, ${Math.abs(lon).toFixed(digits)}° ${ew}`;
}

/**
 * A band or criterion title in the chosen system: when the unit switches between tons and kW, the
 * words "per ton" / "per kW" in the title follow, so that the title never contradicts the unit.
 */
export function displayTitle(title: string, unit: string, system: UnitSystem): string {
  const shown = displayConversion(unit, system).unit;
  if (shown === unit) return title;
  if (/\bkW\b/.test(shown)) return title.replace(/\bper ton\b/g, 'per kW');
  if (/\bton\b/.test(shown)) return title.replace(/\bper kW\b/g, 'per ton');
  return title;
}

/**
 * A unit label for running text: a temperature difference reads '°F', not '°F (difference)' (the
 * sentence says it is a drop or a rise).
 */
export function proseUnit(unit: string): string {
  return unit.replace(/\s+\([a-z ]+\)$/, '');
}

/**
 * A note of words and quantities (layers/note-parts.ts) in the chosen system: SI as the note writes
 * it; North American with each quantity converted and written to 3 significant figures.
 */
export function formatNoteParts(parts: readonly NotePart[], system: UnitSystem): string {
  return parts
    .map((p) => {
      if (typeof p === 'string') return p;
      const c = displayConversion(p.unit, system);
      if (c.factor === 1 && c.offset === 0) return siQuantityText({ ...p, unit: c.unit });
      const text = formatNumber(p.value * c.factor + c.offset, 3);
      return c.unit ? `${text} ${proseUnit(c.unit)}` : text;
    })
    .join('');
}
