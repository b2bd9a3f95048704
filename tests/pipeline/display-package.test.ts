/**
 * The display package (data-pipeline/export/write-display-package.ts): one PMTiles v3 archive of PNG
 * tiles per band. Read back with the `pmtiles` package's reader (an implementation of the published
 * PMTiles v3 specification independent of our writer) for the header, directories and metadata, and
 * the PNG tiles decoded by GDAL's PNG driver (libpng, independent of our encoder). The colours are
 * checked against the web map's own tile colouring (web/src/map/colour-tile.ts) of the same tile.
 */
import { mkdir, readdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  Compression,
  PMTiles,
  tileIdToZxy,
  TileType,
  zxyToTileId,
  type RangeResponse,
  type Source,
} from 'pmtiles';
import { buildDirectories, PmtilesWriter } from '../../data-pipeline/export/pmtiles-writer';
import { writeDisplayPackage } from '../../data-pipeline/export/write-display-package';
import { encodePng } from '../../data-pipeline/export/png-encode';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../layers/cautions';
import type { Band } from '../../layers/screening/manifest';
import { TILE_SIZE, unpackTile } from '../../layers/screening/tile-format';
import { colourTile } from '../../web/src/map/colour-tile';
import { compileFilter, EMPTY_FILTER } from '../../web/src/filters/cell-filter';
import { buildSmallDemo, type DemoBuild } from './demo-build-fixture';
import { makeTempDir, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

/** A pmtiles Source reading a local file (the package ships browser sources only). */
class LocalFile implements Source {
  constructor(private readonly path: string) {}
  getKey() {
    return this.path;
  }
  async getBytes(offset: number, length: number): Promise<RangeResponse> {
    const all = await readFile(this.path);
    const part = all.subarray(offset, offset + length);
    return { data: part.buffer.slice(part.byteOffset, part.byteOffset + part.length) as ArrayBuffer };
  }
}

/** RGBA pixels of a PNG, decoded by GDAL (palette expanded through its colour table and tRNS alpha). */
async function decodePng(bytes: Uint8Array, dir: string, name: string) {
  const gdal = await loadGdal();
  const png = join(dir, `${name}.png`);
  const raw = join(dir, `${name}.raw`);
  await writeFile(png, bytes);
  const info = gdal.info(png);
  expect(info.driverShortName).toBe('PNG');
  const args = [
    '-of',
    'ENVI',
    '-co',
    'INTERLEAVE=BSQ',
    ...(info.bands.length === 1 ? ['-expand', 'rgba'] : []),
  ];
  gdal.translate(png, raw, args);
  const planar = await readFile(raw); // band-sequential: R plane, G, B, A
  const [w, h] = info.size;
  const rgba = new Uint8Array(w * h * 4);
  for (let i = 0; i < w * h; i++) for (let b = 0; b < 4; b++) rgba[i * 4 + b] = planar[b * w * h + i];
  return { width: w, height: h, rgba, bands: info.bands.length };
}

describe('PNG encoder', () => {
  it('an image of few colours is indexed, of many truecolour; both decode (GDAL) to the same RGBA', async () => {
    const dir = await makeTempDir('png');
    const [w, h] = [37, 21];
    const few = new Uint8Array(w * h * 4);
    const many = new Uint8Array(w * h * 4);
    for (let i = 0; i < w * h; i++) {
      const k = i % 5;
      few.set(k === 0 ? [0, 0, 0, 0] : [50 * k, 255 - 40 * k, 7 * k, 255], i * 4);
      many.set([i % 256, (i * 7) % 256, (i >> 8) % 256, 255 - (i % 3)], i * 4);
    }
    const a = await decodePng(encodePng(w, h, few), dir, 'few');
    expect([a.width, a.height, a.bands]).toEqual([w, h, 1]);
    expect(Array.from(a.rgba)).toEqual(Array.from(few));
    const b = await decodePng(encodePng(w, h, many), dir, 'many');
    expect([b.width, b.height, b.bands]).toEqual([w, h, 4]);
    expect(Array.from(b.rgba)).toEqual(Array.from(many));
  });
});

describe('PMTiles v3 writer', () => {
  it('round trip through the pmtiles reader: header, leaf directories, dedup and run lengths', async () => {
    const dir = await makeTempDir('pmtiles');
    const path = join(dir, 'synthetic.pmtiles');
    const writer = new PmtilesWriter(path);
    // z 8: 65 536 tiles, every other tile present, tiles 0..5 all present and sharing one payload (one
    // entry with a run length); the others are one of 4001 payloads picked
    // pseudo-randomly (each stored once). Enough
    // entries of varied offsets that the directory must go into leaves.
    const pick = (k: number) => Math.floor(Math.abs(Math.sin(k)) * 4001);
    const payloadText = (k: number) => (k < 6 ? 'same' : `tile ${pick(k)}`.repeat(1 + (pick(k) % 7)));
    const payload = (k: number) => new TextEncoder().encode(payloadText(k));
    const first = zxyToTileId(8, 0, 0);
    const ks: number[] = [];
    for (let k = 0; k < 4 ** 8; k++) if (k < 6 || k % 2 === 0) ks.push(k);
    for (const k of ks) {
      const [z, x, y] = tileIdToZxy(first + k);
      writer.add(z, x, y, payload(k));
    }
    writer.finish({
      tileType: 2,
      minZoom: 8,
      maxZoom: 8,
      bounds: [-10.5, 70.25, 4, 76],
      metadata: { name: 'Synthetic °C' },
    });
    const archive = new PMTiles(new LocalFile(path));
    const header = await archive.getHeader();
    // Header fields as the v3 specification defines them.
    expect(header.specVersion).toBe(3);
    expect(header.tileType).toBe(TileType.Png);
    expect(header.internalCompression).toBe(Compression.Gzip);
    expect(header.tileCompression).toBe(Compression.None);
    expect(header.clustered).toBe(true);
    expect([header.minZoom, header.maxZoom]).toEqual([8, 8]);
    expect([header.minLon, header.minLat, header.maxLon, header.maxLat]).toEqual([-10.5, 70.25, 4, 76]);
    expect(header.numAddressedTiles).toBe(ks.length);
    expect(header.numTileContents).toBe(new Set(ks.map(payloadText)).size);
    // Tiles 0..5: one entry of run length 6 (ids 0..5 consecutive, one content); tile 6 follows it
    // with another content.
    expect(header.numTileEntries).toBe(ks.length - 5);
    expect(header.leafDirectoryLength).toBeGreaterThan(0);
    expect(header.rootDirectoryOffset + header.rootDirectoryLength).toBeLessThanOrEqual(16_384);
    expect(await archive.getMetadata()).toEqual({ name: 'Synthetic °C' });
    const decoder = new TextDecoder();
    for (const k of [0, 4, 5, 6, 7, 9, 3000, 12_003, 50_000, 4 ** 8 - 1]) {
      const [z, x, y] = tileIdToZxy(first + k);
      const tile = await archive.getZxy(z, x, y);
      if (k < 6 || k % 2 === 0) expect(decoder.decode(tile?.data)).toBe(decoder.decode(payload(k)));
      else expect(tile).toBeUndefined();
    }
  });

  it('a small directory stays in the root; a large one moves to leaves', () => {
    const entries = (n: number) =>
      Array.from({ length: n }, (_, i) => ({ tileId: 3 * i, offset: 1000 * i, length: 999, runLength: 1 }));
    expect(buildDirectories(entries(100)).leaves.length).toBe(0);
    const big = buildDirectories(entries(40_000));
    expect(big.leaves.length).toBeGreaterThan(0);
    expect(127 + big.root.length).toBeLessThanOrEqual(16_384);
  });

  it('refuses tiles out of tile-id order (the archive is clustered)', async () => {
    const dir = await makeTempDir('pmtiles-order');
    const writer = new PmtilesWriter(join(dir, 'x.pmtiles'));
    writer.add(3, 2, 2, Uint8Array.of(1));
    expect(() => writer.add(2, 0, 0, Uint8Array.of(2))).toThrow(/out of tile-id order/);
    writer.abort();
  });
});

describe('display package of a demo build', () => {
  let demo: DemoBuild;
  beforeAll(async () => {
    demo = await buildSmallDemo();
  }, 120_000);

  const archiveOf = (band: Band) =>
    new PMTiles(new LocalFile(join(demo.outDir, 'display', `${band.id}.pmtiles`)));

  it('one archive per band, listed in the manifest, with the web pyramid zoom range and the metadata', async () => {
    const m = demo.manifest;
    const listed = m.parameters.display as Record<string, string>;
    expect(Object.keys(listed).sort()).toEqual(m.bands.map((b) => b.id).sort());
    const cont = m.bands.find((b) => b.kind === 'continuous' && b.unit !== '') as Band;
    const cls = m.bands.find((b) => b.kind === 'class' && (b.classes?.length ?? 0) > 1) as Band;
    for (const band of [cont, cls]) {
      expect(listed[band.id]).toBe(`display/${band.id}.pmtiles`);
      const archive = archiveOf(band);
      const h = await archive.getHeader();
      expect(h.tileType).toBe(TileType.Png);
      expect([h.minZoom, h.maxZoom]).toEqual([m.tiles.minZoom, m.tiles.maxZoom]);
      const [w, s, e, n] = m.region.bounds;
      // Bounds stored as degrees x 1e7 integers (spec): within 1e-7 degrees.
      expect(
        Math.abs(h.minLon - w) + Math.abs(h.minLat - s) + Math.abs(h.maxLon - e) + Math.abs(h.maxLat - n),
      ).toBeLessThan(4e-7);
      const meta = (await archive.getMetadata()) as Record<string, unknown>;
      expect(meta.name).toBe(band.title);
      expect(meta.unit).toBe(band.unit);
      expect(meta.format).toBe('png');
      expect(meta.cautions).toEqual([SCREENING_CAUTION, ...GROUND_CAUTIONS]);
      expect(meta.notice).toBe(FICTIONAL_DATA_NOTICE);
      expect(String(meta.attribution)).toContain(m.sources[0].provenance);
      expect(String(meta.attribution)).toContain(m.sources[0].licence);
    }
    const clsLegend = ((await archiveOf(cls).getMetadata()) as { legend: { classes: { label: string }[] } })
      .legend;
    expect(clsLegend.classes.map((c) => c.label)).toEqual(cls.classes?.map((c) => c.label));
    const contLegend = (
      (await archiveOf(cont).getMetadata()) as { legend: { stops: unknown[]; unit: string } }
    ).legend;
    expect(contLegend.stops).toHaveLength(11);
    expect(contLegend.unit).toBe(cont.unit);
  });

  it('every pixel of a package tile has the web map colour of that tile pixel; nodata transparent', async () => {
    const m = demo.manifest;
    const dir = await makeTempDir('display-px');
    const cont = m.bands.find((b) => b.kind === 'continuous' && b.unit !== '') as Band;
    const cls = m.bands.find((b) => b.kind === 'class' && (b.classes?.length ?? 0) > 1) as Band;
    const filter = compileFilter(EMPTY_FILTER, m.bands);
    let checkedTiles = 0;
    for (const band of [cont, cls]) {
      const bandIndex = m.bands.indexOf(band);
      const archive = archiveOf(band);
      for (const z of [m.tiles.minZoom, m.tiles.maxZoom]) {
        const x = (await readdir(join(demo.outDir, 'tiles', String(z)))).sort()[0];
        const y = (await readdir(join(demo.outDir, 'tiles', String(z), x))).sort()[0].replace('.bin', '');
        const bin = await readFile(join(demo.outDir, 'tiles', String(z), x, `${y}.bin`));
        const planes = unpackTile(bin, m.bands);
        // The web map's colouring of the same tile, at full opacity, no filter.
        const web = colourTile(planes, { band, bandIndex, opacity: 1, filter });
        const tile = await archive.getZxy(z, Number(x), Number(y));
        expect(tile, `${band.id} ${z}/${x}/${y}`).toBeDefined();
        const png = await decodePng(new Uint8Array(tile!.data), dir, `${band.id}-${z}`);
        expect([png.width, png.height]).toEqual([TILE_SIZE, TILE_SIZE]);
        let coloured = 0;
        let transparent = 0;
        for (let i = 0; i < TILE_SIZE * TILE_SIZE; i++) {
          const o = i * 4;
          if (web[o + 3] === 0) {
            if (png.rgba[o + 3] !== 0) throw new Error(`${band.id} pixel ${i}: web transparent, package not`);
            transparent++;
            continue;
          }
          const a = [png.rgba[o], png.rgba[o + 1], png.rgba[o + 2], png.rgba[o + 3]];
          const b = [web[o], web[o + 1], web[o + 2], web[o + 3]];
          if (a.join() !== b.join()) throw new Error(`${band.id} pixel ${i}: package ${a}, web ${b}`);
          coloured++;
        }
        // A tile of the region's edge: both land cells and nodata in it.
        expect(coloured).toBeGreaterThan(0);
        expect(transparent).toBeGreaterThan(0);
        expect(coloured + transparent).toBe(TILE_SIZE * TILE_SIZE);
        checkedTiles++;
      }
    }
    expect(checkedTiles).toBe(4);
  });

  it('a tile of the wrong size: an error naming the tile, and no archive left behind', async () => {
    const dir = await makeTempDir('display-bad');
    const z = demo.manifest.tiles.minZoom;
    await mkdir(join(dir, 'tiles', String(z), '0'), { recursive: true });
    await writeFile(join(dir, 'tiles', String(z), '0', '0.bin'), new Uint8Array(1000));
    await expect(writeDisplayPackage(dir, demo.manifest)).rejects.toThrow(
      new RegExp(
        `tiles/${z}/0/0\\.bin: 1000 bytes, expected ${demo.manifest.bands.length * TILE_SIZE ** 2 * 2}`,
      ),
    );
    expect(await readdir(join(dir, 'display'))).toEqual([]);
  });
});
