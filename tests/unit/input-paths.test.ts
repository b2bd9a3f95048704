/**
 * resolveInputFile (issue 16 item 1) directly: what it accepts (relative names, subdirectories,
 * symlinks that stay inside) as well as what it refuses, each refusal naming the file and the field.
 */
import { mkdir, mkdtemp, rm, symlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolveInputFile } from '../../data-pipeline/read/input-paths';
import { InputError } from '../../data-pipeline/input-error';

let base: string;
let inDir: string;

beforeAll(async () => {
  base = await mkdtemp(join(tmpdir(), 'pile-atlas-paths-'));
  inDir = join(base, 'in');
  await mkdir(join(inDir, 'grids'), { recursive: true });
  await writeFile(join(inDir, 'grids', 'a.tif'), 'x');
  await writeFile(join(base, 'outside.tif'), 'x');
  await symlink('grids/a.tif', join(inDir, 'inside-link.tif'));
  await symlink(join(base, 'outside.tif'), join(inDir, 'outside-link.tif'));
  await symlink(join(base), join(inDir, 'up'));
});

afterAll(() => rm(base, { recursive: true, force: true }));

const resolveIt = (file: string) => resolveInputFile(inDir, file, 'grids.0.file', 'cfg.json');

describe('resolveInputFile', () => {
  it('accepts a file in a subdirectory and a symlink that stays inside, returning the real path', async () => {
    expect(await resolveIt('grids/a.tif')).toMatch(/\/in\/grids\/a\.tif$/);
    expect(await resolveIt('./grids/../grids/a.tif')).toMatch(/\/in\/grids\/a\.tif$/);
    expect(await resolveIt('inside-link.tif')).toMatch(/\/in\/grids\/a\.tif$/);
  });

  const refusals: [string, RegExp][] = [
    [
      '../outside.tif',
      /^\.\.\/outside\.tif: path leaves the inputs directory \(grids\.0\.file of cfg\.json\)$/,
    ],
    ['grids/../../outside.tif', /leaves the inputs directory/],
    ['outside-link.tif', /^outside-link\.tif: symlink pointing outside the inputs directory refused/],
    ['up/outside.tif', /^up\/outside\.tif: symlink pointing outside/],
    ['/etc/passwd', /^\/etc\/passwd: absolute path refused \(grids\.0\.file of cfg\.json\)/],
    ['grids', /^grids: is a directory, expected a file/],
    ['.', /leaves the inputs directory/],
    ['missing.tif', /^missing\.tif: file not found$/],
  ];
  for (const [file, message] of refusals) {
    it(`refuses ${file}`, async () => {
      const err = await resolveIt(file).then(
        () => null,
        (e: unknown) => e,
      );
      expect(err).toBeInstanceOf(InputError);
      expect((err as Error).message).toMatch(message);
    });
  }
});
