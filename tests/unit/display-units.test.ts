import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  displayConversion,
  displayTitle,
  formatLonLat,
  formatNumber,
  formatNoteParts,
  formatQuantity,
  fromDisplay,
  proseUnit,
  toDisplay,
} from '../../web/src/units/display-units';
import { notePartsText, type NotePart } from '../../layers/note-parts';

describe('display units', () => {
  it('converts temperatures with the Fahrenheit offset, differences without', () => {
    // Fahrenheit scale definition: 0 °C = 32 °F, 100 °C = 212 °F, -40 °C = -40 °F (exact).
    expect(toDisplay(0, '°C', 'NA')).toBeCloseTo(32, 12);
    expect(toDisplay(100, '°C', 'NA')).toBeCloseTo(212, 12);
    expect(toDisplay(-40, '°C', 'NA')).toBeCloseTo(-40, 12);
    // A difference of 1 K is 1.8 °F (same definition).
    expect(toDisplay(1, 'K', 'NA')).toBeCloseTo(1.8, 12);
    expect(toDisplay(0.05, 'K/yr', 'NA')).toBeCloseTo(0.09, 12);
  });

  it('uses the exact foot, Btu and ton definitions', () => {
    // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
    expect(toDisplay(0.3048, 'm', 'NA')).toBeCloseTo(1, 12);
    // 1 ton of refrigeration = 12 000 Btu_IT/h = 3.516853 kW (reference-values.md §12, from the definition).
    expect(toDisplay(3.516853, 'kW', 'NA')).toBeCloseTo(1, 6);
    // 1 W = 3.412142 Btu_IT/h (1 Btu_IT = 1055.05585262 J, International Steam Table definition).
    expect(toDisplay(1, 'W', 'NA')).toBeCloseTo(3.412142, 6);
    // 1 W/(m·K) = 0.577789 Btu/(h·ft·°F) (ASHRAE Handbook—Fundamentals, SI conversion table; recalled from memory).
    expect(toDisplay(1, 'W/m·K', 'NA')).toBeCloseTo(0.577789, 6);
    // 1 km² = 0.386102 mi² (1 mi = 1609.344 m exactly).
    expect(toDisplay(1, 'km²', 'NA')).toBeCloseTo(0.386102, 6);
    // 1 US gal = 3.785411784 L exactly.
    expect(toDisplay(3.785411784, 'L/yr', 'NA')).toBeCloseTo(1, 12);
  });

  it('shows a band stored in piles per ton as piles per kW in SI', () => {
    const c = displayConversion('piles/ton', 'SI');
    expect(c.unit).toBe('piles/kW');
    // 10 piles per ton = 10 / 3.516853 piles per kW (ton definition above).
    expect(toDisplay(10, 'piles/ton', 'SI')).toBeCloseTo(2.843451, 6);
    expect(displayConversion('piles/ton', 'NA')).toEqual({ unit: 'piles/ton', factor: 1, offset: 0 });
    expect(toDisplay(2, 'piles/kW', 'NA')).toBeCloseTo(7.033706, 6);
  });

  it('leaves unknown units, years and classes unchanged', () => {
    for (const u of ['yr', '', '%', 'CAD/yr']) {
      expect(displayConversion(u, 'NA')).toEqual({ unit: u, factor: 1, offset: 0 });
      expect(toDisplay(12.5, u, 'SI')).toBe(12.5);
    }
  });

  it('fromDisplay inverts toDisplay for every unit and system', () => {
    const units = [
      '°C',
      'K',
      'm',
      'mm',
      'km²',
      'W',
      'kW',
      'W/m',
      'W/m²',
      'W/m·K',
      'piles/ton',
      'piles/kW',
      'L/yr',
      't/yr',
      'yr',
    ];
    fc.assert(
      fc.property(
        fc.constantFrom(...units),
        fc.constantFrom('SI' as const, 'NA' as const),
        fc.double({ min: -1e6, max: 1e6, noNaN: true }),
        (u, sys, v) =>
          Math.abs(fromDisplay(toDisplay(v, u, sys), u, sys) - v) <= 1e-9 * Math.max(1, Math.abs(v)),
      ),
      { seed: 42 },
    );
  });

  it('formats numbers and nodata for people', () => {
    expect(formatNumber(NaN)).toBe('no data');
    expect(formatNumber(0)).toBe('0');
    expect(formatNumber(3.14159)).toBe('3.14');
    expect(formatNumber(0.012345)).toBe('0.0123');
    expect(formatNumber(123456)).toBe('123,456');
    expect(formatNumber(2094.4)).toBe('2094');
    expect(formatQuantity(0, '°C', 'NA')).toBe('32.0 °F');
    expect(formatQuantity(NaN, 'm', 'SI')).toBe('no data');
    expect(formatLonLat(-3.5, 75.25, 2)).toBe('75.25° N, 3.50° W');
  });
});

describe('display titles', () => {
  it('keeps "per ton" / "per kW" in a title in step with the shown unit', () => {
    expect(displayTitle('Piles per ton of peak heating', 'piles/ton', 'SI')).toBe(
      'Piles per kW of peak heating',
    );
    expect(displayTitle('Piles per ton of peak heating', 'piles/ton', 'NA')).toBe(
      'Piles per ton of peak heating',
    );
    expect(displayTitle('Piles per kW of peak heating', 'piles/kW', 'NA')).toBe(
      'Piles per ton of peak heating',
    );
    expect(displayTitle('Ground temperature', '°C', 'NA')).toBe('Ground temperature');
  });
});

describe('notes with quantities in the chosen units (formatNoteParts)', () => {
  const parts: NotePart[] = [
    'The ground at ',
    { value: 0.5, unit: 'm' },
    ' from the axis reaches ',
    { value: -6.2, unit: '°C', decimals: 1 },
    '; window ',
    { value: 25, unit: 'W/m', decimals: 1 },
    ', ',
    { value: 0.12, unit: 'm³', decimals: 2 },
    '.',
  ];
  it('writes SI as the note does', () => {
    expect(formatNoteParts(parts, 'SI')).toBe(
      'The ground at 0.5 m from the axis reaches -6.2 °C; window 25.0 W/m, 0.12 m³.',
    );
    expect(formatNoteParts(parts, 'SI')).toBe(notePartsText(parts));
  });
  it('converts every quantity to North American units, 3 significant figures', () => {
    // 0.5 m / 0.3048 = 1.640 ft; -6.2 °C × 1.8 + 32 = 20.84 °F; 25 W/m × 3.412142 Btu/h per W × 0.3048
    // m/ft = 26.0 Btu/h·ft; 0.12 m³ / 0.3048³ = 4.238 ft³ (unit definitions, display-units.ts).
    expect(formatNoteParts(parts, 'NA')).toBe(
      'The ground at 1.64 ft from the axis reaches 20.8 °F; window 26.0 Btu/h·ft, 4.24 ft³.',
    );
  });
  it('writes a temperature difference in running text without the table note', () => {
    expect(proseUnit(displayConversion('K', 'NA').unit)).toBe('°F');
    expect(formatNoteParts([{ value: 2, unit: 'K' }, ' drop'], 'NA')).toBe('3.60 °F drop');
  });
});
