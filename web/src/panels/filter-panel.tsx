/**
 * Live filters: a minimum and/or maximum per continuous band (entered in display units, kept in SI)
 * and classes to leave out per class band. Every change fades failing cells at once.
 */
import { useState } from 'react';
import type { Band } from '../../../layers/screening/manifest';
import type { BandRange, FilterSpec } from '../filters/cell-filter';
import { displayTitle, formatNumber, fromDisplay, toDisplay, type UnitSystem } from '../units/display-units';
import { legendRange } from '../map/colour-tile';
import { bandUnitText } from './cell-panel';

function parseBound(text: string, band: Band, units: UnitSystem): number | undefined | null {
  const t = text.trim();
  if (t === '') return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? fromDisplay(v, band.unit, units) : null;
}

function RangeRow(props: {
  band: Band;
  range: BandRange;
  units: UnitSystem;
  onChange: (r: BandRange) => void;
  onRemove: () => void;
}) {
  const { band, range, units } = props;
  const unit = bandUnitText(band, units);
  const [bad, setBad] = useState(false);
  const shown = (v: number | undefined) =>
    v === undefined ? '' : String(Number(toDisplay(v, band.unit, units).toPrecision(6)));
  const [lo, hi] = legendRange(band);
  const set = (which: 'min' | 'max', text: string) => {
    const v = parseBound(text, band, units);
    setBad(v === null);
    if (v !== null) props.onChange({ ...range, [which]: v });
  };
  return (
    <li className="filter-row" data-testid={`filter-${band.id}`}>
      <div className="row">
        <strong>{displayTitle(band.title, band.unit, units)}</strong>
        <button
          type="button"
          className="icon"
          onClick={props.onRemove}
          aria-label={`Remove filter on ${band.title}`}
        >
          ×
        </button>
      </div>
      <div className="row" key={units}>
        <label>
          min
          <input
            inputMode="decimal"
            defaultValue={shown(range.min)}
            onChange={(e) => set('min', e.target.value)}
            aria-label={`Minimum ${band.title} (${unit || 'no unit'})`}
            data-testid={`filter-${band.id}-min`}
          />
        </label>
        <label>
          max
          <input
            inputMode="decimal"
            defaultValue={shown(range.max)}
            onChange={(e) => set('max', e.target.value)}
            aria-label={`Maximum ${band.title} (${unit || 'no unit'})`}
            data-testid={`filter-${band.id}-max`}
          />
        </label>
        <span className="muted small">{unit}</span>
      </div>
      <div className="muted small">
        map range {formatNumber(toDisplay(lo, band.unit, units))} to{' '}
        {formatNumber(toDisplay(hi, band.unit, units))} {unit}
        {bad ? <span className="fail"> — not a number</span> : null}
      </div>
    </li>
  );
}

function ClassRow(props: {
  band: Band;
  excluded: number[];
  onChange: (values: number[]) => void;
  onRemove: () => void;
}) {
  const { band, excluded } = props;
  return (
    <li className="filter-row" data-testid={`filter-${band.id}`}>
      <div className="row">
        <strong>{band.title}</strong>
        <button
          type="button"
          className="icon"
          onClick={props.onRemove}
          aria-label={`Remove filter on ${band.title}`}
        >
          ×
        </button>
      </div>
      <fieldset className="classes">
        <legend className="small muted">keep the ticked classes</legend>
        {(band.classes ?? []).map((c) => (
          <label key={c.value} className="block small">
            <input
              type="checkbox"
              checked={!excluded.includes(c.value)}
              onChange={(e) =>
                props.onChange(
                  e.target.checked ? excluded.filter((v) => v !== c.value) : [...excluded, c.value],
                )
              }
            />
            {c.label}
          </label>
        ))}
      </fieldset>
    </li>
  );
}

/**
 * The active filters in one line each, as the counter repeats them ("Ground temperature ≤ 28 °F",
 * "Suitability class: not poor"), so that what the count means stays in view with it.
 */
export function activeFilterTexts(filter: FilterSpec, bands: Band[], units: UnitSystem): string[] {
  const byId = new Map(bands.map((b) => [b.id, b]));
  const out: string[] = [];
  for (const r of filter.ranges) {
    const band = byId.get(r.bandId);
    if (!band || (r.min === undefined && r.max === undefined)) continue;
    const unit = bandUnitText(band, units);
    const v = (x: number) => `${formatNumber(toDisplay(x, band.unit, units))}${unit ? ` ${unit}` : ''}`;
    const title = displayTitle(band.title, band.unit, units);
    if (r.min !== undefined && r.max !== undefined) out.push(`${title} ${v(r.min)} to ${v(r.max)}`);
    else out.push(r.min !== undefined ? `${title} ≥ ${v(r.min)}` : `${title} ≤ ${v(r.max ?? NaN)}`);
  }
  for (const e of filter.excluded) {
    const band = byId.get(e.bandId);
    if (!band || e.values.length === 0) continue;
    const labels = e.values.map((x) => band.classes?.find((c) => c.value === x)?.label ?? String(x));
    out.push(`${band.title}: not ${labels.join(', not ')}`);
  }
  return out;
}

export function FilterPanel(props: {
  bands: Band[];
  filter: FilterSpec;
  units: UnitSystem;
  onChange: (f: FilterSpec) => void;
}) {
  const { bands, filter, units, onChange } = props;
  const used = new Set([...filter.ranges.map((r) => r.bandId), ...filter.excluded.map((e) => e.bandId)]);
  const byId = new Map(bands.map((b) => [b.id, b]));
  const add = (id: string) => {
    const band = byId.get(id);
    if (!band) return;
    if (band.kind === 'class')
      onChange({ ...filter, excluded: [...filter.excluded, { bandId: id, values: [] }] });
    else onChange({ ...filter, ranges: [...filter.ranges, { bandId: id }] });
  };
  return (
    <section className="panel" aria-label="Filters">
      <h2>Filters</h2>
      <ul className="filters">
        {filter.ranges.map((r, i) => {
          const band = byId.get(r.bandId);
          return band ? (
            <RangeRow
              key={r.bandId}
              band={band}
              range={r}
              units={units}
              onChange={(nr) =>
                onChange({ ...filter, ranges: filter.ranges.map((x, j) => (j === i ? nr : x)) })
              }
              onRemove={() => onChange({ ...filter, ranges: filter.ranges.filter((_, j) => j !== i) })}
            />
          ) : null;
        })}
        {filter.excluded.map((e, i) => {
          const band = byId.get(e.bandId);
          return band ? (
            <ClassRow
              key={e.bandId}
              band={band}
              excluded={e.values}
              onChange={(values) =>
                onChange({
                  ...filter,
                  excluded: filter.excluded.map((x, j) => (j === i ? { ...x, values } : x)),
                })
              }
              onRemove={() => onChange({ ...filter, excluded: filter.excluded.filter((_, j) => j !== i) })}
            />
          ) : null;
        })}
      </ul>
      <label className="block">
        Add a filter on
        <select value="" onChange={(e) => add(e.target.value)} data-testid="filter-add">
          <option value="">choose a layer…</option>
          {bands
            .filter((b) => !used.has(b.id))
            .map((b) => (
              <option key={b.id} value={b.id}>
                {b.title}
              </option>
            ))}
        </select>
      </label>
      {filter.ranges.length + filter.excluded.length > 0 ? (
        <button type="button" onClick={() => onChange({ ranges: [], excluded: [] })}>
          Clear all filters
        </button>
      ) : null}
    </section>
  );
}
