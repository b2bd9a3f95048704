/**
 * The jobs of a queue-backed build, as they travel through BullMQ: plain JSON naming a context object
 * in shared storage (shared-storage.ts) by its checksum, plus the job's own part of the work. A
 * screening job is a range of analysis rows (whole 32-row windows) with the checksums of the inputs and
 * of the model spec (the scenario; whatever else the spec grows, e.g. ensemble members, travels with
 * it); a tile job is one subtree root (z, x, y). A job's id is the checksum of everything that decides
 * its output, so the same work queued again (a second build of the same inputs) is the same job and its
 * finished output is reused.
 */
import type { AnalysisGrid } from '../build/analysis-grid';
import type { WindowInput, WindowStats } from '../build/screen-window';
import type { GridRoleId } from '../inputs-config';
import type { PyramidBand } from '../tiles/write-tile-pyramid';
import { canonicalJson, sha256Text } from './shared-storage';

/** The BullMQ queue every build and worker uses. */
export const QUEUE_NAME = 'pile-atlas-build';
/** Bump when a job's inputs or output layout change, so older finished jobs are not reused. */
export const JOB_FORMAT = 1;
/** Rows screened at a time inside a job (the local build's window). */
export const WINDOW_ROWS = 32;

/** An input as a queued screener reads it: its file in shared storage, checksum, and companion grid. */
export type SharedInput = Omit<WindowInput, 'path' | 'aligned' | 'sd'> & {
  rel: string;
  sha256: string;
  alignedInShared?: boolean;
  /** Its companion standard-deviation grid (data-pipeline/build/sd-grids.ts), shipped the same way. */
  sd?: SharedInput;
};

/** objects/<sha>.json: what every screening job of a build shares. */
export interface ScreenContext {
  format: number;
  tool: string;
  grid: AnalysisGrid;
  /** The inputs as a screener reads them, each with its file in shared storage and its checksum. */
  /** `alignedInShared`: the shared file is the input already warped onto the analysis grid. */
  inputs: SharedInput[];
  echoRoles: GridRoleId[];
  bandCount: number;
  /** sha256 of the canonical list of the inputs' sha256 (with their roles). */
  inputsChecksum: string;
  /** Checksum of the model spec object (objects/<sha>.json). */
  scenarioChecksum: string;
}

export interface ScreenJobData {
  kind: 'screen';
  context: string;
  inputsChecksum: string;
  scenarioChecksum: string;
  row0: number;
  row1: number;
}

export interface ScreenJobResult {
  stats: WindowStats;
  /** host:pid of the worker that ran it. */
  worker: string;
}

/** objects/<sha>.json: what every tile job of a build shares. */
export interface TileContext {
  format: number;
  grid: AnalysisGrid;
  /** The assembled band files, relative to the shared directory. */
  bands: string[];
  width: number;
  height: number;
  pyramid: PyramidBand[];
  maxZoom: number;
  bounds: [number, number, number, number];
}

export interface TileJobData {
  kind: 'tiles';
  context: string;
  z: number;
  x: number;
  y: number;
}

export interface TileJobResult {
  written: Record<number, number>;
  finest: number;
  /** False when the subtree holds no data (no root planes file). */
  hasRoot: boolean;
  worker: string;
}

export type BuildJobData = ScreenJobData | TileJobData;
export type BuildJobResult = ScreenJobResult | TileJobResult;

/** Deterministic job id: kind + checksum of the job data (which names its context by checksum). */
export function jobIdOf(data: BuildJobData): string {
  return `${data.kind}-${sha256Text(canonicalJson({ format: JOB_FORMAT, ...data }))}`;
}

/** How a job is named in messages. */
export function describeJob(data: BuildJobData): string {
  return data.kind === 'screen'
    ? `screening rows ${data.row0}-${data.row1 - 1}`
    : `tile subtree z${data.z}/${data.x}/${data.y}`;
}

/** Root planes file of a tile job: the bands' Float32 planes one after the other (host byte order). */
export const ROOT_PLANES_FILE = 'root.f32';
/** Window statistics of a screening job. */
export const STATS_FILE = 'stats.json';
