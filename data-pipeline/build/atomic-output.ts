/**
 * Atomic directory output: the caller writes into a fresh temporary directory beside the target;
 * `commit` swaps it in with renames (old output moved aside, new renamed in, old removed), `discard`
 * removes it. Until `commit`, a previous output at the target is untouched, whatever fails.
 */
import { mkdir, rename, rm, stat } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';

export interface AtomicOutput {
  /** Temporary directory to write into. */
  dir: string;
  commit(): Promise<void>;
  discard(): Promise<void>;
}

export async function beginAtomicOutput(outDir: string): Promise<AtomicOutput> {
  const target = resolve(outDir);
  const parent = dirname(target);
  await mkdir(parent, { recursive: true });
  const stamp = `${process.pid}-${Date.now().toString(36)}`;
  const dir = join(parent, `.${basename(target)}.building-${stamp}`);
  await mkdir(dir);
  return {
    dir,
    async commit() {
      const exists = await stat(target).then(
        () => true,
        () => false,
      );
      const aside = join(parent, `.${basename(target)}.old-${stamp}`);
      if (exists) await rename(target, aside);
      try {
        await rename(dir, target);
      } catch (err) {
        if (exists) await rename(aside, target);
        throw err;
      }
      if (exists) await rm(aside, { recursive: true, force: true });
    },
    async discard() {
      await rm(dir, { recursive: true, force: true });
    },
  };
}
