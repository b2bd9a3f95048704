/**
 * The clicked cell: the five figures a planner decides on first (key-figures.ts), then, folded, every
 * band's value with its unit and why it has its class, and the button that puts it on the shortlist.
 */
import type { Band, Manifest } from '../../../layers/screening/manifest';
import { horizonText } from '../../../layers/screening/climate-horizon';
import type { CellTable } from '../data/cell-table';
import { isCalendarYearBand } from '../../../layers/screening/export-schema';
import {
  displayConversion,
  displayTitle,
  formatLonLat,
  formatQuantity,
  type UnitSystem,
} from '../units/display-units';
import { ScreeningCaution } from './caution-notes';
import { ClassCard } from './class-card';
import { keyFigures } from './key-figures';

export interface CellSelection {
  /** Row of the cell table, or -1 when the click was outside the screened cells. */
  index: number;
  lon: number;
  lat: number;
}

/** Band values of one table row, keyed by band id (null for nodata). */
export function cellValues(table: CellTable, bands: Band[], index: number): Record<string, number | null> {
  const out: Record<string, number | null> = {};
  bands.forEach((b, i) => {
    const v = table.planes[i][index];
    out[b.id] = Number.isFinite(v) ? v : null;
  });
  return out;
}

/**
 * A band value as shown; `horizonFlag` is the cell's value of the band's horizon flag band
 * (band.horizon.flagBand, climate-horizon.ts): thaw years past the scenario's climate horizon read
 * "after <year>" and bounded durations "≥ value", never a plain number.
 */
export function bandValueText(
  band: Band,
  v: number | null,
  units: UnitSystem,
  horizonFlag?: number | null,
): string {
  if (band.kind !== 'class') {
    const shown =
      v === null
        ? ''
        : isCalendarYearBand(band)
          ? String(Math.round(v))
          : formatQuantity(v, band.unit, units);
    const h = horizonText(band.horizon, horizonFlag, shown);
    if (h !== null) return h;
  }
  if (v === null) return 'no data';
  if (band.kind === 'class') return band.classes?.find((c) => c.value === Math.round(v))?.label ?? String(v);
  if (isCalendarYearBand(band)) return String(Math.round(v));
  return formatQuantity(v, band.unit, units);
}

/** A band's unit as shown beside its numbers: "calendar year" for thaw years, else the display unit. */
export function bandUnitText(band: Band, units: UnitSystem): string {
  return isCalendarYearBand(band) ? 'calendar year' : displayConversion(band.unit, units).unit;
}

/** The horizon flag of a cell for a band, from the cell's values by band id (undefined: none). */
export function horizonFlagOf(
  band: Band,
  values: Record<string, number | null | undefined> | null | undefined,
): number | null | undefined {
  return band.horizon ? values?.[band.horizon.flagBand] : undefined;
}

export function CellPanel(props: {
  manifest: Manifest;
  table: CellTable | null;
  selection: CellSelection;
  units: UnitSystem;
  /** Name of the shortlisted site at this place (the button then updates it, never adds it twice). */
  listedAs?: string | null;
  onAdd: () => void;
  onClose: () => void;
}) {
  const { manifest, table, selection, units } = props;
  const inside = table !== null && selection.index >= 0;
  const values = inside ? cellValues(table, manifest.bands, selection.index) : null;
  return (
    <section className="panel cell-panel" aria-label="Selected cell" data-testid="cell-panel">
      <div className="panel-head">
        <h2>Selected place</h2>
        <button type="button" className="icon" onClick={props.onClose} aria-label="Close selected place">
          ×
        </button>
      </div>
      <p className="muted small">
        {formatLonLat(selection.lon, selection.lat, 4)}
        {inside ? ` · grid cell ${table.col[selection.index]}, ${table.row[selection.index]}` : ''}
      </p>
      {!inside ? (
        <p>{table ? 'No screening data here (sea or outside the screened land).' : 'Loading cell data…'}</p>
      ) : (
        <>
          <dl className="key-figures" data-testid="key-figures">
            {keyFigures(manifest, values ?? {}, units).map((f) => (
              <div key={f.key} data-testid={`key-${f.key}`}>
                <dt>{f.label}</dt>
                <dd>
                  <strong>{f.value}</strong>
                  {f.note ? <span className="muted small"> — {f.note}</span> : null}
                </dd>
              </div>
            ))}
          </dl>
          <details className="all-values" data-testid="all-values">
            <summary>All values ({manifest.bands.length})</summary>
            <table className="values" data-testid="cell-values">
              <tbody>
                {manifest.bands.map((b) => (
                  <tr key={b.id}>
                    <th scope="row">{displayTitle(b.title, b.unit, units)}</th>
                    <td>{bandValueText(b, values?.[b.id] ?? null, units, horizonFlagOf(b, values))}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </details>
          <ClassCard manifest={manifest} values={values ?? {}} units={units} />
          <button type="button" className="primary" onClick={props.onAdd} data-testid="add-to-shortlist">
            {props.listedAs ? `Update “${props.listedAs}” on the shortlist` : 'Add to shortlist'}
          </button>
        </>
      )}
      <ScreeningCaution />
    </section>
  );
}
