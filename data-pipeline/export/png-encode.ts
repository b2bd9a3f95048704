/**
 * A minimal PNG encoder (W3C PNG specification, 2nd edition / ISO/IEC 15948): 8-bit RGBA pixels in,
 * a PNG file out. No image library is a dependency of the project, and node:zlib gives the DEFLATE
 * stream PNG needs, so the encoder is the chunk framing only. An image of at most 256 distinct RGBA
 * values (a map tile of one layer nearly always is) is written as an indexed image (colour type 3,
 * with a tRNS chunk for the alpha of each palette entry): a quarter of the bytes to compress and to
 * store. Other images are written as truecolour with alpha (colour type 6). Scanlines use filter
 * type 0 (none), the filter the specification recommends for indexed images. Decoders return the same
 * RGBA values either way.
 */
import { deflateSync } from 'node:zlib';

const SIGNATURE = Uint8Array.from([137, 80, 78, 71, 13, 10, 26, 10]);

const CRC_TABLE = (() => {
  const table = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    table[n] = c >>> 0;
  }
  return table;
})();

/** CRC-32 as PNG defines it (ISO 3309 polynomial, over the chunk type and data). */
export function crc32(bytes: Uint8Array, crc = 0xffffffff): number {
  let c = crc;
  for (let i = 0; i < bytes.length; i++) c = CRC_TABLE[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return c >>> 0;
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  view.setUint32(8 + data.length, (crc32(out.subarray(4, 8 + data.length)) ^ 0xffffffff) >>> 0);
  return out;
}

function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

function header(width: number, height: number, colourType: number): Uint8Array {
  const ihdr = new Uint8Array(13);
  const view = new DataView(ihdr.buffer);
  view.setUint32(0, width);
  view.setUint32(4, height);
  ihdr[8] = 8; // bit depth
  ihdr[9] = colourType;
  // compression 0 (deflate), filter method 0, interlace 0 (none)
  return ihdr;
}

export interface PngOptions {
  /** zlib compression level, 1 (fastest) to 9 (smallest); default 6, zlib's own default. */
  level?: number;
}

function checkSize(width: number, height: number): void {
  if (!(Number.isInteger(width) && Number.isInteger(height) && width > 0 && height > 0)) {
    throw new RangeError(`encodePng: width and height must be positive integers, got ${width} x ${height}`);
  }
}

/**
 * Encode an indexed image: `indices` (width x height, rows top to bottom) into `palette` (RGBA, 4
 * bytes per entry, at most 256 entries).
 */
export function encodeIndexedPng(
  width: number,
  height: number,
  indices: Uint8Array,
  palette: Uint8Array,
  options: PngOptions = {},
): Uint8Array {
  checkSize(width, height);
  const entries = palette.length / 4;
  if (!(Number.isInteger(entries) && entries >= 1 && entries <= 256)) {
    throw new RangeError(`encodePng: palette of ${palette.length} bytes, expected 4 x 1..256 (RGBA)`);
  }
  if (indices.length !== width * height) {
    throw new RangeError(`encodePng: ${indices.length} indices, expected ${width * height}`);
  }
  const raw = new Uint8Array(height * (width + 1));
  for (let y = 0; y < height; y++) raw.set(indices.subarray(y * width, (y + 1) * width), y * (width + 1) + 1);
  const plte = new Uint8Array(entries * 3);
  const trns = new Uint8Array(entries);
  for (let i = 0; i < entries; i++) {
    plte[i * 3] = palette[i * 4];
    plte[i * 3 + 1] = palette[i * 4 + 1];
    plte[i * 3 + 2] = palette[i * 4 + 2];
    trns[i] = palette[i * 4 + 3];
  }
  return concat([
    SIGNATURE,
    chunk('IHDR', header(width, height, 3)),
    chunk('PLTE', plte),
    ...(trns.some((a) => a !== 255) ? [chunk('tRNS', trns)] : []),
    chunk('IDAT', deflateSync(raw, { level: options.level ?? 6 })),
    chunk('IEND', new Uint8Array(0)),
  ]);
}

/** Encode `rgba` (width x height x 4 bytes, rows top to bottom) as a PNG file. */
export function encodePng(
  width: number,
  height: number,
  rgba: Uint8Array,
  options: PngOptions = {},
): Uint8Array {
  checkSize(width, height);
  if (rgba.length !== width * height * 4) {
    throw new RangeError(`encodePng: ${rgba.length} bytes of RGBA, expected ${width * height * 4}`);
  }
  const words = new Uint32Array(rgba.buffer.slice(rgba.byteOffset, rgba.byteOffset + rgba.length));
  // Palette of the distinct RGBA values (as 32-bit words), while there are at most 256.
  const index = new Map<number, number>();
  const indices = new Uint8Array(words.length);
  for (let i = 0; i < words.length; i++) {
    const w = words[i];
    let k = index.get(w);
    if (k === undefined) {
      if (index.size === 256) return encodeTruecolourPng(width, height, rgba, options);
      k = index.size;
      index.set(w, k);
    }
    indices[i] = k;
  }
  const palette = new Uint8Array(new Uint32Array([...index.keys()]).buffer);
  return encodeIndexedPng(width, height, indices, palette, options);
}

/** Truecolour with alpha (colour type 6). */
export function encodeTruecolourPng(
  width: number,
  height: number,
  rgba: Uint8Array,
  options: PngOptions = {},
): Uint8Array {
  checkSize(width, height);
  const stride = width * 4;
  const raw = new Uint8Array(height * (stride + 1));
  for (let y = 0; y < height; y++) raw.set(rgba.subarray(y * stride, (y + 1) * stride), y * (stride + 1) + 1);
  return concat([
    SIGNATURE,
    chunk('IHDR', header(width, height, 6)),
    chunk('IDAT', deflateSync(raw, { level: options.level ?? 6 })),
    chunk('IEND', new Uint8Array(0)),
  ]);
}
