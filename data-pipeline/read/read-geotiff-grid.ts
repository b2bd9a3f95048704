/**
 * Reads one single-band GeoTIFF into a Grid (layers/grid.ts) with explicit checks, each failing with an
 * InputError that names the file and the problem: file missing, not a TIFF, truncated or unreadable,
 * no georeferencing, CRS missing / user-defined / not supported. Nodata (GDAL_NODATA, or the config's
 * override) and non-finite values become NaN. Multi-band files: the first band is read.
 */
import { createHash } from 'node:crypto';
import { open, readFile } from 'node:fs/promises';
import { fromArrayBuffer, fromFile, type GeoTIFFImage } from 'geotiff';
import type { Grid } from '../../layers/grid';
import { checkRasterBudget, defaultBudget, type BuildBudget } from '../build/build-budget';
import { CRS_DEFINITIONS, proj4DefinitionFor } from '../crs/crs-definitions';
import { InputError } from '../input-error';

export interface SourceGrid {
  grid: Grid;
  /** The file as named in messages (usually the path relative to the inputs directory). */
  label: string;
  nodata: number | null;
  description: string | null;
  sha256: string;
  /** True when the file holds integer samples (class grids must). */
  integerSamples: boolean;
}

export interface ReadGridOptions {
  label: string;
  nodataOverride?: number;
  /** Declared-size budget checked before any pixel is decoded (default: defaultBudget()). */
  budget?: BuildBudget;
}

const USER_DEFINED = 32767;

function isTiffHeader(b: Uint8Array): boolean {
  if (b.length < 8) return false;
  const le = b[0] === 0x49 && b[1] === 0x49;
  const be = b[0] === 0x4d && b[1] === 0x4d;
  if (le) return (b[2] === 42 || b[2] === 43) && b[3] === 0;
  if (be) return b[2] === 0 && (b[3] === 42 || b[3] === 43);
  return false;
}

function asNumbers(v: unknown): number[] {
  if (v == null) return [];
  if (typeof v === 'number') return [v];
  if (typeof v === 'bigint') return [Number(v)];
  if (Array.isArray(v) || ArrayBuffer.isView(v)) return Array.from(v as ArrayLike<number>, Number);
  return [];
}

async function loadTag(image: GeoTIFFImage, tag: string): Promise<unknown> {
  const dir = image.fileDirectory;
  return dir.hasTag(tag as never) ? dir.loadValue(tag as never) : undefined;
}

/** The CRS of an image as 'EPSG:n', or an InputError naming why it cannot be read. */
function crsOf(image: GeoTIFFImage, label: string): string {
  const keys = image.getGeoKeys();
  if (!keys) throw new InputError(`${label}: CRS cannot be read (no GeoKeyDirectory)`);
  const model = keys.GTModelTypeGeoKey as number | undefined;
  const projected = keys.ProjectedCSTypeGeoKey as number | undefined;
  const geographic = keys.GeographicTypeGeoKey as number | undefined;
  const code = model === 2 ? geographic : (projected ?? geographic);
  if (code === undefined) {
    throw new InputError(`${label}: CRS cannot be read (no EPSG code in the GeoKeyDirectory)`);
  }
  if (code === USER_DEFINED) {
    throw new InputError(`${label}: CRS cannot be read (user-defined CRS; reproject to an EPSG code first)`);
  }
  const crs = `EPSG:${code}`;
  if (!proj4DefinitionFor(crs)) {
    throw new InputError(
      `${label}: unsupported CRS ${crs} (supported: ${Object.keys(CRS_DEFINITIONS).join(', ')}, EPSG:326zz/327zz)`,
    );
  }
  return crs;
}

async function geoTransformOf(image: GeoTIFFImage, label: string): Promise<Grid['geoTransform']> {
  const transformation = asNumbers(await loadTag(image, 'ModelTransformation'));
  const scale = asNumbers(await loadTag(image, 'ModelPixelScale'));
  const tiepoint = asNumbers(await loadTag(image, 'ModelTiepoint'));
  let gt: Grid['geoTransform'];
  if (transformation.length >= 16) {
    const m = transformation;
    gt = [m[3], m[0], m[1], m[7], m[4], m[5]];
  } else if (scale.length >= 2 && tiepoint.length >= 6) {
    const [i, j, , x, y] = tiepoint;
    gt = [x - i * scale[0], scale[0], 0, y + j * scale[1], 0, -scale[1]];
  } else {
    throw new InputError(
      `${label}: no georeferencing (needs ModelPixelScale + ModelTiepoint or ModelTransformation)`,
    );
  }
  if (!gt.every(Number.isFinite) || gt[1] * gt[5] - gt[2] * gt[4] === 0) {
    throw new InputError(`${label}: invalid georeferencing (degenerate pixel size)`);
  }
  const keys = image.getGeoKeys();
  if (keys?.GTRasterTypeGeoKey === 2) {
    // PixelIsPoint: the tiepoint is the centre of the first pixel; shift to its outer corner.
    gt = [gt[0] - 0.5 * gt[1] - 0.5 * gt[2], gt[1], gt[2], gt[3] - 0.5 * gt[4] - 0.5 * gt[5], gt[4], gt[5]];
  }
  return gt;
}

/**
 * Check that every strip or tile lies inside the file (a truncated download fails here) and that the
 * declared size is within the budget (a decompression bomb fails here), before any pixel is decoded.
 */
async function checkDataInFile(
  image: GeoTIFFImage,
  label: string,
  fileLength: number,
  budget: BuildBudget,
): Promise<void> {
  const offsets = asNumbers((await loadTag(image, 'StripOffsets')) ?? (await loadTag(image, 'TileOffsets')));
  const counts = asNumbers(
    (await loadTag(image, 'StripByteCounts')) ?? (await loadTag(image, 'TileByteCounts')),
  );
  if (offsets.length === 0 || offsets.length !== counts.length) {
    throw new InputError(`${label}: unreadable TIFF (missing strip or tile offsets)`);
  }
  for (let i = 0; i < offsets.length; i++) {
    if (offsets[i] + counts[i] > fileLength) {
      throw new InputError(
        `${label}: truncated file (${fileLength} bytes, image data runs to byte ${offsets[i] + counts[i]})`,
      );
    }
  }
  let bitsPerSample: number;
  let samplesPerPixel: number;
  let blockWidth: number;
  let blockHeight: number;
  try {
    bitsPerSample = image.getBitsPerSample(0);
    samplesPerPixel = image.getSamplesPerPixel();
    blockWidth = image.getTileWidth();
    blockHeight = Math.min(image.getTileHeight(), image.getHeight());
  } catch (err) {
    throw new InputError(`${label}: unreadable TIFF (${(err as Error).message.split('\n')[0]})`);
  }
  checkRasterBudget(
    label,
    {
      width: image.getWidth(),
      height: image.getHeight(),
      bitsPerSample,
      samplesPerPixel,
      blocks: offsets.length,
      blockWidth,
      blockHeight,
      distinctOffsets: new Set(offsets).size,
      fileBytes: fileLength,
    },
    budget,
  );
}

/** A grid's georeferencing without its values. */
export type GridHeader = Omit<Grid, 'values'>;

/** An opened GeoTIFF, checked like readGeoTiffGrid, whose pixels are read window by window. */
export interface OpenedGeoTiff {
  header: GridHeader;
  image: GeoTIFFImage;
  label: string;
  nodata: number | null;
  description: string | null;
  integerSamples: boolean;
  close: () => Promise<void>;
}

function fileError(label: string, err: unknown): InputError {
  const code = (err as NodeJS.ErrnoException).code;
  if (code === 'ENOENT') return new InputError(`${label}: file not found`);
  if (code === 'EISDIR') return new InputError(`${label}: is a directory, expected a GeoTIFF file`);
  return new InputError(`${label}: cannot read file (${code ?? String(err)})`);
}

/**
 * Open a single-band GeoTIFF without reading its pixels, with the same checks as readGeoTiffGrid (TIFF
 * header, strips/tiles inside the file, georeferencing, CRS). Call `close` when done.
 */
export async function openGeoTiffGrid(path: string, options: ReadGridOptions): Promise<OpenedGeoTiff> {
  const { label } = options;
  const head = new Uint8Array(8);
  let size: number;
  let bytesRead: number;
  try {
    const fh = await open(path, 'r');
    try {
      size = (await fh.stat()).size;
      ({ bytesRead } = await fh.read(head, 0, 8, 0));
    } finally {
      await fh.close();
    }
  } catch (err) {
    throw fileError(label, err);
  }
  if (!isTiffHeader(head.subarray(0, bytesRead))) {
    throw new InputError(`${label}: not a TIFF file (no TIFF header)`);
  }
  let tiff: Awaited<ReturnType<typeof fromFile>>;
  let image: GeoTIFFImage;
  try {
    tiff = await fromFile(path);
  } catch (err) {
    throw new InputError(`${label}: unreadable TIFF (${(err as Error).message.split('\n')[0]})`);
  }
  const close = async () => {
    await tiff.close();
  };
  try {
    try {
      image = await tiff.getImage();
    } catch (err) {
      throw new InputError(`${label}: unreadable TIFF (${(err as Error).message.split('\n')[0]})`);
    }
    await checkDataInFile(image, label, size, options.budget ?? defaultBudget());
    const geoTransform = await geoTransformOf(image, label);
    const crs = crsOf(image, label);
    const nodata = options.nodataOverride ?? image.getGDALNoData();
    const formats = asNumbers(await loadTag(image, 'SampleFormat'));
    const description = await loadTag(image, 'ImageDescription');
    return {
      header: { width: image.getWidth(), height: image.getHeight(), geoTransform, crs },
      image,
      label,
      nodata: nodata ?? null,
      description: typeof description === 'string' ? description : null,
      integerSamples: formats.length === 0 || formats[0] !== 3,
      close,
    };
  } catch (err) {
    await close();
    throw err;
  }
}

/**
 * Read the pixel box [x0, y0, x1, y1) (exclusive) of the first band as Float32, row-major, box width
 * x1 - x0; nodata and non-finite values become NaN. Works for stripped and tiled files alike.
 */
export async function readGridWindow(
  opened: Pick<OpenedGeoTiff, 'image' | 'label' | 'nodata'>,
  box: [number, number, number, number],
): Promise<Float32Array> {
  const { image, label, nodata } = opened;
  const n = (box[2] - box[0]) * (box[3] - box[1]);
  let raster: ArrayLike<number>;
  try {
    raster = (await image.readRasters({
      window: box,
      samples: [0],
      interleave: true,
    })) as unknown as ArrayLike<number>;
  } catch (err) {
    throw new InputError(`${label}: unreadable image data (${(err as Error).message.split('\n')[0]})`);
  }
  if (raster.length !== n) {
    throw new InputError(`${label}: image data has ${raster.length} samples, expected ${n}`);
  }
  const nodataSingle = nodata == null ? NaN : Math.fround(nodata);
  const values = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    const v = raster[i];
    values[i] = v === nodata || v === nodataSingle || !Number.isFinite(v) ? NaN : v;
  }
  return values;
}

/** Read a single-band GeoTIFF file into a Grid (nodata -> NaN). */
export async function readGeoTiffGrid(path: string, options: ReadGridOptions): Promise<SourceGrid> {
  const { label } = options;
  let bytes: Uint8Array;
  try {
    bytes = await readFile(path);
  } catch (err) {
    throw fileError(label, err);
  }
  if (!isTiffHeader(bytes)) throw new InputError(`${label}: not a TIFF file (no TIFF header)`);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  let image: GeoTIFFImage;
  try {
    const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
    image = await (await fromArrayBuffer(buffer)).getImage();
  } catch (err) {
    throw new InputError(`${label}: unreadable TIFF (${(err as Error).message.split('\n')[0]})`);
  }
  await checkDataInFile(image, label, bytes.byteLength, options.budget ?? defaultBudget());
  const geoTransform = await geoTransformOf(image, label);
  const crs = crsOf(image, label);
  const width = image.getWidth();
  const height = image.getHeight();
  let raster: ArrayLike<number>;
  try {
    raster = (await image.readRasters({ samples: [0], interleave: true })) as unknown as ArrayLike<number>;
  } catch (err) {
    throw new InputError(`${label}: unreadable image data (${(err as Error).message.split('\n')[0]})`);
  }
  if (raster.length !== width * height) {
    throw new InputError(`${label}: image data has ${raster.length} samples, expected ${width * height}`);
  }
  const nodata = options.nodataOverride ?? image.getGDALNoData();
  // Float32 files store nodata rounded to single precision: compare against both forms.
  const nodataSingle = nodata == null ? NaN : Math.fround(nodata);
  // Shared memory, so worker threads can resample from the grid without copies.
  const values = new Float32Array(new SharedArrayBuffer(width * height * 4));
  for (let i = 0; i < values.length; i++) {
    const v = raster[i];
    values[i] = v === nodata || v === nodataSingle || !Number.isFinite(v) ? NaN : v;
  }
  const formats = asNumbers(await loadTag(image, 'SampleFormat'));
  const description = await loadTag(image, 'ImageDescription');
  return {
    grid: { values, width, height, geoTransform, crs },
    label,
    nodata: nodata ?? null,
    description: typeof description === 'string' ? description : null,
    sha256,
    integerSamples: formats.length === 0 || formats[0] !== 3,
  };
}

/** What the TIFF structure check learns besides "the file is sound": the CRS code its GeoKeys name. */
export interface TiffStructure {
  /** The EPSG code of the GeoKeyDirectory (projected, else geographic), if any; 32767 = user-defined. */
  crsCode?: number;
}

/**
 * Guards run on a TIFF before GDAL reads it: every strip or tile inside the file (a truncated download)
 * and the declared size within the budget (a decompression bomb), from the header and directory only.
 */
export async function checkTiffStructure(
  path: string,
  label: string,
  size: number,
  budget: BuildBudget,
): Promise<TiffStructure> {
  let tiff: Awaited<ReturnType<typeof fromFile>>;
  try {
    tiff = await fromFile(path);
  } catch (err) {
    throw new InputError(`${label}: unreadable TIFF (${(err as Error).message.split('\n')[0]})`);
  }
  try {
    let image: GeoTIFFImage;
    try {
      image = await tiff.getImage();
    } catch (err) {
      throw new InputError(`${label}: unreadable TIFF (${(err as Error).message.split('\n')[0]})`);
    }
    await checkDataInFile(image, label, size, budget);
    try {
      await geoTransformOf(image, label);
    } catch (err) {
      // GDAL drops a zero pixel size silently (as "no georeferencing"): name it here.
      if (err instanceof InputError && /degenerate/.test(err.message)) throw err;
    }
    const keys = image.getGeoKeys();
    const model = keys?.GTModelTypeGeoKey as number | undefined;
    const projected = keys?.ProjectedCSTypeGeoKey as number | undefined;
    const geographic = keys?.GeographicTypeGeoKey as number | undefined;
    return { crsCode: model === 2 ? geographic : (projected ?? geographic) };
  } finally {
    await tiff.close();
  }
}

/** True when the first bytes are a (Big)TIFF header. */
export function hasTiffHeader(bytes: Uint8Array): boolean {
  return isTiffHeader(bytes);
}

export { fileError as inputFileError };
