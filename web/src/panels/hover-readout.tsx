/**
 * The values under the cursor, in the corner of the map: the shown layer first, then a few headline
 * bands of the same cell (suitability, ground temperature, piles per ton, thaw delay) when the build
 * has them. Everything else is one click away in the cell panel.
 */
import type { Band, Manifest } from '../../../layers/screening/manifest';
import { HEADLINE_BAND_IDS } from '../../../layers/screening/band-registry';
import type { CellTable } from '../data/cell-table';
import { displayTitle, formatLonLat, type UnitSystem } from '../units/display-units';
import { bandValueText } from './cell-panel';
import { rangeText } from './ensemble-ranges';

export interface HoverState {
  lon: number;
  lat: number;
  index: number;
}

const HEADLINE_BANDS: readonly string[] = HEADLINE_BAND_IDS;

export function HoverReadout(props: {
  hover: HoverState | null;
  table: CellTable | null;
  manifest: Manifest;
  band: Band;
  bandIndex: number;
  units: UnitSystem;
  /** Compare view: the scenario the readout is of (named on its first line). */
  scenario?: string;
  testId?: string;
  className?: string;
}) {
  const { hover, table, band, bandIndex, units, manifest } = props;
  if (!hover) return null;
  // The cell's value of a band's climate-horizon flag (thaw after <year>, climate-horizon.ts).
  const flagOf = (b: Band): number | null | undefined => {
    if (!b.horizon || !table || hover.index < 0) return undefined;
    const i = manifest.bands.findIndex((x) => x.id === b.horizon?.flagBand);
    return i < 0 ? undefined : table.planes[i][hover.index];
  };
  const valueOf = (id: string): number | null | undefined => {
    if (!table || hover.index < 0) return undefined;
    const i = manifest.bands.findIndex((x) => x.id === id);
    return i < 0 ? undefined : table.planes[i][hover.index];
  };
  // Ensemble builds: the P10–P90 range of the shown layer (or of the band it is a percentile of).
  const range = table && hover.index >= 0 ? rangeText(manifest, valueOf, band.id, units) : null;
  let text: string;
  if (!table) text = 'loading cells…';
  else if (hover.index < 0) text = 'no data here';
  else {
    const v = table.planes[bandIndex][hover.index];
    text = bandValueText(band, Number.isFinite(v) ? v : null, units, flagOf(band));
  }
  return (
    <div
      className={props.className ? `readout ${props.className}` : 'readout'}
      role="status"
      aria-live="off"
      data-testid={props.testId ?? 'hover-readout'}
    >
      {props.scenario ? (
        <div className="small readout-scenario" data-testid="readout-scenario">
          {props.scenario}
        </div>
      ) : null}
      <div className="small muted">{formatLonLat(hover.lon, hover.lat, 3)}</div>
      <div>
        {displayTitle(band.title, band.unit, units)}: <strong data-testid="hover-value">{text}</strong>
      </div>
      {range ? (
        <div className="small" data-testid="hover-range">
          {range}
        </div>
      ) : null}
      {table && hover.index >= 0
        ? manifest.bands.map((b, i) =>
            HEADLINE_BANDS.includes(b.id) && i !== bandIndex ? (
              <div key={b.id} className="small">
                {displayTitle(b.title, b.unit, units)}:{' '}
                {bandValueText(
                  b,
                  Number.isFinite(table.planes[i][hover.index]) ? table.planes[i][hover.index] : null,
                  units,
                  flagOf(b),
                )}
              </div>
            ) : null,
          )
        : null}
    </div>
  );
}
