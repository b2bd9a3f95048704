/**
 * Binary encoding of screening tiles (the contract between data-pipeline and web; style.md habit 9).
 *
 * Tiles are Web Mercator XYZ tiles (`tiles/{z}/{x}/{y}.bin`), TILE_SIZE x TILE_SIZE pixels, row 0 at
 * the north edge. A tile file holds every band of the manifest, band-planar, in manifest order: for
 * each band TILE_SIZE^2 little-endian uint16 codes. A code is round((value - offset_) / scale_) using
 * the band's scale and offset from the manifest; NODATA_CODE marks nodata (sea, outside the data).
 * A tile absent from the directory is all nodata. Quantisation error is at most scale / 2 in the
 * band's own unit (tested by a round trip).
 */
export const TILE_SIZE = 256;
export const NODATA_CODE = 65535;
export const MAX_CODE = 65534;

const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

export interface BandQuantisation {
  scale: number;
  offset: number;
}

/** Encode one value; NaN or non-finite becomes NODATA_CODE, out-of-range values are clamped. */
export function encodeValue(value: number, q: BandQuantisation): number {
  if (!Number.isFinite(value)) return NODATA_CODE;
  const code = Math.round((value - q.offset) / q.scale);
  return code < 0 ? 0 : code > MAX_CODE ? MAX_CODE : code;
}

/** Decode one code; NODATA_CODE becomes NaN. */
export function decodeValue(code: number, q: BandQuantisation): number {
  return code === NODATA_CODE ? NaN : q.offset + code * q.scale;
}

/** A scale and offset that cover [min, max] with the full uint16 code range. */
export function quantisationFor(min: number, max: number): BandQuantisation {
  if (!(Number.isFinite(min) && Number.isFinite(max) && max >= min)) {
    throw new RangeError(`quantisationFor: need finite min <= max, got min=${min}, max=${max}`);
  }
  const span = max - min || 1;
  return { scale: span / MAX_CODE, offset: min };
}

/** Pack band-planar Float32 planes (each TILE_SIZE^2) into the tile byte layout. */
export function packTile(planes: Float32Array[], quant: BandQuantisation[]): Uint8Array {
  const n = TILE_SIZE * TILE_SIZE;
  if (planes.length !== quant.length) throw new RangeError('packTile: one quantisation per band needed');
  const out = new Uint8Array(planes.length * n * 2);
  const view = new DataView(out.buffer);
  planes.forEach((plane, b) => {
    if (plane.length !== n)
      throw new RangeError(`packTile: band ${b} has ${plane.length} values, expected ${n}`);
    const q = quant[b];
    for (let i = 0; i < n; i++) view.setUint16((b * n + i) * 2, encodeValue(plane[i], q), true);
  });
  return out;
}

/** Unpack a tile's bytes into Float32 planes (NaN for nodata). */
export function unpackTile(bytes: ArrayBuffer | Uint8Array, quant: BandQuantisation[]): Float32Array[] {
  const n = TILE_SIZE * TILE_SIZE;
  const u8 = bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
  if (u8.byteLength !== quant.length * n * 2) {
    throw new RangeError(
      `unpackTile: ${u8.byteLength} bytes, expected ${quant.length * n * 2} for ${quant.length} bands`,
    );
  }
  // Fast path: read the codes through a Uint16Array where the host is little-endian and aligned.
  const codes =
    LITTLE_ENDIAN_HOST && u8.byteOffset % 2 === 0
      ? new Uint16Array(u8.buffer, u8.byteOffset, u8.byteLength / 2)
      : null;
  const view = new DataView(u8.buffer, u8.byteOffset, u8.byteLength);
  return quant.map((q, b) => {
    const plane = new Float32Array(n);
    const base = b * n;
    if (codes) {
      for (let i = 0; i < n; i++) {
        const code = codes[base + i];
        plane[i] = code === NODATA_CODE ? NaN : q.offset + code * q.scale;
      }
    } else {
      for (let i = 0; i < n; i++) plane[i] = decodeValue(view.getUint16((base + i) * 2, true), q);
    }
    return plane;
  });
}
