/**
 * The low-level half of the GDAL wrapper (gdal-wasm.ts): the Emscripten module's calls, GDAL's error
 * state, C string lists, opening and closing datasets, running a GDAL utility function and making a
 * spatial reference. The public calls (gdal-calls.ts) are built on these.
 */
import { resolve } from 'node:path';

/** The parts of the Emscripten module we call. */
export interface EmscriptenModule {
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

export class GdalError extends Error {
  override name = 'GdalError';
}

/** Where the host file system is mounted inside the module. */
export const HOST = '/host';

/** A host path as GDAL sees it inside the module. */
export function gdalPath(path: string): string {
  return HOST + resolve(path);
}

/** GDAL's C API on one loaded module, with the error, memory and dataset bookkeeping every call needs. */
export class GdalCore {
  constructor(readonly M: EmscriptenModule) {}

  /** Call a C function of the module by name. */
  call(name: string, ret: string | null, types: string[], args: unknown[]): unknown {
    return this.M.ccall(name, ret, types, args);
  }

  /** GDAL's last error message (first line) as a GdalError, or "`what` failed" when GDAL gave none. */
  lastError(what: string): GdalError {
    const msg = String(this.call('CPLGetLastErrorMsg', 'string', [], []) ?? '').trim();
    return new GdalError(msg ? msg.split('\n')[0] : `${what} failed`);
  }

  /** Clear GDAL's error state before a call. */
  reset(): void {
    this.call('CPLErrorReset', null, [], []);
  }

  /** A NULL-terminated char** of `args`, freed by the returned function. */
  stringList(args: string[]): [number, () => void] {
    const M = this.M;
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
  }

  /** Open the raster (or vector) dataset at a host path, with ogr2ogr-style open options. */
  open(path: string, vector = false, openOptions: string[] = []): number {
    this.reset();
    // GDAL_OF_RASTER = 0x02, GDAL_OF_VECTOR = 0x04, GDAL_OF_VERBOSE_ERROR = 0x40.
    const flags = (vector ? 0x04 : 0x02) | 0x40;
    const [oo, freeOo] = openOptions.length ? this.stringList(openOptions) : [0, () => undefined];
    try {
      const ds = this.call(
        'GDALOpenEx',
        'number',
        ['string', 'number', 'number', 'number', 'number'],
        [gdalPath(path), flags, 0, oo, 0],
      ) as number;
      if (!ds) throw this.lastError('open');
      return ds;
    } finally {
      freeOo();
    }
  }

  /** Close a dataset (flushing what it wrote). */
  close(ds: number): void {
    this.call('GDALClose', null, ['number'], [ds]);
  }

  /** Run one of GDAL's utility functions: options object, then the call, then free and close. */
  utility(
    src: string,
    vector: boolean,
    args: string[],
    newOptions: string,
    freeOptions: string,
    run: (ds: number, options: number) => number,
    openOptions: string[] = [],
  ): void {
    const ds = this.open(src, vector, openOptions);
    const [list, freeList] = this.stringList(args);
    try {
      const options = this.call(newOptions, 'number', ['number', 'number'], [list, 0]) as number;
      if (!options) throw this.lastError(`options ${args.join(' ')}`);
      try {
        this.reset();
        const out = run(ds, options);
        if (!out) throw this.lastError(newOptions.replace(/OptionsNew$/, ''));
        this.close(out);
        const type = this.call('CPLGetLastErrorType', 'number', [], []) as number;
        // CE_Failure = 3, CE_Fatal = 4: a partial output is an error.
        if (type >= 3) throw this.lastError(newOptions);
      } finally {
        this.call(freeOptions, null, ['number'], [options]);
      }
    } finally {
      freeList();
      this.close(ds);
    }
  }

  /** Call `f` with a one-element array of dataset handles (what GDALWarp and GDALVectorTranslate take). */
  withDatasetList(ds: number, f: (list: number) => number): number {
    const list = this.M._malloc(4);
    this.M.setValue(list, ds, '*');
    try {
      return f(list);
    } finally {
      this.M._free(list);
    }
  }

  /** A spatial reference from any user input GDAL accepts, in longitude, latitude axis order. */
  srs(userInput: string): number {
    const h = this.call('OSRNewSpatialReference', 'number', ['number'], [0]) as number;
    this.reset();
    const err = this.call('OSRSetFromUserInput', 'number', ['number', 'string'], [h, userInput]) as number;
    if (err !== 0) {
      this.destroySrs(h);
      throw this.lastError(`CRS ${userInput}`);
    }
    // OAMS_TRADITIONAL_GIS_ORDER: longitude, latitude / easting, northing.
    this.call('OSRSetAxisMappingStrategy', null, ['number', 'number'], [h, 0]);
    return h;
  }

  /** Free a spatial reference made by `srs`. */
  destroySrs(h: number): void {
    this.call('OSRDestroySpatialReference', null, ['number'], [h]);
  }
}
