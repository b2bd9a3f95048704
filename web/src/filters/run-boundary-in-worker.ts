/**
 * Runs boundary jobs in a Web Worker (boundary-worker.ts) so that parsing, checking and the
 * point-in-polygon pass over every cell never block the page. One job at a time: starting a new job
 * terminates the worker of the one before (its promise then rejects with BoundaryJobCancelled).
 */
import type { BoundaryJobReply, BoundaryJobRequest } from './boundary-job';

export class BoundaryJobCancelled extends Error {
  constructor() {
    super('boundary job cancelled');
    this.name = 'BoundaryJobCancelled';
  }
}

let running: { worker: Worker; reject: (e: Error) => void } | null = null;
let nextId = 1;

/** Start a job (cancelling the running one). */
export function runBoundaryInWorker(request: Omit<BoundaryJobRequest, 'id'>): Promise<BoundaryJobReply> {
  cancelBoundaryJob();
  const worker = new Worker(new URL('./boundary-worker.ts', import.meta.url), { type: 'module' });
  const id = nextId++;
  return new Promise<BoundaryJobReply>((resolve, reject) => {
    running = { worker, reject };
    worker.onmessage = (event: MessageEvent<BoundaryJobReply>) => {
      if (event.data.id !== id) return;
      worker.terminate();
      if (running?.worker === worker) running = null;
      resolve(event.data);
    };
    worker.onerror = (event) => {
      worker.terminate();
      if (running?.worker === worker) running = null;
      reject(new Error(event.message || 'the boundary worker failed'));
    };
    worker.postMessage({ ...request, id });
  });
}

/** Stop the running job, if any. */
export function cancelBoundaryJob(): void {
  if (!running) return;
  running.worker.terminate();
  running.reject(new BoundaryJobCancelled());
  running = null;
}
