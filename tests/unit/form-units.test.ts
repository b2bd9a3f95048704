/**
 * The site form in North American units: shown in the field's unit, stored in SI. Conversion factors
 * are the exact definitions (1 ft = 0.3048 m, 1959 international yard and pound agreement; °F = °C × 9/5
 * + 32; 1 US gal = 3.785411784 L; 1 Btu_IT = 1055.05585262 J); the R-value factor 1 h·ft·°F/Btu =
 * 0.5778 m·K/W is the printed conversion of ASHRAE Handbook—Fundamentals (SI conversion table, recalled
 * from memory to 4 figures).
 */
import { describe, expect, it } from 'vitest';
import { formFieldUnit, formMessages, formStoredValue, formValueText } from '../../web/src/site/form-units';

describe('site form units', () => {
  it('shows SI fields in the North American unit and leaves unit-less ones alone', () => {
    expect(formFieldUnit('m', 'NA')).toBe('ft');
    expect(formFieldUnit('°C', 'NA')).toBe('°F');
    expect(formFieldUnit('W/m·K', 'NA')).toBe('Btu/h·ft·°F');
    expect(formFieldUnit('L/min', 'NA')).toBe('US gal/min');
    expect(formFieldUnit('W', 'NA')).toBe('Btu/h');
    expect(formFieldUnit('yr', 'NA')).toBe('yr');
    expect(formFieldUnit('m', 'SI')).toBe('m');
    // 12.192 m = 40 ft exactly; -2 °C = 28.4 °F exactly.
    expect(formValueText(12.192, 'm', 'NA')).toBe('40');
    expect(formValueText(-2, '°C', 'NA')).toBe('28.4');
    expect(formValueText(-2, '°C', 'SI')).toBe('-2');
  });

  it('stores typed North American values in SI', () => {
    expect(formStoredValue('40', 'm', 'NA')).toBe(12.192);
    expect(formStoredValue('28.4', '°C', 'NA')).toBe(-2);
    expect(formStoredValue('-40', '°C', 'NA')).toBe(-40);
    // 10 US gal/min = 37.85411784 L/min (definition of the US gallon).
    expect(formStoredValue('10', 'L/min', 'NA')).toBeCloseTo(37.85411784, 9);
    // 1 h·ft·°F/Btu = 0.5778 m·K/W (ASHRAE Fundamentals conversion table, 4 figures).
    expect(formStoredValue('1', 'm·K/W', 'NA') as number).toBeCloseTo(0.5778, 4);
    // 1 Btu/h·ft·°F = 1.7307 W/(m·K) (same table, 4 figures).
    expect(formStoredValue('1', 'W/m·K', 'NA') as number).toBeCloseTo(1.7307, 3);
    expect(formStoredValue('', 'm', 'NA')).toBeUndefined();
    expect(formStoredValue('abc', 'm', 'NA')).toBe('abc');
    expect(formStoredValue('3', 'yr', 'NA')).toBe(3);
  });

  it('round-trips shown text to the stored value to 6 significant figures', () => {
    for (const [v, u] of [
      [0.219, 'm'],
      [-3.7, '°C'],
      [2.1, 'W/m·K'],
      [18.5, 'L/min'],
      [0.08, 'm·K/W'],
      [4500, 'W'],
      [0.6, 'K'],
    ] as const) {
      const back = formStoredValue(formValueText(v, u, 'NA'), u, 'NA') as number;
      expect(Math.abs(back - v) / Math.abs(v)).toBeLessThan(5e-6);
    }
  });

  it('states range messages in the field unit', () => {
    expect(formMessages(['must be ≥ 0.3048'], 'm', 'NA')).toEqual(['must be ≥ 1 ft']);
    expect(formMessages(['must be ≥ 0.3048'], 'm', 'SI')).toEqual(['must be ≥ 0.3048']);
    expect(formMessages(['enter a number'], 'm', 'NA')).toEqual(['enter a number']);
  });
});
