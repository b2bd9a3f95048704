/**
 * Golden file for the demo generator (style.md habit 10): the sha256 of every file the generator
 * writes for seed 7 at resolution scale 4. A change to the generator that changes its output fails
 * here; regenerate on purpose with `UPDATE=1 npx vitest run tests/pipeline/demo-data-golden.test.ts`
 * and commit the new golden file with the change that explains it.
 */
import { readdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { sha256OfFile, smallDemo, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

const GOLDEN = join(import.meta.dirname, 'golden', 'demo-data-seed7-scale4.json');

describe('demo-data golden file', () => {
  it('writes the same bytes as the committed golden hashes', async () => {
    const dir = await smallDemo(7);
    const hashes: Record<string, string> = {};
    for (const f of (await readdir(dir)).sort()) hashes[f] = await sha256OfFile(join(dir, f));
    if (process.env.UPDATE === '1') await writeFile(GOLDEN, JSON.stringify(hashes, null, 2) + '\n');
    const golden = JSON.parse(await readFile(GOLDEN, 'utf8')) as Record<string, string>;
    expect(hashes).toEqual(golden);
  }, 60_000);
});
