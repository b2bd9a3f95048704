/**
 * Warps every input onto the analysis grid with GDAL (gdalwarp in WebAssembly, full PROJ database):
 * nearest neighbour for class grids, bilinear for continuous ones (GDAL's bilinear over the valid
 * source pixels, weights renormalised, so nodata never bleeds in as a number; evaluated at the cell
 * centre, XSCALE = YSCALE = 1, as the earlier resampler did), nodata -> NaN. Each result is a raw
 * little-endian Float32 file of the analysis grid's size, row 0 north, holding the file's stored
 * values (scale, offset and unit are applied when a window is read: screen-window.ts; bilinear
 * interpolation commutes with the affine scale/offset). The screening threads then read rows of these
 * files at their offsets; nothing is reprojected by hand.
 */
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { loadGdal } from '../gdal/gdal-wasm';
import { InputError } from '../input-error';
import type { AnalysisGrid, BatchTransform } from './analysis-grid';
import type { LoadedInput } from './load-inputs';

/** The analysis CRS as GDAL takes it. */
export function analysisSrs(grid: AnalysisGrid): string {
  return grid.crs;
}

/** A batch transform from an input's CRS (its WKT) into the analysis CRS, through GDAL. */
export async function gdalTransformTo(targetSrs: string): Promise<(fromWkt: string) => BatchTransform> {
  const gdal = await loadGdal();
  return (fromWkt: string): BatchTransform =>
    (xy) =>
      gdal.transform(fromWkt, targetSrs, xy);
}

/** Warp each GDAL-read input into `dir` on the analysis grid; sets `source.aligned` to the file. */
export async function alignInputs(
  inputs: LoadedInput[],
  grid: AnalysisGrid,
  dir: string,
  onInput?: (done: number, total: number) => void,
): Promise<void> {
  const gdal = await loadGdal();
  await mkdir(dir, { recursive: true });
  const [west, , , north] = grid.geoTransform;
  const east = west + grid.width * grid.cellSize_m;
  const south = north - grid.height * grid.cellSize_m;
  for (const [i, input] of inputs.entries()) {
    if (!input.source.gdal) continue;
    warpOne(input, join(dir, `${i}-${input.entry.role}.f32`));
    // A companion standard-deviation grid (sd-grids.ts) is warped exactly like its input.
    if (input.sd?.source.gdal)
      warpOne(input.sd, join(dir, `${i}-${input.entry.role}-sd.f32`), input.role.kind);
    onInput?.(i + 1, inputs.length);
  }

  function warpOne(input: LoadedInput, dst: string, kind = input.role.kind): void {
    const { source } = input;
    if (!source.gdal) return;
    const args = [
      '-of',
      'ENVI',
      '-ot',
      'Float32',
      '-s_srs',
      source.gdal.srsWkt,
      '-t_srs',
      analysisSrs(grid),
      '-te',
      String(west),
      String(south),
      String(east),
      String(north),
      '-ts',
      String(grid.width),
      String(grid.height),
      '-r',
      kind === 'class' ? 'near' : 'bilinear',
      '-srcnodata',
      source.nodata == null ? 'None' : String(source.nodata),
      '-dstnodata',
      'nan',
      // Point bilinear at the cell centre, as the hand resampler did: without these GDAL widens the
      // kernel when a cell is coarser than the pixels, by a factor it computes per processing chunk,
      // so a build would depend on GDAL's chunking (not byte-identical across partitions).
      '-wo',
      'XSCALE=1',
      '-wo',
      'YSCALE=1',
      '-wm',
      '256',
      '-overwrite',
    ];
    try {
      gdal.warp(source.path, dst, args);
    } catch (err) {
      throw new InputError(`${source.label}: cannot warp onto the analysis grid (${(err as Error).message})`);
    }
    source.aligned = dst;
  }
}
