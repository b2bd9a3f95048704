import { cp, readdir, readFile, rm, truncate, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { writeArrayBuffer } from 'geotiff';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  hashTree,
  makeTempDir,
  runCli,
  SMALL_DEMO,
  smallDemo,
  writePlainTiff,
  removeTempDirs,
} from './pipeline-fixtures';

afterAll(removeTempDirs);

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
  return expectRejectedWith(['--in', inDir], ...fragments);
}

async function expectRejectedWith(args: string[], ...fragments: RegExp[]): Promise<string> {
  const { code, stdout, stderr } = await runCli([
    'build',
    ...args,
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
    const config = JSON.parse(await readFile(join(dir, 'pile-atlas-inputs.json'), 'utf8'));
    config.grids[1].unitt = config.grids[1].unit;
    await writeFile(join(dir, 'pile-atlas-inputs.json'), JSON.stringify(config));
    await expectRejected(dir, /pile-atlas-inputs\.json/, /grids\.1/, /unitt/);
  });

  it('a grid whose CRS cannot be read (user-defined projection, no EPSG code)', async () => {
    const dir = await brokenCopy();
    const values = new Float32Array(40 * 30).fill(5);
    const tiff = writeArrayBuffer(values, {
      width: 40,
      height: 30,
      ModelPixelScale: [4000, 4000, 0],
      ModelTiepoint: [0, 0, 0, 600000, -1000000, 0],
      GTModelTypeGeoKey: 1,
      GTRasterTypeGeoKey: 1,
      ProjectedCSTypeGeoKey: 32767,
    });
    await writeFile(join(dir, 'bedrock-depth.tif'), new Uint8Array(tiff));
    await expectRejected(dir, /bedrock-depth\.tif/, /CRS cannot be read/, /user-defined/);
  });

  it('grids that do not overlap', async () => {
    const dir = await brokenCopy();
    // A warming-rate grid far away (central Siberia) shares no area with the others.
    const tiff = writeArrayBuffer(new Float32Array(20 * 10).fill(0.05), {
      width: 20,
      height: 10,
      ModelPixelScale: [0.5, 0.2, 0],
      ModelTiepoint: [0, 0, 0, 100, 66, 0],
      GTModelTypeGeoKey: 2,
      GTRasterTypeGeoKey: 1,
      GeographicTypeGeoKey: 4326,
    });
    await writeFile(join(dir, 'warming-rate.tif'), new Uint8Array(tiff));
    await expectRejected(dir, /warming-rate\.tif/, /grids do not overlap/);
  });

  it('a band declared in the wrong unit (values outside the plausible range)', async () => {
    const dir = await brokenCopy();
    const file = join(dir, 'pile-atlas-inputs.json');
    const config = JSON.parse(await readFile(file, 'utf8'));
    const entry = config.grids.find((g: { role: string }) => g.role === 'meanAirTemp_C');
    entry.unit = 'K'; // the file holds °C: -6 "K" would be -279 °C
    await writeFile(file, JSON.stringify(config));
    await expectRejected(
      dir,
      /mean-air-temperature\.tif/,
      /meanAirTemp_C/,
      /plausible range -40\.\.25/,
      /"K"/,
    );
  });

  it('a truncated GeoTIFF', async () => {
    const dir = await brokenCopy();
    const file = join(dir, 'soil-texture.tif');
    const size = (await readFile(file)).byteLength;
    await truncate(file, Math.floor(size / 2));
    await expectRejected(dir, /soil-texture\.tif/, /truncated file/);
  });

  it('a scenario file with a wrong field', async () => {
    const scenarioFile = join(await makeTempDir('scenario'), 'scenario.json');
    await writeFile(scenarioFile, JSON.stringify({ designLife_yr: 30, pile: { lenght_m: 12 } }));
    await expectRejectedWith(
      ['--in', demoDir, '--scenario', scenarioFile],
      /scenario\.json/,
      /pile/,
      /lenght_m/,
    );
  });

  it('a scenario field out of range', async () => {
    const scenarioFile = join(await makeTempDir('scenario'), 'scenario.json');
    await writeFile(scenarioFile, JSON.stringify({ designLife_yr: 500 }));
    await expectRejectedWith(
      ['--in', demoDir, '--scenario', scenarioFile],
      /scenario\.json/,
      /designLife_yr/,
    );
  });

  it('a required option is missing', async () => {
    const { code, stderr } = await runCli(['build', '--in', demoDir]);
    expect(code).toBe(2);
    expect(stderr.trim()).toBe('pile-atlas build: error: build: missing required option --out');
  });
});
