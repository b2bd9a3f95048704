/**
 * The map: MapLibre for the offline base map, a deck.gl overlay for the screening tiles (TileLayer +
 * BitmapLayer coloured on the client by colour-tile.ts), settlement names, the drawn boundary and the
 * shortlisted sites. Changing the band, opacity or filters recolours tiles already loaded.
 */
import { memo, useEffect, useRef } from 'react';
import * as maplibregl from 'maplibre-gl';
import 'maplibre-gl/dist/maplibre-gl.css';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';
import { MapboxOverlay } from '@deck.gl/mapbox';
import { TileLayer } from '@deck.gl/geo-layers';
import { BitmapLayer, PathLayer, ScatterplotLayer, TextLayer } from '@deck.gl/layers';
import type { Layer } from '@deck.gl/core';
import type { Feature, Point } from 'geojson';
import { TILE_SIZE } from '../../../layers/screening/tile-format';
import type { Atlas } from '../data/load-atlas';
import { colourTile, type TileStyle } from './colour-tile';
import { baseStyle } from './base-style';

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
  /** Called when every tile of the current view has loaded (and drawn). */
  onViewportLoad?: () => void;
  /** Centre the map here whenever `seq` changes. */
  flyTarget: { lon: number; lat: number; seq: number } | null;
}

interface Painted {
  key: string;
  image: ImageData;
}

export const MapView = memo(function MapView(props: MapViewProps) {
  const container = useRef<HTMLDivElement | null>(null);
  const mapRef = useRef<maplibregl.Map | null>(null);
  const overlayRef = useRef<MapboxOverlay | null>(null);
  const latest = useRef(props);
  latest.current = props;
  const painted = useRef(new WeakMap<Float32Array[], Painted>());

  useEffect(() => {
    if (!container.current) return;
    const { atlas, initialView } = latest.current;
    const [w, s, e, n] = atlas.manifest.region.bounds;
    const map = new maplibregl.Map({
      container: container.current,
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
    map.touchZoomRotate.disableRotation();
    map.addControl(new maplibregl.NavigationControl({ showCompass: false }), 'top-right');
    map.addControl(new maplibregl.ScaleControl({ unit: 'metric' }), 'bottom-right');
    const overlay = new MapboxOverlay({ interleaved: false, layers: [] });
    map.addControl(overlay);
    mapRef.current = map;
    overlayRef.current = overlay;
    map.on('mousemove', (ev) => latest.current.onHover([ev.lngLat.lng, ev.lngLat.lat]));
    map.on('mouseout', () => latest.current.onHover(null));
    map.on('click', (ev) => latest.current.onClick([ev.lngLat.lng, ev.lngLat.lat]));
    map.on('moveend', () => {
      const c = map.getCenter();
      latest.current.onViewChange([c.lng, c.lat], map.getZoom());
    });
    return () => {
      map.remove();
      mapRef.current = null;
      overlayRef.current = null;
    };
  }, []);

  useEffect(() => {
    const map = mapRef.current;
    if (map) map.getCanvas().style.cursor = props.drawing ? 'crosshair' : '';
  }, [props.drawing]);

  const fly = props.flyTarget;
  useEffect(() => {
    if (fly && mapRef.current) mapRef.current.easeTo({ center: [fly.lon, fly.lat], duration: 300 });
  }, [fly]);

  useEffect(() => {
    const overlay = overlayRef.current;
    if (!overlay) return;
    const { atlas, style, styleKey, boundaryRings, drawingPath, selected, shortlist } = props;
    const { manifest, tiles } = atlas;
    // Only the drawn band and the filtered bands are fetched for drawing (Range requests per band).
    const neededBands = [
      ...new Set([
        style.bandIndex,
        ...(style.filter.active ? [...style.filter.rangeBands, ...style.filter.classBands] : []),
      ]),
    ].sort((a, b) => a - b);
    const layers: Layer[] = [
      new TileLayer<Float32Array[] | null>({
        id: 'screening',
        tileSize: manifest.tiles.tileSize,
        minZoom: manifest.tiles.minZoom,
        maxZoom: manifest.tiles.maxZoom,
        extent: manifest.region.bounds,
        maxRequests: 8,
        getTileData: ({ index }) => tiles.getBands(index.z, index.x, index.y, neededBands),
        onViewportLoad: () => latest.current.onViewportLoad?.(),
        updateTriggers: { getTileData: [neededBands.join(',')], renderSubLayers: [styleKey] },
        renderSubLayers: (sub) => {
          const planes = sub.data;
          if (!planes) return null;
          let p = painted.current.get(planes);
          if (!p || p.key !== styleKey) {
            const image = new ImageData(TILE_SIZE, TILE_SIZE);
            colourTile(planes, style, image.data);
            p = { key: styleKey, image };
            painted.current.set(planes, p);
          }
          const [min, max] = sub.tile.boundingBox;
          return new BitmapLayer({
            id: `${sub.id}-bitmap`,
            image: p.image,
            bounds: [min[0], min[1], max[0], max[1]],
            textureParameters: { minFilter: 'nearest', magFilter: 'nearest' },
          });
        },
      }),
    ];
    const settlements = (atlas.settlements?.features ?? []).filter(
      (f): f is Feature<Point> => f.geometry?.type === 'Point',
    );
    layers.push(
      new ScatterplotLayer<Feature<Point>>({
        id: 'settlement-dots',
        data: settlements,
        getPosition: (f) => f.geometry.coordinates as [number, number],
        getRadius: 4,
        radiusUnits: 'pixels',
        getFillColor: [255, 255, 255, 255],
        getLineColor: [20, 32, 40, 255],
        stroked: true,
        lineWidthUnits: 'pixels',
        getLineWidth: 1.5,
      }),
      new TextLayer<Feature<Point>>({
        id: 'settlement-names',
        data: settlements,
        getPosition: (f) => f.geometry.coordinates as [number, number],
        getText: (f) => String(f.properties?.name ?? ''),
        getSize: 13,
        getColor: [20, 32, 40, 255],
        getPixelOffset: [0, -14],
        fontFamily: 'system-ui, sans-serif',
        fontWeight: 600,
        outlineWidth: 3,
        outlineColor: [255, 255, 255, 230],
        fontSettings: { sdf: true },
        characterSet: 'auto',
      }),
    );
    const paths = drawingPath.length > 0 ? [...boundaryRings, drawingPath] : boundaryRings;
    if (paths.length > 0) {
      layers.push(
        new PathLayer<[number, number][]>({
          id: 'boundary',
          data: paths,
          getPath: (d) => d,
          getColor: [190, 30, 90, 255],
          getWidth: 2,
          widthUnits: 'pixels',
        }),
      );
    }
    layers.push(
      new ScatterplotLayer<{ lon: number; lat: number; name: string }>({
        id: 'shortlist',
        data: shortlist,
        getPosition: (d) => [d.lon, d.lat],
        getRadius: 6,
        radiusUnits: 'pixels',
        getFillColor: [255, 255, 255, 255],
        getLineColor: [190, 30, 90, 255],
        lineWidthUnits: 'pixels',
        getLineWidth: 3,
        stroked: true,
      }),
    );
    if (selected) {
      layers.push(
        new ScatterplotLayer<[number, number]>({
          id: 'selected',
          data: [selected],
          getPosition: (d) => d,
          getRadius: 9,
          radiusUnits: 'pixels',
          filled: false,
          stroked: true,
          getLineColor: [20, 32, 40, 255],
          lineWidthUnits: 'pixels',
          getLineWidth: 2,
        }),
      );
    }
    overlay.setProps({ layers });
  }, [props]);

  return <div ref={container} className="map" data-testid="map" aria-label="Map of the screening layer" />;
});

/** Move the map (used by the shortlist's "show" buttons). */
export type FlyTo = (lon: number, lat: number) => void;
