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
import { resolve } from 'node:path';

/** The parts of the Emscripten module we call. */
interface EmscriptenModule {
  ccall: (name: string, ret: string | null, types: string[], args: unknown[]) => unknown;
  _malloc: (n: number) => number;
  _free: (p: number) => void;
  setValue: (p: number, v: number, t: string) => void;
  getValue: (p: number, t: string) => number;
  lengthBytesUTF8: (s: string) => number;
  stringToUTF8: (s: string, p: number, n: number) => void;
  UTF8ToString: (p: number) => string;
  HEAPF64: Float64Array;
  FS: { mkdir: (p: string) => void; mount: (fs: unknown, o: object, p: string) => void };
  NODEFS: unknown;
}

interface Gdal3 {
  Module: EmscriptenModule;
}

export class GdalError extends Error {
  override name = 'GdalError';
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

const HOST = '/host';

/** A host path as GDAL sees it inside the module. */
export function gdalPath(path: string): string {
  return HOST + resolve(path);
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

async function init(): Promise<Gdal> {
  const require = createRequire(import.meta.url);
  const initGdalJs = require('gdal3.js/node.js') as (config: object) => Promise<Gdal3>;
  const quiet = () => undefined;
  const gdal3 = await initGdalJs({ useWorker: false, logHandler: quiet, errorHandler: quiet });
  const M = gdal3.Module;
  M.FS.mkdir(HOST);
  M.FS.mount(M.NODEFS, { root: '/' }, HOST);
  const call = (name: string, ret: string | null, types: string[], args: unknown[]) =>
    M.ccall(name, ret, types, args);
  call('GDALAllRegister', null, [], []);
  // Keep GDAL's block cache modest: several builds may share a machine (common practice: 256 MB).
  call('GDALSetCacheMax', null, ['number'], [256 * 1024 * 1024]);

  const lastError = (what: string) => {
    const msg = String(call('CPLGetLastErrorMsg', 'string', [], []) ?? '').trim();
    return new GdalError(msg ? msg.split('\n')[0] : `${what} failed`);
  };
  const reset = () => call('CPLErrorReset', null, [], []);

  /** A NULL-terminated char** of `args`, freed by the returned function. */
  const stringList = (args: string[]): [number, () => void] => {
    const ptrs = args.map((s) => {
      const n = M.lengthBytesUTF8(s) + 1;
      const p = M._malloc(n);
      M.stringToUTF8(s, p, n);
      return p;
    });
    const list = M._malloc(4 * (args.length + 1));
    ptrs.forEach((p, i) => M.setValue(list + 4 * i, p, '*'));
    M.setValue(list + 4 * args.length, 0, '*');
    return [list, () => (ptrs.forEach((p) => M._free(p)), M._free(list))];
  };

  const open = (path: string, vector = false, openOptions: string[] = []): number => {
    reset();
    // GDAL_OF_RASTER = 0x02, GDAL_OF_VECTOR = 0x04, GDAL_OF_VERBOSE_ERROR = 0x40.
    const flags = (vector ? 0x04 : 0x02) | 0x40;
    const [oo, freeOo] = openOptions.length ? stringList(openOptions) : [0, () => undefined];
    try {
      const ds = call(
        'GDALOpenEx',
        'number',
        ['string', 'number', 'number', 'number', 'number'],
        [gdalPath(path), flags, 0, oo, 0],
      ) as number;
      if (!ds) throw lastError('open');
      return ds;
    } finally {
      freeOo();
    }
  };
  const close = (ds: number) => call('GDALClose', null, ['number'], [ds]);

  /** Run one of GDAL's utility functions: options object, then the call, then free and close. */
  const utility = (
    src: string,
    vector: boolean,
    args: string[],
    newOptions: string,
    freeOptions: string,
    run: (ds: number, options: number) => number,
    openOptions: string[] = [],
  ) => {
    const ds = open(src, vector, openOptions);
    const [list, freeList] = stringList(args);
    try {
      const options = call(newOptions, 'number', ['number', 'number'], [list, 0]) as number;
      if (!options) throw lastError(`options ${args.join(' ')}`);
      try {
        reset();
        const out = run(ds, options);
        if (!out) throw lastError(newOptions.replace(/OptionsNew$/, ''));
        close(out);
        const type = call('CPLGetLastErrorType', 'number', [], []) as number;
        // CE_Failure = 3, CE_Fatal = 4: a partial output is an error.
        if (type >= 3) throw lastError(newOptions);
      } finally {
        call(freeOptions, null, ['number'], [options]);
      }
    } finally {
      freeList();
      close(ds);
    }
  };
  const withDatasetList = (ds: number, f: (list: number) => number) => {
    const list = M._malloc(4);
    M.setValue(list, ds, '*');
    try {
      return f(list);
    } finally {
      M._free(list);
    }
  };

  const srs = (userInput: string): number => {
    const h = call('OSRNewSpatialReference', 'number', ['number'], [0]) as number;
    reset();
    const err = call('OSRSetFromUserInput', 'number', ['number', 'string'], [h, userInput]) as number;
    if (err !== 0) {
      call('OSRDestroySpatialReference', null, ['number'], [h]);
      throw lastError(`CRS ${userInput}`);
    }
    // OAMS_TRADITIONAL_GIS_ORDER: longitude, latitude / easting, northing.
    call('OSRSetAxisMappingStrategy', null, ['number', 'number'], [h, 0]);
    return h;
  };

  return {
    info(path) {
      const ds = open(path);
      const [list, freeList] = stringList(['-json']);
      try {
        const options = call('GDALInfoOptionsNew', 'number', ['number', 'number'], [list, 0]) as number;
        const json = call('GDALInfo', 'string', ['number', 'number'], [ds, options]) as string;
        call('GDALInfoOptionsFree', null, ['number'], [options]);
        if (!json) throw lastError('gdalinfo');
        return JSON.parse(json) as GdalRasterInfo;
      } finally {
        freeList();
        close(ds);
      }
    },
    translate(src, dst, args) {
      utility(src, false, args, 'GDALTranslateOptionsNew', 'GDALTranslateOptionsFree', (ds, o) =>
        Number(
          call(
            'GDALTranslate',
            'number',
            ['string', 'number', 'number', 'number'],
            [gdalPath(dst), ds, o, 0],
          ),
        ),
      );
    },
    warp(src, dst, args) {
      utility(src, false, args, 'GDALWarpAppOptionsNew', 'GDALWarpAppOptionsFree', (ds, o) =>
        withDatasetList(ds, (l) =>
          Number(
            call(
              'GDALWarp',
              'number',
              ['string', 'number', 'number', 'number', 'number', 'number'],
              [gdalPath(dst), 0, 1, l, o, 0],
            ),
          ),
        ),
      );
    },
    rasterize(src, dst, args) {
      utility(src, true, args, 'GDALRasterizeOptionsNew', 'GDALRasterizeOptionsFree', (ds, o) =>
        Number(
          call(
            'GDALRasterize',
            'number',
            ['string', 'number', 'number', 'number', 'number'],
            [gdalPath(dst), 0, ds, o, 0],
          ),
        ),
      );
    },
    buildVrt(srcs, dst, args) {
      const [list, freeList] = stringList(args);
      const [names, freeNames] = stringList(srcs.map(gdalPath));
      try {
        const options = call('GDALBuildVRTOptionsNew', 'number', ['number', 'number'], [list, 0]) as number;
        if (!options) throw lastError(`options ${args.join(' ')}`);
        try {
          reset();
          const out = call(
            'GDALBuildVRT',
            'number',
            ['string', 'number', 'number', 'number', 'number', 'number'],
            [gdalPath(dst), srcs.length, 0, names, options, 0],
          ) as number;
          if (!out) throw lastError('gdalbuildvrt');
          close(out);
        } finally {
          call('GDALBuildVRTOptionsFree', null, ['number'], [options]);
        }
      } finally {
        freeList();
        freeNames();
      }
    },
    vectorTranslate(src, dst, args, openOptions = []) {
      utility(
        src,
        true,
        args,
        'GDALVectorTranslateOptionsNew',
        'GDALVectorTranslateOptionsFree',
        (ds, o) =>
          withDatasetList(ds, (l) =>
            Number(
              call(
                'GDALVectorTranslate',
                'number',
                ['string', 'number', 'number', 'number', 'number', 'number'],
                [gdalPath(dst), 0, 1, l, o, 0],
              ),
            ),
          ),
        openOptions,
      );
    },
    vectorInfo(src, args = []) {
      const ds = open(src, true);
      const [list, freeList] = stringList(['-json', ...args]);
      try {
        const options = call('GDALVectorInfoOptionsNew', 'number', ['number', 'number'], [list, 0]) as number;
        const json = call('GDALVectorInfo', 'string', ['number', 'number'], [ds, options]) as string;
        call('GDALVectorInfoOptionsFree', null, ['number'], [options]);
        if (!json) throw lastError('ogrinfo');
        return JSON.parse(json) as unknown;
      } finally {
        freeList();
        close(ds);
      }
    },
    srsWkt(userInput) {
      const h = srs(userInput);
      const out = M._malloc(4);
      try {
        call('OSRExportToWkt', 'number', ['number', 'number'], [h, out]);
        const p = M.getValue(out, '*');
        const wkt = p ? M.UTF8ToString(p) : '';
        // CPLMalloc is malloc in this build, so the module's free releases the string.
        if (p) M._free(p);
        return wkt;
      } finally {
        M._free(out);
        call('OSRDestroySpatialReference', null, ['number'], [h]);
      }
    },
    transform(fromSrs, toSrs, xy) {
      const n = xy.length / 2;
      const out = new Float64Array(xy.length);
      if (n === 0) return out;
      const a = srs(fromSrs);
      const b = srs(toSrs);
      const ct = call('OCTNewCoordinateTransformation', 'number', ['number', 'number'], [a, b]) as number;
      if (!ct) {
        call('OSRDestroySpatialReference', null, ['number'], [a]);
        call('OSRDestroySpatialReference', null, ['number'], [b]);
        throw lastError(`transform ${fromSrs} -> ${toSrs}`);
      }
      const chunk = Math.min(n, 1 << 16);
      const px = M._malloc(8 * chunk);
      const py = M._malloc(8 * chunk);
      try {
        for (let i0 = 0; i0 < n; i0 += chunk) {
          const m = Math.min(chunk, n - i0);
          let heap = M.HEAPF64;
          for (let i = 0; i < m; i++) {
            heap[px / 8 + i] = xy[2 * (i0 + i)];
            heap[py / 8 + i] = xy[2 * (i0 + i) + 1];
          }
          call(
            'OCTTransform',
            'number',
            ['number', 'number', 'number', 'number', 'number'],
            [ct, m, px, py, 0],
          );
          heap = M.HEAPF64; // the heap may have grown
          for (let i = 0; i < m; i++) {
            const x = heap[px / 8 + i];
            const y = heap[py / 8 + i];
            const ok = Number.isFinite(x) && Number.isFinite(y) && Math.abs(x) < 1e300;
            out[2 * (i0 + i)] = ok ? x : NaN;
            out[2 * (i0 + i) + 1] = ok ? y : NaN;
          }
        }
      } finally {
        M._free(px);
        M._free(py);
        call('OCTDestroyCoordinateTransformation', null, ['number'], [ct]);
        call('OSRDestroySpatialReference', null, ['number'], [a]);
        call('OSRDestroySpatialReference', null, ['number'], [b]);
      }
      return out;
    },
  };
}
