/**
 * The map: MapLibre for the offline base map, deck.gl drawn inside MapLibre's WebGL context
 * (interleaved) for the screening tiles (TileLayer + BitmapLayer coloured on the client by
 * colour-tile.ts); the boundary is a MapLibre line layer above them (base-style.ts); settlements,
 * shortlisted sites and the selected place are HTML markers (point-markers.ts). Changing the band, opacity or filters recolours tiles already
 * loaded. The first full paint is reported once, after the GPU has finished the frame that drew
 * every tile of the opening view (onFirstPaint; the first-paint benchmark reads it).
 */
import { memo, useEffect, useRef, useState, type MutableRefObject } from 'react';
import * as maplibregl from 'maplibre-gl';
import 'maplibre-gl/dist/maplibre-gl.css';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';
import { MapboxOverlay } from '@deck.gl/mapbox';
import { TileLayer } from '@deck.gl/geo-layers';
import type { Layer } from '@deck.gl/core';
import type { Feature, FeatureCollection, LineString } from 'geojson';
import { TILE_SIZE } from '../../../layers/screening/tile-format';
import type { Atlas } from '../data/load-atlas';
import type { TileStyle } from './colour-tile';
import { TileRecolourer } from './tile-recolour';
import { TileBitmapLayer } from './tile-bitmap-layer';
import { baseStyle, BOUNDARY_LAYER, BOUNDARY_LAYER_ID } from './base-style';
import { tilesCovering } from './web-mercator';
import { passiveMarker, settlementMarker } from './point-markers';
import type { ViewLink } from './linked-views';

maplibregl.setWorkerUrl(workerUrl);

export interface MapViewProps {
  atlas: Atlas;
  style: TileStyle;
  /** Changes whenever `style` changes (cheap key for recolouring). */
  styleKey: string;
  initialView: { center: [number, number]; zoom: number } | null;
  /** Rings to outline (closed), plus the open path being drawn. */
  boundaryRings: [number, number][][];
  drawingPath: [number, number][];
  drawing: boolean;
  selected: [number, number] | null;
  shortlist: { lon: number; lat: number; name: string }[];
  onHover: (lngLat: [number, number] | null) => void;
  onClick: (lngLat: [number, number]) => void;
  onViewChange: (center: [number, number], zoom: number) => void;
  /** Called once, with performance.now(), when the first view's tiles have all been drawn. */
  onFirstPaint?: (time_ms: number) => void;
  /** Centre the map here whenever `seq` changes. */
  flyTarget: { lon: number; lat: number; seq: number } | null;
  /** Compare view: the link that keeps this map's pan and zoom with the other map's. */
  link?: ViewLink;
  /**
   * Compare view: the other scenario, whose tiles the style's `otherFilter` is tested on (the veil
   * of cells failing the filters under the other scenario; filters/both-scenarios.ts).
   */
  otherAtlas?: Atlas | null;
  /** Accessible name of the map (default: the screening layer). */
  label?: string;
}

/**
 * What one tile of the layer shows: its recolourer (kept while the tile's data stays; tile-recolour.ts),
 * the style key it was last coloured for, its pixels and the one texture they go to (kept for the tile,
 * written again on each recolouring; no mipmaps: the cells are drawn with nearest sampling).
 */
interface Painted {
  data: NonNullable<TileData>;
  recolour: TileRecolourer;
  key: string;
  pixels: Uint8ClampedArray;
  texture: Texture;
}

export const MapView = memo(function MapView(props: MapViewProps) {
  const container = useRef<HTMLDivElement | null>(null);
  const latest = useRef(props);
  latest.current = props;
  const screeningLayer = useRef<ScreeningLayer | null>(null);
  const [boundaryLayerAdded, setBoundaryLayerAdded] = useState(false);
  const { mapRef, overlayRef, styleLoaded } = useMapAndOverlay(
    container,
    latest,
    screeningLayer,
    setBoundaryLayerAdded,
  );

  useEffect(() => {
    const map = mapRef.current;
    if (map) map.getCanvas().style.cursor = props.drawing ? 'crosshair' : '';
  }, [mapRef, props.drawing]);
  useMarkers(mapRef, props.shortlist, props.selected);
  const fly = props.flyTarget;
  useEffect(() => {
    if (fly && mapRef.current) mapRef.current.easeTo({ center: [fly.lon, fly.lat], duration: 300 });
  }, [mapRef, fly]);
  useScreeningTiles(overlayRef, screeningLayer, props, boundaryLayerAdded);
  useBoundaryLines(mapRef, styleLoaded, props.boundaryRings, props.drawingPath, setBoundaryLayerAdded);

  return (
    <div
      ref={container}
      className="map"
      data-testid="map"
      aria-label={props.label ?? 'Map of the screening layer'}
    />
  );
});

/** The GPU device deck.gl draws with, and a texture of it. */
type Device = Layer['context']['device'];
type Texture = ReturnType<Device['createTexture']>;

/** One tile's planes, and the other scenario's planes of the same tile when its filter is tested (null: absent there). */
type TileData = { planes: Float32Array[]; other: Float32Array[] | null } | null;
type ScreeningLayer = TileLayer<TileData>;
type Ref<T> = MutableRefObject<T>;

/**
 * The MapLibre map and the deck.gl overlay inside it, made once per mount: base style, controls,
 * settlement markers, pointer and view events (read through `latest`, so new handlers need no new
 * map), and the first-paint report.
 */
function useMapAndOverlay(
  container: Ref<HTMLDivElement | null>,
  latest: Ref<MapViewProps>,
  screeningLayer: Ref<ScreeningLayer | null>,
  setBoundaryLayerAdded: (added: boolean) => void,
) {
  const mapRef = useRef<maplibregl.Map | null>(null);
  const overlayRef = useRef<MapboxOverlay | null>(null);
  const styleLoaded = useRef(false);
  const firstPaintDone = useRef(false);
  useEffect(() => {
    if (!container.current) return;
    firstPaintDone.current = false;
    const map = createBaseMap(container.current, latest.current);
    // Interleaved: deck.gl draws into MapLibre's own WebGL context (one context, one canvas to
    // composite; with software WebGL a second context roughly doubles the start-up cost).
    const overlay = new MapboxOverlay({
      interleaved: true,
      layers: [],
      onAfterRender: ({ gl }) => {
        if (firstPaintDone.current || !screeningLayer.current || !allTilesDrawn(screeningLayer.current))
          return;
        // Every tile of the view is loaded and its bitmap drawn in this frame; wait for the GPU to
        // finish the frame so that the time reported is when the pixels exist, not when they were asked.
        firstPaintDone.current = true;
        gl?.finish();
        latest.current.onFirstPaint?.(performance.now());
      },
    });
    map.addControl(overlay);
    mapRef.current = map;
    overlayRef.current = overlay;
    map.once('load', () => {
      styleLoaded.current = true;
    });
    wireMapEvents(map, latest);
    const unlink = latest.current.link?.add(map);
    return () => {
      unlink?.();
      map.remove();
      styleLoaded.current = false;
      setBoundaryLayerAdded(false);
      mapRef.current = null;
      overlayRef.current = null;
    };
  }, [container, latest, screeningLayer, setBoundaryLayerAdded]);
  return { mapRef, overlayRef, styleLoaded };
}

/** The map with the offline base style, its opening view and controls; the opening tiles are asked for at once. */
function createBaseMap(container: HTMLDivElement, props: MapViewProps): maplibregl.Map {
  const { atlas, initialView } = props;
  const [w, s, e, n] = atlas.manifest.region.bounds;
  const map = new maplibregl.Map({
    container,
    style: baseStyle(atlas.land, atlas.settlements),
    ...(initialView
      ? { center: initialView.center, zoom: initialView.zoom }
      : { bounds: [w, s, e, n] as [number, number, number, number], fitBoundsOptions: { padding: 20 } }),
    minZoom: Math.max(0, atlas.manifest.tiles.minZoom - 1),
    maxZoom: atlas.manifest.tiles.maxZoom + 4,
    attributionControl: false,
    dragRotate: false,
    pitchWithRotate: false,
    doubleClickZoom: false,
    canvasContextAttributes: { preserveDrawingBuffer: true },
  });
  exposeTransformForDeck(map);
  skipHiddenSky(map);
  // Start the opening view's tile reads now, while deck.gl sets itself up; its TileLayer then finds
  // them in flight in the tile store (same tiles, same bands) instead of asking only later.
  for (const t of openingTiles(map, atlas.manifest)) {
    atlas.tiles.getBands(t.z, t.x, t.y, bandsToDraw(props.style)).catch(() => undefined);
  }
  map.touchZoomRotate.disableRotation();
  map.addControl(new maplibregl.NavigationControl({ showCompass: false }), 'top-right');
  map.addControl(new maplibregl.ScaleControl({ unit: 'metric' }), 'bottom-right');
  return map;
}

/** Settlement markers, hover / click / view-change events, and the opening view reported once. */
function wireMapEvents(map: maplibregl.Map, latest: Ref<MapViewProps>): void {
  for (const f of latest.current.atlas.settlements?.features ?? []) {
    if (f.geometry?.type !== 'Point') continue;
    const [lon, lat] = f.geometry.coordinates;
    const name = String(f.properties?.name ?? 'Settlement');
    settlementMarker(map, { lon, lat, name }, (lngLat) => latest.current.onClick(lngLat));
  }
  map.on('mousemove', (ev) => latest.current.onHover([ev.lngLat.lng, ev.lngLat.lat]));
  map.on('mouseout', () => latest.current.onHover(null));
  map.on('click', (ev) => latest.current.onClick([ev.lngLat.lng, ev.lngLat.lat]));
  const report = () => {
    const c = map.getCenter();
    // The view on the element too (the compare view's linked maps are checked through it).
    map.getContainer().dataset.view = `${c.lng.toFixed(6)},${c.lat.toFixed(6)},${map.getZoom().toFixed(4)}`;
    latest.current.onViewChange([c.lng, c.lat], map.getZoom());
  };
  map.on('moveend', report);
  // The opening view (fitted to the region, or the link's) fires no moveend: report it, so that the
  // URL holds the view on screen and not the defaults it was computed from.
  report();
}

/** Pins of the shortlisted sites and the ring round the selected place. */
function useMarkers(
  mapRef: Ref<maplibregl.Map | null>,
  shortlist: MapViewProps['shortlist'],
  selected: MapViewProps['selected'],
): void {
  useEffect(() => {
    const map = mapRef.current;
    if (!map) return;
    const pins = shortlist.map((p) => passiveMarker(map, p, 'shortlist-pin', `Shortlisted: ${p.name}`));
    return () => pins.forEach((m) => m.remove());
  }, [mapRef, shortlist]);
  useEffect(() => {
    const map = mapRef.current;
    if (!map || !selected) return;
    const ring = passiveMarker(map, { lon: selected[0], lat: selected[1] }, 'selected-ring');
    return () => {
      ring.remove();
    };
  }, [mapRef, selected]);
}

/** The screening tile layer, rebuilt only when the data, the style or the boundary's layer order change. */
function useScreeningTiles(
  overlayRef: Ref<MapboxOverlay | null>,
  screeningLayer: Ref<ScreeningLayer | null>,
  props: MapViewProps,
  boundaryLayerAdded: boolean,
): void {
  const painted = useRef(new Map<string, Painted>());
  const { atlas, style, styleKey } = props;
  const otherAtlas = style.otherFilter?.active ? (props.otherAtlas ?? null) : null;
  useEffect(() => {
    const overlay = overlayRef.current;
    if (!overlay) return;
    const tileLayer = screeningTileLayer(
      { atlas, otherAtlas, style, styleKey },
      painted.current,
      boundaryLayerAdded,
    );
    screeningLayer.current = tileLayer;
    const layers: Layer[] = [tileLayer];
    overlay.setProps({ layers });
    // Only these change the tiles: a new boundary, marker or selection must not redraw them.
  }, [overlayRef, screeningLayer, atlas, otherAtlas, style, styleKey, boundaryLayerAdded]);
  // The tiles' textures go with the map (its WebGL context).
  useEffect(() => {
    const tiles = painted.current;
    return () => {
      for (const p of tiles.values()) p.texture.destroy();
      tiles.clear();
    };
  }, []);
}

/** The planes of tile (z, x, y) to draw, with the other scenario's filter bands when they are tested. */
async function tileData(
  atlas: Atlas,
  otherAtlas: Atlas | null,
  style: TileStyle,
  [z, x, y]: [number, number, number],
): Promise<TileData> {
  const f = style.otherFilter;
  const otherBands = f?.active ? [...new Set([...f.rangeBands, ...f.classBands])].sort((a, b) => a - b) : [];
  const [planes, other] = await Promise.all([
    atlas.tiles.getBands(z, x, y, bandsToDraw(style)),
    otherAtlas && otherBands.length > 0 ? otherAtlas.tiles.getBands(z, x, y, otherBands) : null,
  ]);
  return planes ? { planes, other } : null;
}

/**
 * The TileLayer of the screening bands: deck.gl's, with the GPU device handed to `renderSubLayers`
 * (each tile keeps one texture of its own, written again when it is recoloured).
 */
class ScreeningTileLayer extends TileLayer<TileData> {
  static override layerName = 'ScreeningTileLayer';
  override renderSubLayers(props: Parameters<TileLayer<TileData>['renderSubLayers']>[0]) {
    return super.renderSubLayers({ ...props, device: this.context.device } as typeof props);
  }
}

/** deck.gl TileLayer of the screening bands, each tile coloured once per style key (tile-recolour.ts). */
function screeningTileLayer(
  drawn: { atlas: Atlas; otherAtlas: Atlas | null; style: TileStyle; styleKey: string },
  painted: Map<string, Painted>,
  belowBoundary: boolean,
): ScreeningLayer {
  const { atlas, otherAtlas, style, styleKey } = drawn;
  const { manifest } = atlas;
  const neededBands = bandsToDraw(style);
  const otherKey = otherAtlas ? `${otherAtlas.dataBase.href}|${JSON.stringify(style.otherFilter)}` : '';
  return new ScreeningTileLayer({
    id: 'screening',
    tileSize: manifest.tiles.tileSize,
    minZoom: manifest.tiles.minZoom,
    maxZoom: manifest.tiles.maxZoom,
    extent: manifest.region.bounds,
    // Read by @deck.gl/mapbox (interleaved): once there is a boundary line, draw the tiles below
    // it. Not in the layer's own prop types, hence the spread.
    ...((belowBoundary ? { beforeId: BOUNDARY_LAYER_ID } : {}) as Record<string, unknown>),
    maxRequests: 16,
    getTileData: ({ index }) => tileData(atlas, otherAtlas, style, [index.z, index.x, index.y]),
    updateTriggers: { getTileData: [neededBands.join(','), otherKey], renderSubLayers: [styleKey] },
    onTileUnload: (tile) => {
      painted.get(tile.id)?.texture.destroy();
      painted.delete(tile.id);
    },
    renderSubLayers: (sub) => {
      const data = sub.data;
      const { device } = sub as typeof sub & { device?: Device };
      if (!data || !device) return null;
      const p = paintTile(painted, sub.tile.id, data, device, style, styleKey);
      const [min, max] = sub.tile.boundingBox;
      return new TileBitmapLayer({
        id: `${sub.id}-bitmap`,
        image: p.texture,
        bounds: [min[0], min[1], max[0], max[1]],
        // The texture is the same object after a recolouring: the key tells the layer it changed.
        ...({ paintedKey: styleKey } as Record<string, unknown>),
      });
    },
  });
}

/** Tile `id` coloured for `styleKey`: recoloured (and its texture written) only when data or key changed. */
function paintTile(
  painted: Map<string, Painted>,
  id: string,
  data: NonNullable<TileData>,
  device: Device,
  style: TileStyle,
  styleKey: string,
): Painted {
  let p = painted.get(id);
  if (p && p.texture.device !== device) {
    p.texture.destroy();
    p = undefined;
  }
  if (p && p.data === data && p.key === styleKey) return p;
  if (!p) {
    const texture = device.createTexture({
      id: `screening-${id}`,
      width: TILE_SIZE,
      height: TILE_SIZE,
      format: 'rgba8unorm',
      mipLevels: 1,
      sampler: {
        minFilter: 'nearest',
        magFilter: 'nearest',
        mipmapFilter: 'none',
        addressModeU: 'clamp-to-edge',
        addressModeV: 'clamp-to-edge',
      },
    });
    const pixels = new Uint8ClampedArray(TILE_SIZE * TILE_SIZE * 4);
    p = { data, recolour: new TileRecolourer(data.planes, data.other), key: '', pixels, texture };
    painted.set(id, p);
  } else if (p.data !== data) {
    p.data = data;
    p.recolour = new TileRecolourer(data.planes, data.other);
  }
  p.recolour.colour(style, p.pixels);
  p.texture.writeData(p.pixels);
  p.key = styleKey;
  return p;
}

/** The boundary rings and the path being drawn, as a MapLibre line layer (added with the first line). */
function useBoundaryLines(
  mapRef: Ref<maplibregl.Map | null>,
  styleLoaded: Ref<boolean>,
  boundaryRings: [number, number][][],
  drawingPath: [number, number][],
  setBoundaryLayerAdded: (added: boolean) => void,
): void {
  useEffect(() => {
    const map = mapRef.current;
    if (!map) return;
    const line = (coordinates: [number, number][]): Feature<LineString> => ({
      type: 'Feature',
      properties: {},
      geometry: { type: 'LineString', coordinates },
    });
    const data: FeatureCollection<LineString> = {
      type: 'FeatureCollection',
      features: [...boundaryRings.map(line), ...(drawingPath.length > 1 ? [line(drawingPath)] : [])],
    };
    const apply = () => {
      const source = map.getSource(BOUNDARY_LAYER_ID) as maplibregl.GeoJSONSource | undefined;
      if (source) source.setData(data);
      else if (data.features.length > 0) {
        map.addSource(BOUNDARY_LAYER_ID, { type: 'geojson', data });
        map.addLayer(BOUNDARY_LAYER);
        setBoundaryLayerAdded(true);
      }
    };
    if (styleLoaded.current) {
      apply();
      return;
    }
    map.once('load', apply);
    return () => {
      map.off('load', apply);
    };
  }, [mapRef, styleLoaded, boundaryRings, drawingPath, setBoundaryLayerAdded]);
}

/** The bands drawn for a style: the shown band and those the live filter tests (Range reads per band). */
function bandsToDraw(style: TileStyle): number[] {
  return [
    ...new Set([
      style.bandIndex,
      ...(style.uncertainty ? [style.uncertainty.bandIndex] : []),
      ...(style.filter.active ? [...style.filter.rangeBands, ...style.filter.classBands] : []),
    ]),
  ].sort((a, b) => a - b);
}

/**
 * The tiles the screening TileLayer will ask for first: deck.gl's rule (getTileIndices) is tile zoom
 * = round(map zoom + log2(512 / tileSize)), clamped to the layer's zoom range, tiles covering the view
 * inside the layer's extent.
 */
function openingTiles(
  map: maplibregl.Map,
  manifest: Atlas['manifest'],
): { z: number; x: number; y: number }[] {
  const { minZoom, maxZoom, tileSize } = manifest.tiles;
  const z = Math.max(minZoom, Math.min(maxZoom, Math.round(map.getZoom() + Math.log2(512 / tileSize))));
  const view = map.getBounds();
  const [w, s, e, n] = manifest.region.bounds;
  const box: [number, number, number, number] = [
    Math.max(w, view.getWest()),
    Math.max(s, view.getSouth()),
    Math.min(e, view.getEast()),
    Math.min(n, view.getNorth()),
  ];
  if (box[0] >= box[2] || box[1] >= box[3]) return [];
  const { x0, x1, y0, y1 } = tilesCovering(box, z);
  const out: { z: number; x: number; y: number }[] = [];
  for (let x = x0; x <= x1; x++) for (let y = y0; y <= y1; y++) out.push({ z, x, y });
  return out;
}

/**
 * Whether every tile the layer shows for the current view has loaded and has its bitmap built (tiles
 * without data have nothing to draw). Reads the tile set deck.gl keeps in the layer's state.
 */
function allTilesDrawn(layer: ScreeningLayer): boolean {
  const tiles = (
    layer.state as {
      tileset?: { selectedTiles?: { isLoaded: boolean; content: unknown; layers: unknown }[] };
    }
  )?.tileset?.selectedTiles;
  return Boolean(
    tiles && tiles.length > 0 && tiles.every((t) => t.isLoaded && (t.content === null || t.layers)),
  );
}

/**
 * MapLibre 6 draws its sky (a shaded full-screen pass) first on every frame, also for a style
 * without one, and the opaque sea background (base-style.ts) then covers every pixel of it: the map
 * can be pitched to at most 60° (MapLibre's default limit), and by MapLibre's own note the horizon
 * comes into view only at about 70°. Same pixels without it. With software
 * WebGL that pass was about a quarter of the GPU's work per frame (issue 18). The painter's draw
 * functions are MapLibre's own (not in its typed API): only the sky's is replaced, for this map only.
 */
function skipHiddenSky(map: maplibregl.Map): void {
  const painter = (map as unknown as { painter?: { drawFunctions?: Record<string, unknown> } }).painter;
  if (painter?.drawFunctions && typeof painter.drawFunctions.sky === 'function') {
    painter.drawFunctions = { ...painter.drawFunctions, sky: () => undefined };
  }
}

/**
 * deck.gl's MapLibre adapter (interleaved mode) reads `map.transform.height` to turn the near and far
 * planes MapLibre hands to custom layers into deck's units; MapLibre 6 no longer has a `transform`
 * property. Give the adapter the one thing it needs, the map's height in CSS pixels (the unit of
 * MapLibre's camera metrics); near/far come from the render options, so `_nearZ`/`_farZ` stay unset.
 */
function exposeTransformForDeck(map: maplibregl.Map): void {
  if ('transform' in map) return;
  Object.defineProperty(map, 'transform', {
    configurable: true,
    get: () => ({ height: map.getContainer().clientHeight }),
  });
}

/** Move the map (used by the shortlist's "show" buttons). */
export type FlyTo = (lon: number, lat: number) => void;
