/** The value under the cursor, in the corner of the map. */
import type { Band, Manifest } from '../../../layers/screening/manifest';
import type { CellTable } from '../data/cell-table';
import { formatLonLat, type UnitSystem } from '../units/display-units';
import { bandValueText } from './cell-panel';

export interface HoverState {
  lon: number;
  lat: number;
  index: number;
}

export function HoverReadout(props: {
  hover: HoverState | null;
  table: CellTable | null;
  manifest: Manifest;
  band: Band;
  bandIndex: number;
  units: UnitSystem;
}) {
  const { hover, table, band, bandIndex, units } = props;
  if (!hover) return null;
  let text: string;
  if (!table) text = 'loading cells…';
  else if (hover.index < 0) text = 'no data here';
  else {
    const v = table.planes[bandIndex][hover.index];
    text = bandValueText(band, Number.isFinite(v) ? v : null, units);
  }
  return (
    <div className="readout" role="status" aria-live="off" data-testid="hover-readout">
      <div className="small muted">{formatLonLat(hover.lon, hover.lat, 3)}</div>
      <div>
        {band.title}: <strong data-testid="hover-value">{text}</strong>
      </div>
    </div>
  );
}
