/**
 * Refuses an output directory whose replacement would destroy something: the inputs directory itself,
 * a directory inside it or containing it, an existing regular file (or device, or symlink), and an
 * existing non-empty directory that is not a previous pile-atlas build (no manifest.json), such as a
 * home directory named by mistake. Paths are compared after resolving symlinks.
 */
import { existsSync, lstatSync, readdirSync, realpathSync, statSync } from 'node:fs';
import { basename, dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { InputError } from '../input-error';

/** The real path of `path`, resolving the part that exists (the rest need not exist yet). */
function realPathOf(path: string): string {
  const abs = resolve(path);
  if (existsSync(abs)) return realpathSync(abs);
  const parent = dirname(abs);
  return parent === abs ? abs : join(realPathOf(parent), basename(abs));
}

/** True when `child` is `parent` or lies inside it. */
function within(parent: string, child: string): boolean {
  const rel = relative(parent, child);
  return rel === '' || (!rel.startsWith('..') && !isAbsolute(rel));
}

/** Throws an InputError naming --out (or --in) when building `inDir` into `outDir` could destroy data. */
export function checkOutputTarget(inDir: string, outDir: string): void {
  let inStat;
  try {
    inStat = statSync(inDir);
  } catch {
    throw new InputError(`--in ${inDir}: inputs directory not found`);
  }
  if (!inStat.isDirectory()) throw new InputError(`--in ${inDir}: not a directory`);
  const realIn = realpathSync(inDir);
  const realOut = realPathOf(outDir);
  if (realOut === realIn) {
    throw new InputError(
      `--out ${outDir}: is the inputs directory (--in); the build would replace its inputs`,
    );
  }
  if (within(realIn, realOut)) {
    throw new InputError(
      `--out ${outDir}: lies inside the inputs directory ${inDir}; choose a directory outside it`,
    );
  }
  if (within(realOut, realIn)) {
    throw new InputError(
      `--out ${outDir}: contains the inputs directory ${inDir}; the build would replace it`,
    );
  }
  let st;
  try {
    st = lstatSync(outDir);
  } catch {
    return; // does not exist yet: nothing to destroy
  }
  if (st.isSymbolicLink()) {
    throw new InputError(`--out ${outDir}: is a symlink; name the directory it points to instead`);
  }
  if (!st.isDirectory()) {
    throw new InputError(`--out ${outDir}: names an existing file, not a directory; nothing was written`);
  }
  const names = readdirSync(outDir);
  if (names.length > 0 && !names.includes('manifest.json')) {
    throw new InputError(
      `--out ${outDir}: an existing non-empty directory that is not a pile-atlas build (no manifest.json); ` +
        'refusing to replace it',
    );
  }
}
