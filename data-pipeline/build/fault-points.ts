/**
 * Named points of a build where the reliability tests inject a failure: `PILE_ATLAS_FAULT=<stage>:<kind>`
 * with kind `pause` (print `pile-atlas fault-point <stage>` on stderr and wait to be killed), `enospc`
 * (throw the error a full disk gives) or `error` (throw a plain Error, a stand-in for a bug). Without the
 * variable a fault point does nothing. The stages, in build order: read, screen, tiles, geotiff,
 * manifest, swap (between moving the previous output aside and renaming the new one in), swapped (after
 * both renames, before the previous output is removed); in a queue worker: job (see WORKER_FAULT_STAGES).
 */
export const FAULT_STAGES = ['read', 'screen', 'tiles', 'geotiff', 'manifest', 'swap', 'swapped'] as const;
export type FaultStage = (typeof FAULT_STAGES)[number];
/** Fault points of a queue worker (`pile-atlas worker`): `job` is inside a job, part of its output written. */
export const WORKER_FAULT_STAGES = ['job'] as const;
export type WorkerFaultStage = (typeof WORKER_FAULT_STAGES)[number];
/** Fault point of `pile-atlas shortlist --out`: `shortlist`, the GeoJSON written to its temporary file. */
export const SHORTLIST_FAULT_STAGES = ['shortlist'] as const;
export type ShortlistFaultStage = (typeof SHORTLIST_FAULT_STAGES)[number];

export const FAULT_ENV = 'PILE_ATLAS_FAULT';

type AnyFaultStage = FaultStage | WorkerFaultStage | ShortlistFaultStage;

/** Synchronous part of a fault point: throws for `enospc` and `error`, true for `pause`. */
function faultAt(stage: AnyFaultStage, target: string): boolean {
  const spec = process.env[FAULT_ENV];
  if (!spec) return false;
  const [at, kind] = spec.split(':');
  if (at !== stage) return false;
  if (kind === 'enospc') {
    throw Object.assign(new Error(`ENOSPC: no space left on device, write '${target}'`), {
      code: 'ENOSPC',
      errno: -28,
      syscall: 'write',
      path: target,
    });
  }
  if (kind === 'error') throw new Error(`injected failure at ${stage}`);
  if (kind === 'pause') {
    process.stderr.write(`pile-atlas fault-point ${stage}\n`);
    return true;
  }
  return false;
}

/** A fault point for `stage` (`target`: the file or directory being written there). */
export async function faultPoint(stage: AnyFaultStage, target: string): Promise<void> {
  if (faultAt(stage, target)) await new Promise(() => setInterval(() => undefined, 1 << 30));
}
