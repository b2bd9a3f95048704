/**
 * Writes one analysis-grid band as a GeoTIFF that desktop GIS opens: little-endian baseline TIFF,
 * Float32 samples in strips, georeferenced by ModelPixelScale + ModelTiepoint and a GeoKeyDirectory
 * with the EPSG code (GeoTIFF 1.0 keys: GTModelType, GTRasterType PixelIsArea, ProjectedCSType or
 * GeographicType), nodata as GDAL_NODATA (-9999; NaN cells are written as -9999). Rows are streamed
 * to the file strip by strip, so the whole image is never copied in memory; with `readRows` instead of
 * `values` the band is read strip by strip too (64 rows x width x 4 bytes at a time), so memory does not
 * grow with the image height.
 */
import { open } from 'node:fs/promises';

export interface BandGeoTiff {
  path: string;
  /** The whole band, row-major (or give `readRows`). */
  values?: Float32Array;
  /** Rows [row0, row1) of the band, row-major (used when `values` is absent). */
  readRows?: (row0: number, row1: number) => Float32Array;
  width: number;
  height: number;
  /** GDAL-style transform without rotation. */
  geoTransform: [number, number, number, number, number, number];
  /** 'EPSG:n'. */
  crs: string;
  description: string;
}

export const GEOTIFF_NODATA = -9999;
export const GEOTIFF_ROWS_PER_STRIP = 64;
const ROWS_PER_STRIP = GEOTIFF_ROWS_PER_STRIP;

type Entry = { tag: number; type: 2 | 3 | 4 | 12; values: number[] | string };
const TYPE_SIZE = { 2: 1, 3: 2, 4: 4, 12: 8 } as const;

function entryBytes(e: Entry): number {
  const count = typeof e.values === 'string' ? e.values.length + 1 : e.values.length;
  return count * TYPE_SIZE[e.type];
}

/** Check the band's size, source, transform and CRS; returns the EPSG code of its CRS. */
function checkBand(band: BandGeoTiff): number {
  const { width, height, values, readRows, geoTransform: gt, crs } = band;
  if (values && values.length !== width * height) {
    throw new RangeError(`writeBandGeoTiff: ${values.length} values for ${width} x ${height}`);
  }
  if (!values && !readRows) throw new TypeError('writeBandGeoTiff: give values or readRows');
  if (gt[2] !== 0 || gt[4] !== 0) throw new RangeError('writeBandGeoTiff: rotated grids are not supported');
  const code = Number(/^EPSG:(\d+)$/.exec(crs)?.[1]);
  if (!Number.isInteger(code)) throw new RangeError(`writeBandGeoTiff: crs must be EPSG:n, got ${crs}`);
  return code;
}

/** The IFD entries of the band's TIFF: baseline Float32 strips and GeoTIFF 1.0 keys (strip offsets 0). */
function tiffEntries(band: BandGeoTiff, code: number, stripBytes: number[]): Entry[] {
  const { width, height, geoTransform: gt } = band;
  const geographic = code === 4326;
  const geoKeys = [1, 1, 0, 3, 1024, 0, 1, geographic ? 2 : 1, 1025, 0, 1, 1];
  geoKeys.push(geographic ? 2048 : 3072, 0, 1, code);
  return [
    { tag: 256, type: 4, values: [width] },
    { tag: 257, type: 4, values: [height] },
    { tag: 258, type: 3, values: [32] },
    { tag: 259, type: 3, values: [1] },
    { tag: 262, type: 3, values: [1] },
    { tag: 270, type: 2, values: band.description.replace(/[^\x20-\x7e]/g, '?') },
    { tag: 273, type: 4, values: new Array<number>(stripBytes.length).fill(0) },
    { tag: 277, type: 3, values: [1] },
    { tag: 278, type: 4, values: [ROWS_PER_STRIP] },
    { tag: 279, type: 4, values: stripBytes },
    { tag: 284, type: 3, values: [1] },
    { tag: 339, type: 3, values: [3] },
    { tag: 33550, type: 12, values: [gt[1], -gt[5], 0] },
    { tag: 33922, type: 12, values: [0, 0, 0, gt[0], gt[3], 0] },
    { tag: 34735, type: 3, values: geoKeys },
    { tag: 42113, type: 2, values: String(GEOTIFF_NODATA) },
  ];
}

/**
 * The file's header: TIFF header, the IFD and the entry values over 4 bytes after it; the strips
 * follow it (the strip offsets entry is filled in here). Its length is where the strips start.
 */
function tiffHeader(entries: Entry[], stripBytes: number[], width: number): Buffer {
  const ifdSize = 2 + entries.length * 12 + 4;
  let extra = 8 + ifdSize;
  const extraOffsets = entries.map((e) => {
    const size = entryBytes(e);
    if (size <= 4) return -1;
    const at = extra;
    extra += size + (size & 1);
    return at;
  });
  const dataStart = extra;
  entries[6].values = stripBytes.map((_, s) => dataStart + s * ROWS_PER_STRIP * width * 4);

  const header = Buffer.alloc(dataStart);
  header.write('II', 0, 'latin1');
  header.writeUInt16LE(42, 2);
  header.writeUInt32LE(8, 4);
  header.writeUInt16LE(entries.length, 8);
  entries.forEach((e, i) => {
    const o = 10 + i * 12;
    const count = typeof e.values === 'string' ? e.values.length + 1 : e.values.length;
    header.writeUInt16LE(e.tag, o);
    header.writeUInt16LE(e.type, o + 2);
    header.writeUInt32LE(count, o + 4);
    const at = extraOffsets[i] >= 0 ? extraOffsets[i] : o + 8;
    if (extraOffsets[i] >= 0) header.writeUInt32LE(at, o + 8);
    if (typeof e.values === 'string') header.write(e.values, at, 'latin1');
    else
      e.values.forEach((v, k) => {
        if (e.type === 3) header.writeUInt16LE(v, at + 2 * k);
        else if (e.type === 4) header.writeUInt32LE(v, at + 4 * k);
        else header.writeDoubleLE(v, at + 8 * k);
      });
  });
  header.writeUInt32LE(0, 10 + entries.length * 12);
  return header;
}

/** Write `header`, then the band strip by strip as little-endian Float32 (NaN -> GEOTIFF_NODATA). */
async function writeStrips(band: BandGeoTiff, header: Buffer, stripBytes: number[]): Promise<void> {
  const { width, values, readRows } = band;
  const file = await open(band.path, 'w');
  try {
    await file.write(header);
    const chunk = Buffer.alloc(ROWS_PER_STRIP * width * 4);
    for (let s = 0; s < stripBytes.length; s++) {
      const row0 = s * ROWS_PER_STRIP;
      const n = stripBytes[s] / 4;
      const rows = values
        ? values.subarray(row0 * width, row0 * width + n)
        : (readRows as NonNullable<BandGeoTiff['readRows']>)(row0, row0 + n / width);
      if (rows.length !== n) {
        throw new RangeError(`writeBandGeoTiff: readRows gave ${rows.length} values for ${n / width} rows`);
      }
      for (let i = 0; i < n; i++) {
        const v = rows[i];
        chunk.writeFloatLE(v === v ? v : GEOTIFF_NODATA, 4 * i);
      }
      await file.write(chunk, 0, stripBytes[s]);
    }
  } finally {
    await file.close();
  }
}

/** Write the band as a Float32 GeoTIFF in strips of GEOTIFF_ROWS_PER_STRIP rows (see the file comment). */
export async function writeBandGeoTiff(band: BandGeoTiff): Promise<void> {
  const code = checkBand(band);
  const { width, height } = band;
  const strips = Math.ceil(height / ROWS_PER_STRIP);
  const stripBytes = Array.from(
    { length: strips },
    (_, s) => Math.min(ROWS_PER_STRIP, height - s * ROWS_PER_STRIP) * width * 4,
  );
  const header = tiffHeader(tiffEntries(band, code, stripBytes), stripBytes, width);
  await writeStrips(band, header, stripBytes);
}
