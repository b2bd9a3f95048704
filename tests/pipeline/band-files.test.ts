import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { bandFor, bandStatsOf, classShares } from '../../data-pipeline/build/assemble-manifest';
import {
  closeBandFds,
  createBandFiles,
  openBandFds,
  readBandBox,
  readBandRows,
  writeBandRows,
  type BandFiles,
} from '../../data-pipeline/build/band-files';
import { GEOTIFF_ROWS_PER_STRIP, writeBandGeoTiff } from '../../data-pipeline/export/write-band-geotiff';
import type { ScreeningLayer } from '../../layers/screening/screening-model';
import { makeTempDir, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

const WIDTH = 37;
const HEIGHT = 150;

/** Band b, cell k: a class code 1..6 on band 0 (with nodata), continuous values on band 1. */
function cellValue(b: number, k: number): number {
  if (k % 11 === 3) return NaN;
  return b === 0 ? 1 + ((k * 7) % 6) : Math.sin(k / 13) * 40 - 3.25;
}

async function filledBands(): Promise<{ files: BandFiles; whole: Float32Array[] }> {
  const files = await createBandFiles(join(await makeTempDir('bands'), 'b'), 2, WIDTH, HEIGHT);
  const whole = [0, 1].map((b) => Float32Array.from({ length: WIDTH * HEIGHT }, (_, k) => cellValue(b, k)));
  const fds = openBandFds(files, 'r+');
  // Written in uneven row windows, last one first, as worker threads may finish in any order.
  const windows: [number, number][] = [
    [128, 150],
    [0, 32],
    [32, 100],
    [100, 128],
  ];
  for (const [r0, r1] of windows) {
    for (let b = 0; b < 2; b++) writeBandRows(fds[b], WIDTH, r0, whole[b].subarray(r0 * WIDTH, r1 * WIDTH));
  }
  closeBandFds(fds);
  return { files, whole };
}

describe('band files (output bands streamed through disk)', () => {
  it('reads back any row range and any row x column box exactly as written', async () => {
    const { files, whole } = await filledBands();
    const fds = openBandFds(files, 'r');
    try {
      fc.assert(
        fc.property(
          fc.integer({ min: 0, max: 1 }),
          fc.integer({ min: 0, max: HEIGHT - 1 }),
          fc.integer({ min: 1, max: HEIGHT }),
          fc.integer({ min: 0, max: WIDTH - 1 }),
          fc.integer({ min: 1, max: WIDTH }),
          (b, row0, rows, col0, cols) => {
            const row1 = Math.min(HEIGHT, row0 + rows);
            const col1 = Math.min(WIDTH, col0 + cols);
            const strip = readBandRows(fds[b], WIDTH, row0, row1);
            expect(Array.from(strip)).toEqual(Array.from(whole[b].subarray(row0 * WIDTH, row1 * WIDTH)));
            const box = new Float32Array((row1 - row0) * (col1 - col0));
            readBandBox(fds[b], WIDTH, { row0, row1, col0, col1 }, box);
            const expected: number[] = [];
            for (let r = row0; r < row1; r++) {
              for (let c = col0; c < col1; c++) expected.push(whole[b][r * WIDTH + c]);
            }
            expect(Array.from(box)).toEqual(expected);
          },
        ),
        { numRuns: 60 },
      );
    } finally {
      closeBandFds(fds);
    }
  });

  it('gives the same manifest range and class shares from the file as from the band in memory', async () => {
    const { files, whole } = await filledBands();
    const classLayer: ScreeningLayer = {
      id: 'textureClass',
      title: 'Texture',
      unit: '',
      kind: 'class',
      classes: [1, 2, 3, 4, 5, 6].map((value) => ({ value, label: `c${value}` })),
      description: 'test band',
      source: 'test',
    };
    const continuousLayer: ScreeningLayer = {
      ...classLayer,
      id: 'x',
      kind: 'continuous',
      classes: undefined,
    };
    const classStats = bandStatsOf(files, 0, 'class');
    expect(bandFor(classLayer, classStats)).toEqual(bandFor(classLayer, whole[0]));
    expect(classShares(classStats, classLayer.classes ?? [])).toEqual(
      classShares(whole[0], classLayer.classes ?? []),
    );
    expect(Object.keys(classShares(classStats, classLayer.classes ?? [])).length).toBe(6);
    const band = bandFor(continuousLayer, bandStatsOf(files, 1, 'continuous'));
    expect(band).toEqual(bandFor(continuousLayer, whole[1]));
    expect(band.min).toBeLessThan(-40);
    expect(band.max).toBeGreaterThan(35);
  });

  it('writes the same GeoTIFF bytes from strip reads as from the whole band, a strip at a time', async () => {
    const { files, whole } = await filledBands();
    const dir = await makeTempDir('tif');
    const common = {
      width: WIDTH,
      height: HEIGHT,
      geoTransform: [-1000, 250, 0, 2000, 0, -250] as [number, number, number, number, number, number],
      crs: 'EPSG:3413',
      description: 'test band. Screening estimate, not a design.',
    };
    await writeBandGeoTiff({ ...common, path: join(dir, 'whole.tif'), values: whole[1] });
    const [fd] = openBandFds({ ...files, paths: [files.paths[1]] }, 'r');
    const requested: [number, number][] = [];
    try {
      await writeBandGeoTiff({
        ...common,
        path: join(dir, 'rows.tif'),
        readRows: (row0, row1) => {
          requested.push([row0, row1]);
          return readBandRows(fd, WIDTH, row0, row1);
        },
      });
    } finally {
      closeBandFds([fd]);
    }
    const a = await readFile(join(dir, 'whole.tif'));
    const b = await readFile(join(dir, 'rows.tif'));
    expect(b.equals(a)).toBe(true);
    expect(requested.length).toBe(Math.ceil(HEIGHT / GEOTIFF_ROWS_PER_STRIP));
    for (const [r0, r1] of requested) expect(r1 - r0).toBeLessThanOrEqual(GEOTIFF_ROWS_PER_STRIP);
    expect(requested[requested.length - 1][1]).toBe(HEIGHT);
  });

  it('rejects a GeoTIFF request with neither values nor readRows, naming both', async () => {
    const dir = await makeTempDir('tif-bad');
    await expect(
      writeBandGeoTiff({
        path: join(dir, 'x.tif'),
        width: 2,
        height: 2,
        geoTransform: [0, 1, 0, 0, 0, -1],
        crs: 'EPSG:3413',
        description: 'x',
      }),
    ).rejects.toThrow(/values or readRows/);
  });
});
