/** Legend of the selected band in the chosen display units, with nodata, sea and filtered-out keys. */
import type { Band } from '../../../layers/screening/manifest';
import { rampColour } from '../../../layers/screening/colour-ramps';
import {
  classColours,
  FADED_ALPHA,
  FADED_RGB,
  HATCH_FILL_ALPHA,
  HATCH_RGB,
  legendRange,
} from '../map/colour-tile';
import { LAND_COLOUR, SEA_COLOUR } from '../map/base-style';
import { bandUnitText } from './cell-panel';
import { displayConversion, displayTitle, formatNumber, type UnitSystem } from '../units/display-units';

function css([r, g, b]: [number, number, number], a = 1): string {
  return `rgba(${r}, ${g}, ${b}, ${a})`;
}

/** Swatch of the hatching of uncertain places (colour-tile.ts: dark diagonal stripes over the faded colour). */
function hatchBackground(): string {
  const stripe = css(HATCH_RGB);
  return `repeating-linear-gradient(45deg, ${stripe} 0 2px, rgba(68, 1, 84, ${HATCH_FILL_ALPHA}) 2px 6px)`;
}

/** Swatch of a cell outside the filters as the map draws it: the grey veil over the land colour. */
function fadedSwatch(): string {
  const veil = css(FADED_RGB, FADED_ALPHA);
  return `linear-gradient(${veil}, ${veil}), ${LAND_COLOUR}`;
}

export function LegendPanel(props: {
  band: Band;
  units: UnitSystem;
  filterActive: boolean;
  /** The robust-class band when uncertain places are hatched (ensemble builds), else null. */
  uncertain?: Band | null;
}) {
  const { band, units, filterActive, uncertain } = props;
  const uncertainText = uncertain?.classes?.find((c) => c.label === 'uncertain')?.description;
  const conv = displayConversion(band.unit, units);
  const show = (v: number) => formatNumber(v * conv.factor + conv.offset);
  let body;
  if (band.kind === 'class') {
    const colours = classColours(band);
    body = (
      <ul className="legend-classes">
        {(band.classes ?? []).map((c) => (
          <li key={c.value}>
            <span className="swatch" style={{ background: css(colours.get(c.value) ?? [0, 0, 0]) }} />
            <span>
              <strong>{c.label}</strong>
              {c.description ? <span className="muted"> — {c.description}</span> : null}
            </span>
          </li>
        ))}
      </ul>
    );
  } else {
    const [lo, hi] = legendRange(band);
    const stops = Array.from({ length: 11 }, (_, i) => {
      const c = rampColour(band.ramp ?? 'viridis', i, 0, 10);
      return `${css(c)} ${i * 10}%`;
    }).join(', ');
    const ticks = [0, 0.25, 0.5, 0.75, 1].map((t) => lo + t * (hi - lo));
    body = (
      <div className="legend-ramp">
        <div className="ramp-bar" style={{ background: `linear-gradient(to right, ${stops})` }} />
        <div className="ramp-ticks" data-testid="legend-ticks">
          {ticks.map((t, i) => (
            <span key={i}>{show(t)}</span>
          ))}
        </div>
        <div className="legend-unit" data-testid="legend-unit">
          {bandUnitText(band, units) || 'no unit'}
          {band.legendMin !== undefined || band.legendMax !== undefined
            ? ' (colours clamped at the ends)'
            : ''}
        </div>
      </div>
    );
  }
  return (
    <section className="panel legend" aria-label="Legend" data-testid="legend">
      <h2>{displayTitle(band.title, band.unit, units)}</h2>
      {body}
      <ul className="legend-keys">
        <li>
          <span className="swatch" style={{ background: LAND_COLOUR }} /> land without data (not screened)
        </li>
        <li>
          <span className="swatch" style={{ background: SEA_COLOUR }} /> sea
        </li>
        {uncertain ? (
          <li data-testid="legend-uncertain">
            <span className="swatch" style={{ background: hatchBackground() }} /> class uncertain:{' '}
            {uncertainText ?? 'the ensemble members disagree on the class'} Screening estimate: check these
            places on site first.
          </li>
        ) : null}
        {filterActive ? (
          <li>
            <span className="swatch" style={{ background: fadedSwatch() }} /> outside the filters
          </li>
        ) : null}
      </ul>
      <p className="muted small">{band.description}</p>
      <p className="muted small">Method: {band.source}</p>
    </section>
  );
}
