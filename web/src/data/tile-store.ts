/**
 * Fetches and decodes screening tiles once, then keeps them: the map recolours loaded tiles from this
 * cache when the layer, the opacity or the filters change, without fetching anything again.
 * A 404 means the tile is absent, i.e. all nodata (tile-format.ts), and is cached as null.
 */
import type { Manifest } from '../../../layers/screening/manifest';
import { unpackTile, type BandQuantisation } from '../../../layers/screening/tile-format';

export interface TileStore {
  get(z: number, x: number, y: number, signal?: AbortSignal): Promise<Float32Array[] | null>;
  peek(z: number, x: number, y: number): Float32Array[] | null | undefined;
}

export function createTileStore(manifest: Manifest, dataBase: URL): TileStore {
  const quant: BandQuantisation[] = manifest.bands.map((b) => ({ scale: b.scale, offset: b.offset }));
  const done = new Map<string, Float32Array[] | null>();
  const pending = new Map<string, Promise<Float32Array[] | null>>();
  const url = (z: number, x: number, y: number) =>
    new URL(
      manifest.tiles.urlTemplate
        .replace('{z}', String(z))
        .replace('{x}', String(x))
        .replace('{y}', String(y)),
      dataBase,
    ).href;
  return {
    peek: (z, x, y) => done.get(`${z}/${x}/${y}`),
    get(z, x, y) {
      const key = `${z}/${x}/${y}`;
      if (done.has(key)) return Promise.resolve(done.get(key) ?? null);
      const inflight = pending.get(key);
      if (inflight) return inflight;
      const p = fetch(url(z, x, y))
        .then(async (res) => {
          if (res.status === 404) return null;
          if (!res.ok) throw new Error(`tile ${key}: HTTP ${res.status}`);
          return unpackTile(await res.arrayBuffer(), quant);
        })
        .then((planes) => {
          done.set(key, planes);
          pending.delete(key);
          return planes;
        })
        .catch((e: unknown) => {
          pending.delete(key);
          throw e;
        });
      pending.set(key, p);
      return p;
    },
  };
}
