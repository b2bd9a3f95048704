/**
 * Writes the Web Mercator tile pyramid `{z}/{x}/{y}.bin` (encoding: layers/screening/tile-format.ts) from
 * the analysis-grid band files (build/band-files.ts). The finest zoom samples the analysis grid at each
 * tile pixel centre (nearest cell, so tile values are the computed cell values): only the box of grid rows
 * x columns under the tile is read from each band file (one buffer, reused band by band): at most about
 * (256·√2·p/c + 2)² cells for Web Mercator pixel size p and cell size c, i.e. about 0.13 M cells (0.5 MB)
 * per band where p = c (p <= c at the region's central latitude). Each coarser level is built from its
 * four children: continuous bands by the mean of the valid child pixels, class bands by their mode (ties
 * to the smaller code). Tiles are produced depth-first, so memory holds at most four tiles per level.
 * All-nodata tiles are not written (an absent tile means nodata). Memory therefore does not grow with the
 * region's size.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { encodeValue, packTile, TILE_SIZE, type BandQuantisation } from '../../layers/screening/tile-format';
import type { AnalysisGrid } from '../build/analysis-grid';
import { closeBandFds, openBandFds, readBandBox, type BandFiles } from '../build/band-files';
import { createTransform } from '../crs/crs-definitions';
import { runWorkerPool } from '../worker-pool';
import type { SubtreeResults, SubtreeRunner } from '../build/build-distributor';

export interface PyramidBand {
  kind: 'continuous' | 'class';
  quant: BandQuantisation;
}

export interface TilePyramidOptions {
  /** Directory that receives `{z}/{x}/{y}.bin`. */
  tilesDir: string;
  grid: AnalysisGrid;
  /** Band files of the analysis grid (one per entry of `bands`, same order). */
  files: BandFiles;
  bands: PyramidBand[];
  minZoom: number;
  maxZoom: number;
  /** [west, south, east, north] degrees of the data. */
  bounds: [number, number, number, number];
  onTile?: (done: number, total: number) => void;
  /** Worker threads for the subtrees below the top levels (default 1: main thread only). */
  workers?: number;
  /** Renders the subtrees elsewhere (e.g. as queue jobs) instead of worker threads. */
  subtreeRunner?: SubtreeRunner;
}

const EARTH_CIRCUMFERENCE_M = 2 * Math.PI * 6378137;

/**
 * Zoom range whose finest tile pixel is no larger than the cell at the region's latitude (Web Mercator
 * pixel ground size = C·cos(lat)/(256·2^z)), and whose coarsest level shows the region in a few tiles.
 */
export function zoomRangeFor(cellSize_m: number, latitude_deg: number): { minZoom: number; maxZoom: number } {
  const groundAtZ0 = (EARTH_CIRCUMFERENCE_M * Math.cos((latitude_deg * Math.PI) / 180)) / TILE_SIZE;
  const maxZoom = Math.max(0, Math.min(16, Math.ceil(Math.log2(groundAtZ0 / cellSize_m))));
  return { minZoom: Math.max(0, maxZoom - 4), maxZoom };
}

const lonOfTileX = (x: number, z: number): number => (x / 2 ** z) * 360 - 180;
const latOfTileY = (y: number, z: number): number =>
  (Math.atan(Math.sinh(Math.PI * (1 - (2 * y) / 2 ** z))) * 180) / Math.PI;
const tileXOfLon = (lon: number, z: number): number => Math.floor(((lon + 180) / 360) * 2 ** z);
const tileYOfLat = (lat: number, z: number): number => {
  const r = (lat * Math.PI) / 180;
  return Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * 2 ** z);
};

/** Tile index range [x0, x1] x [y0, y1] covering the bounds at zoom z. */
export function tileRange(bounds: [number, number, number, number], z: number) {
  const max = 2 ** z - 1;
  const clampT = (v: number) => Math.max(0, Math.min(max, v));
  return {
    x0: clampT(tileXOfLon(bounds[0], z)),
    x1: clampT(tileXOfLon(bounds[2], z)),
    y0: clampT(tileYOfLat(bounds[3], z)),
    y1: clampT(tileYOfLat(bounds[1], z)),
  };
}

/** Mode of up to four values (NaN ignored; ties to the smaller value). */
function mode4(a: number, b: number, c: number, d: number): number {
  let best = NaN;
  let bestCount = 0;
  const vals = [a, b, c, d];
  for (let i = 0; i < 4; i++) {
    const v = vals[i];
    if (v !== v) continue;
    let count = 0;
    for (let j = 0; j < 4; j++) if (vals[j] === v) count++;
    if (count > bestCount || (count === bestCount && v < best)) {
      best = v;
      bestCount = count;
    }
  }
  return best;
}

function aggregateInto(parent: Float32Array, child: Float32Array, dx: number, dy: number, kind: string) {
  const half = TILE_SIZE / 2;
  const isClass = kind === 'class';
  for (let py = 0; py < half; py++) {
    const rowBase = (dy * half + py) * TILE_SIZE + dx * half;
    for (let px = 0; px < half; px++) {
      const c0 = 2 * py * TILE_SIZE + 2 * px;
      const a = child[c0];
      const b = child[c0 + 1];
      const c = child[c0 + TILE_SIZE];
      const d = child[c0 + TILE_SIZE + 1];
      let result: number;
      if (isClass) {
        result = mode4(a, b, c, d);
      } else {
        let sum = 0;
        let n = 0;
        if (a === a) {
          sum += a;
          n++;
        }
        if (b === b) {
          sum += b;
          n++;
        }
        if (c === c) {
          sum += c;
          n++;
        }
        if (d === d) {
          sum += d;
          n++;
        }
        result = n > 0 ? sum / n : NaN;
      }
      parent[rowBase + px] = result;
    }
  }
}

const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** packTile's byte layout (tile-format.ts), written through a Uint16Array view on little-endian hosts. */
export function encodeTile(planes: Float32Array[], quant: BandQuantisation[]): Uint8Array {
  if (!LITTLE_ENDIAN_HOST) return packTile(planes, quant);
  const n = TILE_SIZE * TILE_SIZE;
  const codes = new Uint16Array(planes.length * n);
  for (let b = 0; b < planes.length; b++) {
    const plane = planes[b];
    const q = quant[b];
    const base = b * n;
    for (let i = 0; i < n; i++) codes[base + i] = encodeValue(plane[i], q);
  }
  return new Uint8Array(codes.buffer);
}

export interface TileRenderer {
  /**
   * Render tile (z, x, y) and its subtree down to maxZoom, writing every non-empty tile; returns its
   * planes (null when all nodata). With `stopAt`, tiles at that zoom are not rendered but taken from
   * the map (already written elsewhere, e.g. by a worker thread).
   */
  render(
    z: number,
    x: number,
    y: number,
    stopAt?: { zoom: number; planes: Map<string, Float32Array[] | null> },
  ): Promise<Float32Array[] | null>;
  /** Tiles written so far, per zoom. */
  written: Record<number, number>;
}

export type TileRendererOptions = Omit<TilePyramidOptions, 'minZoom' | 'onTile'> & { onFinest?: () => void };

/** Inclusive rows and columns of the grid cells under a tile. */
interface CellBox {
  row0: number;
  row1: number;
  col0: number;
  col1: number;
}

/**
 * The grid cell (row·width + column) under every pixel centre of tile (z, x, y) into `index` (−1
 * outside the grid); returns the box of the cells touched, or null when the tile misses the grid.
 */
function indexTilePixels(
  z: number,
  x: number,
  y: number,
  grid: AnalysisGrid,
  toGrid: ReturnType<typeof createTransform>,
  index: Int32Array,
): CellBox | null {
  const gt = grid.geoTransform;
  let anyCell = false;
  let row0 = grid.height;
  let row1 = -1;
  let col0 = grid.width;
  let col1 = -1;
  for (let py = 0; py < TILE_SIZE; py++) {
    const lat = latOfTileY(y + (py + 0.5) / TILE_SIZE, z);
    // Exact transforms every 8 pixels along the row, linear in between (error of metres at most).
    let prevPx = -1;
    let prevX = 0;
    let prevY = 0;
    for (
      let px = 0;
      px < TILE_SIZE;
      px = px === TILE_SIZE - 1 ? TILE_SIZE : Math.min(px + 8, TILE_SIZE - 1)
    ) {
      const [gx, gy] = toGrid(lonOfTileX(x + (px + 0.5) / TILE_SIZE, z), lat);
      for (let k = prevPx + 1; k <= px; k++) {
        const t = prevPx < 0 ? 1 : (k - prevPx) / (px - prevPx);
        const cx = prevX + t * (gx - prevX);
        const cy = prevY + t * (gy - prevY);
        const col = Math.floor((cx - gt[0]) / gt[1]);
        const row = Math.floor((cy - gt[3]) / gt[5]);
        const inside = col >= 0 && row >= 0 && col < grid.width && row < grid.height;
        if (inside) {
          anyCell = true;
          if (row < row0) row0 = row;
          if (row > row1) row1 = row;
          if (col < col0) col0 = col;
          if (col > col1) col1 = col;
          index[py * TILE_SIZE + k] = row * grid.width + col;
        } else index[py * TILE_SIZE + k] = -1;
      }
      prevPx = px;
      prevX = gx;
      prevY = gy;
    }
  }
  return anyCell ? { row0, row1, col0, col1 } : null;
}

/** Re-indexes `index` from grid cells into the box `cells` (row-major); returns the box size in cells. */
function indexIntoBox(index: Int32Array, cells: CellBox, gridWidth: number): number {
  const { row0, row1, col0, col1 } = cells;
  const boxWidth = col1 - col0 + 1;
  const boxCells = (row1 - row0 + 1) * boxWidth;
  for (let i = 0; i < index.length; i++) {
    const cell = index[i];
    if (cell >= 0) {
      const row = Math.floor(cell / gridWidth);
      index[i] = (row - row0) * boxWidth + (cell - row * gridWidth - col0);
    }
  }
  return boxCells;
}

/** Each band's tile plane: its box read into `box`, then picked pixel by pixel (null: all nodata). */
function readTilePlanes(
  files: BandFiles,
  bandCount: number,
  gridWidth: number,
  cells: CellBox,
  index: Int32Array,
  box: Float32Array,
): Float32Array[] | null {
  const n = index.length;
  const { row0, row1, col0, col1 } = cells;
  let any = false;
  const fds = openBandFds(files, 'r');
  try {
    const planes = Array.from({ length: bandCount }, (_, b) => {
      readBandBox(fds[b], gridWidth, { row0, row1: row1 + 1, col0, col1: col1 + 1 }, box);
      const plane = new Float32Array(n);
      for (let i = 0; i < n; i++) {
        const cell = index[i];
        const v = cell >= 0 ? box[cell] : NaN;
        plane[i] = v;
        if (v === v) any = true;
      }
      return plane;
    });
    return any ? planes : null;
  } finally {
    closeBandFds(fds);
  }
}

/** The depth-first tile renderer used by writeTilePyramid and its worker threads. */
export function createTileRenderer(options: TileRendererOptions): TileRenderer {
  const { tilesDir, grid, files, bands, maxZoom, bounds, onFinest } = options;
  const toGrid = createTransform('EPSG:4326', grid.crs);
  const quant = bands.map((b) => b.quant);
  const written: Record<number, number> = {};
  const n = TILE_SIZE * TILE_SIZE;

  const index = new Int32Array(n);
  let box = new Float32Array(0);
  const sampleFinest = (x: number, y: number): Float32Array[] | null => {
    const cells = indexTilePixels(maxZoom, x, y, grid, toGrid, index);
    if (!cells) return null;
    // Re-index into the box of rows [row0, row1] x columns [col0, col1] read from each band file.
    const boxCells = indexIntoBox(index, cells, grid.width);
    if (box.length < boxCells) box = new Float32Array(boxCells);
    return readTilePlanes(files, bands.length, grid.width, cells, index, box);
  };

  const emit = async (z: number, x: number, y: number, planes: Float32Array[]) => {
    const dir = join(tilesDir, String(z), String(x));
    await mkdir(dir, { recursive: true });
    await writeFile(join(dir, `${y}.bin`), encodeTile(planes, quant));
    written[z] = (written[z] ?? 0) + 1;
  };

  const render: TileRenderer['render'] = async (z, x, y, stopAt) => {
    const range = tileRange(bounds, z);
    if (x < range.x0 || x > range.x1 || y < range.y0 || y > range.y1) return null;
    if (stopAt && z === stopAt.zoom) return stopAt.planes.get(`${x}/${y}`) ?? null;
    let planes: Float32Array[] | null;
    if (z === maxZoom) {
      planes = sampleFinest(x, y);
      onFinest?.();
    } else {
      planes = null;
      for (let k = 0; k < 4; k++) {
        const dx = k & 1;
        const dy = k >> 1;
        const child = await render(z + 1, 2 * x + dx, 2 * y + dy, stopAt);
        if (!child) continue;
        planes ??= bands.map(() => new Float32Array(n).fill(NaN));
        for (let b = 0; b < bands.length; b++) aggregateInto(planes[b], child[b], dx, dy, bands[b].kind);
      }
    }
    if (planes) await emit(z, x, y, planes);
    return planes;
  };

  return { render, written };
}

/** Write the pyramid; returns the number of tiles written per zoom. */
export async function writeTilePyramid(options: TilePyramidOptions): Promise<Record<number, number>> {
  const { minZoom, maxZoom, bounds, onTile } = options;
  const finest = tileRange(bounds, maxZoom);
  const total = (finest.x1 - finest.x0 + 1) * (finest.y1 - finest.y0 + 1);
  let done = 0;
  const onFinest = () => onTile?.(++done, total);
  const renderer = createTileRenderer({ ...options, onFinest });
  const workers = Math.max(1, options.workers ?? 1);
  let stopAt: { zoom: number; planes: Map<string, Float32Array[] | null> } | undefined;
  let fromWorkers: Record<number, number> = {};
  const runner = options.subtreeRunner;
  if ((workers > 1 || runner) && maxZoom > minZoom) {
    // Subtrees below a cut level go to worker threads; the cut is the first level with enough tiles.
    let cut = minZoom + 1;
    const count = (z: number) => {
      const r = tileRange(bounds, z);
      return (r.x1 - r.x0 + 1) * (r.y1 - r.y0 + 1);
    };
    while (cut < maxZoom && count(cut) < (runner ? runner.minJobs : 4 * workers)) cut++;
    const r = tileRange(bounds, cut);
    const jobs: [number, number][] = [];
    for (let x = r.x0; x <= r.x1; x++) for (let y = r.y0; y <= r.y1; y++) jobs.push([x, y]);
    const onFinestDone = (finestDone: number) => {
      done += finestDone;
      onTile?.(done, total);
    };
    const { tilesDir, grid, files, bands } = options;
    const result = runner
      ? await runner.run({ tilesDir, grid, files, bands, maxZoom, bounds }, cut, jobs, onFinestDone)
      : await renderSubtreesInWorkers(options, cut, jobs, workers, onFinestDone);
    stopAt = { zoom: cut, planes: result.planes };
    fromWorkers = result.written;
  }
  const top = tileRange(bounds, minZoom);
  for (let x = top.x0; x <= top.x1; x++) {
    for (let y = top.y0; y <= top.y1; y++) await renderer.render(minZoom, x, y, stopAt);
  }
  const written = { ...renderer.written };
  for (const [z, c] of Object.entries(fromWorkers)) written[Number(z)] = (written[Number(z)] ?? 0) + c;
  return written;
}

interface SubtreeResult {
  key: string;
  planes: Float32Array[] | null;
  written: Record<number, number>;
  finest: number;
  error?: string;
}

async function renderSubtreesInWorkers(
  options: TilePyramidOptions,
  zoom: number,
  jobs: [number, number][],
  workers: number,
  onProgress: (finestDone: number) => void,
): Promise<SubtreeResults> {
  const data = {
    tilesDir: options.tilesDir,
    grid: options.grid,
    files: options.files,
    bands: options.bands,
    maxZoom: options.maxZoom,
    bounds: options.bounds,
  };
  const planes = new Map<string, Float32Array[] | null>();
  const written: Record<number, number> = {};
  await runWorkerPool<[number, number], SubtreeResult>({
    script: new URL('./tile-worker.mjs', import.meta.url),
    workerData: data,
    size: workers,
    jobs,
    message: ([x, y]) => ({ z: zoom, x, y }),
    onAnswer: (msg) => {
      planes.set(msg.key, msg.planes);
      for (const [z, c] of Object.entries(msg.written)) written[Number(z)] = (written[Number(z)] ?? 0) + c;
      onProgress(msg.finest);
    },
    label: 'tile worker',
  });
  return { planes, written };
}
