/**
 * Opens an input raster through GDAL (gdal-wasm.ts): GeoTIFF and COG (any compression, predictor,
 * byte order, BigTIFF, pixel-is-point), GDAL virtual rasters (VRT mosaics), GeoPackage rasters and
 * every other raster format GDAL reads, in any CRS GDAL's PROJ database knows (EPSG, ESRI, IAU codes,
 * WKT, PROJ strings, e.g. Interrupted Goode Homolosine or EASE-Grid 2.0). Checks before any pixel is
 * decoded, each an InputError naming the file: file missing or not readable, a TIFF that is truncated or
 * declares more pixels than the budget (read from the TIFF directory), no georeferencing, a degenerate
 * pixel size, no CRS, a user-defined CRS without parameters, a CRS code unknown to PROJ.
 *
 * Scale and offset (GDAL band metadata: the GeoTIFF GDAL_METADATA tag, a VRT's <Scale>/<Offset>, CF
 * scale_factor/add_offset) are read and returned: physical = stored x scale + offset. The band's unit
 * (GDAL unit type, CF `units`) is returned too.
 */
import { open } from 'node:fs/promises';
import type { BuildBudget } from '../build/build-budget';
import { checkRasterBudget, defaultBudget } from '../build/build-budget';
import { GdalError, gdalPath, loadGdal, type GdalRasterInfo } from '../gdal/gdal-wasm';
import { InputError } from '../input-error';
import { checkTiffStructure, hasTiffHeader, inputFileError, type GridHeader } from './read-geotiff-grid';

export interface RasterInput {
  /** Size and georeferencing; `crs` is the CRS's name for messages and the manifest (EPSG:n when coded). */
  header: GridHeader;
  /** The CRS as WKT, as GDAL read it (what warping uses). */
  srsWkt: string;
  path: string;
  label: string;
  /** GDAL's driver (GTiff, VRT, GPKG, ...). */
  driver: string;
  /** Stored nodata value (the config's override, else the file's), or null. */
  nodata: number | null;
  /** physical = stored x scale + offset (1 and 0 when the file declares none). */
  scale: number;
  offset: number;
  /** The unit the file declares for band 1, or null. */
  fileUnit: string | null;
  /** GDAL data type of band 1 (Int16, Float32, ...). */
  dataType: string;
  integerSamples: boolean;
  description: string | null;
}

export interface OpenRasterOptions {
  label: string;
  /** Every file the raster reads (a VRT's sources) must lie inside one of these directories. */
  insideDirs?: string[];
  nodataOverride?: number;
  budget?: BuildBudget;
}

const BITS: Record<string, number> = {
  Byte: 8,
  Int8: 8,
  UInt16: 16,
  Int16: 16,
  UInt32: 32,
  Int32: 32,
  UInt64: 64,
  Int64: 64,
  Float32: 32,
  Float64: 64,
  CInt16: 32,
  CInt32: 64,
  CFloat32: 64,
  CFloat64: 128,
};

/** The CRS's name: "EPSG:n" when the WKT carries a top-level EPSG identifier, else its WKT name. */
export function crsNameOf(wkt: string): string {
  const id = /ID\["EPSG",(\d+)\]\]\s*$/.exec(wkt) ?? /AUTHORITY\["EPSG","(\d+)"\]\]\s*$/.exec(wkt);
  if (id) return `EPSG:${id[1]}`;
  const name = /^\s*\w+\["([^"]*)"/.exec(wkt);
  return name && name[1] && name[1] !== 'unknown' ? name[1] : `custom CRS (${projectionMethodOf(wkt)})`;
}

function projectionMethodOf(wkt: string): string {
  return /METHOD\["([^"]+)"/.exec(wkt)?.[1] ?? /PROJECTION\["([^"]+)"/.exec(wkt)?.[1] ?? 'unnamed';
}

/** Refuse a CRS that cannot be used to place the grid on the Earth. */
function checkCrs(label: string, wkt: string, tiffCode: number | undefined): void {
  if (!wkt.trim()) {
    if (tiffCode === 32767) {
      throw new InputError(
        `${label}: CRS cannot be read (user-defined CRS without parameters in the GeoKeys; ` +
          'write the CRS into the file, e.g. as WKT, or reproject it)',
      );
    }
    if (tiffCode !== undefined) {
      throw new InputError(`${label}: unsupported CRS EPSG:${tiffCode} (not in the PROJ database)`);
    }
    throw new InputError(`${label}: CRS cannot be read (the file names no CRS)`);
  }
  if (/^\s*(LOCAL_CS|ENGCRS|ENGINEERING)\[/.test(wkt)) {
    if (tiffCode !== undefined && tiffCode !== 32767) {
      throw new InputError(`${label}: unsupported CRS EPSG:${tiffCode} (not in the PROJ database)`);
    }
    throw new InputError(
      `${label}: CRS cannot be read (user-defined local CRS "${crsNameOf(wkt)}" without parameters ` +
        'relating it to the Earth)',
    );
  }
}

async function headBytes(path: string, label: string): Promise<{ head: Uint8Array; size: number }> {
  try {
    const fh = await open(path, 'r');
    try {
      const size = (await fh.stat()).size;
      const head = new Uint8Array(8);
      const { bytesRead } = await fh.read(head, 0, 8, 0);
      return { head: head.subarray(0, bytesRead), size };
    } finally {
      await fh.close();
    }
  } catch (err) {
    throw inputFileError(label, err);
  }
}

/** Open band 1 of a raster with GDAL, after the guards; nothing is decoded. */
export async function openRaster(path: string, options: OpenRasterOptions): Promise<RasterInput> {
  const { label } = options;
  const budget = options.budget ?? defaultBudget();
  const { head, size } = await headBytes(path, label);
  const tiff = hasTiffHeader(head);
  if (!tiff && /\.tiff?$/i.test(path)) throw new InputError(`${label}: not a TIFF file (no TIFF header)`);
  const structure = tiff ? await checkTiffStructure(path, label, size, budget) : {};
  const gdal = await loadGdal();
  let info: GdalRasterInfo;
  try {
    info = gdal.info(path);
  } catch (err) {
    if (!(err instanceof GdalError)) throw err;
    throw new InputError(`${label}: not a raster GDAL can read (${err.message})`);
  }
  if (options.insideDirs) {
    const roots = options.insideDirs.map((d) => gdalPath(d) + '/');
    const outside = (info.files ?? []).find((f) => !roots.some((root) => f.startsWith(root)));
    if (outside) {
      throw new InputError(
        `${label}: reads ${outside.slice(gdalPath('/').length - 1)}, which leaves the inputs directory (refused)`,
      );
    }
  }
  const band = info.bands?.[0];
  if (!band) throw new InputError(`${label}: the file holds no raster band`);
  const [width, height] = info.size;
  const bits = BITS[band.type] ?? 64;
  checkRasterBudget(
    label,
    {
      width,
      height,
      bitsPerSample: bits,
      samplesPerPixel: 1,
      blocks: Math.ceil(width / band.block[0]) * Math.ceil(height / band.block[1]),
      blockWidth: band.block[0],
      blockHeight: Math.min(band.block[1], height),
      distinctOffsets: Math.ceil(width / band.block[0]) * Math.ceil(height / band.block[1]),
      fileBytes: size,
    },
    budget,
  );
  const gt = info.geoTransform;
  if (!gt) {
    throw new InputError(
      `${label}: no georeferencing (needs ModelPixelScale + ModelTiepoint or ModelTransformation, or a geotransform)`,
    );
  }
  if (!gt.every(Number.isFinite) || gt[1] * gt[5] - gt[2] * gt[4] === 0) {
    throw new InputError(`${label}: invalid georeferencing (degenerate pixel size)`);
  }
  const wkt = info.coordinateSystem?.wkt ?? '';
  checkCrs(label, wkt, structure.crsCode);
  const fileNodata =
    band.noDataValue === undefined
      ? null
      : typeof band.noDataValue === 'number'
        ? band.noDataValue
        : Number(band.noDataValue);
  const scale = band.scale ?? 1;
  const offset = band.offset ?? 0;
  if (!Number.isFinite(scale) || scale === 0 || !Number.isFinite(offset)) {
    throw new InputError(`${label}: invalid scale ${scale} / offset ${offset} in the band metadata`);
  }
  return {
    header: { width, height, geoTransform: gt, crs: crsNameOf(wkt) },
    srsWkt: wkt,
    path,
    label,
    driver: info.driverShortName,
    nodata: options.nodataOverride ?? fileNodata,
    scale,
    offset,
    fileUnit: band.unit ? band.unit : null,
    dataType: band.type,
    integerSamples: !/^(C?Float)/.test(band.type),
    description: band.description || info.metadata?.['']?.TIFFTAG_IMAGEDESCRIPTION || null,
  };
}
