/**
 * The boundary work that runs in the boundary worker (boundary-worker.ts), never on the page's main
 * thread: read the file, parse the JSON, check and normalise the rings (boundary-import.ts), measure
 * the geodesic area, simplify a copy for drawing, work out the boundary a link carries
 * (state/boundary-link.ts) and mark the cells whose centres lie inside. The page gets back only the
 * drawn copy and the cell mask, as typed arrays handed over without copying; the full rings stay in
 * the worker (a later recount runs the same source again). Pure (no DOM beyond Blob.text), so unit
 * tests call it directly.
 */
import { parseBoundary, type CheckedBoundary } from './boundary-import';
import { boundaryArea_km2, boundaryMask } from './zonal-summary';
import { simplifyRings } from '../geometry/simplify-rings';
import { flattenPolygons, type FlatRings, type LonLat } from '../geometry/flat-rings';
import { boundaryForLink, groupByPolygon, type LinkedBoundary } from '../state/boundary-link';

/** Largest boundary file read, bytes (common practice for a browser tab: a few hundred MB of text). */
export const MAX_BOUNDARY_FILE_BYTES = 256 * 1024 * 1024;

/** Most vertices drawn (a deck.gl path of this size draws in a frame even with software WebGL). */
export const MAX_DISPLAY_VERTICES = 50_000;

function countVertices(rings: LonLat[][]): number {
  return rings.reduce((n, r) => n + r.length - 1, 0);
}

/** Where a boundary comes from: a file (read in the worker) or GeoJSON built on the page (small). */
export type BoundarySource =
  { kind: 'file'; file: Blob; name: string } | { kind: 'json'; json: unknown; name: string };

export interface BoundaryJobRequest {
  id: number;
  source: BoundarySource;
  /** Cell centres to mark (the cell table's lon/lat), or null before the table has loaded. */
  cells: { lon: Float64Array; lat: Float64Array } | null;
  /** Douglas-Peucker tolerance for the drawn copy, degrees. */
  displayTolerance_deg: number;
}

/** What the page keeps of a boundary: its figures and drawn copy, never its full rings. */
export interface LoadedBoundary extends Omit<CheckedBoundary, 'rings'> {
  name: string;
  area_km2: number;
  /** Simplified rings to draw (all rings, holes included), grouped by polygon like the full rings. */
  display: FlatRings;
  displayVertices: number;
  /** The boundary a link carries (null: too large even simplified). */
  link: LinkedBoundary | null;
}

export type BoundaryJobReply =
  | { type: 'done'; id: number; boundary: LoadedBoundary; mask: Uint8Array | null; elapsed_ms: number }
  | { type: 'refused'; id: number; problems: string[] };

type Refusal = { problems: string[] };

/** The GeoJSON of a source: the file read and parsed here, or the page's own. */
async function readSource(source: BoundarySource): Promise<{ json: unknown } | Refusal> {
  if (source.kind === 'json') return { json: source.json };
  const { file } = source;
  if (file.size > MAX_BOUNDARY_FILE_BYTES)
    return {
      problems: [
        `the file is ${(file.size / 2 ** 20).toFixed(0)} MB; at most ${MAX_BOUNDARY_FILE_BYTES / 2 ** 20} MB can be read`,
      ],
    };
  try {
    return { json: JSON.parse(await file.text()) };
  } catch (e) {
    if (e instanceof SyntaxError) return { problems: [`not valid JSON: ${e.message.slice(0, 200)}`] };
    throw e;
  }
}

/** Drawn copy: the tolerance doubles until the copy has at most MAX_DISPLAY_VERTICES. */
function drawnCopy(rings: FlatRings, displayTolerance_deg: number): LonLat[][] {
  let tolerance_deg = displayTolerance_deg;
  let display = simplifyRings(rings, tolerance_deg);
  for (let i = 0; i < 12 && countVertices(display) > MAX_DISPLAY_VERTICES; i++) {
    tolerance_deg *= 2;
    display = simplifyRings(rings, tolerance_deg);
  }
  return display;
}

/** Do the job (see the module comment). */
export async function runBoundaryJob(req: BoundaryJobRequest): Promise<BoundaryJobReply> {
  const t0 = performance.now();
  const read = await readSource(req.source);
  if ('problems' in read) return { type: 'refused', id: req.id, problems: read.problems };
  const parsed = parseBoundary(read.json);
  if (!parsed.boundary) return { type: 'refused', id: req.id, problems: parsed.problems };
  const { rings, ...checked } = parsed.boundary;
  const { name } = req.source;
  const drawn = drawnCopy(rings, req.displayTolerance_deg);
  const byPolygon = groupByPolygon(drawn, rings.ringPolygon);
  const boundary: LoadedBoundary = {
    ...checked,
    name,
    area_km2: boundaryArea_km2(rings),
    display: flattenPolygons(byPolygon),
    displayVertices: countVertices(drawn),
    link: boundaryForLink(name, rings, byPolygon),
  };
  const mask = req.cells ? boundaryMask(req.cells, rings) : null;
  return { type: 'done', id: req.id, boundary, mask, elapsed_ms: performance.now() - t0 };
}

/** Buffers a reply can hand over without copying. */
export function replyTransferables(reply: BoundaryJobReply): ArrayBuffer[] {
  if (reply.type !== 'done') return [];
  const r = reply.boundary.display;
  const out = [r.coords.buffer, r.ringStart.buffer, r.ringPolygon.buffer] as ArrayBuffer[];
  if (reply.mask) out.push(reply.mask.buffer as ArrayBuffer);
  return out;
}
