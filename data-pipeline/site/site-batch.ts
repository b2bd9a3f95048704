/**
 * `pile-atlas site --batch <sites> --base <input.json>`: the site simulation for every site of a
 * GeoJSON FeatureCollection of Points or a CSV table, one JSON line per site on stdout as each
 * finishes (JSON Lines), progress on stderr.
 *
 * Each site's input is the base input with the site's overrides merged in: in GeoJSON the Feature's
 * `properties.site` object (deep-merged) plus `properties.name`; in CSV the columns `name`, `lon`,
 * `lat` and any column named by a dotted path into the site input (`climate.meanAirTemp_C`,
 * `pile.length_m`, `ground.layers.1.soil.texture`), numbers parsed as numbers. A site whose input fails
 * the schema, or that repeats an earlier site (same name, or same position to 1e-5 degrees), gets a
 * line with `ok: false` and its problems; the others still run. Exit code 2 when any site was bad.
 */
import { readFile } from 'node:fs/promises';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';
import { formatZodIssues } from '../../layers/validation-error';
import { InputError } from '../input-error';
import { parseJsonText } from '../read/read-json-file';
import { runEnsembleBatch, type BatchEnsembleOptions } from './site-batch-ensemble';
import { badSiteLine, siteSummary, type PreparedSite } from './site-batch-lines';

export interface BatchSite {
  name: string;
  lon: number | null;
  lat: number | null;
  overrides: Record<string, unknown>;
}

type Json = Record<string, unknown>;

function isObject(v: unknown): v is Json {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Deep merge: objects merge key by key, arrays by index, anything else replaces. */
export function mergeInput(base: unknown, over: unknown): unknown {
  if (Array.isArray(base) && isObject(over) && Object.keys(over).every((k) => /^\d+$/.test(k))) {
    const out = [...base];
    for (const [k, v] of Object.entries(over)) out[Number(k)] = mergeInput(out[Number(k)], v);
    return out;
  }
  if (isObject(base) && isObject(over)) {
    const out: Json = { ...base };
    for (const [k, v] of Object.entries(over)) out[k] = mergeInput(base[k], v);
    return out;
  }
  return over === undefined ? base : over;
}

/** `a.b.1.c = v` as nested objects ({ a: { b: { 1: { c: v } } } }). */
function setPath(target: Json, path: string, value: unknown): void {
  const keys = path.split('.');
  let t = target;
  for (const k of keys.slice(0, -1)) t = (t[k] = isObject(t[k]) ? t[k] : {}) as Json;
  t[keys[keys.length - 1]] = value;
}

/** One CSV line (RFC 4180: quoted fields, "" for a quote inside quotes). */
function csvFields(line: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cur += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      out.push(cur);
      cur = '';
    } else cur += ch;
  }
  out.push(cur);
  return out.map((f) => f.trim());
}

/** Read the sites of a GeoJSON or CSV file (by extension; content sniffed when it is neither). */
export function parseSites(file: string, text: string): BatchSite[] {
  const looksJson = /\.(geo)?json$/i.test(file) || /^\s*[{[]/.test(text);
  if (looksJson) {
    const json = parseJsonText(file, text);
    if (!isObject(json) || json.type !== 'FeatureCollection' || !Array.isArray(json.features))
      throw new InputError(`${file}: expected a GeoJSON FeatureCollection of Point features`);
    return json.features.map((f: unknown, i: number) => {
      const feature = isObject(f) ? f : {};
      const g = isObject(feature.geometry) ? feature.geometry : {};
      const props = isObject(feature.properties) ? feature.properties : {};
      const c = Array.isArray(g.coordinates) ? (g.coordinates as unknown[]) : [];
      if (g.type !== 'Point' || typeof c[0] !== 'number' || typeof c[1] !== 'number')
        throw new InputError(`${file}: features.${i}.geometry: expected a Point with longitude, latitude`);
      return {
        name: typeof props.name === 'string' && props.name ? props.name : `site ${i + 1}`,
        lon: c[0],
        lat: c[1],
        overrides: isObject(props.site) ? props.site : {},
      };
    });
  }
  const lines = text.split(/\r?\n/).filter((l) => l.trim() !== '');
  if (lines.length < 2) throw new InputError(`${file}: expected a header line and at least one site`);
  const header = csvFields(lines[0]);
  return lines.slice(1).map((line, i) => {
    const fields = csvFields(line);
    if (fields.length !== header.length)
      throw new InputError(
        `${file}: line ${i + 2}: ${fields.length} fields, the header has ${header.length}`,
      );
    const site: BatchSite = { name: `site ${i + 1}`, lon: null, lat: null, overrides: {} };
    header.forEach((col, k) => {
      const raw = fields[k];
      if (raw === '') return;
      const num = Number(raw);
      const value = Number.isFinite(num) && /^[-+]?[\d.]+(e[-+]?\d+)?$/i.test(raw) ? num : raw;
      if (col === 'name') site.name = raw;
      else if (col === 'lon' || col === 'lat') {
        if (typeof value !== 'number')
          throw new InputError(`${file}: line ${i + 2}, column ${col}: expected degrees, got "${raw}"`);
        site[col] = value;
      } else setPath(site.overrides, col, value);
    });
    return site;
  });
}

/** Merge each site's overrides into the base and check it; a repeated name or position is refused. */
export function prepareSites(sites: readonly BatchSite[], base: unknown): PreparedSite[] {
  const seenNames = new Map<string, number>();
  const seenPlaces = new Map<string, number>();
  return sites.map((site, index) => {
    const head = { index, name: site.name, lon: site.lon, lat: site.lat };
    const key = site.name.trim().toLowerCase();
    const place =
      site.lon === null || site.lat === null ? null : `${site.lon.toFixed(5)},${site.lat.toFixed(5)}`;
    const dupOf = seenNames.get(key) ?? (place ? seenPlaces.get(place) : undefined);
    if (dupOf !== undefined) return { head, problems: [`repeats site ${dupOf + 1} (${sites[dupOf].name})`] };
    seenNames.set(key, index);
    if (place) seenPlaces.set(place, index);
    const parsed = siteInputSchema.safeParse(mergeInput(base, site.overrides));
    if (!parsed.success) return { head, problems: formatZodIssues(parsed.error, { prefix: site.name }) };
    return { head, input: parsed.data };
  });
}

/** Run every site; `emit` gets each line as it finishes. Returns how many sites were bad. */
export async function runSiteBatch(options: {
  sitesFile: string;
  baseFile: string;
  emit: (line: string) => void;
  progress?: (text: string) => void;
  /** Whole result per site instead of the summary. */
  full?: boolean;
  signal?: { cancelled: boolean };
  /** Run the simulated ensemble of every site too (site-batch-ensemble.ts). */
  ensemble?: BatchEnsembleOptions;
}): Promise<{ ok: number; bad: number }> {
  const { sitesFile, baseFile, emit } = options;
  const sites = parseSites(sitesFile, await readText(sitesFile));
  const base = parseJsonText(baseFile, await readText(baseFile));
  const prepared = prepareSites(sites, base);
  if (options.ensemble) return runEnsembleBatch(prepared, { ...options, ensemble: options.ensemble });
  let ok = 0;
  let bad = 0;
  for (const site of prepared) {
    if (options.signal?.cancelled) break;
    if (!site.input) {
      bad++;
      emit(badSiteLine(site));
      continue;
    }
    const { head, input } = site;
    options.progress?.(`site ${head.index + 1}/${sites.length}: ${head.name}`);
    const t0 = performance.now();
    const r = simulateSite(input);
    ok++;
    const line = options.full
      ? { ...head, ok: true, result: r }
      : siteSummary(head, input, r, performance.now() - t0);
    emit(JSON.stringify(line));
  }
  return { ok, bad };
}

async function readText(file: string): Promise<string> {
  try {
    return await readFile(file, 'utf8');
  } catch {
    throw new InputError(`${file}: file not found or not readable`);
  }
}
