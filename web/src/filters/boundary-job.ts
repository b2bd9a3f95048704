/**
 * The boundary work that runs in the boundary worker (boundary-worker.ts), never on the page's main
 * thread: read the file, parse the JSON, check and normalise the rings (boundary-import.ts), measure
 * the geodesic area, simplify a copy for drawing, and mark the cells whose centres lie inside. Pure
 * (no DOM beyond Blob.text), so unit tests call it directly.
 */
import { parseBoundary, type CheckedBoundary } from './boundary-import';
import { boundaryArea_km2, boundaryMask } from './zonal-summary';
import { simplifyRings } from '../geometry/simplify-rings';
import type { FlatRings, LonLat } from '../geometry/flat-rings';

/** Largest boundary file read, bytes (common practice for a browser tab: a few hundred MB of text). */
export const MAX_BOUNDARY_FILE_BYTES = 256 * 1024 * 1024;

/** Most vertices drawn (a deck.gl path of this size draws in a frame even with software WebGL). */
export const MAX_DISPLAY_VERTICES = 50_000;

function countVertices(rings: LonLat[][]): number {
  return rings.reduce((n, r) => n + r.length - 1, 0);
}

export type BoundarySource =
  | { kind: 'file'; file: Blob; name: string }
  | { kind: 'json'; json: unknown; name: string }
  | { kind: 'rings'; boundary: LoadedBoundary };

export interface BoundaryJobRequest {
  id: number;
  source: BoundarySource;
  /** Cell centres to mark (the cell table's lon/lat), or null before the table has loaded. */
  cells: { lon: Float64Array; lat: Float64Array } | null;
  /** Douglas-Peucker tolerance for the drawn copy, degrees. */
  displayTolerance_deg: number;
}

export interface LoadedBoundary extends CheckedBoundary {
  name: string;
  area_km2: number;
  /** Simplified rings to draw (all rings, holes included). */
  display: LonLat[][];
  displayVertices: number;
}

export type BoundaryJobReply =
  | { type: 'done'; id: number; boundary: LoadedBoundary; mask: Uint8Array | null; elapsed_ms: number }
  | { type: 'refused'; id: number; problems: string[] };

/** Do the job (see the module comment). */
export async function runBoundaryJob(req: BoundaryJobRequest): Promise<BoundaryJobReply> {
  const t0 = performance.now();
  let boundary: LoadedBoundary;
  if (req.source.kind === 'rings') boundary = req.source.boundary;
  else {
    const { name } = req.source;
    let json: unknown;
    if (req.source.kind === 'file') {
      const { file } = req.source;
      if (file.size > MAX_BOUNDARY_FILE_BYTES)
        return {
          type: 'refused',
          id: req.id,
          problems: [
            `the file is ${(file.size / 2 ** 20).toFixed(0)} MB; at most ${MAX_BOUNDARY_FILE_BYTES / 2 ** 20} MB can be read`,
          ],
        };
      try {
        json = JSON.parse(await file.text());
      } catch (e) {
        return {
          type: 'refused',
          id: req.id,
          problems: [`not valid JSON: ${(e as Error).message.slice(0, 200)}`],
        };
      }
    } else json = req.source.json;
    const parsed = parseBoundary(json);
    if (!parsed.boundary) return { type: 'refused', id: req.id, problems: parsed.problems };
    // Drawn copy: the tolerance doubles until the copy has at most MAX_DISPLAY_VERTICES.
    let tolerance_deg = req.displayTolerance_deg;
    let display = simplifyRings(parsed.boundary.rings, tolerance_deg);
    for (let i = 0; i < 12 && countVertices(display) > MAX_DISPLAY_VERTICES; i++) {
      tolerance_deg *= 2;
      display = simplifyRings(parsed.boundary.rings, tolerance_deg);
    }
    boundary = {
      ...parsed.boundary,
      name,
      area_km2: boundaryArea_km2(parsed.boundary.rings),
      display,
      displayVertices: countVertices(display),
    };
  }
  const mask = req.cells ? boundaryMask(req.cells, boundary.rings) : null;
  return { type: 'done', id: req.id, boundary, mask, elapsed_ms: performance.now() - t0 };
}

/** Buffers a reply can hand over without copying. */
export function replyTransferables(reply: BoundaryJobReply): ArrayBuffer[] {
  if (reply.type !== 'done') return [];
  const r: FlatRings = reply.boundary.rings;
  const out = [r.coords.buffer, r.ringStart.buffer, r.ringPolygon.buffer] as ArrayBuffer[];
  if (reply.mask) out.push(reply.mask.buffer as ArrayBuffer);
  return out;
}
