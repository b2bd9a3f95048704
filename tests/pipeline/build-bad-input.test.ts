import { cp, readdir, rm, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { hashTree, makeTempDir, runCli, SMALL_DEMO, smallDemo, writePlainTiff } from './pipeline-fixtures';

let demoDir: string;
let outDir: string;
let goodTree: Record<string, string>;

beforeAll(async () => {
  demoDir = await smallDemo();
  outDir = join(await makeTempDir('bad'), 'tiles');
  const first = await runCli([
    'build',
    '--in',
    demoDir,
    '--out',
    outDir,
    '--cell-size',
    String(SMALL_DEMO.cellSize_m),
    '--quiet',
  ]);
  expect(first.code, first.stderr).toBe(0);
  goodTree = await hashTree(outDir);
}, 180_000);

/** A copy of the demo inputs that the test may break. */
async function brokenCopy(): Promise<string> {
  const dir = join(await makeTempDir('broken'), 'in');
  await cp(demoDir, dir, { recursive: true });
  return dir;
}

/** Build from `inDir` into the shared output; expect a one-line error and the old output intact. */
async function expectRejected(inDir: string, ...fragments: RegExp[]): Promise<string> {
  const { code, stdout, stderr } = await runCli([
    'build',
    '--in',
    inDir,
    '--out',
    outDir,
    '--cell-size',
    String(SMALL_DEMO.cellSize_m),
    '--quiet',
  ]);
  expect(code).toBe(2);
  expect(stdout).toBe('');
  const lines = stderr.trimEnd().split('\n');
  expect(lines, stderr).toHaveLength(1);
  expect(lines[0]).toMatch(/^pile-atlas build: error: /);
  expect(lines[0]).not.toMatch(/\bat .*\.ts:\d+/); // no stack trace
  for (const f of fragments) expect(lines[0]).toMatch(f);
  expect(await hashTree(outDir)).toEqual(goodTree);
  const leftovers = (await readdir(dirname(outDir))).filter(
    (n) => n.includes('.building-') || n.includes('.old-'),
  );
  expect(leftovers).toEqual([]);
  return lines[0];
}

describe('build rejects bad input with a one-line error and leaves the previous output untouched', () => {
  it('a grid listed in the config is missing', async () => {
    const dir = await brokenCopy();
    await rm(join(dir, 'water-content.tif'));
    await expectRejected(dir, /water-content\.tif/, /file not found/);
  });

  it('a grid has no georeferencing', async () => {
    const dir = await brokenCopy();
    await writePlainTiff(join(dir, 'bedrock-depth.tif'), 20, 10);
    await expectRejected(dir, /bedrock-depth\.tif/, /no georeferencing/);
  });

  it('a text file is named .tif', async () => {
    const dir = await brokenCopy();
    await writeFile(join(dir, 'soil-texture.tif'), 'texture,class\n1,gravel\n');
    await expectRejected(dir, /soil-texture\.tif/, /not a TIFF file/);
  });

  it('the inputs config has a misspelt field', async () => {
    const dir = await brokenCopy();
    const config = JSON.parse(
      await (await import('node:fs/promises')).readFile(join(dir, 'pile-atlas-inputs.json'), 'utf8'),
    );
    config.grids[1].unitt = config.grids[1].unit;
    await writeFile(join(dir, 'pile-atlas-inputs.json'), JSON.stringify(config));
    await expectRejected(dir, /pile-atlas-inputs\.json/, /grids\.1/, /unitt/);
  });

  it('a required option is missing', async () => {
    const { code, stderr } = await runCli(['build', '--in', demoDir]);
    expect(code).toBe(2);
    expect(stderr.trim()).toBe('pile-atlas build: error: build: missing required option --out');
  });
});
