/**
 * The counter: cells and area matching the filters, for the whole region and inside a boundary that
 * the planner draws on the map or imports as GeoJSON, with the active filters in words beside it.
 */
import type { ChangeEvent, ReactNode } from 'react';
import type { ZonalSummary } from '../filters/zonal-summary';
import { formatQuantity, type UnitSystem } from '../units/display-units';

export function Counts(props: { label: string; s: ZonalSummary; units: UnitSystem; testId: string }) {
  const { s, units } = props;
  return (
    <div className="counts" data-testid={props.testId}>
      <div className="muted small">{props.label}</div>
      <div>
        <strong data-testid={`${props.testId}-cells`}>{s.matchingCells.toLocaleString('en-US')}</strong> of{' '}
        {s.screenedCells.toLocaleString('en-US')} cells match
      </div>
      <div>
        <strong data-testid={`${props.testId}-area`}>
          {formatQuantity(s.matchingArea_km2, 'km²', units, 4)}
        </strong>{' '}
        of {formatQuantity(s.screenedArea_km2, 'km²', units, 4)}
      </div>
    </div>
  );
}

function ActiveFilters(props: { filters: string[] }) {
  if (props.filters.length === 0)
    return <p className="muted small">No filters: every screened cell counts.</p>;
  return (
    <ul className="active-filters small" aria-label="Active filters" data-testid="active-filters">
      {props.filters.map((f, i) => (
        <li key={i}>{f}</li>
      ))}
    </ul>
  );
}

export interface SummaryPanelProps {
  region: ZonalSummary | null;
  zone: ZonalSummary | null;
  /** The active filters in words (filter-panel.ts activeFilterTexts), shown with the counts. */
  filters: string[];
  zoneArea_km2: number | null;
  units: UnitSystem;
  drawing: boolean;
  hasBoundary: boolean;
  boundaryMessage: string | null;
  /** What the boundary worker is doing, or null. */
  boundaryBusy: string | null;
  onDraw: () => void;
  onFinish: () => void;
  onClear: () => void;
  onImport: (ev: ChangeEvent<HTMLInputElement>) => void;
  /** Further counts after the region's and the boundary's (the compare view's "under both"). */
  children?: ReactNode;
  /** Compare view: which scenario(s) the counts are under, in words, after "Whole region, ". */
  scopeText?: string;
  /** Compare view: the control choosing which scenario(s) the filters apply to. */
  scopePicker?: ReactNode;
}

export function SummaryPanel(props: SummaryPanelProps) {
  const { units } = props;
  const under = props.scopeText ? `, ${props.scopeText}` : '';
  return (
    <section className="panel" aria-label="Matching area" data-testid="summary-panel">
      <h2>Matching area</h2>
      {props.scopePicker}
      {props.region ? (
        <Counts label={`Whole region${under}`} s={props.region} units={units} testId="region-count" />
      ) : (
        <p className="muted">Counting cells…</p>
      )}
      <ActiveFilters filters={props.filters} />
      {props.zone ? (
        <Counts
          label={`Inside the boundary (${formatQuantity(props.zoneArea_km2 ?? NaN, 'km²', units, 4)} geodesic)${under}`}
          s={props.zone}
          units={units}
          testId="zone-count"
        />
      ) : null}
      {props.children}
      <div className="row wrap">
        {props.drawing ? (
          <button type="button" className="primary" onClick={props.onFinish} data-testid="boundary-finish">
            Finish boundary
          </button>
        ) : (
          <button type="button" onClick={props.onDraw} data-testid="boundary-draw">
            Draw a boundary
          </button>
        )}
        <label className="file-button">
          Import boundary
          <input
            type="file"
            accept=".geojson,.json,application/geo+json,application/json"
            onChange={props.onImport}
            data-testid="boundary-import"
          />
        </label>
        {props.hasBoundary ? (
          <button type="button" onClick={props.onClear} data-testid="boundary-clear">
            Clear boundary
          </button>
        ) : null}
      </div>
      {props.drawing ? (
        <p className="small">
          Click the map to place corners; “Finish boundary” closes the shape (Esc cancels).
        </p>
      ) : null}
      {props.boundaryBusy ? (
        <p className="small busy" aria-live="polite" data-testid="boundary-busy">
          {props.boundaryBusy}
        </p>
      ) : null}
      {props.boundaryMessage ? (
        <p className="small" role="status" data-testid="boundary-message">
          {props.boundaryMessage}
        </p>
      ) : null}
      <p className="muted small">Areas add up the analysis-grid cells on the ground, not map pixels.</p>
    </section>
  );
}
