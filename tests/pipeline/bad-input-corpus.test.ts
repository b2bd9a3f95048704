/**
 * The bad-input corpus (issue 16 item 7, issue 21 item 4): every case is a build the CLI must refuse
 * with exit 2 and one line of at most 300 characters on stderr that names the culprit (file, field or
 * option), no stack trace, nothing on stdout, the previous output byte-identical, the inputs
 * byte-identical, and nothing left behind beside the output. Inputs are hard-linked copies of one
 * small demo region (tests/pipeline/pipeline-fixtures.ts) with one thing broken.
 */
import { execFileSync } from 'node:child_process';
import { copyFile, mkdir, readdir, readFile, rm, symlink, truncate, writeFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { writeArrayBuffer } from 'geotiff';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FAULT_ENV } from '../../data-pipeline/build/fault-points';
import {
  hashTree,
  linkedCopy,
  makeTempDir,
  removeTempDirs,
  replaceFile,
  runCli,
  SMALL_DEMO,
  smallDemo,
  tiffBomb,
  writePlainTiff,
} from './pipeline-fixtures';

afterAll(removeTempDirs);

const CONFIG = 'pile-atlas-inputs.json';
let demoDir: string;
let outDir: string;
let goodTree: Record<string, string>;
let demoTree: Record<string, string>;

/** Coarser than SMALL_DEMO: the corpus needs a previous output to protect, not a detailed one. */
const BUILD_FLAGS = ['--cell-size', String(4 * SMALL_DEMO.cellSize_m), '--quiet', '--no-geotiff'];

beforeAll(async () => {
  demoDir = await smallDemo();
  outDir = join(await makeTempDir('corpus'), 'tiles');
  const first = await runCli(['build', '--in', demoDir, '--out', outDir, ...BUILD_FLAGS]);
  expect(first.code, first.stderr).toBe(0);
  goodTree = await hashTree(outDir);
  demoTree = await hashTree(demoDir);
}, 180_000);

type Config = {
  settlements?: string;
  land?: string;
  grids: { role: string; file: string; unit: string; kind: string; [k: string]: unknown }[];
  [k: string]: unknown;
};

async function readConfig(dir: string): Promise<Config> {
  return JSON.parse(await readFile(join(dir, CONFIG), 'utf8')) as Config;
}

async function editConfig(dir: string, edit: (c: Config) => void): Promise<void> {
  const c = await readConfig(dir);
  edit(c);
  await replaceFile(dir, CONFIG, JSON.stringify(c, null, 2));
}

const gridOf = (c: Config, role: string) => c.grids.find((g) => g.role === role)!;

/** A small georeferenced Float32 GeoTIFF with the given geo keys. */
function geoTiff(fill: number, keys: Record<string, unknown>, width = 20, height = 10): Uint8Array {
  return new Uint8Array(
    writeArrayBuffer(new Float32Array(width * height).fill(fill), {
      width,
      height,
      GTRasterTypeGeoKey: 1,
      ...keys,
    }),
  );
}

const FEATURE = (geometry: unknown, properties: unknown = { name: 'X' }) => ({
  type: 'Feature',
  geometry,
  properties,
});
const collection = (...features: unknown[]) => JSON.stringify({ type: 'FeatureCollection', features });

interface Case {
  name: string;
  /** Break a linked copy of the demo inputs; return extra CLI arguments (default: --in dir --out outDir). */
  setup: (dir: string) => Promise<string[] | void>;
  culprit: RegExp[];
  env?: Record<string, string>;
}

const CASES: Case[] = [
  // The inputs config.
  {
    name: 'the inputs config is missing',
    setup: (d) => rm(join(d, CONFIG)),
    culprit: [/pile-atlas-inputs\.json/, /file not found/],
  },
  {
    name: 'the inputs config is not JSON (syntax error on line 3)',
    setup: (d) => replaceFile(d, CONFIG, '{\n  "formatVersion": 1,\n  "region": oops\n}\n'),
    culprit: [/pile-atlas-inputs\.json/, /not valid JSON/, /line 3/],
  },
  {
    name: 'the inputs config is empty',
    setup: (d) => replaceFile(d, CONFIG, ''),
    culprit: [/pile-atlas-inputs\.json/, /not valid JSON/, /end of JSON/],
  },
  {
    name: 'the inputs config is a JSON array',
    setup: (d) => replaceFile(d, CONFIG, '[1, 2, 3]'),
    culprit: [/pile-atlas-inputs\.json: Invalid input: expected object, received array/],
  },
  {
    name: 'the inputs config is a directory',
    setup: async (d) => {
      await rm(join(d, CONFIG));
      await mkdir(join(d, CONFIG));
    },
    culprit: [/pile-atlas-inputs\.json/, /is a directory/],
  },
  {
    name: 'a misspelt field in the config',
    setup: (d) => editConfig(d, (c) => (c.grids[1].unitt = c.grids[1].unit)),
    culprit: [/pile-atlas-inputs\.json/, /grids\.1/, /unitt/],
  },
  {
    name: 'an unknown formatVersion',
    setup: (d) => editConfig(d, (c) => (c.formatVersion = 2)),
    culprit: [/pile-atlas-inputs\.json/, /formatVersion/],
  },
  {
    name: 'a required role missing',
    setup: (d) => editConfig(d, (c) => (c.grids = c.grids.filter((g) => g.role !== 'bedrockDepth_m'))),
    culprit: [/pile-atlas-inputs\.json/, /missing required role bedrockDepth_m/],
  },
  {
    name: 'a role given twice',
    setup: (d) => editConfig(d, (c) => c.grids.push({ ...gridOf(c, 'meanAirTemp_C') })),
    culprit: [/pile-atlas-inputs\.json/, /meanAirTemp_C given twice/],
  },
  {
    name: 'a unit the role does not accept',
    setup: (d) => editConfig(d, (c) => (gridOf(c, 'bedrockDepth_m').unit = 'furlong')),
    culprit: [/pile-atlas-inputs\.json/, /grids\.\d\.unit/, /furlong/],
  },
  {
    name: 'a continuous role declared as classes',
    setup: (d) => editConfig(d, (c) => (gridOf(c, 'bedrockDepth_m').kind = 'class')),
    culprit: [/pile-atlas-inputs\.json/, /grids\.\d\.kind/],
  },
  {
    name: 'an empty grid list',
    setup: (d) => editConfig(d, (c) => (c.grids = [])),
    culprit: [/pile-atlas-inputs\.json/, /grids/],
  },
  {
    name: 'a config with 5,000 bad grid entries (one line, the count of further issues)',
    setup: (d) =>
      editConfig(d, (c) => {
        for (let i = 0; i < 5000; i++) c.grids.push({ role: 'nope', file: '', unit: '', kind: 'x' });
      }),
    culprit: [/pile-atlas-inputs\.json/, /\+\d{4,} more issues; --verbose lists all/],
  },
  // Paths that leave the inputs directory, and files that are not regular files.
  {
    name: 'settlements ../../../../etc/passwd',
    setup: (d) => editConfig(d, (c) => (c.settlements = '../../../../etc/passwd')),
    culprit: [/\.\.\/\.\.\/\.\.\/\.\.\/etc\/passwd/, /leaves the inputs directory/, /settlements/],
  },
  {
    name: 'settlements as an absolute path',
    setup: (d) => editConfig(d, (c) => (c.settlements = '/etc/passwd')),
    culprit: [/\/etc\/passwd/, /absolute path refused/],
  },
  {
    name: 'land as ../ of a sibling directory',
    setup: (d) => editConfig(d, (c) => (c.land = '../in/../../land.geojson')),
    culprit: [/land\.geojson/, /leaves the inputs directory/, /\bland\b/],
  },
  {
    name: 'a grid named by a path outside',
    setup: (d) => editConfig(d, (c) => (gridOf(c, 'bedrockDepth_m').file = '../bedrock-depth.tif')),
    culprit: [/\.\.\/bedrock-depth\.tif/, /leaves the inputs directory/, /grids\.\d\.file/],
  },
  {
    name: 'a grid named by an absolute path',
    setup: async (d) => {
      const abs = join(d, 'bedrock-depth.tif');
      await editConfig(d, (c) => (gridOf(c, 'bedrockDepth_m').file = abs));
    },
    culprit: [/bedrock-depth\.tif/, /absolute path refused/],
  },
  {
    name: 'a grid that is a symlink to /dev/zero',
    setup: async (d) => {
      await rm(join(d, 'bedrock-depth.tif'));
      await symlink('/dev/zero', join(d, 'bedrock-depth.tif'));
    },
    culprit: [/bedrock-depth\.tif/, /symlink pointing outside/],
  },
  {
    name: 'a grid that is a symlink to /dev/urandom',
    setup: async (d) => {
      await rm(join(d, 'soil-texture.tif'));
      await symlink('/dev/urandom', join(d, 'soil-texture.tif'));
    },
    culprit: [/soil-texture\.tif/, /symlink pointing outside/],
  },
  {
    name: 'settlements that are a symlink to a file outside',
    setup: async (d) => {
      const outside = join(dirname(d), 'secret.geojson');
      await writeFile(outside, collection());
      await rm(join(d, 'settlements.geojson'));
      await symlink(outside, join(d, 'settlements.geojson'));
    },
    culprit: [/settlements\.geojson/, /symlink pointing outside/],
  },
  {
    name: 'a grid that is a FIFO',
    setup: async (d) => {
      await rm(join(d, 'warming-rate.tif'));
      execFileSync('mkfifo', [join(d, 'warming-rate.tif')]);
    },
    culprit: [/warming-rate\.tif/, /not a regular file/],
  },
  {
    name: 'a grid that is a directory',
    setup: async (d) => {
      await rm(join(d, 'warming-rate.tif'));
      await mkdir(join(d, 'warming-rate.tif'));
    },
    culprit: [/warming-rate\.tif/, /is a directory/],
  },
  {
    name: 'a broken symlink',
    setup: async (d) => {
      await rm(join(d, 'warming-rate.tif'));
      await symlink('gone.tif', join(d, 'warming-rate.tif'));
    },
    culprit: [/warming-rate\.tif/, /broken symlink/],
  },
  {
    name: 'a symlink loop',
    setup: async (d) => {
      await rm(join(d, 'warming-rate.tif'));
      await symlink('loop-b.tif', join(d, 'warming-rate.tif'));
      await symlink('warming-rate.tif', join(d, 'loop-b.tif'));
    },
    culprit: [/warming-rate\.tif/, /symlink loop/],
  },
  {
    name: 'a file name with a NUL character',
    setup: (d) => editConfig(d, (c) => (gridOf(c, 'warming_C_per_yr').file = 'warming\u0000.tif')),
    culprit: [/grids\.\d\.file/, /NUL/],
  },
  {
    name: 'settlements file missing',
    setup: (d) => rm(join(d, 'settlements.geojson')),
    culprit: [/settlements\.geojson/, /file not found/],
  },
  // GeoJSON layers (RFC 7946).
  {
    name: 'settlements that are not JSON',
    setup: (d) => replaceFile(d, 'settlements.geojson', 'name,lon,lat\nNorth,1,75\n'),
    culprit: [/settlements\.geojson/, /not valid JSON/],
  },
  {
    name: 'settlements Point with string coordinates',
    setup: (d) =>
      replaceFile(d, 'settlements.geojson', collection(FEATURE({ type: 'Point', coordinates: ['1', '75'] }))),
    culprit: [/settlements\.geojson/, /features\.0\.geometry\.coordinates\.0/],
  },
  {
    name: 'settlements longitude 200',
    setup: (d) =>
      replaceFile(d, 'settlements.geojson', collection(FEATURE({ type: 'Point', coordinates: [200, 75] }))),
    culprit: [/settlements\.geojson/, /longitude 200 outside -180\.\.180/],
  },
  {
    name: 'settlements latitude 95',
    setup: (d) =>
      replaceFile(d, 'settlements.geojson', collection(FEATURE({ type: 'Point', coordinates: [1, 95] }))),
    culprit: [/settlements\.geojson/, /latitude 95 outside -90\.\.90/],
  },
  {
    name: 'settlements coordinate 1e400 (infinite once parsed)',
    setup: (d) =>
      replaceFile(
        d,
        'settlements.geojson',
        '{"type":"FeatureCollection","features":[{"type":"Feature","geometry":{"type":"Point","coordinates":[1e400,75]},"properties":{"name":"X"}}]}',
      ),
    culprit: [/settlements\.geojson/, /features\.0\.geometry\.coordinates\.0/],
  },
  {
    name: 'settlements position with one number',
    setup: (d) =>
      replaceFile(d, 'settlements.geojson', collection(FEATURE({ type: 'Point', coordinates: [1] }))),
    culprit: [/settlements\.geojson/, /at least two numbers/],
  },
  {
    name: 'a settlement that is a Polygon',
    setup: (d) =>
      replaceFile(
        d,
        'settlements.geojson',
        collection(
          FEATURE({
            type: 'Polygon',
            coordinates: [
              [
                [0, 75],
                [1, 75],
                [1, 76],
                [0, 75],
              ],
            ],
          }),
        ),
      ),
    culprit: [/settlements\.geojson/, /features\.0\.geometry\.type/],
  },
  {
    name: 'a settlement without a name',
    setup: (d) =>
      replaceFile(
        d,
        'settlements.geojson',
        collection(FEATURE({ type: 'Point', coordinates: [1, 75] }, { population: 3 })),
      ),
    culprit: [/settlements\.geojson/, /features\.0\.properties\.name/],
  },
  {
    name: 'settlements that are a single Feature, not a FeatureCollection',
    setup: (d) =>
      replaceFile(d, 'settlements.geojson', JSON.stringify(FEATURE({ type: 'Point', coordinates: [1, 75] }))),
    culprit: [/settlements\.geojson/, /type/],
  },
  {
    name: 'land with an unclosed ring',
    setup: (d) =>
      replaceFile(
        d,
        'land.geojson',
        collection(
          FEATURE({
            type: 'Polygon',
            coordinates: [
              [
                [0, 75],
                [1, 75],
                [1, 76],
                [0, 76],
              ],
            ],
          }),
        ),
      ),
    culprit: [/land\.geojson/, /features\.0\.geometry\.coordinates\.0/, /closed/],
  },
  {
    name: 'land with a ring of three positions',
    setup: (d) =>
      replaceFile(
        d,
        'land.geojson',
        collection(
          FEATURE({
            type: 'Polygon',
            coordinates: [
              [
                [0, 75],
                [1, 75],
                [0, 75],
              ],
            ],
          }),
        ),
      ),
    culprit: [/land\.geojson/, /at least four positions/],
  },
  {
    name: 'land with a null coordinate',
    setup: (d) =>
      replaceFile(
        d,
        'land.geojson',
        collection(
          FEATURE({
            type: 'Polygon',
            coordinates: [
              [
                [0, 75],
                [null, 75],
                [1, 76],
                [0, 75],
              ],
            ],
          }),
        ),
      ),
    culprit: [/land\.geojson/, /features\.0\.geometry\.coordinates\.0\.1\.0/],
  },
  {
    name: 'land made of Points',
    setup: (d) =>
      replaceFile(d, 'land.geojson', collection(FEATURE({ type: 'Point', coordinates: [1, 75] }))),
    culprit: [/land\.geojson/, /features\.0\.geometry/],
  },
  // GeoTIFF grids.
  {
    name: 'a grid listed in the config is missing',
    setup: (d) => rm(join(d, 'water-content.tif')),
    culprit: [/water-content\.tif/, /file not found/],
  },
  {
    name: 'a grid has no georeferencing',
    setup: async (d) => {
      await rm(join(d, 'bedrock-depth.tif'));
      await writePlainTiff(join(d, 'bedrock-depth.tif'), 20, 10);
    },
    culprit: [/bedrock-depth\.tif/, /no georeferencing/],
  },
  {
    name: 'a text file named .tif',
    setup: (d) => replaceFile(d, 'soil-texture.tif', 'texture,class\n1,gravel\n'),
    culprit: [/soil-texture\.tif/, /not a TIFF file/],
  },
  {
    name: 'an empty .tif',
    setup: (d) => replaceFile(d, 'soil-texture.tif', ''),
    culprit: [/soil-texture\.tif/, /not a TIFF file/],
  },
  {
    name: 'a truncated GeoTIFF',
    setup: async (d) => {
      const file = join(d, 'soil-texture.tif');
      await rm(file);
      await copyFile(join(demoDir, 'soil-texture.tif'), file);
      await truncate(file, 4000);
    },
    culprit: [/soil-texture\.tif/, /truncated file/],
  },
  {
    name: 'a decompression bomb: 60,000 x 60,000 Float32 in 60,000 strips sharing one payload',
    setup: (d) => replaceFile(d, 'bedrock-depth.tif', tiffBomb(60_000, 60_000)),
    culprit: [/bedrock-depth\.tif/, /60000 x 60000/, /decompression bomb/, /--max-input-mb/],
  },
  {
    name: 'a grid whose CRS is user-defined',
    setup: (d) =>
      replaceFile(
        d,
        'bedrock-depth.tif',
        geoTiff(5, {
          ModelPixelScale: [4000, 4000, 0],
          ModelTiepoint: [0, 0, 0, 600000, -1000000, 0],
          GTModelTypeGeoKey: 1,
          ProjectedCSTypeGeoKey: 32767,
        }),
      ),
    culprit: [/bedrock-depth\.tif/, /CRS cannot be read/, /user-defined/],
  },
  {
    // A code PROJ's database does not hold (EPSG:2154 and every other code GDAL knows is accepted).
    name: 'a grid in a CRS unknown to the PROJ database',
    setup: (d) =>
      replaceFile(
        d,
        'bedrock-depth.tif',
        geoTiff(5, {
          ModelPixelScale: [4000, 4000, 0],
          ModelTiepoint: [0, 0, 0, 600000, 6000000, 0],
          GTModelTypeGeoKey: 1,
          ProjectedCSTypeGeoKey: 29999,
        }),
      ),
    culprit: [/bedrock-depth\.tif/, /unsupported CRS EPSG:29999/, /PROJ database/],
  },
  {
    name: 'a grid with a zero pixel size',
    setup: (d) =>
      replaceFile(
        d,
        'bedrock-depth.tif',
        geoTiff(5, {
          ModelPixelScale: [0, 0, 0],
          ModelTiepoint: [0, 0, 0, -3, 76, 0],
          GTModelTypeGeoKey: 2,
          GeographicTypeGeoKey: 4326,
        }),
      ),
    culprit: [/bedrock-depth\.tif/, /degenerate pixel size/],
  },
  {
    name: 'grids that do not overlap',
    setup: (d) =>
      replaceFile(
        d,
        'warming-rate.tif',
        geoTiff(0.05, {
          ModelPixelScale: [0.5, 0.2, 0],
          ModelTiepoint: [0, 0, 0, 100, 66, 0],
          GTModelTypeGeoKey: 2,
          GeographicTypeGeoKey: 4326,
        }),
      ),
    culprit: [/warming-rate\.tif/, /grids do not overlap/],
  },
  {
    name: 'a grid that is all nodata',
    setup: async (d) => {
      await replaceFile(
        d,
        'bedrock-depth.tif',
        geoTiff(-9999, {
          ModelPixelScale: [0.5, 0.2, 0],
          ModelTiepoint: [0, 0, 0, -8, 77, 0],
          GTModelTypeGeoKey: 2,
          GeographicTypeGeoKey: 4326,
        }),
      );
      await editConfig(d, (c) => (gridOf(c, 'bedrockDepth_m').nodata = -9999));
    },
    culprit: [/bedrock-depth\.tif/, /holds no data/],
  },
  {
    name: 'a band declared in the wrong unit',
    setup: (d) => editConfig(d, (c) => (gridOf(c, 'meanAirTemp_C').unit = 'K')),
    culprit: [/mean-air-temperature\.tif/, /meanAirTemp_C/, /plausible range -40\.\.25/, /"K"/],
  },
  {
    name: 'a class grid with fractional codes',
    setup: (d) =>
      replaceFile(
        d,
        'soil-texture.tif',
        geoTiff(2.5, {
          ModelPixelScale: [0.5, 0.2, 0],
          ModelTiepoint: [0, 0, 0, -8, 77, 0],
          GTModelTypeGeoKey: 2,
          GeographicTypeGeoKey: 4326,
        }),
      ),
    culprit: [/soil-texture\.tif/, /textureClass value 2\.5/, /integer class codes/],
  },
  // The scenario file.
  ...scenarioCases(),
  // Options and the output directory.
  {
    name: '--cell-size 0',
    setup: async (d) => ['--in', d, '--out', outDir, '--cell-size', '0'],
    culprit: [/--cell-size/, /\[50, 50000\]/],
  },
  {
    name: '--workers abc',
    setup: async (d) => ['--in', d, '--out', outDir, '--workers', 'abc'],
    culprit: [/--workers/, /"abc"/],
  },
  {
    name: 'an unknown option',
    setup: async (d) => ['--in', d, '--out', outDir, '--frobnicate'],
    culprit: [/unknown option --frobnicate/],
  },
  {
    name: '--model foo',
    setup: async (d) => ['--in', d, '--out', outDir, '--model', 'foo'],
    culprit: [/--model/, /"foo"/],
  },
  {
    name: '--in that does not exist',
    setup: async (d) => ['--in', join(d, 'nope'), '--out', outDir],
    culprit: [/--in .*nope/, /not found/],
  },
  {
    name: 'an analysis grid over the cell budget (--max-cells 100)',
    setup: async (d) => ['--in', d, '--out', outDir, '--max-cells', '100'],
    culprit: [/analysis grid/, /over the budget of 100 cells/, /--max-cells/],
  },
  {
    // The demo region spans about 73.6-76.4°N.
    name: 'an analysis grid reaching south of the latitude limit (--min-latitude 76)',
    setup: async (d) => ['--in', d, '--out', outDir, '--min-latitude', '76'],
    culprit: [/analysis grid/, /reaches 7\d\.\d°N, south of the limit 76°N/, /--min-latitude/],
  },
  {
    name: 'an analysis grid over the cell budget of the inputs config (budget.maxCells 100)',
    setup: async (d) => {
      await editConfig(d, (c) => ((c as { budget?: object }).budget = { maxCells: 100 }));
      return ['--in', d, '--out', outDir];
    },
    culprit: [/analysis grid/, /over the budget of 100 cells/],
  },
  {
    name: 'a build over the memory budget (--max-memory-mb 1)',
    setup: async (d) => ['--in', d, '--out', outDir, '--max-memory-mb', '1'],
    culprit: [/memory/, /--max-memory-mb/],
  },
  {
    name: 'a build over the disk budget (--max-disk-mb 1)',
    setup: async (d) => ['--in', d, '--out', outDir, '--max-disk-mb', '1'],
    culprit: [/--out /, /disk/, /--max-disk-mb/],
  },
  {
    name: 'an input grid over the decoded-size budget (--max-input-mb 0.001)',
    setup: async (d) => ['--in', d, '--out', outDir, '--max-input-mb', '0.001'],
    culprit: [/\.tif: declares/, /--max-input-mb/],
  },
  // A full disk while writing (ENOSPC injected at each writing stage, the swap included).
  ...(['screen', 'tiles', 'manifest', 'swap', 'swapped'] as const).map((stage): Case => ({
    name: `a full disk (ENOSPC) at the ${stage} stage`,
    setup: async () => undefined,
    env: { [FAULT_ENV]: `${stage}:enospc` },
    culprit: [new RegExp(`--out ${outDirPattern()}`), /no space left/, /previous output is untouched/],
  })),
];

function outDirPattern(): string {
  return '\\S+tiles';
}

function scenarioCases(): Case[] {
  const scenario = async (content: string | null): Promise<string> => {
    const file = join(await makeTempDir('scenario'), 'scenario.json');
    if (content !== null) await writeFile(file, content);
    return file;
  };
  return [
    {
      name: 'a scenario file with a wrong field',
      setup: async (d) => [
        '--in',
        d,
        '--out',
        outDir,
        '--scenario',
        await scenario(JSON.stringify({ pile: { lenght_m: 12 } })),
      ],
      culprit: [/scenario\.json/, /pile/, /lenght_m/],
    },
    {
      name: 'a scenario field out of range',
      setup: async (d) => [
        '--in',
        d,
        '--out',
        outDir,
        '--scenario',
        await scenario(JSON.stringify({ designLife_yr: 500 })),
      ],
      culprit: [/scenario\.json/, /designLife_yr/],
    },
    {
      name: 'a scenario that is not JSON (a multi-line syntax error)',
      setup: async (d) => [
        '--in',
        d,
        '--out',
        outDir,
        '--scenario',
        await scenario('{\n "designLife_yr": 30,\n}\n'),
      ],
      culprit: [/scenario\.json/, /not valid JSON/, /line 3/],
    },
    {
      name: 'a scenario file missing',
      setup: async (d) => ['--in', d, '--out', outDir, '--scenario', await scenario(null)],
      culprit: [/scenario\.json/, /file not found/],
    },
    {
      name: 'a scenario that is a device (/dev/zero)',
      setup: async (d) => ['--in', d, '--out', outDir, '--scenario', '/dev/zero'],
      culprit: [/\/dev\/zero/, /not a regular file/],
    },
  ];
}

/** Entries beside the output that a build may have left behind. */
async function leftoversBeside(out: string): Promise<string[]> {
  const names = await readdir(dirname(out));
  return names.filter((n) => n.startsWith(`.${basename(out)}.`));
}

describe('bad-input corpus: exit 2, one line naming the culprit, previous output byte-identical', () => {
  it('has at least 50 cases, each with a distinct name', () => {
    expect(CASES.length).toBeGreaterThanOrEqual(50);
    expect(new Set(CASES.map((c) => c.name)).size).toBe(CASES.length);
  });

  for (const c of CASES) {
    it(c.name, async () => {
      const dir = await linkedCopy(demoDir, 'corpus-in');
      const args = (await c.setup(dir)) ?? ['--in', dir, '--out', outDir];
      const before = await hashTree(dir);
      for (const [k, v] of Object.entries(c.env ?? {})) process.env[k] = v;
      let result;
      try {
        result = await runCli([
          'build',
          ...args,
          ...(args.includes('--cell-size') ? BUILD_FLAGS.slice(2) : BUILD_FLAGS),
        ]);
      } finally {
        for (const k of Object.keys(c.env ?? {})) delete process.env[k];
      }
      const { code, stdout, stderr } = result;
      expect(code, stderr).toBe(2);
      expect(stdout).toBe('');
      const lines = stderr.trimEnd().split('\n');
      expect(lines, stderr).toHaveLength(1);
      expect(lines[0].length).toBeLessThanOrEqual(300);
      expect(lines[0]).toMatch(/^pile-atlas build: error: /);
      expect(lines[0]).not.toMatch(/\bat .*\.ts:\d+|\n\s+at /);
      for (const f of c.culprit) expect(lines[0]).toMatch(f);
      expect(await hashTree(outDir)).toEqual(goodTree);
      expect(await leftoversBeside(outDir)).toEqual([]);
      expect(await hashTree(dir)).toEqual(before);
      expect(await hashTree(demoDir)).toEqual(demoTree);
    });
  }
});

describe('an output directory that a build would destroy is refused (exit 2, nothing touched)', () => {
  const refuse = async (inDir: string, out: string, ...culprit: RegExp[]) => {
    const protectedDir = culprit.some((c) => /contains/.test(c.source)) ? out : dirname(out);
    const before = await hashTree(protectedDir);
    const { code, stdout, stderr } = await runCli(['build', '--in', inDir, '--out', out, ...BUILD_FLAGS]);
    expect(code, stderr).toBe(2);
    expect(stdout).toBe('');
    expect(stderr.trimEnd().split('\n')).toHaveLength(1);
    for (const f of culprit) expect(stderr).toMatch(f);
    expect(await hashTree(protectedDir)).toEqual(before);
    expect(await leftoversBeside(out)).toEqual([]);
  };

  it('--out equal to --in', async () => {
    const dir = await linkedCopy(demoDir, 'same');
    await refuse(dir, dir, /--out .*is the inputs directory/);
    expect(await hashTree(dir)).toEqual(demoTree);
  });

  it('--out inside --in', async () => {
    const dir = await linkedCopy(demoDir, 'inside');
    await refuse(dir, join(dir, 'tiles'), /--out .*lies inside the inputs directory/);
  });

  it('--out containing --in', async () => {
    const dir = await linkedCopy(demoDir, 'contains');
    await refuse(dir, dirname(dir), /--out .*contains the inputs directory/);
  });

  it('--out naming an existing regular file', async () => {
    const file = join(await makeTempDir('file'), 'notes.txt');
    await writeFile(file, 'keep me\n');
    await refuse(demoDir, file, /--out .*notes\.txt: names an existing file/);
    expect(await readFile(file, 'utf8')).toBe('keep me\n');
  });

  it('--out naming a non-empty directory that is not a build', async () => {
    const home = join(await makeTempDir('home'), 'me');
    await mkdir(home);
    await writeFile(join(home, 'thesis.tex'), 'keep me\n');
    await refuse(demoDir, home, /--out .*me: an existing non-empty directory that is not a pile-atlas build/);
  });

  it('--out that is a symlink', async () => {
    const base = await makeTempDir('link');
    await mkdir(join(base, 'real'));
    await symlink(join(base, 'real'), join(base, 'out'));
    await refuse(demoDir, join(base, 'out'), /--out .*out: is a symlink/);
  });
});

describe('errors that are not bad input', () => {
  it('a bug during screening (an injected Error) is exit 1, one short line, the output untouched', async () => {
    process.env[FAULT_ENV] = 'screen:error';
    let r;
    try {
      r = await runCli(['build', '--in', demoDir, '--out', outDir, ...BUILD_FLAGS]);
    } finally {
      delete process.env[FAULT_ENV];
    }
    expect(r.code, r.stderr).toBe(1);
    const lines = r.stderr.trimEnd().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0].length).toBeLessThanOrEqual(300);
    expect(lines[0]).toMatch(/internal error .*not bad input.*Error: injected failure at screen/);
    expect(lines[0]).toMatch(/at data-pipeline\/build\/fault-points\.ts:\d+/);
    expect(await hashTree(outDir)).toEqual(goodTree);
    expect(await leftoversBeside(outDir)).toEqual([]);
  });

  it('--verbose lists every issue of a bad config, one per line', async () => {
    const dir = await linkedCopy(demoDir, 'verbose');
    await editConfig(dir, (c) => {
      for (let i = 0; i < 30; i++) c.grids.push({ role: 'nope', file: '', unit: '', kind: 'x' });
    });
    const r = await runCli(['build', '--in', dir, '--out', outDir, '--verbose', ...BUILD_FLAGS]);
    expect(r.code).toBe(2);
    const lines = r.stderr.trimEnd().split('\n');
    expect(lines.length).toBeGreaterThanOrEqual(60); // at least role and kind of each of the 30 entries
    for (const l of lines) expect(l).toMatch(/^pile-atlas build: error: pile-atlas-inputs\.json: /);
  });
});

describe('demo-data refuses to write over what is not a demo region', () => {
  it('--out naming a file, or a non-empty directory without an inputs config: exit 2, untouched', async () => {
    const base = await makeTempDir('demo-out');
    await writeFile(join(base, 'notes.txt'), 'keep me\n');
    const before = await hashTree(base);
    for (const out of [join(base, 'notes.txt'), base]) {
      const r = await runCli(['demo-data', '--out', out, '--resolution-scale', '8']);
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(/^pile-atlas demo-data: error: --out /);
    }
    expect(await hashTree(base)).toEqual(before);
  });
});
