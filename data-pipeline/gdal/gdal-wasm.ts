/**
 * GDAL (with its full PROJ database) compiled to WebAssembly (`gdal3.js`), wrapped as a few synchronous
 * calls on real file paths: the host file system is mounted inside the module, so GDAL reads and writes
 * the files themselves (block by block; nothing is copied into the module's memory first). Loaded once
 * per process, on first use (about 0.5 s), and only on the main thread: worker threads read the raw
 * grids GDAL wrote. No network: the PROJ database and the drivers ship inside the package.
 *
 * Every call resets GDAL's error state and, on failure, throws a GdalError carrying GDAL's own message
 * (callers turn it into an InputError naming the file). GDAL's console output is silenced.
 */
import { createRequire } from 'node:module';
import { buildVrtCall, crsCalls, rasterCalls, vectorCalls } from './gdal-calls';
import { GdalCore, HOST, type EmscriptenModule } from './gdal-core';

export { GdalError, gdalPath } from './gdal-core';

interface Gdal3 {
  Module: EmscriptenModule;
}

/** `gdalinfo -json` of a raster, the fields we read. */
export interface GdalRasterInfo {
  driverShortName: string;
  /** Every file the dataset reads (a VRT's sources among them), as GDAL paths. */
  files?: string[];
  size: [number, number];
  geoTransform?: [number, number, number, number, number, number];
  coordinateSystem?: { wkt: string; dataAxisToSRSAxisMapping?: number[] };
  metadata?: Record<string, Record<string, string>>;
  bands: {
    band: number;
    block: [number, number];
    type: string;
    description?: string;
    noDataValue?: number | string;
    scale?: number;
    offset?: number;
    unit?: string;
    metadata?: Record<string, Record<string, string>>;
  }[];
}

export interface Gdal {
  /** `gdalinfo -json` of the raster at `path`. */
  info: (path: string) => GdalRasterInfo;
  /** `gdal_translate args src dst`. */
  translate: (src: string, dst: string, args: string[]) => void;
  /** `gdalwarp args src dst`. */
  warp: (src: string, dst: string, args: string[]) => void;
  /** `gdal_rasterize args src dst` (dst is created). */
  rasterize: (src: string, dst: string, args: string[]) => void;
  /** `gdalbuildvrt args dst srcs...` (a virtual mosaic of the sources). */
  buildVrt: (srcs: string[], dst: string, args: string[]) => void;
  /** `ogr2ogr args dst src`, the source opened with `openOptions` (ogr2ogr's `-oo`, as NAME=VALUE). */
  vectorTranslate: (src: string, dst: string, args: string[], openOptions?: string[]) => void;
  /** `ogrinfo -json args src`. */
  vectorInfo: (src: string, args?: string[]) => unknown;
  /** The WKT of a CRS given as any user input GDAL accepts (EPSG:n, ESRI:n, PROJ string, WKT). */
  srsWkt: (userInput: string) => string;
  /** Transform interleaved x, y pairs between two CRSs (any user input GDAL accepts; lon, lat order). */
  transform: (fromSrs: string, toSrs: string, xy: Float64Array) => Float64Array;
}

let loading: Promise<Gdal> | undefined;

/** The process's GDAL, loaded on first call. */
export function loadGdal(): Promise<Gdal> {
  loading ??= init();
  return loading;
}

/** Load the module, mount the host file system, register the drivers and build the calls. */
async function init(): Promise<Gdal> {
  const require = createRequire(import.meta.url);
  const initGdalJs = require('gdal3.js/node.js') as (config: object) => Promise<Gdal3>;
  const quiet = () => undefined;
  const gdal3 = await initGdalJs({ useWorker: false, logHandler: quiet, errorHandler: quiet });
  const M = gdal3.Module;
  M.FS.mkdir(HOST);
  M.FS.mount(M.NODEFS, { root: '/' }, HOST);
  const core = new GdalCore(M);
  core.call('GDALAllRegister', null, [], []);
  // Keep GDAL's block cache modest: several builds may share a machine (common practice: 256 MB).
  core.call('GDALSetCacheMax', null, ['number'], [256 * 1024 * 1024]);
  return { ...rasterCalls(core), ...buildVrtCall(core), ...vectorCalls(core), ...crsCalls(core) };
}
