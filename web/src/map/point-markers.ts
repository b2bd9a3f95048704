/**
 * The map's few point symbols as HTML markers placed by MapLibre: settlements (a dot and its name,
 * a button that inspects the place), shortlisted sites (pins) and the selected place (a ring).
 *
 * They are HTML rather than WebGL layers on purpose: with software WebGL every extra shader program
 * costs hundreds of milliseconds before the first map paint, and a handful of points needs none.
 * As HTML they are also keyboard reachable and read out by screen readers; the pins and the ring let
 * the pointer through to the map (hover and click keep working under them).
 */
import * as maplibregl from 'maplibre-gl';

/**
 * Shortlisted sites pinned on the map (HTML markers, repositioned every frame): the first this many.
 * Thousands of markers would stall the page; the shortlist panel says when pins are left out.
 */
export const MAX_SHORTLIST_PINS = 300;

export interface PointMark {
  lon: number;
  lat: number;
  name: string;
}

/** A settlement: dot + name, as one button that reports the settlement's position when pressed. */
export function settlementMarker(
  map: maplibregl.Map,
  s: PointMark,
  onInspect: (lngLat: [number, number]) => void,
): maplibregl.Marker {
  const el = document.createElement('button');
  el.type = 'button';
  el.className = 'settlement-mark';
  el.setAttribute('aria-label', `Settlement ${s.name}: show its values`);
  const label = document.createElement('span');
  label.className = 'settlement-mark-name';
  label.textContent = s.name;
  el.append(label);
  el.addEventListener('click', (ev) => {
    // The map would also see this click (a few pixels off the settlement); report the settlement.
    ev.stopPropagation();
    onInspect([s.lon, s.lat]);
  });
  return new maplibregl.Marker({ element: el, anchor: 'center' }).setLngLat([s.lon, s.lat]).addTo(map);
}

/** A passive symbol (shortlist pin or selection ring) that lets the pointer through to the map. */
export function passiveMarker(
  map: maplibregl.Map,
  p: { lon: number; lat: number },
  className: string,
  title?: string,
): maplibregl.Marker {
  const el = document.createElement('div');
  el.className = className;
  if (title) {
    el.title = title;
    el.setAttribute('role', 'img');
    el.setAttribute('aria-label', title);
  } else {
    el.setAttribute('aria-hidden', 'true');
  }
  return new maplibregl.Marker({ element: el, anchor: 'center' }).setLngLat([p.lon, p.lat]).addTo(map);
}
