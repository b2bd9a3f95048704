/**
 * The shared storage of a queue-backed build: one directory every worker and the coordinator see
 * (an NFS, SMB or cluster file system mount; on one machine any directory). Everything in it is
 * addressed by checksum and written once (temporary name, then rename), so any number of machines can
 * use it at the same time and a path, once present, never changes:
 *   inputs/<sha256>/<file>   the input grids, copied by the coordinator and checked by each worker
 *   objects/<sha256>.json    job contexts and model specs (the scenario) as canonical JSON
 *   jobs/<job id>/           one finished job's output, published by one rename (the first wins)
 *   bands/<key>/             the screened bands assembled by the coordinator for the tile jobs
 * Paths inside objects are relative to the shared directory, so machines may mount it at different
 * places. Anything here may be deleted while no build runs (a later build recomputes it).
 */
import { createHash, randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream, existsSync, statSync } from 'node:fs';
import { mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { basename, join } from 'node:path';
import { pipeline } from 'node:stream/promises';
import { Transform } from 'node:stream';
import { InputError } from '../input-error';

/** Check that `dir` is an existing directory (option names it in the message); returns it. */
export function sharedRoot(dir: string, option = '--shared'): string {
  if (!existsSync(dir) || !statSync(dir).isDirectory()) {
    throw new InputError(
      `${option} ${dir}: not an existing directory (expected shared storage every worker sees at its own path)`,
    );
  }
  return dir;
}

/** JSON with object keys sorted, so equal values give equal text (and equal checksums). */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v)
      ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : 1)))
      : v,
  );
}

export const sha256Text = (text: string): string => createHash('sha256').update(text).digest('hex');

const tempSuffix = () => `${hostname()}-${process.pid}-${randomBytes(4).toString('hex')}`;

/** Store a JSON value under its checksum (written once); returns the checksum. */
export async function putObject(root: string, value: unknown): Promise<string> {
  const text = canonicalJson(value);
  const sha = sha256Text(text);
  const path = join(root, 'objects', `${sha}.json`);
  if (!existsSync(path)) {
    await mkdir(join(root, 'objects'), { recursive: true });
    const tmp = `${path}.tmp-${tempSuffix()}`;
    await writeFile(tmp, text);
    await rename(tmp, path);
  }
  return sha;
}

/** Read a stored JSON value and check its checksum. */
export async function getObject<T>(root: string, sha: string): Promise<T> {
  const path = join(root, 'objects', `${sha}.json`);
  const text = await readFile(path, 'utf8').catch((err: NodeJS.ErrnoException) => {
    throw new Error(
      `shared storage: object ${sha} not found (${err.code}); is --shared the same storage as the build's?`,
    );
  });
  if (sha256Text(text) !== sha) throw new Error(`shared storage: object ${sha} does not match its checksum`);
  return JSON.parse(text) as T;
}

/** Where an input file addressed by its checksum lives (relative to the shared directory). */
export const inputRelPath = (sha: string, file: string): string => join('inputs', sha, basename(file));

async function sha256OfFile(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

/**
 * Copy an input into shared storage under its checksum (skipped when present), hashing what is copied:
 * a file that changed since it was read and checked is refused, naming it.
 */
export async function putInput(root: string, path: string, sha: string, label: string): Promise<string> {
  const rel = inputRelPath(sha, path);
  const target = join(root, rel);
  if (existsSync(target)) return rel;
  await mkdir(join(root, 'inputs', sha), { recursive: true });
  const tmp = `${target}.tmp-${tempSuffix()}`;
  const hash = createHash('sha256');
  const tap = new Transform({
    transform(chunk: Buffer, _enc, done) {
      hash.update(chunk);
      done(null, chunk);
    },
  });
  await pipeline(createReadStream(path), tap, createWriteStream(tmp));
  if (hash.digest('hex') !== sha) {
    await rm(tmp, { force: true });
    throw new InputError(`${label}: the file changed while the build was reading it; run the build again`);
  }
  await rename(tmp, target);
  return rel;
}

const verified = new Set<string>();

/** Absolute path of a shared input, checked once per process against its checksum. */
export async function verifiedInput(root: string, rel: string, sha: string): Promise<string> {
  const path = join(root, rel);
  if (verified.has(path)) return path;
  const actual = await sha256OfFile(path).catch((err: NodeJS.ErrnoException) => {
    throw new Error(`shared storage: input ${rel} not found (${err.code}); is --shared the build's storage?`);
  });
  if (actual !== sha) throw new Error(`shared storage: input ${rel} does not match its checksum ${sha}`);
  verified.add(path);
  return path;
}

/** The directory of a published job's output. */
export const jobDir = (root: string, jobId: string): string => join(root, 'jobs', jobId);

/**
 * Write a job's output into a temporary directory with `fill`, then publish it with one rename. When
 * another run of the same job has published first (a job retried after its worker was presumed dead
 * but was not), this run's output is removed and the first one stands: an output is published once.
 * Returns true when this run published it.
 */
export async function publishJobOutput(
  root: string,
  jobId: string,
  fill: (dir: string) => Promise<void>,
): Promise<boolean> {
  const target = jobDir(root, jobId);
  const tmp = join(root, 'jobs', `.tmp-${jobId}-${tempSuffix()}`);
  await mkdir(tmp, { recursive: true });
  try {
    await fill(tmp);
    if (existsSync(target)) return false;
    try {
      await rename(tmp, target);
      return true;
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      if (code === 'ENOTEMPTY' || code === 'EEXIST') return false;
      throw err;
    }
  } finally {
    await rm(tmp, { recursive: true, force: true });
  }
}
