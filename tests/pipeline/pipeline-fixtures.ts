/** Shared fixtures for the pipeline tests: temporary directories, hashes, a small demo region. */
import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { vi } from 'vitest';
import { main } from '../../data-pipeline/cli';
import { generateDemoData } from '../../data-pipeline/demo/generate-demo-data';

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
