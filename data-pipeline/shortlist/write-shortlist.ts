/**
 * Writers of `pile-atlas shortlist`: the RFC 7946 GeoJSON, streamed feature by feature (every match,
 * however many; the collection's counts follow the features array), and beside it the GeoPackage of
 * the same features, written by GDAL (compiled to WebAssembly) from a typed CSV the same pass writes:
 *   layer `shortlist`   the features, every column of the export schema with its type (real, integer,
 *                       text), the cautions in every row, WGS 84 (EPSG:4326)
 *   layer `units`       one row per column: name, type, unit (a table without geometry)
 *   metadata            CAUTIONS, UNITS (JSON: column -> unit), UNIT_SYSTEM (SI or North American), NOTICE, WHERE, SUBJECT, MATCHED,
 *                       RETURNED, REGION, SCENARIO, BUILD on the dataset (GDAL metadata, gpkg_metadata)
 *                       and the cautions as the layer's description (gpkg_contents)
 * Both files are written atomically (a temporary name beside the target, then a rename).
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Feature } from 'geojson';
import { EXPORT_CAUTIONS, type ExportColumn } from '../../layers/screening/export-schema';
import { beginAtomicFile } from '../build/atomic-output';
import { faultPoint } from '../build/fault-points';
import { GdalError, loadGdal } from '../gdal/gdal-wasm';
import type { ShortlistRun } from './shortlist-cells';

/** Where text goes: a chunk at a time, the promise resolving when the sink can take more. */
export type TextSink = (chunk: string) => Promise<void>;

/** Chunks of about 1 MB: few writes, little memory. */
const CHUNK = 1 << 20;

/** A sink writing to a file descriptor (synchronous writes, nothing buffered beyond one chunk). */
function fdSink(fd: number): TextSink {
  return async (chunk) => {
    writeSync(fd, chunk);
  };
}

/** A sink writing to a stream (stdout), waiting for 'drain' when the stream asks for it. */
export function streamSink(stream: NodeJS.WritableStream): TextSink {
  return (chunk) =>
    new Promise((resolve) => {
      if (stream.write(chunk)) resolve();
      else stream.once('drain', () => resolve());
    });
}

/** A CSV cell (RFC 4180): quoted when it holds a comma, a quote or a line break. */
function csvCell(v: unknown): string {
  if (v === null || v === undefined) return '';
  const text = typeof v === 'object' ? JSON.stringify(v) : String(v);
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** WKT of a feature's point or polygon (the only geometries the shortlist writes). */
function wkt(f: Feature): string {
  const g = f.geometry;
  if (g.type === 'Point') return `POINT (${g.coordinates[0]} ${g.coordinates[1]})`;
  if (g.type === 'Polygon') {
    const rings = g.coordinates.map((r) => `(${r.map((p) => `${p[0]} ${p[1]}`).join(', ')})`);
    return `POLYGON (${rings.join(', ')})`;
  }
  throw new Error(`shortlist: unexpected geometry ${g.type}`);
}

const CSVT: Record<ExportColumn['type'], string> = { integer: 'Integer', real: 'Real', text: 'String' };

/**
 * Stream the run's GeoJSON to `sink` and, when `csvPath` is given, the same features as a typed CSV
 * (a WKT geometry column first, then the columns; `<csvPath>t` holds the types) for the GeoPackage.
 */
export async function streamShortlist(run: ShortlistRun, sink: TextSink, csvPath?: string): Promise<void> {
  const csv = csvPath === undefined ? null : openSync(csvPath, 'w');
  try {
    let buf = '{"type":"FeatureCollection","features":[';
    let csvBuf = '';
    if (csv !== null) {
      writeCsvt(`${csvPath}t`, ['WKT', ...run.columns.map((c) => CSVT[c.type])].join(','));
      csvBuf = ['WKT', ...run.columns.map((c) => c.name)].map(csvCell).join(',') + '\n';
    }
    let first = true;
    for (const f of run.features()) {
      buf += (first ? '' : ',') + JSON.stringify(f);
      first = false;
      if (csv !== null) {
        const p = f.properties ?? {};
        csvBuf += [wkt(f), ...run.columns.map((c) => p[c.name])].map(csvCell).join(',') + '\n';
        if (csvBuf.length >= CHUNK) {
          writeSync(csv, csvBuf);
          csvBuf = '';
        }
      }
      if (buf.length >= CHUNK) {
        await sink(buf);
        buf = '';
      }
    }
    // The foreign members after the features: the counts are known only now (JSON keys have no order).
    const members = JSON.stringify(run.members());
    buf += `]${members === '{}' ? '' : `,${members.slice(1, -1)}`}}\n`;
    await sink(buf);
    if (csv !== null && csvBuf) writeSync(csv, csvBuf);
  } finally {
    if (csv !== null) closeSync(csv);
  }
}

export interface ShortlistFiles {
  /** GeoJSON output file. */
  geojson: string;
  /** GeoPackage output file, or null for none. */
  gpkg: string | null;
}

/** The GeoPackage beside a GeoJSON file: the same name with `.gpkg` for `.geojson` / `.json`. */
export function gpkgBeside(geojson: string): string {
  return /\.(geo)?json$/i.test(geojson) ? geojson.replace(/\.(geo)?json$/i, '.gpkg') : `${geojson}.gpkg`;
}

/** GDAL metadata values are one line of text. */
const oneLine = (s: unknown) => String(s ?? '').replace(/\s+/g, ' ');

/** Write the GeoJSON (and the GeoPackage) of a run, each atomically; returns the counts. */
export async function writeShortlistFiles(
  run: ShortlistRun,
  files: ShortlistFiles,
): Promise<{ matched: number; returned: number }> {
  const geo = beginAtomicFile(files.geojson);
  const gpkg = files.gpkg === null ? null : beginAtomicFile(files.gpkg);
  const work = gpkg === null ? null : await mkdtemp(join(tmpdir(), 'pile-atlas-shortlist-'));
  try {
    const fd = openSync(geo.path, 'w');
    const csvPath = work === null ? undefined : join(work, 'shortlist.csv');
    try {
      await streamShortlist(run, fdSink(fd), csvPath);
    } finally {
      closeSync(fd);
    }
    await faultPoint('shortlist', files.geojson);
    const members = run.members() as { matched: number; returned: number } & Record<string, unknown>;
    if (gpkg !== null && work !== null && csvPath !== undefined) {
      await writeGpkg(run, members, csvPath, join(work, 'units.csv'), gpkg.path, files.gpkg ?? '');
      await gpkg.commit();
    }
    await geo.commit();
    return { matched: members.matched, returned: members.returned };
  } catch (err) {
    await geo.discard();
    await gpkg?.discard();
    throw err;
  } finally {
    if (work !== null) await rm(work, { recursive: true, force: true });
  }
}

async function writeGpkg(
  run: ShortlistRun,
  members: Record<string, unknown>,
  csvPath: string,
  unitsPath: string,
  dst: string,
  label: string,
): Promise<void> {
  const gdal = await loadGdal();
  const units = Object.fromEntries(run.columns.filter((c) => c.type !== 'text').map((c) => [c.name, c.unit]));
  const build = members.build as { tool?: { name?: string; version?: string }; createdAt?: string };
  const meta: Record<string, string> = {
    CAUTIONS: EXPORT_CAUTIONS,
    UNITS: JSON.stringify(units),
    UNIT_SYSTEM: oneLine(members.unitSystem),
    NOTICE: oneLine(run.manifest.notice),
    WHERE: oneLine(members.where),
    SUBJECT: oneLine(members.subject),
    MATCHED: String(members.matched),
    RETURNED: String(members.returned),
    REGION: oneLine(members.region),
    SCENARIO: oneLine(members.scenario),
    BUILD: oneLine(`${build.tool?.name ?? ''} ${build.tool?.version ?? ''} ${build.createdAt ?? ''}`),
  };
  const mo = Object.entries(meta).flatMap(([k, v]) => ['-mo', `${k}=${v}`]);
  try {
    const csvOpen = ['KEEP_GEOM_COLUMNS=NO', 'EMPTY_STRING_AS_NULL=YES'];
    gdal.vectorTranslate(
      csvPath,
      dst,
      [
        '-f',
        'GPKG',
        '-a_srs',
        'EPSG:4326',
        '-nln',
        'shortlist',
        '-nlt',
        run.geometryType.toUpperCase(),
        '-lco',
        `DESCRIPTION=${EXPORT_CAUTIONS}`,
        '-lco',
        'IDENTIFIER=shortlist',
        '-lco',
        'GEOMETRY_NAME=geom',
        ...mo,
      ],
      csvOpen,
    );
    // The units table: one row per column, no geometry.
    const rows = run.columns.map((c) => [c.name, c.type, c.unit].map(csvCell).join(','));
    const fd = openSync(unitsPath, 'w');
    writeSync(fd, ['column,type,unit', ...rows].join('\n') + '\n');
    closeSync(fd);
    writeCsvt(`${unitsPath}t`, 'String,String,String');
    gdal.vectorTranslate(
      unitsPath,
      dst,
      [
        '-update',
        '-f',
        'GPKG',
        '-nln',
        'units',
        '-nlt',
        'NONE',
        '-lco',
        'DESCRIPTION=Unit of every column of the shortlist layer',
      ],
      csvOpen,
    );
  } catch (err) {
    if (err instanceof GdalError) throw new Error(`${label}: GeoPackage not written: ${err.message}`);
    throw err;
  }
}

function writeCsvt(path: string, types: string): void {
  const fd = openSync(path, 'w');
  writeSync(fd, types + '\n');
  closeSync(fd);
}
