/**
 * The public GDAL calls (the `Gdal` interface of gdal-wasm.ts), grouped by what they work on: raster
 * utilities, the virtual mosaic, vector utilities and coordinate reference systems. Each is a thin
 * sequence of C calls on a GdalCore, which owns the error state and the memory bookkeeping.
 */
import { gdalPath, type GdalCore } from './gdal-core';
import type { Gdal, GdalRasterInfo } from './gdal-wasm';

/** `gdalinfo -json`, `gdal_translate`, `gdalwarp` and `gdal_rasterize`. */
export function rasterCalls(core: GdalCore): Pick<Gdal, 'info' | 'translate' | 'warp' | 'rasterize'> {
  const call = core.call.bind(core);
  return {
    info(path) {
      const ds = core.open(path);
      const [list, freeList] = core.stringList(['-json']);
      try {
        const options = call('GDALInfoOptionsNew', 'number', ['number', 'number'], [list, 0]) as number;
        const json = call('GDALInfo', 'string', ['number', 'number'], [ds, options]) as string;
        call('GDALInfoOptionsFree', null, ['number'], [options]);
        if (!json) throw core.lastError('gdalinfo');
        return JSON.parse(json) as GdalRasterInfo;
      } finally {
        freeList();
        core.close(ds);
      }
    },
    translate(src, dst, args) {
      core.utility(src, false, args, 'GDALTranslateOptionsNew', 'GDALTranslateOptionsFree', (ds, o) =>
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
      core.utility(src, false, args, 'GDALWarpAppOptionsNew', 'GDALWarpAppOptionsFree', (ds, o) =>
        core.withDatasetList(ds, (l) =>
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
      core.utility(src, true, args, 'GDALRasterizeOptionsNew', 'GDALRasterizeOptionsFree', (ds, o) =>
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
  };
}

/** `gdalbuildvrt`: a virtual mosaic of several sources (opened by GDAL itself, not by us). */
export function buildVrtCall(core: GdalCore): Pick<Gdal, 'buildVrt'> {
  return {
    buildVrt(srcs, dst, args) {
      const [list, freeList] = core.stringList(args);
      const [names, freeNames] = core.stringList(srcs.map(gdalPath));
      try {
        const options = core.call(
          'GDALBuildVRTOptionsNew',
          'number',
          ['number', 'number'],
          [list, 0],
        ) as number;
        if (!options) throw core.lastError(`options ${args.join(' ')}`);
        try {
          core.reset();
          const out = core.call(
            'GDALBuildVRT',
            'number',
            ['string', 'number', 'number', 'number', 'number', 'number'],
            [gdalPath(dst), srcs.length, 0, names, options, 0],
          ) as number;
          if (!out) throw core.lastError('gdalbuildvrt');
          core.close(out);
        } finally {
          core.call('GDALBuildVRTOptionsFree', null, ['number'], [options]);
        }
      } finally {
        freeList();
        freeNames();
      }
    },
  };
}

/** `ogr2ogr` and `ogrinfo -json`. */
export function vectorCalls(core: GdalCore): Pick<Gdal, 'vectorTranslate' | 'vectorInfo'> {
  const call = core.call.bind(core);
  return {
    vectorTranslate(src, dst, args, openOptions = []) {
      core.utility(
        src,
        true,
        args,
        'GDALVectorTranslateOptionsNew',
        'GDALVectorTranslateOptionsFree',
        (ds, o) =>
          core.withDatasetList(ds, (l) =>
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
      const ds = core.open(src, true);
      const [list, freeList] = core.stringList(['-json', ...args]);
      try {
        const options = call('GDALVectorInfoOptionsNew', 'number', ['number', 'number'], [list, 0]) as number;
        const json = call('GDALVectorInfo', 'string', ['number', 'number'], [ds, options]) as string;
        call('GDALVectorInfoOptionsFree', null, ['number'], [options]);
        if (!json) throw core.lastError('ogrinfo');
        return JSON.parse(json) as unknown;
      } finally {
        freeList();
        core.close(ds);
      }
    },
  };
}

/** A CRS's WKT, and coordinate transforms between two CRSs. */
export function crsCalls(core: GdalCore): Pick<Gdal, 'srsWkt' | 'transform'> {
  const M = core.M;
  return {
    srsWkt(userInput) {
      const h = core.srs(userInput);
      const out = M._malloc(4);
      try {
        core.call('OSRExportToWkt', 'number', ['number', 'number'], [h, out]);
        const p = M.getValue(out, '*');
        const wkt = p ? M.UTF8ToString(p) : '';
        // CPLMalloc is malloc in this build, so the module's free releases the string.
        if (p) M._free(p);
        return wkt;
      } finally {
        M._free(out);
        core.destroySrs(h);
      }
    },
    transform(fromSrs, toSrs, xy) {
      const n = xy.length / 2;
      const out = new Float64Array(xy.length);
      if (n === 0) return out;
      const a = core.srs(fromSrs);
      const b = core.srs(toSrs);
      const ct = core.call(
        'OCTNewCoordinateTransformation',
        'number',
        ['number', 'number'],
        [a, b],
      ) as number;
      if (!ct) {
        core.destroySrs(a);
        core.destroySrs(b);
        throw core.lastError(`transform ${fromSrs} -> ${toSrs}`);
      }
      try {
        transformInChunks(core, ct, xy, out);
      } finally {
        core.call('OCTDestroyCoordinateTransformation', null, ['number'], [ct]);
        core.destroySrs(a);
        core.destroySrs(b);
      }
      return out;
    },
  };
}

/** Transform interleaved x, y pairs chunk by chunk through the module's heap; NaN where it fails. */
function transformInChunks(core: GdalCore, ct: number, xy: Float64Array, out: Float64Array): void {
  const M = core.M;
  const n = xy.length / 2;
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
      core.call(
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
  }
}
