/** Shared fixtures for the pipeline tests: temporary directories, hashes, a small demo region. */
import { createHash } from 'node:crypto';
import { link, mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { deflateSync } from 'node:zlib';
import { vi } from 'vitest';
import { main } from '../../data-pipeline/cli';
import { generateDemoData } from '../../data-pipeline/demo/generate-demo-data';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';

/** Coarse settings so a whole demo build takes a second or two. */
export const SMALL_DEMO = { resolutionScale: 4, cellSize_m: 4000 } as const;

const tempDirs: string[] = [];

/** A fresh temporary directory, removed by removeTempDirs (call it in afterAll). */
export async function makeTempDir(prefix: string): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), `pile-atlas-${prefix}-`));
  tempDirs.push(dir);
  return dir;
}

export async function removeTempDirs(): Promise<void> {
  await Promise.all(tempDirs.splice(0).map((d) => rm(d, { recursive: true, force: true })));
}

export async function sha256OfFile(path: string): Promise<string> {
  return createHash('sha256')
    .update(await readFile(path))
    .digest('hex');
}

/** sha256 of every file under `dir` (relative path -> hash), for "output untouched" checks. */
export async function hashTree(dir: string): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  const entries = await readdir(dir, { recursive: true, withFileTypes: true });
  for (const e of entries) {
    if (!e.isFile()) continue;
    const full = join(e.parentPath, e.name);
    out[full.slice(dir.length + 1)] = await sha256OfFile(full);
  }
  return out;
}

export async function smallDemo(seed = 7): Promise<string> {
  const dir = await makeTempDir('demo');
  await generateDemoData({ outDir: dir, seed, resolutionScale: SMALL_DEMO.resolutionScale });
  return dir;
}

/** Run the CLI in-process; returns the exit code and what it wrote to stdout and stderr. */
export async function runCli(argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const out = vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => {
    stdout += String(chunk);
    return true;
  });
  const err = vi.spyOn(process.stderr, 'write').mockImplementation((chunk: string | Uint8Array) => {
    stderr += String(chunk);
    return true;
  });
  try {
    const code = await main(argv);
    return { code, stdout, stderr };
  } finally {
    out.mockRestore();
    err.mockRestore();
  }
}

/**
 * A minimal little-endian baseline TIFF (one Float32 strip, no GeoTIFF tags): a valid image with no
 * georeferencing, written by hand so no library adds defaults.
 */
export async function writePlainTiff(path: string, width: number, height: number): Promise<void> {
  const tags: [number, number, number, number][] = [
    [256, 3, 1, width],
    [257, 3, 1, height],
    [258, 3, 1, 32],
    [259, 3, 1, 1],
    [262, 3, 1, 1],
    [273, 4, 1, 0],
    [277, 3, 1, 1],
    [278, 3, 1, height],
    [279, 4, 1, width * height * 4],
    [339, 3, 1, 3],
  ];
  const ifdSize = 2 + tags.length * 12 + 4;
  const dataOffset = 8 + ifdSize;
  const buf = Buffer.alloc(dataOffset + width * height * 4);
  buf.write('II', 0, 'latin1');
  buf.writeUInt16LE(42, 2);
  buf.writeUInt32LE(8, 4);
  buf.writeUInt16LE(tags.length, 8);
  tags.forEach(([tag, type, count, value], i) => {
    const o = 10 + i * 12;
    buf.writeUInt16LE(tag, o);
    buf.writeUInt16LE(type, o + 2);
    buf.writeUInt32LE(count, o + 4);
    const v = tag === 273 ? dataOffset : value;
    if (type === 3) buf.writeUInt16LE(v, o + 8);
    else buf.writeUInt32LE(v, o + 8);
  });
  for (let i = 0; i < width * height; i++) buf.writeFloatLE(-3 + i * 0.01, dataOffset + i * 4);
  await writeFile(path, buf);
}

/**
 * A copy of the directory `src` made of hard links (instant, no bytes copied). Replace a file with
 * `replaceFile`, never write into a linked one: that would change the original too.
 */
export async function linkedCopy(src: string, prefix = 'linked'): Promise<string> {
  const dir = join(await makeTempDir(prefix), 'in');
  await mkdir(dir);
  for (const name of await readdir(src)) await link(join(src, name), join(dir, name));
  return dir;
}

/** Replace `dir/name` (unlinking it first, so a hard-linked original is left alone). */
export async function replaceFile(dir: string, name: string, content: string | Uint8Array): Promise<void> {
  await rm(join(dir, name), { force: true, recursive: true });
  await writeFile(join(dir, name), content);
}

/**
 * A decompression bomb (issue 16): a TIFF declaring `width` x `height` Float32 pixels, deflate
 * compressed, one row per strip, every strip pointing at the same small compressed payload of one
 * row of zeros. The file is a few hundred kB; decoded it would be width x height x 4 bytes.
 */
export function tiffBomb(width: number, height: number): Uint8Array {
  const payload = deflateSync(Buffer.alloc(width * 4));
  const tags: [number, number, number, number | 'offsets' | 'counts'][] = [
    [256, 4, 1, width],
    [257, 4, 1, height],
    [258, 3, 1, 32],
    [259, 3, 1, 8],
    [262, 3, 1, 1],
    [273, 4, height, 'offsets'],
    [277, 3, 1, 1],
    [278, 4, 1, 1],
    [279, 4, height, 'counts'],
    [339, 3, 1, 3],
  ];
  const ifdSize = 2 + tags.length * 12 + 4;
  const offsetsAt = 8 + ifdSize;
  const countsAt = offsetsAt + height * 4;
  const payloadAt = countsAt + height * 4;
  const buf = Buffer.alloc(payloadAt + payload.byteLength);
  buf.write('II', 0, 'latin1');
  buf.writeUInt16LE(42, 2);
  buf.writeUInt32LE(8, 4);
  buf.writeUInt16LE(tags.length, 8);
  tags.forEach(([tag, type, count, value], i) => {
    const o = 10 + i * 12;
    buf.writeUInt16LE(tag, o);
    buf.writeUInt16LE(type, o + 2);
    buf.writeUInt32LE(count, o + 4);
    const v = value === 'offsets' ? offsetsAt : value === 'counts' ? countsAt : value;
    if (type === 3) buf.writeUInt16LE(v, o + 8);
    else buf.writeUInt32LE(v, o + 8);
  });
  for (let r = 0; r < height; r++) {
    buf.writeUInt32LE(payloadAt, offsetsAt + r * 4);
    buf.writeUInt32LE(payload.byteLength, countsAt + r * 4);
  }
  payload.copy(buf, payloadAt);
  return buf;
}

/**
 * Re-encode a grid as a GIS team would, with GDAL's gdalwarp: into `srs` (any CRS GDAL takes) at
 * `pixel` units, nearest neighbour for classes and bilinear otherwise, nodata -9999, written in
 * `format` (GTiff by default) with the creation options given.
 */
export async function gdalReproject(
  src: string,
  dst: string,
  srs: string,
  pixel: number,
  kind: string,
  extra: string[] = ['-of', 'GTiff', '-co', 'COMPRESS=DEFLATE'],
): Promise<void> {
  const gdal = await loadGdal();
  gdal.warp(src, dst, [
    '-t_srs',
    srs,
    '-tr',
    String(pixel),
    String(pixel),
    '-r',
    kind === 'class' ? 'near' : 'bilinear',
    '-dstnodata',
    '-9999',
    '-overwrite',
    ...extra,
  ]);
}
