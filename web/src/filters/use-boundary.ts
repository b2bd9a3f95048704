/**
 * React state of the zonal-summary boundary: import a file or finish a drawn shape, both checked and
 * measured in the boundary worker (run-boundary-in-worker.ts), then the cell mask, recomputed in the
 * worker when the cell table arrives. The page holds only what the worker hands back (figures, the
 * drawn copy, the link's boundary and the mask), never the full rings of a large file: a recount runs
 * the same source (the File handle, or the small GeoJSON built here) again. While a job runs `busy`
 * says what is being done; a refused boundary leaves the previous one in place and `message` says why.
 */
import { useCallback, useEffect, useRef, useState, type MutableRefObject } from 'react';
import type { CellTable } from '../data/cell-table';
import { unflattenPolygons, type LonLat } from '../geometry/flat-rings';
import { polygonFromVertices } from './boundary-import';
import type { BoundaryJobReply, BoundarySource, LoadedBoundary } from './boundary-job';
import { BoundaryJobCancelled, cancelBoundaryJob, runBoundaryInWorker } from './run-boundary-in-worker';

/** A boundary as the page shows it: the worker's figures, the drawn copy as rings of positions. */
export interface ShownBoundary extends Omit<LoadedBoundary, 'display'> {
  display: LonLat[][];
}

export interface BoundaryState {
  boundary: ShownBoundary | null;
  /** Cell mask of `boundary` over `table` (null until computed). */
  mask: Uint8Array | null;
  busy: string | null;
  message: string | null;
  setMessage: (m: string | null) => void;
  importFile: (file: File) => void;
  finishDrawing: (vertices: LonLat[]) => void;
  /** Polygons from a shared link (checked in the worker like any boundary). */
  loadPolygons: (polygons: LonLat[][][], name: string) => void;
  clear: () => void;
}

type OnReply = (reply: BoundaryJobReply, t: CellTable | null) => void;
/** Start a job; `onCancelled` when a later job (or clear) cancelled it before it ended. */
type Run = (source: BoundarySource, busyText: string, onDone: OnReply, onCancelled?: () => void) => void;
interface Shown {
  boundary: ShownBoundary;
  source: BoundarySource;
}
/** A recount tried for this boundary and table. */
interface Attempt {
  boundary: ShownBoundary;
  table: CellTable;
}
interface Masked {
  boundary: ShownBoundary;
  table: CellTable;
  mask: Uint8Array;
}

function describe(b: ShownBoundary, elapsed_ms: number): string {
  const n = (v: number) => v.toLocaleString('en-US');
  const drawn = b.displayVertices < b.vertices ? `, drawn with ${n(b.displayVertices)}` : '';
  const notes = b.notes.length ? `; ${b.notes.join('; ')}` : '';
  return `Boundary from ${b.name}: ${n(b.vertices)} vertices in ${n(b.polygons)} polygon(s)${drawn} (${(elapsed_ms / 1000).toFixed(1)} s)${notes}.`;
}

/** The drawn copy as rings of positions for the map (at most MAX_DISPLAY_VERTICES of them). */
function toShown(b: LoadedBoundary): ShownBoundary {
  return { ...b, display: unflattenPolygons(b.display).flat() };
}

/** One job at a time in the worker, with the cells of the table at its start; `busy` while it runs. */
function useJobRunner(table: CellTable | null, displayTolerance_deg: number) {
  const [busy, setBusy] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const tableRef = useRef(table);
  tableRef.current = table;
  const run = useCallback<Run>(
    (source, busyText, onDone, onCancelled) => {
      const t = tableRef.current;
      setBusy(busyText);
      runBoundaryInWorker({
        source,
        cells: t ? { lon: t.lon, lat: t.lat } : null,
        displayTolerance_deg,
      }).then(
        (reply) => {
          setBusy(null);
          onDone(reply, t);
        },
        (e: unknown) => {
          if (e instanceof BoundaryJobCancelled) {
            onCancelled?.();
            return;
          }
          setBusy(null);
          setMessage(`The boundary could not be processed: ${(e as Error).message}`);
        },
      );
    },
    [displayTolerance_deg],
  );
  return { busy, setBusy, message, setMessage, run };
}

/** The cell table arrived (or changed) after the boundary: count its cells in the worker, once. */
function useRecount(
  shown: Shown | null,
  table: CellTable | null,
  masked: Masked | null,
  busy: string | null,
  run: Run,
  setMasked: (m: Masked) => void,
  tried: MutableRefObject<Attempt | null>,
): void {
  useEffect(() => {
    if (busy || !shown || !table || (masked && masked.boundary === shown.boundary && masked.table === table))
      return;
    const { boundary, source } = shown;
    // A source that cannot be read again (a file changed on disk) is not retried for ever.
    if (tried.current?.boundary === boundary && tried.current.table === table) return;
    const attempt = { boundary, table };
    tried.current = attempt;
    run(
      source,
      'Counting cells inside the boundary…',
      (reply, t) => {
        if (reply.type === 'done' && reply.mask && t) setMasked({ boundary, table: t, mask: reply.mask });
      },
      () => {
        // Cancelled by another job: try again once that one is done.
        if (tried.current === attempt) tried.current = null;
      },
    );
  }, [busy, shown, table, masked, run, setMasked, tried]);
}

/** `displayTolerance_deg`: Douglas-Peucker tolerance of the drawn copy (about a quarter cell). */
export function useBoundary(table: CellTable | null, displayTolerance_deg: number): BoundaryState {
  const { busy, setBusy, message, setMessage, run } = useJobRunner(table, displayTolerance_deg);
  const [shown, setShown] = useState<Shown | null>(null);
  const [masked, setMasked] = useState<Masked | null>(null);
  const tried = useRef<Attempt | null>(null);

  const load = useCallback(
    (source: BoundarySource, busyText: string, label: string) =>
      run(source, busyText, (reply, t) => {
        if (reply.type === 'refused') {
          setMessage(`${label} was not used: ${reply.problems.join('; ')}`);
          return;
        }
        const boundary = toShown(reply.boundary);
        setShown({ boundary, source });
        if (t && reply.mask) setMasked({ boundary, table: t, mask: reply.mask });
        setMessage(describe(boundary, reply.elapsed_ms));
      }),
    [run, setMessage],
  );

  const importFile = useCallback(
    (file: File) => {
      const mb = file.size / 2 ** 20;
      const size = mb >= 1 ? ` (${mb.toFixed(0)} MB)` : '';
      load({ kind: 'file', file, name: file.name }, `Reading ${file.name}${size}…`, file.name);
    },
    [load],
  );

  const finishDrawing = useCallback(
    (vertices: LonLat[]) => {
      const polygon = polygonFromVertices(vertices);
      if (!polygon) setMessage('A boundary needs at least three corners.');
      else
        load(
          { kind: 'json', json: polygon, name: 'the drawn shape' },
          'Checking the drawn shape…',
          'The drawn shape',
        );
    },
    [load, setMessage],
  );

  const loadPolygons = useCallback(
    (polygons: LonLat[][][], name: string) =>
      load(
        { kind: 'json', json: { type: 'MultiPolygon', coordinates: polygons }, name },
        'Checking the boundary from the link…',
        'The boundary from the link',
      ),
    [load],
  );

  useRecount(shown, table, masked, busy, run, setMasked, tried);

  const clear = useCallback(() => {
    cancelBoundaryJob();
    setBusy(null);
    setShown(null);
    setMasked(null);
    setMessage(null);
  }, [setBusy, setMessage]);

  useEffect(() => () => cancelBoundaryJob(), []);

  const boundary = shown?.boundary ?? null;
  const mask = masked && masked.boundary === boundary && masked.table === table ? masked.mask : null;
  return { boundary, mask, busy, message, setMessage, importFile, finishDrawing, loadPolygons, clear };
}
