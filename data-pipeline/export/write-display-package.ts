/**
 * The display package of a build: every band of the manifest as one PMTiles v3 archive of PNG tiles
 * (`display/<band>.pmtiles`), Web Mercator XYZ, 256 px, the zoom range of the web's tile pyramid,
 * coloured as the web map colours the band (layers/screening/band-colour.ts), nodata transparent.
 * A map team serves the archives from any static server that answers range requests, or opens them
 * in a GIS that reads raster PMTiles.
 *
 * The tiles are made from the web's own binary tiles (`tiles/{z}/{x}/{y}.bin`, tile-format.ts), decoded
 * exactly as the web decodes them, so every pixel of a package tile has the colour the web map draws
 * there (overview levels included: the pyramid's means and modes, coloured). One archive per band, not
 * one for all: a PMTiles archive holds one tileset (one tile per z/x/y), and a GIS or a web map adds
 * one archive as one layer with its own name, legend and unit in the archive's metadata. Each archive
 * is written under a temporary name and renamed into place (atomic-output.ts beginAtomicFile); on an
 * error none is left half written.
 *
 * The metadata (TileJSON-like keys that tile viewers show, plus the legend): name (the band's title),
 * description, unit, legend (ramp stops or classes with their colours, in the band's SI unit),
 * attribution (the inputs' provenance and licence), the cautions, the demo-data notice for invented
 * data, the region and the scenario.
 */
import { readdir, readFile, mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { zxyToTileId } from 'pmtiles';
import { bandPalette, legendRange, RAMP_STEPS } from '../../layers/screening/band-colour';
import { GROUND_CAUTIONS, SCREENING_CAUTION, FICTIONAL_DATA_NOTICE } from '../../layers/cautions';
import type { Band, Manifest } from '../../layers/screening/manifest';
import { NODATA_CODE, TILE_SIZE } from '../../layers/screening/tile-format';
import { beginAtomicFile, type AtomicFile } from '../build/atomic-output';
import { encodeIndexedPng, encodeTruecolourPng } from './png-encode';
import { PMTILES_TILE_TYPE, PmtilesWriter } from './pmtiles-writer';

export const DISPLAY_DIR = 'display';

/**
 * zlib level of the PNG tiles. Measured on the demo's tiles: level 3 deflates an indexed tile in about
 * half the time of zlib's default 6, for files about 4 % larger.
 */
const PNG_LEVEL = 3;

const hex = (rgb: readonly number[]) => '#' + rgb.map((c) => c.toString(16).padStart(2, '0')).join('');

/** The legend of a band as the archive's metadata carries it (colours as #rrggbb). */
export function displayLegend(band: Band): Record<string, unknown> {
  const { colours, indexOf } = bandPalette(band);
  if (band.kind === 'class') {
    return {
      kind: 'classes',
      classes: (band.classes ?? []).map((c) => ({
        value: c.value,
        label: c.label,
        ...(c.description ? { description: c.description } : {}),
        colour: indexOf(c.value) >= 0 ? hex(colours[indexOf(c.value)]) : null,
      })),
    };
  }
  const [lo, hi] = legendRange(band);
  const stops = Array.from({ length: 11 }, (_, i) => {
    const value = lo + (i / 10) * (hi - lo);
    return { value: +value.toPrecision(6), colour: hex(colours[indexOf(value)]) };
  });
  return {
    kind: 'ramp',
    unit: band.unit,
    min: lo,
    max: hi,
    stops,
    note:
      `${RAMP_STEPS} colours between min and max, linear in the value; values beyond the range take ` +
      'the end colours.',
  };
}

/** The inputs' provenance and licence, each distinct line once. */
function attribution(manifest: Manifest): string {
  const lines = [
    ...new Set(manifest.sources.map((s) => `${s.provenance.replace(/[.\s]+$/, '')}. Licence: ${s.licence}`)),
  ];
  return `Pile Atlas screening (${manifest.region.name}). Inputs: ${lines.join(' ')}`;
}

/** The metadata of one band's archive. */
export function displayMetadata(manifest: Manifest, band: Band): Record<string, unknown> {
  const scenario = manifest.scenario?.name;
  return {
    name: band.title,
    description: band.description,
    version: '1',
    type: 'overlay',
    format: 'png',
    minzoom: manifest.tiles.minZoom,
    maxzoom: manifest.tiles.maxZoom,
    bounds: manifest.region.bounds,
    attribution: attribution(manifest),
    unit: band.unit,
    legend: displayLegend(band),
    nodata: 'transparent (sea, outside the data, or a cell the model could not screen)',
    cautions: [SCREENING_CAUTION, ...GROUND_CAUTIONS],
    ...(manifest.fictional ? { notice: FICTIONAL_DATA_NOTICE } : {}),
    region: manifest.region.name,
    ...(typeof scenario === 'string' ? { scenario } : {}),
    generator: `pile-atlas ${manifest.tool.version}`,
  };
}

/** Every tile file of the pyramid, in increasing PMTiles tile id. */
async function pyramidTiles(tilesDir: string, minZoom: number, maxZoom: number) {
  const tiles: { z: number; x: number; y: number; id: number }[] = [];
  for (let z = minZoom; z <= maxZoom; z++) {
    const xs = await readdir(join(tilesDir, String(z))).catch(() => [] as string[]);
    for (const xName of xs) {
      for (const yName of await readdir(join(tilesDir, String(z), xName))) {
        const m = /^(\d+)\.bin$/.exec(yName);
        if (!m) continue;
        const [x, y] = [Number(xName), Number(m[1])];
        if (!(Number.isInteger(x) && x < 2 ** z && y < 2 ** z)) {
          throw new Error(`${join('tiles', String(z), xName, yName)}: no tile of zoom ${z} has this x/y`);
        }
        tiles.push({ z, x, y, id: zxyToTileId(z, x, y) });
      }
    }
  }
  return tiles.sort((a, b) => a.id - b.id);
}

/** A code whose palette entry is not computed yet. */
const UNKNOWN = -2;

/**
 * Palette entry (-1: none) of a band's tile codes: a code decoded as the web decodes it (tile-format.ts
 * unpackTile: offset + code x scale, held as Float32), then coloured (band-colour.ts). Filled on first
 * use of each code (a build uses a fraction of the 65 535 codes of most bands).
 */
export class CodePalette {
  private readonly lut = new Int16Array(NODATA_CODE + 1).fill(UNKNOWN);
  constructor(
    private readonly band: Pick<Band, 'offset' | 'scale'>,
    private readonly indexOf: (v: number) => number,
  ) {
    this.lut[NODATA_CODE] = -1;
  }
  of(code: number): number {
    const c = this.lut[code];
    if (c !== UNKNOWN) return c;
    return (this.lut[code] = this.indexOf(Math.fround(this.band.offset + code * this.band.scale)));
  }
}

/** One band's tile as PNG (null when the band has no colour anywhere in it). */
function bandTilePng(
  codes: Uint16Array,
  lut: CodePalette,
  rgba: Uint8Array,
  remap: Int16Array,
  scratch: { indices: Uint8Array; image: Uint8Array },
): Uint8Array | null {
  // Only the palette entries the tile uses (slot 0: no colour, drawn transparent).
  remap.fill(-1);
  let used = 0;
  let coloured = false;
  const { indices } = scratch;
  for (let i = 0; i < codes.length; i++) {
    const slot = lut.of(codes[i]) + 1;
    if (slot > 0) coloured = true;
    let k = remap[slot];
    if (k < 0) k = remap[slot] = used++;
    indices[i] = k;
  }
  if (!coloured) return null;
  if (used <= 256) {
    const palette = new Uint8Array(used * 4);
    for (let slot = 1; slot < remap.length; slot++) {
      const k = remap[slot];
      if (k >= 0) palette.set(rgba.subarray((slot - 1) * 4, slot * 4), k * 4);
    }
    return encodeIndexedPng(TILE_SIZE, TILE_SIZE, indices, palette, { level: PNG_LEVEL });
  }
  const { image } = scratch;
  for (let i = 0; i < codes.length; i++) {
    const c = lut.of(codes[i]);
    if (c < 0) image.fill(0, i * 4, i * 4 + 4);
    else image.set(rgba.subarray(c * 4, c * 4 + 4), i * 4);
  }
  return encodeTruecolourPng(TILE_SIZE, TILE_SIZE, image, { level: PNG_LEVEL });
}

const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** The uint16 codes of a tile file, band-planar (tile-format.ts), in host order. */
function tileCodes(bytes: Buffer, bands: number, label: string): Uint16Array {
  const expected = bands * TILE_SIZE * TILE_SIZE * 2;
  if (bytes.length !== expected) {
    throw new Error(`${label}: ${bytes.length} bytes, expected ${expected} for ${bands} bands`);
  }
  // An aligned copy of the bytes, read as uint16 directly on little-endian hosts.
  const codes = new Uint16Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.length));
  if (!LITTLE_ENDIAN_HOST) for (let i = 0; i < codes.length; i++) codes[i] = bytes.readUInt16LE(2 * i);
  return codes;
}

/**
 * Write `<dir>/display/<band>.pmtiles` for every band of `manifest` from `<dir>/tiles`. Returns band id
 * -> archive path relative to `dir` (bands without any coloured pixel get no archive).
 */
export async function writeDisplayPackage(
  dir: string,
  manifest: Manifest,
  onProgress?: (done: number, total: number) => void,
): Promise<Record<string, string>> {
  const { minZoom, maxZoom } = manifest.tiles;
  const tiles = await pyramidTiles(join(dir, 'tiles'), minZoom, maxZoom);
  await mkdir(join(dir, DISPLAY_DIR), { recursive: true });
  const n = TILE_SIZE * TILE_SIZE;
  const bands = manifest.bands.map((band) => {
    const { colours, indexOf } = bandPalette(band);
    // Palette as RGBA, fully opaque: a GIS or web map sets the layer's opacity itself.
    const rgba = new Uint8Array(colours.length * 4);
    colours.forEach((c, i) => rgba.set([c[0], c[1], c[2], 255], i * 4));
    const file = `${DISPLAY_DIR}/${band.id}.pmtiles`;
    const lut = new CodePalette(band, indexOf);
    return { band, lut, rgba, file, remap: new Int16Array(colours.length + 1) };
  });
  const files: AtomicFile[] = [];
  const writers: PmtilesWriter[] = [];
  try {
    for (const b of bands) {
      const f = beginAtomicFile(join(dir, b.file));
      files.push(f);
      writers.push(new PmtilesWriter(f.path));
    }
    const scratch = { indices: new Uint8Array(n), image: new Uint8Array(n * 4) };
    for (let t = 0; t < tiles.length; t++) {
      const { z, x, y } = tiles[t];
      const file = join('tiles', String(z), String(x), `${y}.bin`);
      const codes = tileCodes(await readFile(join(dir, file)), bands.length, file);
      bands.forEach((b, i) => {
        const png = bandTilePng(codes.subarray(i * n, (i + 1) * n), b.lut, b.rgba, b.remap, scratch);
        if (png) writers[i].add(z, x, y, png);
      });
      onProgress?.(t + 1, tiles.length);
    }
    const written: Record<string, string> = {};
    for (let i = 0; i < bands.length; i++) {
      if (writers[i].tileCount === 0) {
        writers[i].abort();
        await files[i].discard();
        continue;
      }
      writers[i].finish({
        tileType: PMTILES_TILE_TYPE.png,
        minZoom,
        maxZoom,
        bounds: manifest.region.bounds,
        metadata: displayMetadata(manifest, bands[i].band),
      });
      await files[i].commit();
      written[bands[i].band.id] = bands[i].file;
    }
    return written;
  } catch (err) {
    writers.forEach((w) => w.abort());
    await Promise.all(files.map((f) => f.discard()));
    throw err;
  }
}
