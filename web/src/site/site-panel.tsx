/**
 * The site panel: opened by a click on a cell or a settlement, prefilled from the cell's tile values
 * (layers/screening/site-prefill.ts). The small card in the side bar shows what was taken from the map; "Open site
 * study" opens the full study (site-study.tsx) with the form, the run and the results.
 */
import { lazy, Suspense, useEffect, useMemo, useState } from 'react';
import type { FeatureCollection } from 'geojson';
import type { Manifest } from '../../../layers/screening/manifest';
import type { CellTable } from '../data/cell-table';
import { greatCircle_m } from '../data/cell-table';
import { cellValues, type CellSelection } from '../panels/cell-panel';
import { formatQuantity, type UnitSystem } from '../units/display-units';
import { sitePrefill } from '../../../layers/screening/site-prefill';
import './site-panel.css';

// The study (form, charts, simulator worker) loads on first use, not with the map.
const SiteStudy = lazy(() => import('./site-study').then((m) => ({ default: m.SiteStudy })));

/** A settlement within `maxDistance_m` of the click names the site. */
export function nearestSettlement(
  settlements: FeatureCollection | null,
  lon: number,
  lat: number,
  maxDistance_m = 5000,
): string | null {
  let best: string | null = null;
  let bestD = maxDistance_m;
  for (const f of settlements?.features ?? []) {
    if (f.geometry?.type !== 'Point') continue;
    const [x, y] = f.geometry.coordinates;
    const d = greatCircle_m([lon, lat], [x, y]);
    const name = f.properties?.name;
    if (d <= bestD && typeof name === 'string') {
      best = name;
      bestD = d;
    }
  }
  return best;
}

export interface SitePlace {
  name: string;
  lon: number;
  lat: number;
  values: Record<string, number | null>;
}

export function SitePanel(props: {
  manifest: Manifest;
  table: CellTable | null;
  selection: CellSelection;
  settlements: FeatureCollection | null;
  units: UnitSystem;
  /** Where the build's data lives (the study's run under every scenario reads the set from beside it). */
  dataBase?: URL;
}) {
  const { manifest, table, selection, units } = props;
  const [open, setOpen] = useState(false);
  const inside = table !== null && selection.index >= 0;
  const place: SitePlace | null = useMemo(() => {
    if (!inside || !table) return null;
    const town = nearestSettlement(props.settlements, selection.lon, selection.lat);
    return {
      name: town ? `near ${town}` : `${selection.lat.toFixed(3)}° N, ${selection.lon.toFixed(3)}° E`,
      lon: selection.lon,
      lat: selection.lat,
      values: cellValues(table, manifest.bands, selection.index),
    };
  }, [inside, table, selection, manifest.bands, props.settlements]);
  const prefill = useMemo(
    () => (place ? sitePrefill(place.values, manifest.scenario) : null),
    [place, manifest.scenario],
  );
  useEffect(() => setOpen(false), [selection.lon, selection.lat]);
  if (!place || !prefill) return null;
  const c = prefill.draft.climate;
  const layers = prefill.draft.ground.layers;
  return (
    <section className="panel site-card" aria-label="Site study" data-testid="site-card">
      <h2>Site study</h2>
      <p className="small">
        Simulate one pile here over {prefill.draft.years} years, with and without heat extraction. Starting
        inputs from the map:
      </p>
      <ul className="small prefill-list">
        <li>
          Air {formatQuantity(c.meanAirTemp_C, '°C', units)} mean, swinging ±
          {formatQuantity(c.amplitude_C, 'K', units).replace(' (difference)', '')} over the year
        </li>
        <li>
          {layers.length > 1 && layers[1].soil?.texture === 'bedrock'
            ? `${layers[0].soil?.texture ?? 'soil'} to ${formatQuantity(layers[0].bottom_m, 'm', units, 3)}, bedrock below`
            : `${layers[0].soil?.texture ?? 'soil'} throughout the ${formatQuantity(layers[0].bottom_m, 'm', units, 2)} column`}
        </li>
      </ul>
      <button type="button" className="primary" onClick={() => setOpen(true)} data-testid="open-site-study">
        Open site study
      </button>
      {open ? (
        <Suspense fallback={<p className="small">Opening the site study…</p>}>
          <SiteStudy
            place={place}
            prefill={prefill}
            manifest={manifest}
            units={units}
            dataBase={props.dataBase}
            onClose={() => setOpen(false)}
          />
        </Suspense>
      ) : null}
    </section>
  );
}
