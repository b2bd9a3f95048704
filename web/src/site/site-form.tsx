/**
 * The site input form, drawn from the one zod schema (layers/site/site-input-schema.ts): every field of
 * the schema is editable, with its title and unit from the schema's metadata and its validation message
 * right beside it. Fields with a value are shown; fields left empty (their default applies, or they are
 * optional) sit under "More settings". Optional and nullable groups get a switch, unions a selector,
 * arrays of objects add/remove buttons, arrays of numbers a comma-separated box.
 */
import { useId, useState } from 'react';
import { z } from 'zod';
import {
  emptyValue,
  getAt,
  pathKey,
  setAt,
  unwrapSchema,
  type Path,
  type Unwrapped,
} from './schema-form-model';
import { fieldId, Messages, NumberField, NumberListField, Toggle, type FormContext } from './form-inputs';
import { optionTitle } from '../../../layers/site/site-option-titles';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** 'outerDiameter_m' -> 'Outer diameter' (used when the schema gives no title). */
export function humanise(key: string): string {
  const base = key
    .replace(/_.*$/, '')
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase();
  return base.charAt(0).toUpperCase() + base.slice(1);
}

/** What every kind of field reads from its schema node: where it is, its value, label and default. */
interface FieldNode {
  ctx: FormContext;
  path: Path;
  name: string;
  u: Unwrapped;
  value: unknown;
  label: string;
  unit: string;
  /** The placeholder: the default that applies when the field is left empty, or "optional". */
  defaultText: string | undefined;
}

function fieldNode(props: { ctx: FormContext; schema: z.ZodType; path: Path; name: string }): FieldNode {
  const { ctx, path, name } = props;
  const u = unwrapSchema(props.schema);
  const defaultText =
    u.hasDefault && (typeof u.defaultValue === 'number' || typeof u.defaultValue === 'string')
      ? `default ${typeof u.defaultValue === 'number' ? Number(u.defaultValue.toPrecision(4)) : u.defaultValue}`
      : u.optional
        ? 'optional'
        : undefined;
  return {
    ctx,
    path,
    name,
    u,
    value: getAt(ctx.root, path),
    label: u.meta.title ?? humanise(name),
    unit: u.meta.unit ?? '',
    defaultText,
  };
}

/** One schema node at `path` (recursive). */
export function SchemaField(props: { ctx: FormContext; schema: z.ZodType; path: Path; name: string }) {
  const node = fieldNode(props);
  const { ctx, path, u, label } = node;
  const b = u.base;
  if (b instanceof z.ZodNumber) {
    return (
      <NumberField
        ctx={ctx}
        path={path}
        schema={b}
        label={label}
        unit={node.unit}
        defaultValue={u.hasDefault && typeof u.defaultValue === 'number' ? u.defaultValue : undefined}
        placeholder={node.defaultText}
        hint={u.meta.description}
      />
    );
  }
  if (b instanceof z.ZodEnum) return <EnumField node={node} options={b.options} />;
  if (b instanceof z.ZodLiteral) return null;
  if (b instanceof z.ZodBoolean) {
    return (
      <Toggle
        id={fieldId(path)}
        label={label}
        checked={node.value === true}
        onChange={(v) => ctx.onChange(setAt(ctx.root, path, v))}
      />
    );
  }
  if (b instanceof z.ZodArray) return <ArrayField node={node} element={b.element as z.ZodType} />;
  if (b instanceof z.ZodDiscriminatedUnion || b instanceof z.ZodUnion)
    return <UnionField node={node} options={b.options as z.ZodType[]} />;
  if (b instanceof z.ZodObject) return <ObjectGroup node={node} schema={b} />;
  return null;
}

function EnumField({ node, options }: { node: FieldNode; options: readonly (string | number)[] }) {
  const { ctx, path, value } = node;
  const id = fieldId(path);
  const messages = ctx.issues.get(pathKey(path));
  return (
    <div className={`field${messages ? ' invalid' : ''}`}>
      <label htmlFor={id}>{node.label}</label>
      <select
        id={id}
        value={typeof value === 'string' ? value : ''}
        onChange={(e) => ctx.onChange(setAt(ctx.root, path, e.target.value || undefined))}
      >
        {value === undefined ? <option value="">{node.defaultText ?? 'choose'}</option> : null}
        {options.map((o) => (
          <option key={String(o)} value={String(o)}>
            {optionTitle(String(o))}
          </option>
        ))}
      </select>
      <Messages id={`${id}-err`} messages={messages} />
    </div>
  );
}

/** A list: numbers in one comma-separated box, month switches, or items with add / remove buttons. */
function ArrayField({ node, element }: { node: FieldNode; element: z.ZodType }) {
  const el = unwrapSchema(element);
  if (el.base instanceof z.ZodNumber) {
    return (
      <NumberListField ctx={node.ctx} path={node.path} label={node.label} unit={el.meta.unit ?? node.unit} />
    );
  }
  if (el.base instanceof z.ZodBoolean) return <MonthSwitches node={node} />;
  return (
    <ItemList node={node} element={element} itemObject={el.base instanceof z.ZodObject ? el.base : null} />
  );
}

/** Twelve monthly switches behind one switch (off: the field is left out). */
function MonthSwitches({ node }: { node: FieldNode }) {
  const { ctx, path } = node;
  const list = Array.isArray(node.value) ? (node.value as boolean[]) : null;
  return (
    <fieldset className="group">
      <legend>
        <Toggle
          id={`${fieldId(path)}-on`}
          label={node.label}
          checked={list !== null}
          onChange={(v) => ctx.onChange(setAt(ctx.root, path, v ? new Array(12).fill(true) : undefined))}
        />
      </legend>
      {list ? (
        <div className="months">
          {list.map((on, i) => (
            <Toggle
              key={i}
              id={`${fieldId(path)}-${i}`}
              label={MONTHS[i] ?? String(i + 1)}
              checked={on}
              onChange={(v) => ctx.onChange(setAt(ctx.root, [...path, i], v))}
            />
          ))}
        </div>
      ) : null}
    </fieldset>
  );
}

function ItemList(props: { node: FieldNode; element: z.ZodType; itemObject: z.ZodObject | null }) {
  const { ctx, path, name, label } = props.node;
  const { element, itemObject } = props;
  const list = Array.isArray(props.node.value) ? props.node.value : [];
  const messages = ctx.issues.get(pathKey(path));
  const itemName = humanise(name).replace(/s$/, '');
  return (
    <fieldset className="group list">
      <legend>{label}</legend>
      {list.map((_, i) => (
        <div className="list-item" key={i}>
          <div className="list-item-head">
            <strong>
              {itemName} {i + 1}
            </strong>
            <button
              type="button"
              className="small"
              onClick={() =>
                ctx.onChange(
                  setAt(
                    ctx.root,
                    path,
                    list.filter((__, j) => j !== i),
                  ),
                )
              }
              aria-label={`Remove ${itemName.toLowerCase()} ${i + 1}`}
            >
              Remove
            </button>
          </div>
          {itemObject ? (
            <ObjectFields ctx={ctx} schema={itemObject} path={[...path, i]} />
          ) : (
            <SchemaField ctx={ctx} schema={element} path={[...path, i]} name={String(i)} />
          )}
        </div>
      ))}
      <button
        type="button"
        className="small"
        onClick={() => ctx.onChange(setAt(ctx.root, path, [...list, newItem(element, list)]))}
      >
        Add {itemName.toLowerCase()}
      </button>
      <Messages id={`${fieldId(path)}-err`} messages={messages} />
    </fieldset>
  );
}

/** A choice between shapes (a union): a "Kind" selector and the chosen shape's fields. */
function UnionField({ node, options }: { node: FieldNode; options: z.ZodType[] }) {
  const { ctx, path, value, label, u } = node;
  const labels = options.map((o) => optionLabel(o));
  const active = options.findIndex((o) => o.safeParse(value).success || matchesDiscriminator(o, value));
  const index = active < 0 ? 0 : active;
  const id = fieldId([...path, 'kind']);
  const messages = ctx.issues.get(pathKey(path));
  const cu = unwrapSchema(options[index]);
  return (
    <fieldset className="group">
      <legend>{label}</legend>
      <div className="field">
        <label htmlFor={id}>{u.meta.title ? 'Kind' : label}</label>
        <select
          id={id}
          value={index}
          onChange={(e) => ctx.onChange(setAt(ctx.root, path, emptyValue(options[Number(e.target.value)])))}
        >
          {labels.map((l, i) => (
            <option key={l} value={i}>
              {l}
            </option>
          ))}
        </select>
      </div>
      {cu.base instanceof z.ZodObject ? <ObjectFields ctx={ctx} schema={cu.base} path={path} /> : null}
      <Messages id={`${id}-err`} messages={messages} />
    </fieldset>
  );
}

/** A group of fields; an optional or nullable group has a switch that adds or removes it. */
function ObjectGroup({ node, schema }: { node: FieldNode; schema: z.ZodObject }) {
  const { ctx, path, value, label, u } = node;
  const idBase = useId();
  const present = value !== undefined && value !== null;
  const switchable = u.optional || u.nullable;
  const messages = ctx.issues.get(pathKey(path));
  return (
    <fieldset className="group" data-path={pathKey(path)}>
      <legend>
        {switchable ? (
          <Toggle
            id={`${fieldId(path)}-on${idBase}`}
            label={label}
            checked={present}
            onChange={(v) =>
              ctx.onChange(setAt(ctx.root, path, v ? emptyValue(schema) : u.nullable ? null : undefined))
            }
          />
        ) : (
          label
        )}
      </legend>
      {u.meta.description && present ? <p className="hint">{u.meta.description}</p> : null}
      {present || !switchable ? <ObjectFields ctx={ctx} schema={schema} path={path} /> : null}
      <Messages id={`${fieldId(path)}-err`} messages={messages} />
    </fieldset>
  );
}

function optionLabel(o: z.ZodType): string {
  const b = unwrapSchema(o).base;
  if (b instanceof z.ZodLiteral) return optionTitle(String(b.value));
  if (b instanceof z.ZodObject) {
    for (const child of Object.values(b.shape as Record<string, z.ZodType>)) {
      if (child instanceof z.ZodLiteral) return optionTitle(String(child.value));
    }
    return Object.keys(b.shape).map(humanise).join(', ').toLowerCase();
  }
  return 'option';
}

function matchesDiscriminator(o: z.ZodType, value: unknown): boolean {
  const b = unwrapSchema(o).base;
  if (!(b instanceof z.ZodObject) || value === null || typeof value !== 'object') return false;
  for (const [k, child] of Object.entries(b.shape as Record<string, z.ZodType>)) {
    if (child instanceof z.ZodLiteral) return (value as Record<string, unknown>)[k] === child.value;
  }
  return false;
}

/** A new list item: a copy of the last one moved below it where it has top/bottom depths, else empty. */
function newItem(element: z.ZodType, list: unknown[]): unknown {
  const last = list[list.length - 1] as Record<string, unknown> | undefined;
  if (last && typeof last === 'object') {
    const copy = structuredClone(last);
    if (typeof last.bottom_m === 'number' && typeof last.top_m === 'number') {
      copy.top_m = last.bottom_m;
      copy.bottom_m = last.bottom_m + Math.max(1, last.bottom_m - last.top_m);
    }
    return copy;
  }
  return emptyValue(element);
}

/** The fields of an object: present ones first, the rest under "More settings". */
export function ObjectFields(props: { ctx: FormContext; schema: z.ZodObject; path: Path }) {
  const { ctx, schema, path } = props;
  const entries = Object.entries(schema.shape as Record<string, z.ZodType>).filter(
    ([, s]) => !(s instanceof z.ZodLiteral),
  );
  const hasIssue = (p: string) => [...ctx.issues.keys()].some((k) => k === p || k.startsWith(`${p}.`));
  // Fields present when the group first appeared stay in place even when emptied (focus is not lost).
  const [initial] = useState(
    () => new Set(entries.filter(([k]) => getAt(ctx.root, [...path, k]) !== undefined).map(([k]) => k)),
  );
  const required = (s: z.ZodType) => {
    const u = unwrapSchema(s);
    return !u.optional && !u.hasDefault;
  };
  const shown = entries.filter(
    ([k, s]) =>
      initial.has(k) ||
      required(s) ||
      getAt(ctx.root, [...path, k]) !== undefined ||
      hasIssue(pathKey([...path, k])),
  );
  const hidden = entries.filter((e) => !shown.includes(e));
  return (
    <div className="fields">
      {shown.map(([k, s]) => (
        <SchemaField key={k} ctx={ctx} schema={s} path={[...path, k]} name={k} />
      ))}
      {hidden.length ? (
        <details className="more">
          <summary>More settings ({hidden.length}, defaults apply)</summary>
          {hidden.map(([k, s]) => (
            <SchemaField key={k} ctx={ctx} schema={s} path={[...path, k]} name={k} />
          ))}
        </details>
      ) : null}
    </div>
  );
}
