/**
 * Output bands on disk: one raw row-major Float32 file per band (host byte order, temporary, never
 * shipped), `width x height` cells, NaN = nodata. The screener writes whole row windows at their
 * offsets; the tile writer and the GeoTIFF writer read back only the rows (or the row x column box)
 * they need with positioned reads, so no stage holds a band whole and memory does not grow with the
 * region.
 */
import { closeSync, openSync, readSync, writeSync } from 'node:fs';
import { mkdir, open } from 'node:fs/promises';
import { join } from 'node:path';

export interface BandFiles {
  /** One file per band, in band order. */
  paths: string[];
  width: number;
  height: number;
  /** First analysis-grid row the files hold (default 0: the whole grid; a queue job holds a slice). */
  row0?: number;
}

/** Create `count` band files of `width x height` cells (sized; contents written by the screener). */
export async function createBandFiles(
  dir: string,
  count: number,
  width: number,
  height: number,
): Promise<BandFiles> {
  await mkdir(dir, { recursive: true });
  const paths: string[] = [];
  for (let b = 0; b < count; b++) {
    const path = join(dir, `band-${b}.f32`);
    const file = await open(path, 'w');
    await file.truncate(width * height * 4);
    await file.close();
    paths.push(path);
  }
  return { paths, width, height };
}

const bytesOf = (a: Float32Array) => new Uint8Array(a.buffer, a.byteOffset, a.byteLength);

/** Write `values` (whole rows) into a band file at row `row0`. */
export function writeBandRows(fd: number, width: number, row0: number, values: Float32Array): void {
  const bytes = bytesOf(values);
  let done = 0;
  while (done < bytes.length) {
    done += writeSync(fd, bytes, done, bytes.length - done, row0 * width * 4 + done);
  }
}

function readFully(fd: number, into: Uint8Array, position: number): void {
  let done = 0;
  while (done < into.length) {
    const n = readSync(fd, into, done, into.length - done, position + done);
    if (n === 0) throw new Error(`band file ended early at byte ${position + done}`);
    done += n;
  }
}

/** Read rows [row0, row1) of a band file into `into` (length >= (row1 - row0) * width); returns the view. */
export function readBandRows(
  fd: number,
  width: number,
  row0: number,
  row1: number,
  into?: Float32Array,
): Float32Array {
  const n = (row1 - row0) * width;
  const out = into ? into.subarray(0, n) : new Float32Array(n);
  readFully(fd, bytesOf(out), row0 * width * 4);
  return out;
}

/**
 * Read the box rows [row0, row1) x columns [col0, col1) of a band file into `into` (row-major, box
 * width col1 - col0): one positioned read per row.
 */
export function readBandBox(
  fd: number,
  width: number,
  box: { row0: number; row1: number; col0: number; col1: number },
  into: Float32Array,
): void {
  const boxWidth = box.col1 - box.col0;
  for (let r = box.row0; r < box.row1; r++) {
    const at = (r - box.row0) * boxWidth;
    readFully(fd, bytesOf(into.subarray(at, at + boxWidth)), (r * width + box.col0) * 4);
  }
}

/** Open every band file (read, or read/write); close with closeBandFds. */
export function openBandFds(files: BandFiles, mode: 'r' | 'r+'): number[] {
  return files.paths.map((p) => openSync(p, mode));
}

export function closeBandFds(fds: number[]): void {
  for (const fd of fds) closeSync(fd);
}

/** Rows per chunk when a band is scanned whole in order (about 4 MB of cells per chunk). */
export function rowsPerChunk(width: number): number {
  return Math.max(1, Math.floor((1 << 20) / Math.max(1, width)));
}

/** Call `fn` on consecutive row chunks of one band (bounded buffer: see rowsPerChunk). */
export function scanBand(files: BandFiles, band: number, fn: (chunk: Float32Array) => void): void {
  const fd = openSync(files.paths[band], 'r');
  try {
    const step = rowsPerChunk(files.width);
    const buffer = new Float32Array(step * files.width);
    for (let r = 0; r < files.height; r += step) {
      fn(readBandRows(fd, files.width, r, Math.min(files.height, r + step), buffer));
    }
  } finally {
    closeSync(fd);
  }
}
