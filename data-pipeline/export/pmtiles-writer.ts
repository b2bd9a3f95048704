/**
 * Writes a PMTiles version 3 archive (the published PMTiles v3 specification, protomaps/PMTiles
 * spec/v3/spec.md): one file holding a tile pyramid, read by tile viewers with HTTP range requests.
 * The `pmtiles` npm package reads v3 archives but does not write them; it supplies the Hilbert tile ids
 * (zxyToTileId) here, and the tests read the archives back with its reader.
 *
 * Layout, in this order: the 127-byte header; the root directory; the JSON metadata; the leaf
 * directories; the tile data. Directories are serialised as the specification says (entry count,
 * then the tile-id deltas, run lengths, lengths and offsets, each a varint; an offset that follows the
 * previous entry's data directly is written 0, any other offset + 1) and gzip-compressed, as is the
 * metadata (internal compression gzip, node:zlib). Tiles must be added in increasing tile id, so the
 * tile data is in tile-id order (clustered). Identical tiles are stored once (by SHA-1 of their
 * bytes); consecutive tile ids with the same content share one entry (run length). The root directory
 * with the header fits the first 16 KiB as required; when it would not, the entries go into leaf
 * directories and the root lists the leaves.
 *
 * Memory holds the directory entries only (16 bytes-ish each): tile data is appended to a side file
 * while tiles are added, and copied after the directories when the archive is finished.
 */
import { createHash } from 'node:crypto';
import { closeSync, openSync, readSync, rmSync, writeSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { zxyToTileId } from 'pmtiles';

/** Tile types of the specification (header byte 99). */
export const PMTILES_TILE_TYPE = { unknown: 0, mvt: 1, png: 2, jpeg: 3, webp: 4, avif: 5 } as const;
/** Compression codes of the specification (header bytes 97 and 98). */
const COMPRESSION = { none: 1, gzip: 2 } as const;

const HEADER_BYTES = 127;
const ROOT_LIMIT = 16_384;

export interface PmtilesEntry {
  tileId: number;
  offset: number;
  length: number;
  runLength: number;
}

export interface PmtilesArchiveInfo {
  tileType: number;
  minZoom: number;
  maxZoom: number;
  /** [west, south, east, north] degrees. */
  bounds: [number, number, number, number];
  /** Centre shown first: defaults to the middle of the bounds at minZoom. */
  center?: [number, number, number];
  /** The JSON metadata (TileJSON-like keys: name, description, attribution, ...). */
  metadata: Record<string, unknown>;
}

function writeVarint(out: number[], value: number): void {
  if (!(Number.isSafeInteger(value) && value >= 0))
    throw new RangeError(`varint: ${value} is not a safe uint`);
  let v = value;
  while (v >= 0x80) {
    out.push((v % 0x80) | 0x80);
    v = Math.floor(v / 0x80);
  }
  out.push(v);
}

/** A directory as the specification serialises it, before compression. */
export function serializeDirectory(entries: PmtilesEntry[]): Uint8Array {
  const out: number[] = [];
  writeVarint(out, entries.length);
  let last = 0;
  for (const e of entries) {
    writeVarint(out, e.tileId - last);
    last = e.tileId;
  }
  for (const e of entries) writeVarint(out, e.runLength);
  for (const e of entries) writeVarint(out, e.length);
  entries.forEach((e, i) => {
    const prev = entries[i - 1];
    writeVarint(out, i > 0 && e.offset === prev.offset + prev.length ? 0 : e.offset + 1);
  });
  return Uint8Array.from(out);
}

/** Root and leaf directories (gzip): everything in the root if it fits the first 16 KiB, else leaves. */
export function buildDirectories(entries: PmtilesEntry[]): { root: Uint8Array; leaves: Uint8Array } {
  const whole = gzipSync(serializeDirectory(entries));
  if (HEADER_BYTES + whole.length <= ROOT_LIMIT) return { root: whole, leaves: new Uint8Array(0) };
  for (let leafSize = 4096; ; leafSize *= 2) {
    const rootEntries: PmtilesEntry[] = [];
    const parts: Uint8Array[] = [];
    let offset = 0;
    for (let i = 0; i < entries.length; i += leafSize) {
      const leaf = gzipSync(serializeDirectory(entries.slice(i, i + leafSize)));
      rootEntries.push({ tileId: entries[i].tileId, offset, length: leaf.length, runLength: 0 });
      parts.push(leaf);
      offset += leaf.length;
    }
    const root = gzipSync(serializeDirectory(rootEntries));
    if (HEADER_BYTES + root.length <= ROOT_LIMIT) return { root, leaves: Buffer.concat(parts) };
  }
}

function setUint64(view: DataView, at: number, value: number): void {
  view.setBigUint64(at, BigInt(value), true);
}

const e7 = (deg: number) => Math.round(deg * 1e7);

/** The 127-byte header. */
function headerBytes(
  s: {
    rootOffset: number;
    rootLength: number;
    metadataOffset: number;
    metadataLength: number;
    leavesOffset: number;
    leavesLength: number;
    dataOffset: number;
    dataLength: number;
    addressed: number;
    entries: number;
    contents: number;
  },
  info: PmtilesArchiveInfo,
): Uint8Array {
  const out = new Uint8Array(HEADER_BYTES);
  const view = new DataView(out.buffer);
  out.set(new TextEncoder().encode('PMTiles'), 0);
  out[7] = 3;
  setUint64(view, 8, s.rootOffset);
  setUint64(view, 16, s.rootLength);
  setUint64(view, 24, s.metadataOffset);
  setUint64(view, 32, s.metadataLength);
  setUint64(view, 40, s.leavesOffset);
  setUint64(view, 48, s.leavesLength);
  setUint64(view, 56, s.dataOffset);
  setUint64(view, 64, s.dataLength);
  setUint64(view, 72, s.addressed);
  setUint64(view, 80, s.entries);
  setUint64(view, 88, s.contents);
  out[96] = 1; // clustered: tile data in tile-id order
  out[97] = COMPRESSION.gzip;
  // Tile compression: PNG (and JPEG, WebP, AVIF) carry their own; MVT would be gzip.
  out[98] = info.tileType === PMTILES_TILE_TYPE.mvt ? COMPRESSION.gzip : COMPRESSION.none;
  out[99] = info.tileType;
  out[100] = info.minZoom;
  out[101] = info.maxZoom;
  const [w, s_, e, n] = info.bounds;
  view.setInt32(102, e7(w), true);
  view.setInt32(106, e7(s_), true);
  view.setInt32(110, e7(e), true);
  view.setInt32(114, e7(n), true);
  const center = info.center ?? [(w + e) / 2, (s_ + n) / 2, info.minZoom];
  out[118] = center[2];
  view.setInt32(119, e7(center[0]), true);
  view.setInt32(123, e7(center[1]), true);
  return out;
}

/**
 * An archive being written to `path`: `add` tiles in increasing tile id, then `finish`. `abort`
 * removes what was written. The file at `path` is complete only after `finish` (write it under a
 * temporary name and rename it, atomic-output.ts beginAtomicFile).
 */
export class PmtilesWriter {
  readonly path: string;
  private readonly dataPath: string;
  private dataFd: number | null;
  private dataLength = 0;
  private readonly entries: PmtilesEntry[] = [];
  private readonly byHash = new Map<string, { offset: number; length: number }>();
  private lastTileId = -1;
  private addressed = 0;

  constructor(path: string) {
    this.path = path;
    // Same name plus a suffix: a killed run's side file is removed with its temporary archive
    // (atomic-output.ts recoverOutput matches both names).
    this.dataPath = `${path}tiles`;
    this.dataFd = openSync(this.dataPath, 'w');
  }

  /** Tiles added so far. */
  get tileCount(): number {
    return this.addressed;
  }

  add(z: number, x: number, y: number, bytes: Uint8Array): void {
    if (this.dataFd === null) throw new Error(`${this.path}: add after finish or abort`);
    const tileId = zxyToTileId(z, x, y);
    if (tileId <= this.lastTileId) {
      throw new Error(`${this.path}: tile ${z}/${x}/${y} added out of tile-id order`);
    }
    const hash = createHash('sha1').update(bytes).digest('hex');
    let stored = this.byHash.get(hash);
    if (!stored) {
      stored = { offset: this.dataLength, length: bytes.length };
      writeSync(this.dataFd, bytes);
      this.dataLength += bytes.length;
      this.byHash.set(hash, stored);
    }
    const last = this.entries[this.entries.length - 1];
    if (last && last.tileId + last.runLength === tileId && last.offset === stored.offset) last.runLength++;
    else this.entries.push({ tileId, offset: stored.offset, length: stored.length, runLength: 1 });
    this.lastTileId = tileId;
    this.addressed++;
  }

  /** Write the archive (header, directories, metadata, tile data) and remove the side file. */
  finish(info: PmtilesArchiveInfo): void {
    if (this.dataFd === null) throw new Error(`${this.path}: finish twice`);
    if (this.entries.length === 0) throw new Error(`${this.path}: an archive needs at least one tile`);
    closeSync(this.dataFd);
    this.dataFd = null;
    const { root, leaves } = buildDirectories(this.entries);
    const metadata = gzipSync(Buffer.from(JSON.stringify(info.metadata), 'utf8'));
    const rootOffset = HEADER_BYTES;
    const metadataOffset = rootOffset + root.length;
    const leavesOffset = metadataOffset + metadata.length;
    const dataOffset = leavesOffset + leaves.length;
    const header = headerBytes(
      {
        rootOffset,
        rootLength: root.length,
        metadataOffset,
        metadataLength: metadata.length,
        leavesOffset,
        leavesLength: leaves.length,
        dataOffset,
        dataLength: this.dataLength,
        addressed: this.addressed,
        entries: this.entries.length,
        contents: this.byHash.size,
      },
      info,
    );
    const fd = openSync(this.path, 'w');
    try {
      for (const part of [header, root, metadata, leaves]) writeSync(fd, part);
      const src = openSync(this.dataPath, 'r');
      try {
        const buf = Buffer.allocUnsafe(1 << 20);
        for (let n; (n = readSync(src, buf, 0, buf.length, null)) > 0;) writeSync(fd, buf, 0, n);
      } finally {
        closeSync(src);
      }
    } finally {
      closeSync(fd);
    }
    rmSync(this.dataPath, { force: true });
  }

  abort(): void {
    if (this.dataFd !== null) closeSync(this.dataFd);
    this.dataFd = null;
    rmSync(this.dataPath, { force: true });
  }
}
