/**
 * Choice of the map layer (any band of the build), the display units, the layer's opacity and, in an
 * ensemble build, the hatching of places whose class is uncertain.
 */
import type { Band } from '../../../layers/screening/manifest';
import type { UnitSystem } from '../units/display-units';

export function LayerPanel(props: {
  bands: Band[];
  bandId: string;
  units: UnitSystem;
  opacity: number;
  onBand: (id: string) => void;
  onUnits: (u: UnitSystem) => void;
  onOpacity: (o: number) => void;
  /** Ensemble builds: whether cells whose class is uncertain are hatched (null: not an ensemble build). */
  hatch?: { on: boolean; onChange: (on: boolean) => void } | null;
}) {
  return (
    <section className="panel" aria-label="Map layer">
      <h2>Map layer</h2>
      <label className="block">
        Show
        <select
          value={props.bandId}
          onChange={(e) => props.onBand(e.target.value)}
          data-testid="layer-select"
        >
          {props.bands.map((b) => (
            <option key={b.id} value={b.id}>
              {b.title}
            </option>
          ))}
        </select>
      </label>
      <fieldset className="row">
        <legend>Units</legend>
        {(['SI', 'NA'] as const).map((u) => (
          <label key={u}>
            <input
              type="radio"
              name="units"
              value={u}
              checked={props.units === u}
              onChange={() => props.onUnits(u)}
              data-testid={`units-${u}`}
            />
            {u === 'SI' ? 'SI (kW, m, °C)' : 'North American (ton, ft, °F)'}
          </label>
        ))}
      </fieldset>
      <label className="block">
        Opacity {Math.round(props.opacity * 100)} %
        <input
          type="range"
          min={0}
          max={1}
          step={0.05}
          value={props.opacity}
          onChange={(e) => props.onOpacity(Number(e.target.value))}
          data-testid="opacity"
        />
      </label>
      {props.hatch ? (
        <label className="block">
          <input
            type="checkbox"
            checked={props.hatch.on}
            onChange={(e) => props.hatch?.onChange(e.target.checked)}
            data-testid="hatch-uncertain"
          />{' '}
          Hatch places whose class is uncertain
        </label>
      ) : null}
    </section>
  );
}
