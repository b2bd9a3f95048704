/**
 * The offline base map: a MapLibre style with no remote sources, tiles, sprites or glyphs. Sea is the
 * background, land is a fill of the build's own coastline polygons (land.geojson). Settlements (dots
 * and names in the browser's local fonts) are HTML markers above the screening tiles (point-markers.ts).
 */
import type { LineLayerSpecification, StyleSpecification } from 'maplibre-gl';
import type { FeatureCollection } from 'geojson';

export const SEA_COLOUR = '#d5e1e8';
export const LAND_COLOUR = '#f3efe6';
export const COAST_COLOUR = '#7f8f99';
export const BOUNDARY_COLOUR = '#be1e5a';
/** The boundary outline layer and its source; the screening tiles are drawn below it (map-view.tsx). */
export const BOUNDARY_LAYER_ID = 'boundary';

/** The boundary outline, added to the map with its source when the first boundary is drawn. */
export const BOUNDARY_LAYER: LineLayerSpecification = {
  id: BOUNDARY_LAYER_ID,
  type: 'line',
  source: BOUNDARY_LAYER_ID,
  paint: { 'line-color': BOUNDARY_COLOUR, 'line-width': 2 },
};

const EMPTY: FeatureCollection = { type: 'FeatureCollection', features: [] };

export function baseStyle(
  land: FeatureCollection | null,
  settlements: FeatureCollection | null,
): StyleSpecification {
  return {
    version: 8,
    sources: {
      land: { type: 'geojson', data: land ?? EMPTY },
      settlements: { type: 'geojson', data: settlements ?? EMPTY },
    },
    layers: [
      { id: 'sea', type: 'background', paint: { 'background-color': SEA_COLOUR } },
      { id: 'land', type: 'fill', source: 'land', paint: { 'fill-color': LAND_COLOUR } },
      { id: 'coast', type: 'line', source: 'land', paint: { 'line-color': COAST_COLOUR, 'line-width': 1 } },
    ],
  };
}
