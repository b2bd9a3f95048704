/**
 * Fetches and decodes screening tiles once, then keeps them: the map recolours loaded tiles from this
 * cache when the layer, the opacity or the filters change, without fetching anything again.
 * A 404 means the tile is absent, i.e. all nodata (tile-format.ts), and is cached as null.
 *
 * Two ways in: `get` loads whole tiles (every band; the cell table needs them), `getBands` only the
 * bands the map must draw right now, each read with an HTTP Range request of its own byte slice
 * (band-planar layout, tile-format.ts), so the first paint moves ~1/40 of the bytes. `getBands`
 * answers from a whole tile when one is cached; a server that ignores Range (status 200) gives the
 * whole tile, which is then cached as such.
 */
import type { Manifest } from '../../../layers/screening/manifest';
import { TILE_SIZE, unpackTile, type BandQuantisation } from '../../../layers/screening/tile-format';

export interface TileStore {
  get(z: number, x: number, y: number, signal?: AbortSignal): Promise<Float32Array[] | null>;
  /**
   * The tile with at least `bandIndices` decoded; the other entries of the returned array are one
   * shared all-NaN plane unless the whole tile is cached. Null when the tile is absent.
   */
  getBands(z: number, x: number, y: number, bandIndices: readonly number[]): Promise<Float32Array[] | null>;
  peek(z: number, x: number, y: number): Float32Array[] | null | undefined;
}

const PLANE_BYTES = TILE_SIZE * TILE_SIZE * 2;

function tileUrl(manifest: Manifest, dataBase: URL, z: number, x: number, y: number): string {
  return new URL(
    manifest.tiles.urlTemplate.replace('{z}', String(z)).replace('{x}', String(x)).replace('{y}', String(y)),
    dataBase,
  ).href;
}

/** A whole tile, every band decoded (null: absent). */
async function fetchTile(
  href: string,
  key: string,
  quant: BandQuantisation[],
): Promise<Float32Array[] | null> {
  const res = await fetch(href);
  if (res.status === 404) return null;
  if (!res.ok) throw new Error(`tile ${key}: HTTP ${res.status}`);
  return unpackTile(await res.arrayBuffer(), quant);
}

/**
 * One band of a tile, read with an HTTP Range request of its byte slice (null: absent). A server that
 * ignores Range sends the whole tile (200): it is handed to `keepWhole` and its band returned.
 */
async function fetchBand(
  href: string,
  key: string,
  b: number,
  quant: BandQuantisation[],
  keepWhole: (planes: Float32Array[]) => void,
): Promise<Float32Array | null> {
  const start = b * PLANE_BYTES;
  const res = await fetch(href, { headers: { Range: `bytes=${start}-${start + PLANE_BYTES - 1}` } });
  if (res.status === 404) return null;
  if (res.status === 200) {
    // The server sent the whole tile: keep it whole.
    const planes = unpackTile(await res.arrayBuffer(), quant);
    keepWhole(planes);
    return planes[b];
  }
  if (res.status !== 206) throw new Error(`tile ${key} band ${b}: HTTP ${res.status}`);
  return unpackTile(await res.arrayBuffer(), [quant[b]])[0];
}

export function createTileStore(manifest: Manifest, dataBase: URL): TileStore {
  const quant: BandQuantisation[] = manifest.bands.map((b) => ({ scale: b.scale, offset: b.offset }));
  const emptyPlane = new Float32Array(TILE_SIZE * TILE_SIZE).fill(NaN);
  const done = new Map<string, Float32Array[] | null>();
  const pending = new Map<string, Promise<Float32Array[] | null>>();
  /** Per tile key: band index -> decoded plane (or null: tile absent). */
  const bandDone = new Map<string, Map<number, Float32Array | null>>();
  const bandPending = new Map<string, Promise<Float32Array | null>>();
  const url = (z: number, x: number, y: number) => tileUrl(manifest, dataBase, z, x, y);

  function get(z: number, x: number, y: number): Promise<Float32Array[] | null> {
    const key = `${z}/${x}/${y}`;
    if (done.has(key)) return Promise.resolve(done.get(key) ?? null);
    const inflight = pending.get(key);
    if (inflight) return inflight;
    const p = fetchTile(url(z, x, y), key, quant)
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
  }

  function getBand(z: number, x: number, y: number, b: number): Promise<Float32Array | null> {
    const key = `${z}/${x}/${y}`;
    const cached = bandDone.get(key);
    if (cached?.has(b)) return Promise.resolve(cached.get(b) ?? null);
    const pkey = `${key}#${b}`;
    const inflight = bandPending.get(pkey);
    if (inflight) return inflight;
    const p = fetchBand(url(z, x, y), key, b, quant, (planes) => done.set(key, planes))
      .then((plane) => {
        const m = bandDone.get(key) ?? new Map<number, Float32Array | null>();
        m.set(b, plane);
        bandDone.set(key, m);
        bandPending.delete(pkey);
        return plane;
      })
      .catch((e: unknown) => {
        bandPending.delete(pkey);
        throw e;
      });
    bandPending.set(pkey, p);
    return p;
  }

  return {
    peek: (z, x, y) => done.get(`${z}/${x}/${y}`),
    get,
    async getBands(z, x, y, bandIndices) {
      const key = `${z}/${x}/${y}`;
      if (done.has(key)) return done.get(key) ?? null;
      const planes = await Promise.all(bandIndices.map((b) => getBand(z, x, y, b)));
      if (done.has(key)) return done.get(key) ?? null;
      if (planes.some((p) => p === null)) return null;
      const out: Float32Array[] = quant.map(() => emptyPlane);
      bandIndices.forEach((b, i) => (out[b] = planes[i] as Float32Array));
      return out;
    },
  };
}
