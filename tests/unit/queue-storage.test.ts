/**
 * The queue-backed build's small parts (issue 19): the `--queue` URL check (messages never show the
 * password), canonical JSON for checksums, write-once objects, and job outputs published once.
 */
import { existsSync } from 'node:fs';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { checkQueueServer, parseQueueUrl } from '../../data-pipeline/queue/redis-url';
import { jobIdOf } from '../../data-pipeline/queue/queue-jobs';
import {
  canonicalJson,
  getObject,
  publishJobOutput,
  putInput,
  putObject,
} from '../../data-pipeline/queue/shared-storage';
import { freePort } from '../pipeline/redis-fixture';

const dirs: string[] = [];
const tempDir = async () => {
  const d = await mkdtemp(join(tmpdir(), 'pile-atlas-queue-unit-'));
  dirs.push(d);
  return d;
};
afterAll(async () => {
  await Promise.all(dirs.map((d) => rm(d, { recursive: true, force: true })));
});

describe('--queue URL', () => {
  it('accepts redis:// and rediss:// URLs and shows them without the password', () => {
    const c = parseQueueUrl('redis://:s3cret@10.0.0.5:6380/2');
    expect(c.display).toBe('redis://10.0.0.5:6380/2');
    expect(c.display).not.toContain('s3cret');
    expect(c.options.url).toBe('redis://:s3cret@10.0.0.5:6380/2');
    expect(parseQueueUrl('rediss://user:pw@cache.internal').display).toBe('rediss://cache.internal:6379');
  });

  it('refuses what is not a Redis URL, naming the option and the expected form', () => {
    expect(() => parseQueueUrl('localhost:6379')).toThrow(
      /--queue: expected a redis:\/\/ or rediss:\/\/ URL/,
    );
    expect(() => parseQueueUrl('not a url')).toThrow(
      /--queue "not a url": not a URL; expected redis:\/\/host:port/,
    );
    expect(() => parseQueueUrl('http://h:1')).toThrow(/redis:\/\//);
    expect(() => parseQueueUrl('redis://h:1/queue')).toThrow(/database number/);
  });

  it('fails in seconds with one line when no server answers (password not shown)', async () => {
    const port = await freePort();
    const started = Date.now();
    await expect(checkQueueServer(parseQueueUrl(`redis://:pw123@127.0.0.1:${port}`), 2000)).rejects.toThrow(
      new RegExp(`--queue redis://127.0.0.1:${port}: no Redis server answered`),
    );
    expect(Date.now() - started).toBeLessThan(5000);
  });
});

describe('shared storage', () => {
  it('gives equal text (and job ids) for equal values whatever the key order', () => {
    expect(canonicalJson({ b: 1, a: { d: [1, { y: 2, x: 1 }], c: null } })).toBe(
      '{"a":{"c":null,"d":[1,{"x":1,"y":2}]},"b":1}',
    );
    const a = jobIdOf({ kind: 'tiles', context: 'c', z: 5, x: 1, y: 2 });
    expect(jobIdOf({ y: 2, x: 1, z: 5, context: 'c', kind: 'tiles' })).toBe(a);
    expect(jobIdOf({ kind: 'tiles', context: 'c', z: 5, x: 1, y: 3 })).not.toBe(a);
  });

  it('stores objects under their checksum and refuses one that was altered', async () => {
    const root = await tempDir();
    const sha = await putObject(root, { scenario: { years: 40 } });
    expect(await getObject(root, sha)).toEqual({ scenario: { years: 40 } });
    await writeFile(join(root, 'objects', `${sha}.json`), '{"scenario":{"years":41}}');
    await expect(getObject(root, sha)).rejects.toThrow(/does not match its checksum/);
  });

  it('refuses an input whose content no longer matches the checksum read at load time', async () => {
    const root = await tempDir();
    const file = join(root, 'grid.tif');
    await writeFile(file, 'changed bytes');
    await expect(putInput(root, file, '0'.repeat(64), 'grid.tif')).rejects.toThrow(
      /grid\.tif: the file changed while the build was reading it/,
    );
    expect(await readdir(join(root, 'inputs', '0'.repeat(64)))).toEqual([]);
  });

  it('publishes a job output once: a second run of the same job leaves the first output', async () => {
    const root = await tempDir();
    const first = await publishJobOutput(root, 'screen-x', (dir) => writeFile(join(dir, 'out'), 'first'));
    const second = await publishJobOutput(root, 'screen-x', (dir) => writeFile(join(dir, 'out'), 'second'));
    expect([first, second]).toEqual([true, false]);
    expect(await readFile(join(root, 'jobs', 'screen-x', 'out'), 'utf8')).toBe('first');
    // No temporary directory is left behind, also when the job fails.
    await expect(
      publishJobOutput(root, 'screen-y', async () => {
        throw new Error('job failed');
      }),
    ).rejects.toThrow('job failed');
    expect(existsSync(join(root, 'jobs', 'screen-y'))).toBe(false);
    expect((await readdir(join(root, 'jobs'))).sort()).toEqual(['screen-x']);
  });
});
