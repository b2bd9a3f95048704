/**
 * Shortlist exports and re-import (pure).
 *
 * GeoJSON: RFC 7946 FeatureCollection of Points, coordinates [lon, lat] in WGS 84 with no `crs`
 * member; every numeric property carries its unit in its name (`groundTemp_degC`, `lon_deg`); each
 * feature also carries the cautions, the fictional-data notice when it applies, the scenario and the
 * data provenance of the build, so the file still explains itself when it is passed on; with a
 * scenario-set build also every scenario's key figures at the site (scenario-figures.ts, one column
 * group per scenario, the export schema's). Columns, units and rounding are the export schema the CLI
 * shares (layers/screening/export-schema.ts), in the unit system the unit switch shows: SI (the build's
 * stored units; piles per ton) or North American (°F, ft, mi, Btu/h, US gal, short tons; the column
 * names carry the converted unit, the scenario groups' too), recorded in every record's `unitSystem`
 * and in the collection's `unitSystem` member; the site's metrics follow the same conversion
 * (METRIC_UNITS). The re-import reads either back to SI. A GeoPackage of a shortlist
 * comes from the CLI (`pile-atlas shortlist --out`, beside the GeoJSON): GDAL is too heavy for the browser.
 * CSV: one row per site with the same columns as the GeoJSON properties. Text cells that begin with
 * = + - @ tab or CR are prefixed with an apostrophe so that spreadsheets do not run them as formulas
 * (OWASP "CSV Injection"); numbers we write ourselves are plain decimals and are left as they are.
 */
import { z } from 'zod';
import type { Band, Manifest } from '../../../layers/screening/manifest';
import {
  bandColumnName,
  exportConversion,
  exportRecord,
  importBandValue,
  roundToStep,
  unitSlug,
  unitSystemOf,
  UNIT_SYSTEM_NAME,
  type ExportValue,
  type UnitSystem,
} from '../../../layers/screening/export-schema';
import { shortlistItemSchema, type ShortlistItem } from './shortlist-item';
import type { ScenarioFigures } from './scenario-figures';
import { formatZodIssues, type ValidationIssue } from '../../../layers/validation-error';

export { EXPORT_CAUTIONS, unitSlug } from '../../../layers/screening/export-schema';

type PropertyValue = ExportValue | boolean | Record<string, unknown>;

/** Property name of a band in exports (the shared schema's column: band id plus unit, or `_class`). */
export const bandPropertyName = (band: Band): string => bandColumnName(band);

/**
 * The units of the metric keys that carry one (a key ends in its SI unit, shortlist-item.ts), longest
 * suffix first; keys without one (pileCount, systemCop, yr, currency) are exported as they are.
 */
const METRIC_UNITS: ReadonlyArray<readonly [suffix: string, unit: string]> = [
  ['_L_per_yr', 'L/yr'],
  ['_t_per_yr', 't/yr'],
  ['_kW', 'kW'],
  ['_C', '°C'],
  ['_m', 'm'],
];

/**
 * A metric's export name and value: `metric_` + key (SI: as stored; North American: the unit suffix
 * replaced by the converted unit, `lowestFluid_C` -> `lowestFluid_degF`, the value converted).
 */
export function exportMetric(
  key: string,
  value: number | string | null,
  system: UnitSystem,
): [string, number | string | null] {
  const hit = system === 'NA' ? METRIC_UNITS.find(([suffix]) => key.endsWith(suffix)) : undefined;
  if (!hit) return [`metric_${key}`, value];
  const c = exportConversion(hit[1], system);
  const name = `metric_${key.slice(0, -hit[0].length)}_${unitSlug(c.unit)}`;
  return [name, typeof value === 'number' ? value * c.factor + c.offset : value];
}

/** A metric read back from an export: its SI key and value (inverse of exportMetric). */
export function importMetric(
  name: string,
  value: number | string | null,
  system: UnitSystem,
): [string, number | string | null] {
  const key = name.slice('metric_'.length);
  if (system === 'SI') return [key, value];
  for (const [suffix, unit] of METRIC_UNITS) {
    const c = exportConversion(unit, system);
    const tail = `_${unitSlug(c.unit)}`;
    if (!key.endsWith(tail)) continue;
    const si = `${key.slice(0, -tail.length)}${suffix}`;
    return [si, typeof value === 'number' ? (value - c.offset) / c.factor : value];
  }
  return [key, value];
}

/** One line naming the build and its inputs (tool, creation time, files with checksums and licences). */
export function provenanceText(manifest: Manifest): string {
  const inputs = manifest.sources
    .map(
      (s) =>
        `${s.file} (${s.role}, ${s.crs}, sha256 ${s.sha256.slice(0, 12)}…, ${s.licence}; ${s.provenance})`,
    )
    .join('; ');
  return (
    `${manifest.tool.name} ${manifest.tool.version}, tiles built ${manifest.createdAt}, region ` +
    `${manifest.region.name}${inputs ? `; inputs: ${inputs}` : ''}`
  );
}

/**
 * Properties of one site in export order (shared by GeoJSON and CSV): the site's own columns, then the
 * record the CLI writes too (layers/screening/export-schema.ts: position, bands rounded to their step,
 * cautions, demo-data notice), then the site's metrics, the scenario and the provenance.
 */
export function exportProperties(
  item: ShortlistItem,
  rank: number,
  manifest: Manifest,
  system: UnitSystem = 'SI',
  figures: ScenarioFigures | null = null,
): Record<string, PropertyValue> {
  const scenarios = figures && {
    sets: figures.sets,
    valueOf: (i: number, id: string) => figures.values.get(item.id)?.[i]?.[id],
  };
  const p: Record<string, PropertyValue> = {
    rank,
    name: item.name,
    note: item.note,
    addedAt: item.addedAt,
    origin: item.origin,
    pileAtlasId: item.id,
    ...exportRecord(manifest, item.lon, item.lat, (id) => item.values[id], system, scenarios ?? undefined),
  };
  for (const [k, v] of Object.entries(item.metrics)) {
    const [name, value] = exportMetric(k, v, system);
    p[name] = value;
  }
  p.scenario = manifest.scenario ?? null;
  // A scenario-set build: the scenario these values come from and every scenario's region figures.
  if (manifest.scenarioSet) {
    // The scenario the site's values were taken under (recorded when it was added), else the one shown.
    const recorded = item.metrics.scenario;
    p.scenarioName = typeof recorded === 'string' ? recorded : manifest.scenarioSet.current;
    p.scenarioSet = Object.fromEntries(
      manifest.scenarioSet.scenarios.map((s) => [
        s.name,
        { differences: s.differences.map((d) => d.text), ...s.keyFigures },
      ]),
    );
  }
  p.provenance = provenanceText(manifest);
  return p;
}

/** RFC 7946 FeatureCollection of the shortlist in the given (ranked) order and unit system. */
export function shortlistToGeoJSON(
  items: readonly ShortlistItem[],
  manifest: Manifest,
  system: UnitSystem = 'SI',
  figures: ScenarioFigures | null = null,
) {
  return {
    type: 'FeatureCollection' as const,
    unitSystem: UNIT_SYSTEM_NAME[system],
    features: items.map((item, i) => ({
      type: 'Feature' as const,
      geometry: {
        type: 'Point' as const,
        coordinates: [roundToStep(item.lon, 1e-6), roundToStep(item.lat, 1e-6)],
      },
      properties: exportProperties(item, i + 1, manifest, system, figures),
    })),
  };
}

/** One CSV cell: quoted when needed, formula-leading text neutralised with a leading apostrophe. */
export function csvCell(value: PropertyValue | undefined): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  let text = typeof value === 'object' ? JSON.stringify(value) : String(value);
  if (/^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** CSV (RFC 4180, CRLF line ends) with the same columns as the GeoJSON properties. */
export function shortlistToCsv(
  items: readonly ShortlistItem[],
  manifest: Manifest,
  system: UnitSystem = 'SI',
  figures: ScenarioFigures | null = null,
): string {
  const rows = items.map((item, i) => exportProperties(item, i + 1, manifest, system, figures));
  const columns: string[] = [];
  const template = exportProperties(
    { id: '', name: '', note: '', lon: 0, lat: 0, addedAt: '', origin: 'map', values: {}, metrics: {} },
    0,
    manifest,
    system,
    figures,
  );
  for (const k of Object.keys(template)) columns.push(k);
  for (const r of rows) for (const k of Object.keys(r)) if (!columns.includes(k)) columns.push(k);
  const lines = [columns.map((c) => csvCell(c)).join(',')];
  for (const r of rows) lines.push(columns.map((c) => csvCell(r[c])).join(','));
  return lines.join('\r\n') + '\r\n';
}

const importedFeatureSchema = z.object({
  type: z.literal('Feature'),
  geometry: z.object({
    type: z.literal('Point'),
    coordinates: z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]).rest(z.number()),
  }),
  properties: z.record(z.string(), z.unknown()).nullable(),
});
const importedCollectionSchema = z.object({
  type: z.literal('FeatureCollection'),
  unitSystem: z.unknown().optional(),
  features: z.array(importedFeatureSchema),
});

/**
 * The unit system of one imported feature: its own `unitSystem`, else the collection's, else SI (files
 * from before North American exports); an unknown name is an issue.
 */
function featureUnitSystem(own: unknown, collection: unknown): UnitSystem | string {
  const text = own ?? collection;
  if (text === undefined || text === null) return 'SI';
  return (
    unitSystemOf(text) ??
    `unitSystem: "${String(text)}" is not a unit system; expected "${UNIT_SYSTEM_NAME.SI}" or "${UNIT_SYSTEM_NAME.NA}"`
  );
}

/** The SI band values and metrics of one imported feature's properties in its unit system. */
function importedValues(p: Record<string, unknown>, bands: Band[], system: UnitSystem) {
  const values: Record<string, number | null> = {};
  for (const band of bands) {
    const v = importBandValue(band, p, system);
    if (v !== undefined) values[band.id] = v;
  }
  const metrics: Record<string, number | string | null> = {};
  for (const [k, v] of Object.entries(p)) {
    if (k.startsWith('metric_') && (typeof v === 'number' || typeof v === 'string' || v === null)) {
      const [key, value] = importMetric(k, v, system);
      metrics[key] = value;
    }
  }
  return { values, metrics };
}

/**
 * One problem of an imported feature in words a planner can follow to the file: the site's number in
 * the file (counted from 1) and the property, e.g. `site 3 in the file, property name: expected text`.
 */
function featureIssueInWords(index: number, issue: ValidationIssue): string {
  const path = issue.path.map(String);
  const where =
    path[0] === 'lon' || path[0] === 'lat'
      ? 'its coordinates'
      : path[0] === 'metrics'
        ? `property metric_${path[1]}`
        : `property ${path.join('.')}`;
  return `site ${index + 1} in the file, ${path.length > 0 ? where : 'the feature'}: ${issue.message}`;
}

/**
 * Read a shortlist back from a GeoJSON export (ours in SI or North American units, read back to SI; or
 * any Point FeatureCollection: unknown properties are ignored, names default). Returns the items and the problems found, with paths.
 */
export function shortlistFromGeoJSON(
  json: unknown,
  bands: Band[],
): { items: ShortlistItem[]; issues: string[] } {
  const parsed = importedCollectionSchema.safeParse(json);
  if (!parsed.success) {
    return {
      items: [],
      issues: formatZodIssues(parsed.error),
    };
  }
  const items: ShortlistItem[] = [];
  const issues: string[] = [];
  parsed.data.features.forEach((f, i) => {
    const p = f.properties ?? {};
    const system = featureUnitSystem(p.unitSystem, parsed.data.unitSystem);
    if (system !== 'SI' && system !== 'NA') {
      issues.push(`site ${i + 1} in the file, property ${system}`);
      return;
    }
    const { values, metrics } = importedValues(p, bands, system);
    const candidate = {
      id: typeof p.pileAtlasId === 'string' && p.pileAtlasId ? p.pileAtlasId : `import-${Date.now()}-${i}`,
      name: typeof p.name === 'string' ? p.name : `Imported site ${i + 1}`,
      note: typeof p.note === 'string' ? p.note : '',
      lon: f.geometry.coordinates[0],
      lat: f.geometry.coordinates[1],
      addedAt: typeof p.addedAt === 'string' ? p.addedAt : new Date().toISOString(),
      origin: p.origin === 'site' || p.origin === 'map' ? p.origin : 'import',
      values,
      metrics,
    };
    const ok = shortlistItemSchema.safeParse(candidate);
    if (ok.success) items.push(ok.data);
    else issues.push(...ok.error.issues.map((issue) => featureIssueInWords(i, issue)));
  });
  return { items, issues };
}

/** Sort key choices: name, date added, or any band / metric (numeric, nodata last). */
export type ShortlistSortKey = 'name' | 'addedAt' | `band:${string}` | `metric:${string}`;

/** A sorted copy (stable); numeric keys put missing values last in both directions. */
export function sortShortlist(
  items: readonly ShortlistItem[],
  key: ShortlistSortKey,
  direction: 'asc' | 'desc',
): ShortlistItem[] {
  const sign = direction === 'asc' ? 1 : -1;
  const numeric = (it: ShortlistItem): number | null => {
    const v = key.startsWith('band:') ? it.values[key.slice(5)] : it.metrics[key.slice(7)];
    return typeof v === 'number' && Number.isFinite(v) ? v : null;
  };
  return items
    .map((it, i) => ({ it, i }))
    .sort((a, b) => {
      if (key === 'name' || key === 'addedAt') {
        const c = a.it[key].localeCompare(b.it[key]);
        return c !== 0 ? sign * c : a.i - b.i;
      }
      const va = numeric(a.it);
      const vb = numeric(b.it);
      if (va === null && vb === null) return a.i - b.i;
      if (va === null) return 1;
      if (vb === null) return -1;
      return va !== vb ? sign * (va - vb) : a.i - b.i;
    })
    .map((x) => x.it);
}
