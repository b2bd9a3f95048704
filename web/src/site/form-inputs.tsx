/**
 * The input widgets of the site form (site-form.tsx): a number box in the chosen unit system (form-units.ts)
 * with its allowed range and, when converted, the stored SI value beside it, a comma-separated number list, a switch, and the message beside a field.
 */
import { useEffect, useState } from 'react';
import { z } from 'zod';
import { getAt, numberLimits, pathKey, setAt, type Path } from './schema-form-model';
import { formatNumber, type UnitSystem } from '../units/display-units';
import {
  formFieldConverts,
  formFieldUnit,
  formMessages,
  formStoredValue,
  formValueNumber,
  formValueText,
} from './form-units';

export interface FormContext {
  root: unknown;
  /** Display system: in 'NA' each SI field shows and takes its North American unit (stored SI). */
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
  /** The schema's (SI) unit; the field shows and takes the North American unit when that is on. */
  unit: string;
  /** The schema default (SI), shown as the placeholder in the field's unit. */
  defaultValue?: number;
  placeholder?: string;
  hint?: string;
}) {
  const { ctx, path } = props;
  const system = ctx.units ?? 'SI';
  const value = getAt(ctx.root, path);
  const unit = formFieldUnit(props.unit, system);
  const shown =
    typeof value === 'number'
      ? formValueText(value, props.unit, system)
      : typeof value === 'string'
        ? value
        : '';
  const [text, setText] = useState(shown);
  const [textSystem, setTextSystem] = useState(system);
  useEffect(() => {
    // Resync when the value changes from outside (reset, prefill) or the unit switch flips; typing
    // keeps its own text (its stored value is what the text converts to).
    if (textSystem !== system) {
      setTextSystem(system);
      setText(shown);
      return;
    }
    if (formStoredValue(text, props.unit, system) !== value && !(value === undefined && text.trim() === ''))
      setText(shown);
  }, [value, system]);
  const id = fieldId(path);
  const messages = formMessages(ctx.issues.get(pathKey(path)), props.unit, system);
  const lim = numberLimits(props.schema);
  const inUnit = (v: number) => formValueNumber(v, props.unit, system);
  const range =
    lim.min !== null && lim.max !== null
      ? `${inUnit(lim.min)} to ${inUnit(lim.max)}`
      : lim.min !== null
        ? `at least ${inUnit(lim.min)}`
        : lim.max !== null
          ? `at most ${inUnit(lim.max)}`
          : '';
  const placeholder =
    props.defaultValue !== undefined ? `default ${inUnit(props.defaultValue)}` : props.placeholder;
  return (
    <div className={`field${messages ? ' invalid' : ''}`}>
      <label htmlFor={id}>{props.label}</label>
      <span className="input-unit">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          value={text}
          placeholder={placeholder}
          data-stored-si={typeof value === 'number' ? String(value) : undefined}
          aria-invalid={messages ? true : undefined}
          aria-describedby={messages ? `${id}-err` : undefined}
          title={[range && `allowed ${range}${unit ? ` ${unit}` : ''}`, props.hint]
            .filter(Boolean)
            .join('. ')}
          onChange={(e) => {
            setText(e.target.value);
            ctx.onChange(setAt(ctx.root, path, formStoredValue(e.target.value, props.unit, system)));
          }}
        />
        <span className="unit">{unit}</span>
      </span>
      {formFieldConverts(props.unit, system) && typeof value === 'number' ? (
        <span className="alt-unit" data-testid="si-equivalent">
          = {formatNumber(value, 4)} {props.unit}
        </span>
      ) : null}
      <Messages id={`${id}-err`} messages={messages} />
    </div>
  );
}

export function NumberListField(props: { ctx: FormContext; path: Path; label: string; unit: string }) {
  const { ctx, path } = props;
  const system = ctx.units ?? 'SI';
  const value = getAt(ctx.root, path);
  const listText = () =>
    Array.isArray(value)
      ? value
          .map((v) => (typeof v === 'number' ? formValueText(v, props.unit, system) : String(v)))
          .join(', ')
      : '';
  const [text, setText] = useState(listText);
  const [textSystem, setTextSystem] = useState(system);
  useEffect(() => {
    if (textSystem !== system) {
      setTextSystem(system);
      setText(listText());
    }
  }, [system]);
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
            const next =
              parts.length === 0 ? undefined : parts.map((p) => formStoredValue(p, props.unit, system) ?? p);
            ctx.onChange(setAt(ctx.root, path, next));
          }}
        />
        <span className="unit">{formFieldUnit(props.unit, system)}</span>
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
