/**
 * Writes one analysis-grid band as a Cloud Optimized GeoTIFF through GDAL's COG driver: 256 x 256
 * tiles, DEFLATE with the predictor that suits the type (horizontal differencing for integers,
 * floating-point for Float32), overviews down to one tile (average for values, nearest for classes),
 * the CRS as GDAL writes it (EPSG:3413 GeoKeys), and the band's metadata where desktop GIS reads it:
 * band description = the band's title, unit type = its unit, nodata (-9999 for values, 255 for classes),
 * and for class bands an 8-bit band with a colour table (the map's colours, class-colours.ts) and
 * category names (in the PAM sidecar `.tif.aux.xml`, as GDAL keeps them for GeoTIFF, and in the band
 * metadata `CLASS_<code>` inside the file). Dataset metadata holds the title, the band id, the unit,
 * the cautions and the notice, UTF-8 in GDAL's metadata tag; the TIFF ImageDescription is kept ASCII.
 *
 * The band is read from its raw Float32 band file (band-files.ts) through a VRT, so GDAL streams it by
 * blocks; a class band is first converted to a raw byte file (one row block at a time).
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { classColours } from '../../layers/screening/class-colours';
import { gdalPath, loadGdal } from '../gdal/gdal-wasm';
import { readBandRows } from '../build/band-files';

export interface CogBand {
  id: string;
  title: string;
  unit: string;
  kind: 'continuous' | 'class';
  ramp?: string;
  classes?: { value: number; label: string }[];
}

export interface BandCog {
  /** Output .tif path. */
  path: string;
  /** Raw little-endian Float32 band file, row-major, row 0 north (band-files.ts). */
  rawPath: string;
  width: number;
  height: number;
  geoTransform: [number, number, number, number, number, number];
  /** 'EPSG:n' or any CRS GDAL accepts. */
  crs: string;
  band: CogBand;
  /** Dataset metadata (e.g. CAUTION, NOTICE), UTF-8. */
  metadata: Record<string, string>;
}

export const CLASS_NODATA = 255;
/** Nodata of value bands, as documented for the build's GeoTIFFs. */
export const VALUE_NODATA = -9999;

const xml = (s: string) =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** ASCII rendering for the TIFF ImageDescription tag (TIFF ASCII is 7-bit). */
export function asciiDescription(s: string): string {
  return s
    .replace(/°([CF])/g, 'deg$1')
    .replace(/°/g, ' deg')
    .replace(/³/g, '3')
    .replace(/²/g, '2')
    .replace(/·/g, '.')
    .replace(/[^\x20-\x7e]/g, '?');
}

function vrtXml(o: BandCog, source: string, byte: boolean): string {
  const { band } = o;
  const md = (entries: Record<string, string>) =>
    `<Metadata>${Object.entries(entries)
      .map(([k, v]) => `<MDI key="${xml(k)}">${xml(v)}</MDI>`)
      .join('')}</Metadata>`;
  const classes = band.classes ?? [];
  let classXml = '';
  const classMd: Record<string, string> = {};
  if (byte) {
    const colours = classColours({ classes, ramp: band.ramp });
    const top = Math.max(0, ...classes.map((c) => c.value));
    const names: string[] = [];
    const entries: string[] = [];
    for (let v = 0; v <= top; v++) {
      const c = classes.find((k) => k.value === v);
      names.push(`<Category>${xml(c?.label ?? '')}</Category>`);
      const rgb = colours.get(v);
      entries.push(
        rgb
          ? `<Entry c1="${rgb[0]}" c2="${rgb[1]}" c3="${rgb[2]}" c4="255"/>`
          : '<Entry c1="0" c2="0" c3="0" c4="0"/>',
      );
      if (c) classMd[`CLASS_${v}`] = c.label;
    }
    classXml =
      `<CategoryNames>${names.join('')}</CategoryNames><ColorInterp>Palette</ColorInterp>` +
      `<ColorTable>${entries.join('')}</ColorTable>`;
  }
  const px = byte ? 1 : 4;
  return (
    `<VRTDataset rasterXSize="${o.width}" rasterYSize="${o.height}">` +
    `<SRS dataAxisToSRSAxisMapping="1,2">${xml(o.crs)}</SRS>` +
    `<GeoTransform>${o.geoTransform.join(', ')}</GeoTransform>` +
    md({
      ...o.metadata,
      TIFFTAG_IMAGEDESCRIPTION: asciiDescription(
        `pile-atlas ${band.title}${band.unit ? ` [${band.unit}]` : ''}. ${o.metadata.CAUTION ?? ''}`.trim(),
      ),
    }) +
    `<VRTRasterBand dataType="${byte ? 'Byte' : 'Float32'}" band="1" subClass="VRTRawRasterBand">` +
    `<SourceFilename relativeToVRT="0">${xml(gdalPath(source))}</SourceFilename>` +
    `<ImageOffset>0</ImageOffset><PixelOffset>${px}</PixelOffset><LineOffset>${px * o.width}</LineOffset>` +
    `<ByteOrder>LSB</ByteOrder>` +
    `<Description>${xml(band.title)}</Description>` +
    `<UnitType>${xml(band.unit)}</UnitType>` +
    `<NoDataValue>${byte ? CLASS_NODATA : VALUE_NODATA}</NoDataValue>` +
    md({ BAND_ID: band.id, TITLE: band.title, UNIT: band.unit || '(none)', ...classMd }) +
    classXml +
    `</VRTRasterBand></VRTDataset>`
  );
}

/** Copy a Float32 value band with NaN -> -9999 (GEOTIFF_NODATA), row block by row block. */
function valueBandWithNodata(o: BandCog, dst: string): void {
  const rows = Math.max(1, Math.floor((1 << 20) / o.width));
  const inFd = openSync(o.rawPath, 'r');
  const outFd = openSync(dst, 'w');
  try {
    const buf = new Float32Array(rows * o.width);
    for (let r0 = 0; r0 < o.height; r0 += rows) {
      const r1 = Math.min(o.height, r0 + rows);
      const v = readBandRows(inFd, o.width, r0, r1, buf);
      for (let i = 0; i < v.length; i++) if (v[i] !== v[i]) v[i] = VALUE_NODATA;
      writeSync(outFd, new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
    }
  } finally {
    closeSync(inFd);
    closeSync(outFd);
  }
}

/** Convert a Float32 class band to bytes (NaN -> 255), row block by row block. */
function classBandToBytes(o: BandCog, dst: string): void {
  const rows = Math.max(1, Math.floor((1 << 20) / o.width));
  const inFd = openSync(o.rawPath, 'r');
  const outFd = openSync(dst, 'w');
  try {
    const buf = new Float32Array(rows * o.width);
    const bytes = new Uint8Array(rows * o.width);
    for (let r0 = 0; r0 < o.height; r0 += rows) {
      const r1 = Math.min(o.height, r0 + rows);
      const v = readBandRows(inFd, o.width, r0, r1, buf);
      for (let i = 0; i < v.length; i++) {
        const x = v[i];
        if (x === x && (x < 0 || x >= CLASS_NODATA || !Number.isInteger(x))) {
          throw new RangeError(`band ${o.band.id}: class code ${x} is not an integer 0..254`);
        }
        bytes[i] = x === x ? x : CLASS_NODATA;
      }
      writeSync(outFd, bytes, 0, v.length);
    }
  } finally {
    closeSync(inFd);
    closeSync(outFd);
  }
}

/** Write the band as a COG at `o.path` (plus `o.path`.aux.xml for a class band's category names). */
export async function writeBandCog(o: BandCog): Promise<void> {
  const gdal = await loadGdal();
  const work = join(dirname(o.path), `.cog-${basename(o.path)}`);
  await mkdir(work, { recursive: true });
  try {
    const byte = o.band.kind === 'class';
    const source = join(work, byte ? 'band.u8' : 'band.f32');
    if (byte) classBandToBytes(o, source);
    else valueBandWithNodata(o, source);
    const vrt = join(work, 'band.vrt');
    await writeFile(vrt, vrtXml(o, source, byte));
    gdal.translate(vrt, o.path, [
      '-of',
      'COG',
      '-co',
      'COMPRESS=DEFLATE',
      '-co',
      'PREDICTOR=YES',
      '-co',
      'BLOCKSIZE=256',
      '-co',
      `RESAMPLING=${byte ? 'NEAREST' : 'AVERAGE'}`,
      '-co',
      'BIGTIFF=IF_SAFER',
    ]);
  } finally {
    await rm(work, { recursive: true, force: true });
  }
}
