/**
 * "Near a settlement": a radius around a chosen settlement becomes the zonal boundary (a 72-sided
 * geodesic circle, layers/screening/proximity.ts), so the counter, the outline on the map and the link
 * follow it like any drawn boundary. The radius is typed in the display unit (km or mi).
 */
import { useState } from 'react';
import type { FeatureCollection } from 'geojson';
import { circleRing } from '../../../layers/screening/proximity';
import { displayConversion, fromDisplay, type UnitSystem } from '../units/display-units';

export function RadiusFilter(props: {
  settlements: FeatureCollection | null;
  units: UnitSystem;
  onApply: (polygons: [number, number][][][], name: string) => void;
}) {
  const places = (props.settlements?.features ?? []).flatMap((f) =>
    f.geometry?.type === 'Point'
      ? [
          {
            name: String(f.properties?.name ?? 'Settlement'),
            lonLat: f.geometry.coordinates as [number, number],
          },
        ]
      : [],
  );
  const [name, setName] = useState('');
  const [radius, setRadius] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const unit = displayConversion('km', props.units).unit;
  if (places.length === 0) return null;
  const apply = () => {
    const place = places.find((p) => p.name === name);
    const r = Number(radius);
    if (!place) return setProblem('Choose a settlement.');
    if (radius.trim() === '' || !Number.isFinite(r) || r <= 0 || r > 2000)
      return setProblem(`The radius should be a number of ${unit} above 0 and at most 2000.`);
    setProblem(null);
    const r_km = fromDisplay(r, 'km', props.units);
    props.onApply([[circleRing(place.lonLat, r_km)]], `within ${r} ${unit} of ${place.name}`);
  };
  return (
    <section className="panel" aria-label="Near a settlement" data-testid="radius-filter">
      <h2>Near a settlement</h2>
      <div className="row wrap">
        <select value={name} onChange={(e) => setName(e.target.value)} data-testid="radius-settlement">
          <option value="">settlement…</option>
          {places.map((p) => (
            <option key={p.name} value={p.name}>
              {p.name}
            </option>
          ))}
        </select>
        <label>
          within{' '}
          <input
            type="number"
            min={0}
            step="any"
            value={radius}
            onChange={(e) => setRadius(e.target.value)}
            style={{ width: '5em' }}
            data-testid="radius-km"
          />{' '}
          {unit}
        </label>
        <button type="button" onClick={apply} data-testid="radius-apply">
          Count
        </button>
      </div>
      {problem ? (
        <p className="small notice warn" role="alert">
          {problem}
        </p>
      ) : (
        <p className="muted small">The circle becomes the boundary: the counter below counts inside it.</p>
      )}
    </section>
  );
}
