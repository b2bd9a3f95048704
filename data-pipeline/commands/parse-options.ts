/**
 * Tiny option parser shared by the commands: `--name value`, `--name=value` and boolean `--flag`.
 * Unknown options and missing values are InputErrors naming the option.
 */
import { InputError } from '../input-error';

export interface OptionSpec {
  /** Option names taking a value. */
  values: string[];
  /** Boolean flags. */
  flags?: string[];
}

export interface ParsedOptions {
  values: Record<string, string>;
  flags: Set<string>;
  positional: string[];
}

export function parseOptions(command: string, argv: string[], spec: OptionSpec): ParsedOptions {
  const values: Record<string, string> = {};
  const flags = new Set<string>();
  const positional: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (!arg.startsWith('--')) {
      positional.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    const name = arg.slice(2, eq >= 0 ? eq : undefined);
    if (spec.values.includes(name)) {
      const value = eq >= 0 ? arg.slice(eq + 1) : argv[++i];
      if (value === undefined || (eq < 0 && value.startsWith('--'))) {
        throw new InputError(`${command}: option --${name} needs a value`);
      }
      values[name] = value;
    } else if (spec.flags?.includes(name) && eq < 0) {
      flags.add(name);
    } else {
      throw new InputError(`${command}: unknown option ${arg} (see pile-atlas ${command} --help)`);
    }
  }
  return { values, flags, positional };
}

/** A required option's value, or an InputError naming it. */
export function requireOption(command: string, options: ParsedOptions, name: string): string {
  const v = options.values[name];
  if (v === undefined || v === '') throw new InputError(`${command}: missing required option --${name}`);
  return v;
}

/** Parse a numeric option within [min, max], or an InputError naming it. */
export function numberOption(
  command: string,
  options: ParsedOptions,
  name: string,
  fallback: number,
  min: number,
  max: number,
  integer = false,
): number {
  const raw = options.values[name];
  if (raw === undefined) return fallback;
  const v = Number(raw);
  if (!Number.isFinite(v) || v < min || v > max || (integer && !Number.isInteger(v))) {
    throw new InputError(
      `${command}: --${name} must be ${integer ? 'an integer' : 'a number'} in [${min}, ${max}], got "${raw}"`,
    );
  }
  return v;
}
