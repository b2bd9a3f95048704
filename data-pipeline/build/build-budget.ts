/**
 * The work a build may take on, checked before anything is read or written: the declared size of each
 * input raster (decoded bytes, pixels, the size of one strip or tile that the decoder holds at once),
 * the analysis grid's cell count, and the memory and disk the build will need (estimated from the grid
 * and the band count as build-tiles.ts documents its memory use). Over budget is an InputError naming
 * the file or the output and the option that raises the limit, so a decompression bomb or a CRS read
 * wrongly is refused in milliseconds instead of running for hours.
 */
import { statfsSync } from 'node:fs';
import { totalmem } from 'node:os';
import { dirname, resolve } from 'node:path';
import { existsSync } from 'node:fs';
import { InputError } from '../input-error';

const MB = 1024 * 1024;

export interface BuildBudget {
  /** Decoded bytes of one input raster (all its pixels), bytes. Option --max-input-mb. */
  maxInputBytes: number;
  /** Cells of the analysis grid. Option --max-cells. */
  maxCells: number;
  /** Estimated peak memory of the build, bytes. Option --max-memory-mb. */
  maxMemoryBytes: number;
  /** Disk the build may fill, bytes; default: the free space where the output goes. Option --max-disk-mb. */
  maxDiskBytes?: number;
  /** Southernmost latitude the analysis grid may reach, degrees north. Option --min-latitude. */
  minLatitude_deg: number;
}

/**
 * Defaults (common practice, sized for a workstation): 4 GB decoded per input (a 32,000 x 32,000
 * Float32 grid), 200 M analysis cells (the Arctic north of 55 N at 1 km is about 120 M), memory 3/4
 * of this machine's RAM.
 */
export function defaultBudget(): BuildBudget {
  return {
    maxInputBytes: 4096 * MB,
    maxCells: 200_000_000,
    maxMemoryBytes: Math.floor(totalmem() * 0.75),
    minLatitude_deg: DEFAULT_MIN_LATITUDE_DEG,
  };
}

/**
 * 30°N: south of the lowest mountain permafrost of the northern hemisphere (about 28°N on the Tibetan
 * Plateau excepted; recalled from memory), and where the polar stereographic analysis grid's scale
 * error reaches about 30 % (k = (1 + sin 70°) / (1 + sin φ) = 1.29 at 30°N).
 */
export const DEFAULT_MIN_LATITUDE_DEG = 30;

/** The budget as the inputs config may state it (`budget`), in the config's units. */
export interface ConfigBudget {
  maxInputMb?: number;
  maxCells?: number;
  maxMemoryMb?: number;
  maxDiskMb?: number;
  minLatitude_deg?: number;
}

/** The config's budget in BuildBudget terms (only the fields it states). */
export function budgetFromConfig(b: ConfigBudget | undefined): Partial<BuildBudget> {
  if (!b) return {};
  return {
    ...(b.maxInputMb !== undefined ? { maxInputBytes: Math.round(b.maxInputMb * MB) } : {}),
    ...(b.maxCells !== undefined ? { maxCells: b.maxCells } : {}),
    ...(b.maxMemoryMb !== undefined ? { maxMemoryBytes: Math.round(b.maxMemoryMb * MB) } : {}),
    ...(b.maxDiskMb !== undefined ? { maxDiskBytes: Math.round(b.maxDiskMb * MB) } : {}),
    ...(b.minLatitude_deg !== undefined ? { minLatitude_deg: b.minLatitude_deg } : {}),
  };
}

/**
 * Refuse an analysis grid that reaches south of the budget's latitude limit, or whose outline does not
 * map onto the Earth (a CRS or extent read wrongly), before anything is allocated.
 */
export function checkLatitudeRange(
  o: { width: number; height: number; cellSize_m: number; latitudes: number[] },
  budget: BuildBudget,
): void {
  const bad = o.latitudes.filter((v) => !Number.isFinite(v)).length;
  const south = Math.min(...o.latitudes.filter(Number.isFinite));
  if (bad > 0 || !(south >= budget.minLatitude_deg)) {
    throw new InputError(
      `analysis grid: ${o.width} x ${o.height} cells of ${o.cellSize_m} m ` +
        (bad > 0
          ? `has ${bad} outline points off the Earth`
          : `reaches ${south.toFixed(1)}°N, south of the limit ${budget.minLatitude_deg}°N`) +
        ' (a CRS or extent read wrongly?); set --min-latitude or budget.minLatitude_deg in the inputs config if intended',
    );
  }
}

/** Largest single strip or tile the decoder may hold at once, bytes (common practice). */
export const MAX_BLOCK_BYTES = 512 * MB;

const fmtBytes = (b: number): string =>
  b >= 1e9
    ? `${(b / 1e9).toFixed(1)} GB`
    : b >= 1e6
      ? `${(b / 1e6).toFixed(1)} MB`
      : `${Math.round(b / 1e3)} kB`;

export interface RasterDeclaration {
  width: number;
  height: number;
  bitsPerSample: number;
  samplesPerPixel: number;
  /** Strips or tiles. */
  blocks: number;
  blockWidth: number;
  blockHeight: number;
  /** Distinct data offsets among the blocks (fewer than the blocks: blocks share one payload). */
  distinctOffsets: number;
  fileBytes: number;
}

/** Refuse a raster whose declared size is over budget, before any pixel is decoded. */
export function checkRasterBudget(label: string, d: RasterDeclaration, budget: BuildBudget): void {
  const dims = [d.width, d.height, d.bitsPerSample, d.samplesPerPixel, d.blockWidth, d.blockHeight];
  if (!dims.every((v) => Number.isInteger(v) && v > 0)) {
    throw new InputError(
      `${label}: unreadable TIFF (declared size ${d.width} x ${d.height} is not positive)`,
    );
  }
  const bytesPerPixel = (d.bitsPerSample / 8) * d.samplesPerPixel;
  const decoded = d.width * d.height * bytesPerPixel;
  const block = d.blockWidth * d.blockHeight * bytesPerPixel;
  const shared =
    d.distinctOffsets < d.blocks ? `; ${d.blocks} blocks share ${d.distinctOffsets} data offsets` : '';
  const what =
    `declares ${d.width} x ${d.height} pixels of ${d.bitsPerSample} bits x ${d.samplesPerPixel} ` +
    `(${fmtBytes(decoded)} decoded from a ${fmtBytes(d.fileBytes)} file, ${d.blocks} strips or tiles${shared})`;
  if (decoded > budget.maxInputBytes) {
    throw new InputError(
      `${label}: ${what}, over the budget of ${fmtBytes(budget.maxInputBytes)} decoded per input ` +
        '(a decompression bomb?); raise --max-input-mb if the file is genuine',
    );
  }
  if (block > MAX_BLOCK_BYTES) {
    throw new InputError(
      `${label}: one strip or tile decodes to ${fmtBytes(block)}, over ${fmtBytes(MAX_BLOCK_BYTES)}; ` +
        'rewrite the file with smaller strips or tiles',
    );
  }
}

export interface BuildEstimate {
  memoryBytes: number;
  diskBytes: number;
}

/**
 * Peak memory and disk of a build (build-tiles.ts header): per screening thread B x 32 x W x 4 B of
 * output rows, 32 x W x 16 B of cell centres per input, 10 x 32 x W x 4 B of resampled inputs and a
 * 32-row input box per input; the tile writer about 2 tiles of B x 128 kB per zoom level per thread;
 * an allowance of 128 MB per thread for the runtime (common practice, not measured). Disk: the band files (B x cells x 4 B), the GeoTIFFs (the
 * same again), the tiles: B x 256 x 256 x 2 B each, at the highest zoom enough to cover the grid at
 * up to 1.5 tile pixels per cell along each side (the zoom is chosen so a pixel is 1/2 to 1 cell, and
 * the grid's box in Web Mercator is larger than in EPSG:3413) plus a ring of edge tiles, and the same
 * for each of the four overview levels above it at half the size each.
 */
export function estimateBuild(o: {
  width: number;
  height: number;
  bands: number;
  inputs: number;
  threads: number;
  inputWidthMax: number;
  geotiff: boolean;
  /** Inputs warped onto the analysis grid as raw Float32 files (GDAL reader): 4 B x cells each. */
  alignedInputs?: number;
}): BuildEstimate {
  const cells = o.width * o.height;
  const perThread =
    o.bands * 32 * o.width * 4 +
    o.inputs * 32 * o.width * 16 +
    10 * 32 * o.width * 4 +
    o.inputs * 40 * o.inputWidthMax * 4 +
    2 * 17 * o.bands * 131_072 +
    128 * MB;
  const memoryBytes = o.threads * perThread + 2 * 64 * o.width * 4 + 4 * MB;
  const bandFiles = o.bands * cells * 4;
  let tileCount = 0;
  for (let level = 0; level <= 4; level++) {
    const across = (n: number) => Math.ceil((3 * n) / 256 / 2 ** level) + 2;
    tileCount += across(o.width) * across(o.height);
  }
  const tiles = tileCount * o.bands * 256 * 256 * 2 + 16 * MB;
  const aligned = (o.alignedInputs ?? 0) * cells * 4;
  const diskBytes = bandFiles + (o.geotiff ? bandFiles : 0) + tiles + aligned;
  return { memoryBytes, diskBytes };
}

/** Free bytes on the file system that holds `path` (or its nearest existing ancestor). */
export function freeBytesAt(path: string): number {
  let p = resolve(path);
  while (!existsSync(p) && dirname(p) !== p) p = dirname(p);
  const s = statfsSync(p);
  return s.bavail * s.bsize;
}

/** Refuse a build whose analysis grid, memory or disk estimate is over budget. */
export function checkBuildBudget(
  o: { outDir: string; width: number; height: number; cellSize_m: number } & BuildEstimate,
  budget: BuildBudget,
): void {
  const cells = o.width * o.height;
  if (cells > budget.maxCells) {
    throw new InputError(
      `analysis grid: ${o.width} x ${o.height} cells of ${o.cellSize_m} m (${cells} cells) over the budget of ` +
        `${budget.maxCells} cells (a CRS or extent read wrongly?); raise --max-cells or --cell-size`,
    );
  }
  if (o.memoryBytes > budget.maxMemoryBytes) {
    throw new InputError(
      `analysis grid: ${o.width} x ${o.height} cells need about ${fmtBytes(o.memoryBytes)} of memory, over the ` +
        `budget of ${fmtBytes(budget.maxMemoryBytes)}; use fewer --workers, a larger --cell-size or raise --max-memory-mb`,
    );
  }
  const free = budget.maxDiskBytes ?? freeBytesAt(o.outDir);
  if (o.diskBytes > free) {
    throw new InputError(
      `--out ${o.outDir}: the build needs about ${fmtBytes(o.diskBytes)} of disk, ` +
        (budget.maxDiskBytes === undefined
          ? `only ${fmtBytes(free)} free there`
          : `over the budget of ${fmtBytes(free)} (--max-disk-mb)`) +
        '; free space, choose another --out, a larger --cell-size, --no-geotiff, or set --max-disk-mb',
    );
  }
}
