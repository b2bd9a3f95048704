/**
 * The input widgets of the site form (site-form.tsx): a number box with its unit, allowed range and
 * North American equivalent, a comma-separated number list, a switch, and the message beside a field.
 */
import { useEffect, useState } from 'react';
import { z } from 'zod';
import { getAt, numberLimits, parseNumberText, pathKey, setAt, type Path } from './schema-form-model';
import { displayConversion, formatNumber, type UnitSystem } from '../units/display-units';

export interface FormContext {
  root: unknown;
  /** Display system: in 'NA' each SI field also shows its North American equivalent. */
  units?: UnitSystem;
  issues: Map<string, string[]>;
  onChange(next: unknown): void;
}

export function fieldId(path: Path): string {
  return `site-${pathKey(path).replace(/[^a-zA-Z0-9_-]/g, '-')}`;
}

export function Messages(props: { id: string; messages: string[] | undefined }) {
  if (!props.messages?.length) return null;
  return (
    <span className="field-error" id={props.id} data-testid="field-error">
      {props.messages.join('; ')}
    </span>
  );
}

export function NumberField(props: {
  ctx: FormContext;
  path: Path;
  schema: z.ZodNumber;
  label: string;
  unit: string;
  placeholder?: string;
  hint?: string;
}) {
  const { ctx, path } = props;
  const value = getAt(ctx.root, path);
  const shown = typeof value === 'number' ? String(value) : typeof value === 'string' ? value : '';
  const [text, setText] = useState(shown);
  useEffect(() => {
    if (parseNumberText(text) !== value && !(value === undefined && text.trim() === '')) setText(shown);
    // Resync only when the value changes from outside (reset, prefill); typing keeps its own text.
  }, [value]);
  const id = fieldId(path);
  const messages = ctx.issues.get(pathKey(path));
  const lim = numberLimits(props.schema);
  const range =
    lim.min !== null && lim.max !== null
      ? `${lim.min} to ${lim.max}`
      : lim.min !== null
        ? `at least ${lim.min}`
        : lim.max !== null
          ? `at most ${lim.max}`
          : '';
  return (
    <div className={`field${messages ? ' invalid' : ''}`}>
      <label htmlFor={id}>{props.label}</label>
      <span className="input-unit">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          value={text}
          placeholder={props.placeholder}
          aria-invalid={messages ? true : undefined}
          aria-describedby={messages ? `${id}-err` : undefined}
          title={[range && `allowed ${range}${props.unit ? ` ${props.unit}` : ''}`, props.hint]
            .filter(Boolean)
            .join('. ')}
          onChange={(e) => {
            setText(e.target.value);
            ctx.onChange(setAt(ctx.root, path, parseNumberText(e.target.value)));
          }}
        />
        <span className="unit">{props.unit}</span>
      </span>
      {ctx.units === 'NA' && typeof value === 'number' ? <AltUnit value={value} unit={props.unit} /> : null}
      <Messages id={`${id}-err`} messages={messages} />
    </div>
  );
}

/** The North American equivalent of an SI value (display units module), when the unit has one. */
function AltUnit(props: { value: number; unit: string }) {
  const unit = props.unit === 'W/m·K' ? 'W/(m·K)' : props.unit;
  const c = displayConversion(unit, 'NA');
  if (c.unit === unit) return null;
  return (
    <span className="alt-unit">
      = {formatNumber(props.value * c.factor + c.offset)} {c.unit}
    </span>
  );
}

export function NumberListField(props: { ctx: FormContext; path: Path; label: string; unit: string }) {
  const { ctx, path } = props;
  const value = getAt(ctx.root, path);
  const [text, setText] = useState(Array.isArray(value) ? value.join(', ') : '');
  const id = fieldId(path);
  const key = pathKey(path);
  const messages = [...ctx.issues.entries()]
    .filter(([k]) => k === key || k.startsWith(`${key}.`))
    .flatMap(([k, m]) => (k === key ? m : m.map((x) => `item ${Number(k.slice(key.length + 1)) + 1}: ${x}`)));
  return (
    <div className={`field wide${messages.length ? ' invalid' : ''}`}>
      <label htmlFor={id}>{props.label}</label>
      <span className="input-unit">
        <input
          id={id}
          type="text"
          value={text}
          placeholder="comma-separated numbers"
          aria-invalid={messages.length ? true : undefined}
          aria-describedby={messages.length ? `${id}-err` : undefined}
          onChange={(e) => {
            setText(e.target.value);
            const parts = e.target.value.split(/[,;\s]+/).filter((p) => p !== '');
            const next = parts.length === 0 ? undefined : parts.map((p) => parseNumberText(p) ?? p);
            ctx.onChange(setAt(ctx.root, path, next));
          }}
        />
        <span className="unit">{props.unit}</span>
      </span>
      <Messages id={`${id}-err`} messages={messages.length ? messages : undefined} />
    </div>
  );
}

export function Toggle(props: { id: string; label: string; checked: boolean; onChange(v: boolean): void }) {
  return (
    <label className="toggle" htmlFor={props.id}>
      <input
        id={props.id}
        type="checkbox"
        checked={props.checked}
        onChange={(e) => props.onChange(e.target.checked)}
      />{' '}
      {props.label}
    </label>
  );
}
