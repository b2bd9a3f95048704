/**
 * Assembles manifest.json (layers/screening/manifest.ts) from a build's pieces: quantised bands with
 * their ranges and provenance, sources with checksums, cautions, analysis grid, tile pyramid, model
 * parameters, scenario and criteria, and the run summary.
 */
import { readFile } from 'node:fs/promises';
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../layers/cautions';
import type { Band, Criterion, Manifest } from '../../layers/screening/manifest';
import type { ScreeningLayer } from '../../layers/screening/screening-model';
import { NODATA_CODE, quantisationFor, TILE_SIZE } from '../../layers/screening/tile-format';
import type { InputsConfig } from '../inputs-config';
import type { AnalysisGrid } from './analysis-grid';
import { scanBand, type BandFiles } from './band-files';
import type { LoadedInput } from './load-inputs';

export async function toolVersion(): Promise<string> {
  const text = await readFile(new URL('../../package.json', import.meta.url), 'utf8');
  return (JSON.parse(text) as { version: string }).version;
}

/** Range of the values present in one band and, for class bands, the count of each value. */
export interface BandStats {
  range: [number, number];
  counts?: Map<number, number>;
}

function accumulate(values: Float32Array, into: { min: number; max: number; counts?: Map<number, number> }) {
  const counts = into.counts;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < into.min) into.min = v;
    if (v > into.max) into.max = v;
    if (counts && v === v) counts.set(v, (counts.get(v) ?? 0) + 1);
  }
}

/** Stats of one band file, read in bounded row chunks (band-files.ts scanBand). */
export function bandStatsOf(files: BandFiles, band: number, kind: 'continuous' | 'class'): BandStats {
  const acc = {
    min: Infinity,
    max: -Infinity,
    counts: kind === 'class' ? new Map<number, number>() : undefined,
  };
  scanBand(files, band, (chunk) => accumulate(chunk, acc));
  return { range: acc.min <= acc.max ? [acc.min, acc.max] : [0, 0], counts: acc.counts };
}

function bandRange(values: Float32Array | BandStats): [number, number] {
  if (!(values instanceof Float32Array)) return values.range;
  const acc = { min: Infinity, max: -Infinity };
  accumulate(values, acc);
  return acc.min <= acc.max ? [acc.min, acc.max] : [0, 0];
}

/** Manifest band for a layer: range of the values present, quantisation covering it. */
export function bandFor(layer: ScreeningLayer, values: Float32Array | BandStats): Band {
  const [min, max] = bandRange(values);
  const q = layer.kind === 'class' ? { scale: 1, offset: 0 } : quantisationFor(min, max);
  return {
    id: layer.id,
    title: layer.title,
    unit: layer.unit,
    kind: layer.kind,
    scale: q.scale,
    offset: q.offset,
    min,
    max,
    ...(layer.ramp ? { ramp: layer.ramp } : {}),
    ...(layer.legendMin !== undefined ? { legendMin: layer.legendMin } : {}),
    ...(layer.legendMax !== undefined ? { legendMax: layer.legendMax } : {}),
    ...(layer.classes ? { classes: layer.classes } : {}),
    description: layer.description,
    source: layer.source,
    ...(layer.horizon ? { horizon: layer.horizon } : {}),
  };
}

/** Share of the screened cells in each class of a class band (label -> fraction). */
export function classShares(values: Float32Array | BandStats, classes: { value: number; label: string }[]) {
  let counts = values instanceof Float32Array ? undefined : values.counts;
  if (!counts) {
    const acc = { min: Infinity, max: -Infinity, counts: new Map<number, number>() };
    if (values instanceof Float32Array) accumulate(values, acc);
    counts = acc.counts;
  }
  let total = 0;
  for (const c of counts.values()) total += c;
  const shares: Record<string, number> = {};
  for (const c of classes) {
    const n = counts.get(c.value) ?? 0;
    if (n > 0) shares[c.label] = +(n / total).toFixed(4);
  }
  return shares;
}

export interface ManifestParts {
  config: InputsConfig;
  inputs: LoadedInput[];
  grid: AnalysisGrid;
  bands: Band[];
  bounds: [number, number, number, number];
  minZoom: number;
  maxZoom: number;
  parameters: Record<string, unknown>;
  scenario?: Record<string, unknown>;
  criteria?: Criterion[];
  summary: Record<string, unknown>;
  geotiffs?: Record<string, string>;
}

export async function assembleManifest(p: ManifestParts): Promise<Manifest> {
  const fictional = p.config.region.fictional;
  return {
    formatVersion: 1,
    tool: { name: 'pile-atlas', version: await toolVersion() },
    createdAt: new Date().toISOString(),
    fictional,
    notice: [SCREENING_CAUTION, ...GROUND_CAUTIONS, ...(fictional ? [FICTIONAL_DATA_NOTICE] : [])].join(' '),
    region: { name: p.config.region.name, bounds: p.bounds },
    tiles: {
      urlTemplate: 'tiles/{z}/{x}/{y}.bin',
      tileSize: TILE_SIZE,
      minZoom: p.minZoom,
      maxZoom: p.maxZoom,
      encoding: 'uint16-planar-le',
      nodataCode: NODATA_CODE,
    },
    analysisGrid: p.grid,
    bands: p.bands,
    sources: p.inputs.map((i) => ({
      file: i.entry.file,
      role: i.entry.role,
      crs: i.source.grid.crs,
      width: i.source.grid.width,
      height: i.source.grid.height,
      unit: i.entry.unit,
      sha256: i.source.sha256,
      provenance: i.entry.provenance ?? p.config.provenance,
      licence: i.entry.licence ?? p.config.licence,
      reading: {
        reader: i.source.gdal ? 'GDAL (WebAssembly)' : 'GeoTIFF reader (legacy)',
        ...(i.source.gdal
          ? {
              format: i.source.gdal.driver,
              dataType: i.source.gdal.dataType,
              fileUnit: i.source.gdal.fileUnit,
            }
          : {}),
        scale: i.source.scale,
        offset: i.source.offset,
        nodata: i.source.nodata,
        ...(i.source.netcdf
          ? i.source.netcdf.polygons
            ? i.source.netcdf
            : { netcdf: i.source.netcdf }
          : {}),
      },
      // The companion spread grid the ensemble reads as each cell's standard deviation or confusion
      // probability (sd-grids.ts).
      ...(i.sd
        ? {
            [i.sd.companion === 'confusion' ? 'confusionProbability' : 'standardDeviation']: {
              file: i.sd.entry.file,
              unit: i.sd.entry.unit,
              crs: i.sd.source.grid.crs,
              width: i.sd.source.grid.width,
              height: i.sd.source.grid.height,
              sha256: i.sd.source.sha256,
              nodata: i.sd.source.nodata,
              scale: i.sd.source.scale,
              offset: i.sd.source.offset,
            },
          }
        : {}),
    })),
    ...(p.config.settlements ? { settlements: 'settlements.geojson' } : {}),
    ...(p.config.land ? { land: 'land.geojson' } : {}),
    parameters: { ...p.parameters, ...(p.geotiffs ? { geotiffs: p.geotiffs } : {}) },
    ...(p.scenario ? { scenario: p.scenario } : {}),
    ...(p.criteria ? { criteria: p.criteria } : {}),
    summary: p.summary,
  };
}
