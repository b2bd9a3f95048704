import { describe, it, expect } from 'vitest';
import {
  requireFinite,
  requireNonNegative,
  requireOneOf,
  requireOpenRange,
  requirePositive,
  requireRange,
} from '../../layers/physics/validate';

describe('input checks name the parameter, the allowed range and the value received', () => {
  it('requireFinite: NaN, ±Infinity and non-numbers throw TypeError; finite numbers pass through', () => {
    expect(requireFinite('x_m', 2.5)).toBe(2.5);
    expect(() => requireFinite('x_m', NaN)).toThrow(
      new TypeError('x_m must be a finite number; received NaN'),
    );
    expect(() => requireFinite('x_m', -Infinity)).toThrow(/x_m must be a finite number; received -Infinity/);
    expect(() => requireFinite('x_m', '3')).toThrow(/received "3"/);
    expect(() => requireFinite('x_m', undefined)).toThrow(/received undefined/);
  });
  it('requireRange: inclusive bounds, RangeError with unit', () => {
    expect(requireRange('porosity', 0, 0, 1)).toBe(0);
    expect(requireRange('porosity', 1, 0, 1)).toBe(1);
    expect(() => requireRange('porosity', -0.1, 0, 1)).toThrow(
      new RangeError('porosity must be in [0, 1]; received -0.1'),
    );
    expect(() => requireRange('waterContent_m3m3', 0.6, 0, 0.4, 'm3/m3')).toThrow(
      /\[0, 0\.4\] m3\/m3; received 0\.6/,
    );
    expect(() => requireRange('porosity', NaN, 0, 1)).toThrow(TypeError);
  });
  it('requirePositive, requireNonNegative, requireOpenRange', () => {
    expect(() => requirePositive('k_W_mK', 0)).toThrow(/k_W_mK must be > 0; received 0/);
    expect(requireNonNegative('t_s', 0)).toBe(0);
    expect(() => requireNonNegative('t_s', -1)).toThrow(RangeError);
    expect(() => requireOpenRange('f', 1, 0, 1)).toThrow(/f must be in \(0, 1\)/);
    expect(requireOpenRange('f', 0.5, 0, 1)).toBe(0.5);
  });
  it('requireOneOf lists the allowed values', () => {
    expect(requireOneOf('state', 'frozen', ['frozen', 'thawed'] as const)).toBe('frozen');
    expect(() => requireOneOf('state', 'liquid', ['frozen', 'thawed'] as const)).toThrow(
      /state must be one of frozen, thawed; received "liquid"/,
    );
  });
});
