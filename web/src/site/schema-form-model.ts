/**
 * The pure half of the schema-driven site form: reading a zod schema's shape and field metadata
 * (title, unit, min, max, description from `.meta()`, see layers/site/site-input-schema.ts), reading and
 * writing a draft value at a path without mutating it, parsing typed text, and grouping validation
 * issues by path so each message sits next to its field. One schema validates the form, the CLI and
 * imported files; nothing here duplicates its rules.
 */
import { z } from 'zod';

export type Path = readonly (string | number)[];

export interface FieldMeta {
  title?: string;
  unit?: string;
  min?: number;
  max?: number;
  description?: string;
}

/** A schema with its wrappers peeled off: optional / nullable / default and the metadata found on the way. */
export interface Unwrapped {
  base: z.ZodType;
  optional: boolean;
  nullable: boolean;
  hasDefault: boolean;
  defaultValue: unknown;
  meta: FieldMeta;
}

function metaOf(s: z.ZodType): FieldMeta {
  const m = z.globalRegistry.get(s) as FieldMeta | undefined;
  return m ?? {};
}

/** Peel optional, nullable and default wrappers (any order), merging metadata outer-first. */
export function unwrapSchema(schema: z.ZodType): Unwrapped {
  let s: z.ZodType = schema;
  let optional = false;
  let nullable = false;
  let hasDefault = false;
  let defaultValue: unknown = undefined;
  let meta: FieldMeta = { ...metaOf(s) };
  for (;;) {
    if (s instanceof z.ZodOptional) {
      optional = true;
      s = s.unwrap() as z.ZodType;
    } else if (s instanceof z.ZodNullable) {
      nullable = true;
      s = s.unwrap() as z.ZodType;
    } else if (s instanceof z.ZodDefault) {
      hasDefault = true;
      const d = s._zod.def.defaultValue;
      defaultValue = typeof d === 'function' ? (d as () => unknown)() : d;
      s = s._zod.def.innerType as z.ZodType;
    } else break;
    meta = { ...metaOf(s), ...meta };
  }
  return { base: s, optional, nullable, hasDefault, defaultValue, meta };
}

/** Number limits of a ZodNumber (from its checks), with `isInt`. */
export function numberLimits(s: z.ZodNumber): { min: number | null; max: number | null; isInt: boolean } {
  const min = s.minValue;
  const max = s.maxValue;
  return {
    min: min !== null && Number.isFinite(min) ? min : null,
    max: max !== null && Number.isFinite(max) ? max : null,
    isInt: s.isInt,
  };
}

/** Value at `path` (undefined when any step is missing). */
export function getAt(root: unknown, path: Path): unknown {
  let v: unknown = root;
  for (const key of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string | number, unknown>)[key];
  }
  return v;
}

/**
 * Copy of `root` with `value` at `path` (objects and arrays along the path are copied, missing ones
 * created: an array when the next key is a number). `undefined` removes an object key.
 */
export function setAt(root: unknown, path: Path, value: unknown): unknown {
  if (path.length === 0) return value;
  const [key, ...rest] = path;
  const base: unknown = root !== null && typeof root === 'object' ? root : typeof key === 'number' ? [] : {};
  const child = (base as Record<string | number, unknown>)[key];
  const next = setAt(child, rest, value);
  if (Array.isArray(base)) {
    const copy = base.slice();
    copy[key as number] = next;
    return copy;
  }
  const copy = { ...(base as Record<string, unknown>) };
  if (next === undefined) delete copy[key as string];
  else copy[key as string] = next;
  return copy;
}

/** Path as a dotted key, e.g. ['ground', 'layers', 0, 'top_m'] -> 'ground.layers.0.top_m'. */
export function pathKey(path: Path): string {
  return path.join('.');
}

/**
 * Parse what was typed into a number field: a finite number, `undefined` for an empty box (the
 * schema's default or "absent" applies), else the raw text (the schema then reports it).
 */
export function parseNumberText(text: string): number | string | undefined {
  const t = text.trim().replace(/\u2212/g, '-');
  if (t === '') return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : text;
}

export interface FieldIssue {
  path: string;
  message: string;
}

/** Plain message for one zod issue (a typed-text issue says so). */
function issueMessage(issue: z.core.$ZodIssue): string {
  if (issue.code === 'invalid_type' && issue.expected === 'number') {
    return 'enter a number';
  }
  if (issue.code === 'too_small' && typeof issue.minimum !== 'undefined') {
    const n =
      issue.origin === 'array'
        ? `at least ${issue.minimum} entries`
        : `${issue.inclusive ? '≥' : '>'} ${issue.minimum}`;
    return `must be ${n}`;
  }
  if (issue.code === 'too_big' && typeof issue.maximum !== 'undefined') {
    const n =
      issue.origin === 'array'
        ? `at most ${issue.maximum} entries`
        : `${issue.inclusive ? '≤' : '<'} ${issue.maximum}`;
    return `must be ${n}`;
  }
  return issue.message;
}

/** Validate `draft` with `schema`; issues grouped by dotted path ('' = the whole input). */
export function issuesByPath(schema: z.ZodType, draft: unknown): Map<string, string[]> {
  const out = new Map<string, string[]>();
  const r = schema.safeParse(draft);
  if (r.success) return out;
  for (const issue of r.error.issues) {
    const key = pathKey(issue.path as Path);
    const list = out.get(key) ?? [];
    list.push(issueMessage(issue));
    out.set(key, list);
  }
  return out;
}

/**
 * Issues whose path is not one of `shown` (so no field displays them), each attached to the nearest
 * shown ancestor path or '' — nothing is ever dropped silently.
 */
export function orphanIssues(issues: Map<string, string[]>, shown: ReadonlySet<string>): FieldIssue[] {
  const out: FieldIssue[] = [];
  for (const [path, messages] of issues) {
    if (shown.has(path)) continue;
    for (const m of messages) out.push({ path, message: m });
  }
  return out;
}

/** A starting value for a schema branch the user switches on (e.g. a new layer or probe). */
export function emptyValue(schema: z.ZodType): unknown {
  const u = unwrapSchema(schema);
  if (u.hasDefault) return structuredClone(u.defaultValue);
  const b = u.base;
  if (b instanceof z.ZodObject) {
    const out: Record<string, unknown> = {};
    for (const [k, child] of Object.entries(b.shape as Record<string, z.ZodType>)) {
      const cu = unwrapSchema(child);
      if (cu.optional || cu.hasDefault) continue;
      out[k] = emptyValue(child);
    }
    return out;
  }
  if (b instanceof z.ZodArray) return [];
  if (b instanceof z.ZodEnum) return b.options[0];
  if (b instanceof z.ZodLiteral) return b.value;
  if (b instanceof z.ZodBoolean) return false;
  if (b instanceof z.ZodNumber) {
    const { min, max } = numberLimits(b);
    return min !== null && min > 0 ? min : max !== null && max < 0 ? max : 0;
  }
  if (b instanceof z.ZodDiscriminatedUnion || b instanceof z.ZodUnion) {
    return emptyValue(b.options[0] as z.ZodType);
  }
  return undefined;
}

export interface InputLine {
  /** Readable path, e.g. 'Ground › Layers 1 › Layer top'. */
  label: string;
  value: string;
  unit: string;
}

/** Every leaf value of `value` with the schema's titles and units, for the printed site sheet. */
export function flattenInputs(schema: z.ZodType, value: unknown, trail: string[] = []): InputLine[] {
  const u = unwrapSchema(schema);
  const b = u.base;
  const title = u.meta.title;
  if (value === undefined) return [];
  if (value === null) return [{ label: trail.join(' › '), value: 'none', unit: '' }];
  if (b instanceof z.ZodObject && typeof value === 'object') {
    return Object.entries(b.shape as Record<string, z.ZodType>).flatMap(([k, s]) => {
      const cu = unwrapSchema(s);
      const name = cu.meta.title ?? k;
      return flattenInputs(s, (value as Record<string, unknown>)[k], [...trail, name]);
    });
  }
  if ((b instanceof z.ZodDiscriminatedUnion || b instanceof z.ZodUnion) && typeof value === 'object') {
    const match =
      (b.options as z.ZodType[]).find((o) => o.safeParse(value).success) ?? (b.options[0] as z.ZodType);
    return flattenInputs(match, value, trail);
  }
  if (b instanceof z.ZodArray && Array.isArray(value)) {
    const el = unwrapSchema(b.element as z.ZodType);
    if (el.base instanceof z.ZodNumber || el.base instanceof z.ZodBoolean) {
      return [{ label: trail.join(' › '), value: value.map(String).join(', '), unit: el.meta.unit ?? '' }];
    }
    return value.flatMap((v, i) =>
      flattenInputs(b.element as z.ZodType, v, [
        ...trail.slice(0, -1),
        `${trail[trail.length - 1] ?? ''} ${i + 1}`,
      ]),
    );
  }
  const text = typeof value === 'number' ? String(Number(value.toPrecision(6))) : String(value);
  return [{ label: trail.join(' › ') || (title ?? ''), value: text, unit: u.meta.unit ?? '' }];
}

/**
 * A field path in the trade's words for messages on screen and paper: the field's title from the site
 * schema, with the item number of each list it sits in ("Ground layers 2 · Texture"); never the path.
 */
export function fieldLabel(path: string, meta: Record<string, { title?: string }>): string {
  if (!path) return 'The input';
  const parts = path.split('.');
  const words: string[] = [];
  let key = '';
  for (const part of parts) {
    if (/^\d+$/.test(part)) {
      key = `${key}[]`;
      if (words.length) words[words.length - 1] += ` ${Number(part) + 1}`;
      continue;
    }
    key = key ? `${key}.${part}` : part;
    const title = meta[key]?.title;
    if (title) words.push(title);
  }
  return words.length ? words.join(' · ') : 'An input';
}
