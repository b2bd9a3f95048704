/**
 * Every file an inputs config names must lie inside the inputs directory: the path is relative, stays
 * inside once resolved, resolves (through any symlinks) to a file inside, and that file is a regular
 * file, not a device, FIFO, socket or directory. Returns the real path, which the readers then open.
 */
import { lstat, realpath, stat } from 'node:fs/promises';
import { isAbsolute, relative, resolve, sep } from 'node:path';
import { InputError } from '../input-error';

function inside(root: string, path: string): boolean {
  const rel = relative(root, path);
  return rel !== '' && !rel.startsWith(`..${sep}`) && rel !== '..' && !isAbsolute(rel);
}

/**
 * The real path of `file` (as written at `field` of `configFile`) inside `inDir`, or an InputError
 * naming the file and the field.
 */
export async function resolveInputFile(
  inDir: string,
  file: string,
  field: string,
  configFile: string,
): Promise<string> {
  const where = `${field} of ${configFile}`;
  if (file.includes('\0')) throw new InputError(`${where}: file name contains a NUL character`);
  if (isAbsolute(file)) {
    throw new InputError(
      `${file}: absolute path refused (${where}); name files relative to the inputs directory`,
    );
  }
  let root: string;
  try {
    root = await realpath(inDir);
  } catch {
    throw new InputError(`${inDir}: inputs directory not found`);
  }
  const candidate = resolve(root, file);
  if (!inside(root, candidate)) {
    throw new InputError(`${file}: path leaves the inputs directory (${where})`);
  }
  try {
    await lstat(candidate);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'ENOTDIR') throw new InputError(`${file}: file not found`);
    throw new InputError(`${file}: cannot read (${code ?? String(err)})`);
  }
  let real: string;
  try {
    real = await realpath(candidate);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new InputError(`${file}: broken symlink (${where})`);
    if (code === 'ELOOP') throw new InputError(`${file}: symlink loop (${where})`);
    throw new InputError(`${file}: cannot read (${code ?? String(err)})`);
  }
  if (!inside(root, real)) {
    throw new InputError(`${file}: symlink pointing outside the inputs directory refused (${where})`);
  }
  const st = await stat(real);
  if (st.isDirectory()) throw new InputError(`${file}: is a directory, expected a file (${where})`);
  if (!st.isFile()) {
    throw new InputError(`${file}: not a regular file (a device, FIFO or socket) refused (${where})`);
  }
  return real;
}
