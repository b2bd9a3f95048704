import { describe, expect, it } from 'vitest';
import {
  NODATA_CODE,
  TILE_SIZE,
  decodeValue,
  encodeValue,
  packTile,
  quantisationFor,
  unpackTile,
} from '../../layers/screening/tile-format';

/** Seeded linear congruential generator (Numerical Recipes constants) so the planes repeat. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe('tile encoding (pack/unpack round trip)', () => {
  const n = TILE_SIZE * TILE_SIZE;
  const rand = lcg(7);
  const temperature = new Float32Array(n).map(() => -15 + 20 * rand());
  const years = new Float32Array(n).map((_, i) => (i % 97 === 0 ? NaN : 300 * rand()));
  const quant = [quantisationFor(-15, 5), quantisationFor(0, 300)];

  it('bounds the quantisation error by half a step in the band unit and keeps nodata', () => {
    const [t, y] = unpackTile(packTile([temperature, years], quant), quant);
    let worstT = 0;
    let worstY = 0;
    for (let i = 0; i < n; i++) {
      worstT = Math.max(worstT, Math.abs(t[i] - temperature[i]));
      if (Number.isNaN(years[i])) expect(y[i]).toBeNaN();
      else worstY = Math.max(worstY, Math.abs(y[i] - years[i]));
    }
    // Half a code step plus float32 rounding of the stored value.
    expect(worstT).toBeLessThanOrEqual(quant[0].scale / 2 + 1e-5);
    expect(worstY).toBeLessThanOrEqual(quant[1].scale / 2 + 1e-4);
    expect(worstT).toBeGreaterThan(0); // the planes really were quantised
  });

  it('decodes the same from an unaligned byte view (DataView path) as from the aligned fast path', () => {
    const bytes = packTile([temperature, years], quant);
    const shifted = new Uint8Array(bytes.byteLength + 1);
    shifted.set(bytes, 1);
    const a = unpackTile(bytes, quant);
    const b = unpackTile(shifted.subarray(1), quant);
    expect(Array.from(b[0].subarray(0, 500))).toEqual(Array.from(a[0].subarray(0, 500)));
    expect(Array.from(b[1].subarray(0, 500))).toEqual(Array.from(a[1].subarray(0, 500)));
  });

  it('maps non-finite values to the nodata code and clamps out-of-range values', () => {
    const q = quantisationFor(0, 10);
    expect(encodeValue(NaN, q)).toBe(NODATA_CODE);
    expect(encodeValue(Infinity, q)).toBe(NODATA_CODE);
    expect(decodeValue(encodeValue(-5, q), q)).toBe(0);
    expect(decodeValue(encodeValue(50, q), q)).toBeCloseTo(10, 9);
  });

  it('refuses a byte length that does not match the band count', () => {
    expect(() => unpackTile(new Uint8Array(10), [quantisationFor(0, 1)])).toThrow(/expected/);
  });
});
