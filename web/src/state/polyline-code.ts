/**
 * Rings of lon/lat vertices as short text for a link: the Encoded Polyline Algorithm Format
 * (published by Google for its map APIs): each vertex as (lat, lon) rounded to 1e-5 degrees (about
 * 1 m), delta-coded from the previous vertex, zig-zag signed, in 5-bit chunks offset by 63 so every
 * character lies in '?'..'~' (63-126). ',' and ';' never occur, so they separate rings and polygons.
 */
import type { LonLat } from './url-state';

const SCALE = 1e5;

function encodeValue(v: number): string {
  let n = v < 0 ? ~(v << 1) : v << 1;
  let out = '';
  while (n >= 0x20) {
    out += String.fromCharCode((0x20 | (n & 0x1f)) + 63);
    n >>>= 5;
  }
  return out + String.fromCharCode(n + 63);
}

/** Encode a ring (lon/lat degrees) at 1e-5 degrees. */
export function encodeRing(ring: readonly LonLat[]): string {
  let lat0 = 0;
  let lon0 = 0;
  let out = '';
  for (const [lon, lat] of ring) {
    const la = Math.round(lat * SCALE);
    const lo = Math.round(lon * SCALE);
    out += encodeValue(la - lat0) + encodeValue(lo - lon0);
    lat0 = la;
    lon0 = lo;
  }
  return out;
}

/** Decode a ring written by encodeRing; throws RangeError on a character outside '?'..'~' or a cut value. */
export function decodeRing(text: string): LonLat[] {
  const values: number[] = [];
  let shift = 0;
  let acc = 0;
  for (let i = 0; i < text.length; i++) {
    const b = text.charCodeAt(i) - 63;
    if (b < 0 || b > 63) throw new RangeError(`character ${i} of an encoded ring is not in '?'..'~'`);
    acc |= (b & 0x1f) << shift;
    shift += 5;
    if (b < 0x20) {
      values.push(acc & 1 ? ~(acc >> 1) : acc >> 1);
      acc = 0;
      shift = 0;
    } else if (shift > 30) throw new RangeError('an encoded ring holds a value too large');
  }
  if (shift !== 0 || values.length % 2 !== 0) throw new RangeError('an encoded ring is cut short');
  const ring: LonLat[] = [];
  let lat = 0;
  let lon = 0;
  for (let i = 0; i < values.length; i += 2) {
    lat += values[i];
    lon += values[i + 1];
    ring.push([lon / SCALE, lat / SCALE]);
  }
  return ring;
}
