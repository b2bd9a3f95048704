/**
 * How a build hands its two kinds of pure job to workers other than its own threads: the screening
 * windows (row ranges of the analysis grid) and the tile subtrees (a tile below the top levels of the
 * pyramid and everything under it). The local build runs both on its worker pool; a distributor (e.g.
 * the queue-backed one in data-pipeline/queue/) runs them anywhere and brings back exactly what the
 * pool would have: the windows' rows in the band files, the subtrees' tiles in the tiles directory and
 * their root planes, so the rest of the build (statistics, top levels, GeoTIFFs, manifest, atomic
 * swap) is the same code and the output is byte-identical.
 */
import type { GridRoleId } from '../inputs-config';
import type { PyramidBand } from '../tiles/write-tile-pyramid';
import type { AnalysisGrid } from './analysis-grid';
import type { BandFiles } from './band-files';
import type { ModelSpec } from './model-spec';
import type { WindowInput, WindowStats } from './screen-window';

/** Everything a screening window needs besides its rows (plain data). */
export interface ScreenJobContext {
  spec: ModelSpec;
  grid: AnalysisGrid;
  inputs: WindowInput[];
  /** sha256 of each input file, aligned with `inputs`. */
  inputSha256: string[];
  echoRoles: GridRoleId[];
  /** Output bands: model layers, echo bands, flags band. */
  bandCount: number;
}

export interface WindowRunner {
  /** Create the build's band files (wherever the runner's workers can read them back). */
  prepare(ctx: ScreenJobContext): Promise<BandFiles>;
  /** Screen every window into the prepared band files; `onWindow` once per window. */
  run(windows: [number, number][], onWindow: (stats: WindowStats, rows: number) => void): Promise<void>;
  /** Workers that took part (for the run summary). */
  workers(): number;
}

/** What a subtree renderer needs (plain data): the tile renderer's options. */
export interface SubtreeContext {
  tilesDir: string;
  grid: AnalysisGrid;
  files: BandFiles;
  bands: PyramidBand[];
  maxZoom: number;
  bounds: [number, number, number, number];
}

export interface SubtreeResults {
  /** Root planes of every subtree, by `${x}/${y}` (null when all nodata). */
  planes: Map<string, Float32Array[] | null>;
  /** Tiles written into `tilesDir`, per zoom. */
  written: Record<number, number>;
}

export interface SubtreeRunner {
  /** Fewest subtrees to cut the pyramid into (the cut is the first zoom with at least this many tiles). */
  minJobs: number;
  /** Render the subtrees rooted at (zoom, x, y) into ctx.tilesDir; `onFinest` counts finest tiles. */
  run(
    ctx: SubtreeContext,
    zoom: number,
    roots: [number, number][],
    onFinest: (count: number) => void,
  ): Promise<SubtreeResults>;
}

export interface BuildDistributor {
  windows: WindowRunner;
  subtrees: SubtreeRunner;
  /** Remove the build's intermediate files on shared storage (after the output is complete). */
  cleanup(): Promise<void>;
  /** Queue statistics for the run summary. */
  report(): Record<string, number>;
}
