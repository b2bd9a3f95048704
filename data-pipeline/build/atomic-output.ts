/**
 * Atomic directory output that survives a kill at any instant. The build writes into a fresh directory
 * beside the target (`.<out>.building-<pid>-<t>`); `commit` swaps it in with two renames under a
 * journal (`.<out>.swap.json`, naming the aside directory):
 *   1. write the journal          3. rename building -> out          5. remove the journal (commit point)
 *   2. rename out -> aside        4. (nothing: both trees whole)      6. remove the aside directory
 * Until the journal is removed the swap is not committed: `recoverOutput` (run by every build before it
 * starts, and by a signal handler) rolls it back, so the previous output is whole at every instant, at
 * `out` or at the aside path the journal names, and is back at `out` after recovery. Recovery also
 * removes the building and aside directories of earlier runs whose process is gone.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { faultPoint } from './fault-points';

export interface AtomicOutput {
  /** Temporary directory to write into. */
  dir: string;
  commit(): Promise<void>;
  discard(): Promise<void>;
}

interface Journal {
  pid: number;
  /** Name (in the parent directory) of the previous output while it is moved aside, or null. */
  aside: string | null;
  /** Name of the new output before it is renamed in. */
  building: string;
}

const journalName = (base: string) => `.${base}.swap.json`;
const STALE = /^\.(.+)\.(building|old|discard)-(\d+)-[0-9a-z]+$/;

function pidAlive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function readJournal(file: string): Journal | null {
  try {
    const j = JSON.parse(readFileSync(file, 'utf8')) as Journal;
    return typeof j.pid === 'number' && typeof j.building === 'string' ? j : null;
  } catch {
    return null;
  }
}

/** Roll back an uncommitted swap of `target` (journal present): the previous output back at `target`. */
function rollBack(target: string, journal: Journal, stamp: string): void {
  const parent = dirname(target);
  const journalFile = join(parent, journalName(basename(target)));
  const aside = journal.aside ? join(parent, journal.aside) : null;
  if (aside && existsSync(aside)) {
    if (existsSync(target)) {
      // Both renames were done: the new output is at the target. Move it away, the previous one back.
      const discard = join(parent, `.${basename(target)}.discard-${stamp}`);
      renameSync(target, discard);
      renameSync(aside, target);
      rmSync(discard, { recursive: true, force: true });
    } else {
      renameSync(aside, target);
    }
  }
  rmSync(join(parent, journal.building), { recursive: true, force: true });
  rmSync(journalFile, { force: true });
}

/**
 * Put `outDir` back in order after an earlier run was killed: roll back an uncommitted swap, remove
 * building/aside directories of processes that are gone. Returns what it did, for messages and tests.
 */
export function recoverOutput(outDir: string): { rolledBack: boolean; removed: string[] } {
  const target = resolve(outDir);
  const parent = dirname(target);
  const base = basename(target);
  const removed: string[] = [];
  let rolledBack = false;
  if (!existsSync(parent)) return { rolledBack, removed };
  const journal = readJournal(join(parent, journalName(base)));
  if (journal && !(journal.pid !== process.pid && pidAlive(journal.pid))) {
    rollBack(target, journal, `${process.pid}-r${Date.now().toString(36)}`);
    rolledBack = true;
  } else if (!journal) {
    rmSync(join(parent, journalName(base)), { force: true });
  }
  // A journal written but not yet renamed into place: the swap had not begun.
  if (!journal || journal.pid === process.pid || !pidAlive(journal.pid)) {
    rmSync(join(parent, `${journalName(base)}.tmp`), { force: true });
  }
  const live = readJournal(join(parent, journalName(base)));
  for (const name of readdirSync(parent)) {
    const m = STALE.exec(name);
    if (!m || m[1] !== base) continue;
    const pid = Number(m[3]);
    if (pid === process.pid || pidAlive(pid)) continue;
    if (live && (name === live.aside || name === live.building)) continue;
    rmSync(join(parent, name), { recursive: true, force: true });
    removed.push(name);
  }
  return { rolledBack, removed };
}

/** Outputs being written by this process, for the signal handler. */
const active = new Set<{ target: string; dir: string; swapping: () => Journal | null }>();

/**
 * Synchronously undo every output this process is writing (remove the building directory, roll back a
 * swap in progress). For SIGINT/SIGTERM handlers, which cannot wait for promises.
 */
export function abortActiveOutputs(): void {
  for (const entry of active) {
    const journal = entry.swapping();
    try {
      if (journal) rollBack(entry.target, journal, `${process.pid}-a${Date.now().toString(36)}`);
      rmSync(entry.dir, { recursive: true, force: true });
    } catch {
      // Best effort: the next build's recoverOutput finishes the job.
    }
  }
  active.clear();
}

export async function beginAtomicOutput(outDir: string): Promise<AtomicOutput> {
  const target = resolve(outDir);
  const parent = dirname(target);
  const base = basename(target);
  mkdirSync(parent, { recursive: true });
  recoverOutput(target);
  const stamp = `${process.pid}-${Date.now().toString(36)}`;
  const dir = join(parent, `.${base}.building-${stamp}`);
  mkdirSync(dir);
  const journalFile = join(parent, journalName(base));
  let journal: Journal | null = null;
  const entry = { target, dir, swapping: () => journal };
  active.add(entry);
  return {
    dir,
    async commit() {
      const exists = existsSync(target);
      const asideName = `.${base}.old-${stamp}`;
      const aside = join(parent, asideName);
      journal = { pid: process.pid, aside: exists ? asideName : null, building: basename(dir) };
      writeFileSync(`${journalFile}.tmp`, JSON.stringify(journal));
      renameSync(`${journalFile}.tmp`, journalFile);
      try {
        if (exists) renameSync(target, aside);
        await faultPoint('swap', target);
        renameSync(dir, target);
        await faultPoint('swapped', target);
      } catch (err) {
        rollBack(target, journal, `${stamp}x`);
        journal = null;
        active.delete(entry);
        throw err;
      }
      rmSync(journalFile, { force: true });
      journal = null;
      active.delete(entry);
      if (exists) rmSync(aside, { recursive: true, force: true });
    },
    async discard() {
      active.delete(entry);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** One output file written atomically: to `path` (a temporary name beside it), then `commit`. */
export interface AtomicFile {
  /** Temporary file to write (same directory as the target, so the rename cannot cross devices). */
  path: string;
  /** Rename the temporary file over the target (POSIX rename: readers see the old or the new file). */
  commit(): Promise<void>;
  /** Remove the temporary file; the target is left as it was. */
  discard(): Promise<void>;
}

/**
 * Begin writing `outFile` atomically: the caller writes `path` (`.<name>.building-<pid>-<t>` beside the
 * target) and commits. A kill leaves the previous file untouched: the signal handler removes the
 * temporary file (abortActiveOutputs), and the next write of the same target removes those of runs
 * whose process is gone (recoverOutput).
 */
export function beginAtomicFile(outFile: string): AtomicFile {
  const target = resolve(outFile);
  const parent = dirname(target);
  mkdirSync(parent, { recursive: true });
  recoverOutput(target);
  const stamp = `${process.pid}-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
  const path = join(parent, `.${basename(target)}.building-${stamp}`);
  const entry = { target, dir: path, swapping: () => null };
  active.add(entry);
  return {
    path,
    async commit() {
      renameSync(path, target);
      active.delete(entry);
    },
    async discard() {
      active.delete(entry);
      rmSync(path, { force: true, recursive: true });
    },
  };
}
