/**
 * React state of the zonal-summary boundary: import a file or finish a drawn shape, both checked and
 * measured in the boundary worker (run-boundary-in-worker.ts), then the cell mask, recomputed in the
 * worker when the cell table arrives. While a job runs `busy` says what is being done; a refused
 * boundary leaves the previous one in place and `message` says why.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import type { CellTable } from '../data/cell-table';
import type { LonLat } from '../geometry/flat-rings';
import { polygonFromVertices } from './boundary-import';
import type { BoundaryJobReply, BoundarySource, LoadedBoundary } from './boundary-job';
import { BoundaryJobCancelled, cancelBoundaryJob, runBoundaryInWorker } from './run-boundary-in-worker';

export interface BoundaryState {
  boundary: LoadedBoundary | null;
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

function describe(b: LoadedBoundary, elapsed_ms: number): string {
  const n = (v: number) => v.toLocaleString('en-US');
  const drawn = b.displayVertices < b.vertices ? `, drawn with ${n(b.displayVertices)}` : '';
  const notes = b.notes.length ? `; ${b.notes.join('; ')}` : '';
  return `Boundary from ${b.name}: ${n(b.vertices)} vertices in ${n(b.polygons)} polygon(s)${drawn} (${(elapsed_ms / 1000).toFixed(1)} s)${notes}.`;
}

/** `displayTolerance_deg`: Douglas-Peucker tolerance of the drawn copy (about a quarter cell). */
export function useBoundary(table: CellTable | null, displayTolerance_deg: number): BoundaryState {
  const [boundary, setBoundary] = useState<LoadedBoundary | null>(null);
  const [masked, setMasked] = useState<{
    boundary: LoadedBoundary;
    table: CellTable;
    mask: Uint8Array;
  } | null>(null);
  const [busy, setBusy] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const tableRef = useRef(table);
  tableRef.current = table;

  const run = useCallback(
    (
      source: BoundarySource,
      busyText: string,
      onDone: (reply: BoundaryJobReply, t: CellTable | null) => void,
    ) => {
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
          if (e instanceof BoundaryJobCancelled) return;
          setBusy(null);
          setMessage(`The boundary could not be processed: ${(e as Error).message}`);
        },
      );
    },
    [displayTolerance_deg],
  );

  const accept = useCallback((label: string) => {
    return (reply: BoundaryJobReply, t: CellTable | null) => {
      if (reply.type === 'refused') {
        setMessage(`${label} was not used: ${reply.problems.join('; ')}`);
        return;
      }
      setBoundary(reply.boundary);
      if (t && reply.mask) setMasked({ boundary: reply.boundary, table: t, mask: reply.mask });
      setMessage(describe(reply.boundary, reply.elapsed_ms));
    };
  }, []);

  const importFile = useCallback(
    (file: File) => {
      const mb = file.size / 2 ** 20;
      run(
        { kind: 'file', file, name: file.name },
        `Reading ${file.name}${mb >= 1 ? ` (${mb.toFixed(0)} MB)` : ''}…`,
        accept(file.name),
      );
    },
    [run, accept],
  );

  const finishDrawing = useCallback(
    (vertices: LonLat[]) => {
      const polygon = polygonFromVertices(vertices);
      if (!polygon) {
        setMessage('A boundary needs at least three corners.');
        return;
      }
      run(
        { kind: 'json', json: polygon, name: 'the drawn shape' },
        'Checking the drawn shape…',
        accept('The drawn shape'),
      );
    },
    [run, accept],
  );

  const loadPolygons = useCallback(
    (polygons: LonLat[][][], name: string) => {
      run(
        { kind: 'json', json: { type: 'MultiPolygon', coordinates: polygons }, name },
        'Checking the boundary from the link…',
        accept('The boundary from the link'),
      );
    },
    [run, accept],
  );

  // The cell table arrived (or changed) after the boundary: mark the cells in the worker.
  useEffect(() => {
    if (busy || !boundary || !table || (masked && masked.boundary === boundary && masked.table === table))
      return;
    run({ kind: 'rings', boundary }, 'Counting cells inside the boundary…', (reply, t) => {
      if (reply.type === 'done' && reply.mask && t) setMasked({ boundary, table: t, mask: reply.mask });
    });
  }, [busy, boundary, table, masked, run]);

  const clear = useCallback(() => {
    cancelBoundaryJob();
    setBusy(null);
    setBoundary(null);
    setMasked(null);
    setMessage(null);
  }, []);

  useEffect(() => () => cancelBoundaryJob(), []);

  const mask = masked && masked.boundary === boundary && masked.table === table ? masked.mask : null;
  return { boundary, mask, busy, message, setMessage, importFile, finishDrawing, loadPolygons, clear };
}
