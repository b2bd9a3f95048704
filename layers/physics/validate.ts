/**
 * Input checks shared by the science core's public entry points (style.md habit 6, tier 2).
 *
 * Every check throws an error naming the parameter, the allowed range and the value received, so a
 * caller never gets a silent NaN: `TypeError` when the value is not a finite number, `RangeError` when
 * it is finite but outside its physical domain. The helpers return the value so they can be inlined:
 * `const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK);`.
 */

function describe(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === null) return 'null';
  return typeof value;
}

/** Throws a TypeError unless `value` is a finite number (not NaN, not ±Infinity, not a non-number). */
export function requireFinite(name: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new TypeError(`${name} must be a finite number; received ${describe(value)}`);
  }
  return value;
}

/**
 * Throws unless `min <= value <= max` (both inclusive; pass ±Infinity for an open side).
 * `unit` is appended to the message when given, e.g. 'm3/m3'.
 */
export function requireRange(name: string, value: unknown, min: number, max: number, unit = ''): number {
  const v = requireFinite(name, value);
  if (v < min || v > max) {
    const u = unit ? ` ${unit}` : '';
    throw new RangeError(`${name} must be in [${min}, ${max}]${u}; received ${v}`);
  }
  return v;
}

/** Throws unless `value > 0` and finite. */
export function requirePositive(name: string, value: unknown, unit = ''): number {
  const v = requireFinite(name, value);
  if (!(v > 0)) {
    const u = unit ? ` ${unit}` : '';
    throw new RangeError(`${name} must be > 0${u}; received ${v}`);
  }
  return v;
}

/** Throws unless `value >= 0` and finite. */
export function requireNonNegative(name: string, value: unknown, unit = ''): number {
  return requireRange(name, value, 0, Infinity, unit);
}

/** Throws unless `min < value < max` (both exclusive). */
export function requireOpenRange(name: string, value: unknown, min: number, max: number, unit = ''): number {
  const v = requireFinite(name, value);
  if (!(v > min && v < max)) {
    const u = unit ? ` ${unit}` : '';
    throw new RangeError(`${name} must be in (${min}, ${max})${u}; received ${v}`);
  }
  return v;
}

/** Throws a TypeError unless `value` is one of `allowed`. */
export function requireOneOf<T extends string>(name: string, value: unknown, allowed: readonly T[]): T {
  if (typeof value !== 'string' || !(allowed as readonly string[]).includes(value)) {
    throw new TypeError(`${name} must be one of ${allowed.join(', ')}; received ${describe(value)}`);
  }
  return value as T;
}
