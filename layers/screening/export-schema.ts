/**
 * The one export schema of the shortlist, shared by the web (GeoJSON and CSV of the shortlisted sites,
 * web/src/shortlist/shortlist-export.ts) and the CLI (`pile-atlas shortlist`, GeoJSON and GeoPackage of
 * the matching cells or settlements, data-pipeline/shortlist/shortlist-cells.ts).
 *
 * Every export carries the same record per place, in this order:
 *   lon_deg, lat_deg          WGS 84 position, 6 decimals (0.1 m)
 *   <band>_<unit>             each continuous band, its unit in the name (groundTemp_degC, thawDelay_yr)
 *   <band>_class, _label      each class band: the integer class code and its label in words
 *   <band>_qualifier          bands bounded by the climate horizon: "after 2100", "≥ 45 yr", or null
 *                             (an ensemble build's bands are bands like any other: pilesPerTonP10_piles_per_ton,
 *                             successProbability, robustClass_class and _label; none without an ensemble)
 *   <scenario>__…             a scenario-set build: per scenario of the set, a column group of its key
 *                             figures at the place (`high_pathway_50_year_life__scenario` its name, then
 *                             `…__suitability_class`, `…__thawDelay_yr`, …: SCENARIO_KEY_BAND_IDS; in the
 *                             record's unit system, renamed like the band columns: `…__pilesPerTon_…`)
 *   cautions                  the screening cautions (layers/cautions.ts)
 *   unitSystem                the units of the record: "SI" or "North American" (UNIT_SYSTEM_NAME)
 *   fictionalData             the demo-data notice (builds from invented data only)
 * The web puts the site's name, note and rank before it and the site metrics, scenario and provenance
 * after it; the CLI puts the cell's column and row before it and the rest on the collection.
 *
 * Units: an SI export is in the units the build stores (SI, and piles per ton where the trade quotes
 * tons). A North American export ('NA': the web's unit switch on North American, `pile-atlas shortlist
 * --units na`) converts every value with the display's own table (layers/unit-systems.ts: °F, ft, mi,
 * Btu/h, US gal, short tons, kip; units the display leaves alone, such as yr, kWh/yr and piles/ton,
 * stay) and names the column with the converted unit (groundTemp_degF, alt_ft, settlementDistance_mi).
 * Each record says which system it is in (`unitSystem`), and `importBandValue` reads either back to the
 * stored SI value. Values are rounded to a meaningful step per quantity (EXPORT_STEPS; in North
 * American units the largest power of ten not coarser than the SI step, see exportStep), far finer than
 * the screening's own uncertainty and coarser than float noise.
 */
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../cautions';
import { BAND } from './band-ids';
import { horizonText } from './climate-horizon';
import type { Band, Manifest } from './manifest';
import { displayConversion, type UnitConversion, type UnitSystem } from '../unit-systems';
import { scenarioSlug } from './scenario-set';

export type { UnitSystem } from '../unit-systems';

/** How each unit system is named in the files (the `unitSystem` column and metadata). */
export const UNIT_SYSTEM_NAME: Readonly<Record<UnitSystem, string>> = {
  SI: 'SI',
  NA: 'North American',
};

/** The unit system a file's `unitSystem` text names, or null when it names none of them. */
export function unitSystemOf(text: unknown): UnitSystem | null {
  if (text === UNIT_SYSTEM_NAME.SI) return 'SI';
  if (text === UNIT_SYSTEM_NAME.NA || text === 'NA') return 'NA';
  return null;
}

const IDENTITY = (unit: string): UnitConversion => ({ unit, factor: 1, offset: 0 });

/**
 * The conversion of a stored unit into an export's system: none for SI (the stored units, piles per ton
 * included), the display's North American conversion for 'NA' (layers/unit-systems.ts).
 */
export function exportConversion(unit: string, system: UnitSystem): UnitConversion {
  return system === 'NA' ? displayConversion(unit, 'NA') : IDENTITY(unit);
}

/** The cautions text every export carries (one column, and the GeoPackage's metadata). */
export const EXPORT_CAUTIONS = [SCREENING_CAUTION, ...GROUND_CAUTIONS].join(' ');

/** The fields of a band the schema reads. */
export type ExportBand = Pick<Band, 'id' | 'unit' | 'kind' | 'classes' | 'horizon'>;

/**
 * A unit label as an identifier suffix: '°C' -> 'degC', 'piles/kW' -> 'piles_per_kW', 'm²' -> 'm2';
 * a trailing note in words is left out ('°F (difference)' -> 'degF').
 */
export function unitSlug(unit: string): string {
  return unit
    .replace(/\s+\([a-z ]+\)$/, '')
    .replace(/°/g, 'deg')
    .replace(/²/g, '2')
    .replace(/³/g, '3')
    .replace(/\//g, '_per_')
    .replace(/[·\s]+/g, '')
    .replace(/[^A-Za-z0-9_]/g, '');
}

/** Letters and digits only, lower case: how a unit suffix already in a band id is compared. */
const bare = (s: string) =>
  unitSlug(s).replace(/deg/g, '').replace(/_per_/g, '').replace(/_/g, '').toLowerCase();

/**
 * True when the band id already ends in its unit: `settlementDistance_km` (km), `waterContent_m3m3`
 * (m³/m³), `magt_C` (°C), `warming_C_per_yr` (K/yr: a temperature difference is the same in K and °C).
 */
function unitCut(id: string, unit: string): number {
  const want = bare(unit.replace(/^K(?=\/|$)/, 'C'));
  for (let cut = id.indexOf('_'); cut > 0; cut = id.indexOf('_', cut + 1)) {
    if (bare(id.slice(cut + 1)) === want) return cut;
  }
  return -1;
}

/**
 * Column of a band's value: the band id plus its unit in the export's system (class bands: `_class`,
 * the integer code). A band id that already ends in its stored unit is used as it is, so the unit is
 * never doubled (the old `waterContent_m3m3_m3_per_m3`); in North American units that suffix is
 * replaced by the converted unit (`magt_C` -> `magt_degF`, `settlementDistance_km` -> `_mi`).
 */
export function bandColumnName(band: Pick<Band, 'id' | 'unit' | 'kind'>, system: UnitSystem = 'SI'): string {
  if (band.kind === 'class') return `${band.id}_class`;
  const conv = exportConversion(band.unit, system);
  const slug = unitSlug(conv.unit);
  const cut = unitCut(band.id, band.unit);
  if (cut > 0) return conv.unit === band.unit ? band.id : `${band.id.slice(0, cut)}_${slug}`;
  return slug ? `${band.id}_${slug}` : band.id;
}

/**
 * Rounding step of each stored unit, in that unit (common practice for screening figures, chosen so
 * that the step is well below what the inputs can resolve):
 * temperatures 0.01 K; warming rates 0.0001 K/yr (0.01 K per century); depths and thicknesses 0.01 m;
 * distances 0.01 km; durations 0.1 yr (calendar years: 1, see CALENDAR_YEAR_BANDS); piles per ton 0.1;
 * power 0.1 W; heat rate per length 0.01 W/m; forces 0.1 kN; energy 1 kWh/yr; fuel 1 L/yr; CO2 0.01 t/yr;
 * money 1 currency unit; volume fractions 0.001 m³/m³; dimensionless scores, shares, ratios, COPs and
 * probabilities 0.001.
 */
export const EXPORT_STEPS: Readonly<Record<string, number>> = {
  '°C': 0.01,
  K: 0.01,
  'K/yr': 0.0001,
  '°C/yr': 0.0001,
  m: 0.01,
  km: 0.01,
  yr: 0.1,
  'piles/ton': 0.1,
  W: 0.1,
  'W/m': 0.01,
  kN: 0.1,
  'kWh/yr': 1,
  'L/yr': 1,
  't/yr': 0.01,
  'm³/m³': 0.001,
  '': 0.001,
};

/** Bands in 'yr' that are calendar years, not durations: exported as whole years. */
const CALENDAR_YEAR_BANDS: ReadonlySet<string> = new Set([
  BAND.thawYear,
  BAND.thawYearPiles,
  BAND.iceRichThawYear,
]);

/** Whether a band's values are calendar years (read "2094", never "2094 yr"). */
export function isCalendarYearBand(band: Pick<Band, 'id'>): boolean {
  return CALENDAR_YEAR_BANDS.has(band.id);
}

/** A currency code with or without '/yr' (the scenario's currency, substituted for ¤ in the build). */
const CURRENCY = /^(?:[A-Z]{3}|¤)(?:\/yr)?$/;

/**
 * The rounding step of a band in the export's units, or null when its unit has no rule (then 4
 * significant figures). North American: the largest power of ten not above the SI step expressed in
 * the converted unit (0.01 °C = 0.018 °F -> 0.01 °F; 0.01 km = 0.0062 mi -> 0.001 mi), so that a North
 * American file is never coarser than the SI one and reads back to within one SI step.
 */
export function exportStep(
  band: Pick<Band, 'id' | 'unit' | 'kind'>,
  system: UnitSystem = 'SI',
): number | null {
  if (band.kind === 'class') return 1;
  if (CALENDAR_YEAR_BANDS.has(band.id)) return 1;
  if (CURRENCY.test(band.unit)) return 1;
  const step = EXPORT_STEPS[band.unit];
  if (step === undefined) return null;
  const { factor } = exportConversion(band.unit, system);
  return factor === 1 ? step : Number(`1e${Math.floor(Math.log10(step * factor) + 1e-9)}`);
}

/** The export's value type of a band's column: class codes and calendar years are integers. */
export function exportType(band: Pick<Band, 'id' | 'unit' | 'kind'>): 'integer' | 'real' {
  return exportStep(band) === 1 && (band.kind === 'class' || CALENDAR_YEAR_BANDS.has(band.id))
    ? 'integer'
    : 'real';
}

/** `value` rounded to `step` (no float noise: 0.1 + 0.2 gives 0.3), -0 as 0. */
export function roundToStep(value: number, step: number): number {
  const decimals = Math.max(0, Math.ceil(-Math.log10(step) - 1e-9));
  const r = +(Math.round(value / step) * step).toFixed(decimals);
  return r === 0 ? 0 : r;
}

/**
 * A band's value as exported: the stored value converted to the export's system (class codes never),
 * rounded to its step (4 significant figures without a rule), nodata null.
 */
export function exportValue(
  band: Pick<Band, 'id' | 'unit' | 'kind'>,
  value: number | null | undefined,
  system: UnitSystem = 'SI',
) {
  if (value === null || value === undefined || !Number.isFinite(value)) return null;
  const c = band.kind === 'class' ? IDENTITY(band.unit) : exportConversion(band.unit, system);
  const shown = value * c.factor + c.offset;
  const step = exportStep(band, system);
  if (step === null) return +shown.toPrecision(4);
  return roundToStep(shown, step);
}

/**
 * A band's stored (SI) value from an export's column (inverse of exportValue up to its rounding):
 * looks up the band's column in the file's system; undefined when the record has no such column.
 */
export function importBandValue(
  band: Pick<Band, 'id' | 'unit' | 'kind'>,
  record: Readonly<Record<string, unknown>>,
  system: UnitSystem,
): number | null | undefined {
  const v = record[bandColumnName(band, system)];
  if (v === null) return null;
  if (typeof v !== 'number') return undefined;
  if (band.kind === 'class') return v;
  const c = exportConversion(band.unit, system);
  return (v - c.offset) / c.factor;
}

export type ExportValue = string | number | null;

/** One column of the shared record, for typed outputs (GeoPackage) and the units table. */
export interface ExportColumn {
  name: string;
  type: 'integer' | 'real' | 'text';
  /** Unit of the values ('' for text, 'class code' for class codes, '1' for dimensionless numbers). */
  unit: string;
}

/**
 * The column(s) of one band in the export's unit system: its value, its class label, its horizon
 * qualifier; `prefix` before each.
 */
export function bandColumns(band: ExportBand, prefix = '', system: UnitSystem = 'SI'): ExportColumn[] {
  const unit = band.kind === 'class' ? 'class code' : exportConversion(band.unit, system).unit || '1';
  const cols: ExportColumn[] = [
    { name: prefix + bandColumnName(band, system), type: exportType(band), unit },
  ];
  if (band.kind === 'class') cols.push({ name: `${prefix}${band.id}_label`, type: 'text', unit: '' });
  if (band.horizon) cols.push({ name: `${prefix}${band.id}_qualifier`, type: 'text', unit: '' });
  return cols;
}

/**
 * The columns of the shared record, in order (see the file comment), in the given unit system; a
 * scenario-set build's column group per scenario (scenario-key-figures.ts) before the cautions.
 */
export function exportColumns(
  manifest: Pick<Manifest, 'bands' | 'fictional'>,
  system: UnitSystem = 'SI',
  scenarios: readonly ScenarioKeyBands[] = [],
): ExportColumn[] {
  const cols: ExportColumn[] = [
    { name: 'lon_deg', type: 'real', unit: '°' },
    { name: 'lat_deg', type: 'real', unit: '°' },
  ];
  for (const band of manifest.bands) cols.push(...bandColumns(band, '', system));
  for (const set of scenarios) cols.push(...scenarioColumns(set, system));
  cols.push({ name: 'cautions', type: 'text', unit: '' });
  cols.push({ name: 'unitSystem', type: 'text', unit: '' });
  if (manifest.fictional) cols.push({ name: 'fictionalData', type: 'text', unit: '' });
  return cols;
}

/** The demo-data notice of a build from invented data (with the build's own notice when it says more). */
export function fictionalDataText(manifest: Pick<Manifest, 'notice'>): string {
  const extra = manifest.notice.includes(FICTIONAL_DATA_NOTICE) ? '' : ` ${manifest.notice}`;
  return `${FICTIONAL_DATA_NOTICE}${extra}`;
}

/**
 * The entries of one band (bandColumns' names): the value converted to the export's unit system and
 * rounded, the class label and the horizon qualifier.
 */
export function bandEntries(
  band: ExportBand,
  valueOf: (bandId: string) => number | null | undefined,
  prefix = '',
  system: UnitSystem = 'SI',
): Record<string, ExportValue> {
  const r: Record<string, ExportValue> = {};
  const v = exportValue(band, valueOf(band.id), system);
  r[prefix + bandColumnName(band, system)] = v;
  if (band.kind === 'class')
    r[`${prefix}${band.id}_label`] = band.classes?.find((c) => c.value === v)?.label ?? null;
  if (band.horizon) {
    // Past the scenario's climate horizon: "after 2100", "≥ 45 yr" (climate-horizon.ts); null otherwise.
    const text = v === null ? '' : `${v} ${exportConversion(band.unit, system).unit}`;
    r[`${prefix}${band.id}_qualifier`] = horizonText(band.horizon, valueOf(band.horizon.flagBand), text);
  }
  return r;
}

/** Every scenario's key bands and a reader of their values at the place (scenario index, band id). */
export interface ScenarioValues {
  sets: readonly ScenarioKeyBands[];
  valueOf: (scenario: number, bandId: string) => number | null | undefined;
}

/**
 * The shared record of one place: its position and the values of every band of the build (looked up by
 * band id through `valueOf`, SI as stored, null/undefined/NaN = nodata), converted to the export's unit
 * system and rounded by the schema; with `scenarios` (a scenario-set build) every scenario's key figures
 * at the place, one group each, in the same system.
 */
export function exportRecord(
  manifest: Pick<Manifest, 'bands' | 'fictional' | 'notice'>,
  lon: number,
  lat: number,
  valueOf: (bandId: string) => number | null | undefined,
  system: UnitSystem = 'SI',
  scenarios?: ScenarioValues,
): Record<string, ExportValue> {
  const r: Record<string, ExportValue> = {
    lon_deg: roundToStep(lon, 1e-6),
    lat_deg: roundToStep(lat, 1e-6),
  };
  for (const band of manifest.bands) Object.assign(r, bandEntries(band, valueOf, '', system));
  if (scenarios) Object.assign(r, scenarioRecord(scenarios.sets, scenarios.valueOf, system));
  r.cautions = EXPORT_CAUTIONS;
  r.unitSystem = UNIT_SYSTEM_NAME[system];
  if (manifest.fictional) r.fictionalData = fictionalDataText(manifest);
  return r;
}

/** Unit of every numeric column of the shared record (the collection's and the GeoPackage's `units`). */
export function exportUnits(
  manifest: Pick<Manifest, 'bands' | 'fictional'>,
  system: UnitSystem = 'SI',
  scenarios: readonly ScenarioKeyBands[] = [],
): Record<string, string> {
  return Object.fromEntries(
    exportColumns(manifest, system, scenarios)
      .filter((c) => c.type !== 'text')
      .map((c) => [c.name, c.unit]),
  );
}

/**
 * The key figures every scenario of a scenario-set build carries per place (issue 17 item 4), in the
 * order of the cell panel's key figures (web/src/panels/key-figures.ts): the suitability class, the
 * thaw delay bought by the piles, piles per ton of peak heating, the share of the heating load the
 * piles carry, and the ground temperature at pile depth at the end of the design life.
 */
export const SCENARIO_KEY_BAND_IDS: readonly string[] = [
  BAND.suitability,
  BAND.thawDelay,
  BAND.pilesPerTon,
  BAND.loadShare,
  BAND.groundTempEnd,
];

/** One scenario's column group: its name, its column prefix and its key bands as its manifest has them. */
export interface ScenarioKeyBands {
  name: string;
  /** Column prefix: the scenario's slug with underscores and a double underscore after it. */
  prefix: string;
  bands: ExportBand[];
}

/** The column prefix of a scenario: "High pathway, 50-year life" -> "high_pathway_50_year_life__". */
export function scenarioColumnPrefix(name: string): string {
  return `${scenarioSlug(name).replace(/-/g, '_')}__`;
}

/** A scenario's column group from its manifest's bands (the key bands that build has). */
export function scenarioKeyBands(name: string, bands: readonly ExportBand[]): ScenarioKeyBands {
  const keyBands = SCENARIO_KEY_BAND_IDS.map((id) => bands.find((b) => b.id === id)).filter(
    (b): b is ExportBand => b !== undefined,
  );
  return { name, prefix: scenarioColumnPrefix(name), bands: keyBands };
}

/** The bands to read for a scenario's group: its key bands and the horizon flags of their qualifiers. */
export function scenarioReadBandIds(set: ScenarioKeyBands): string[] {
  const ids = set.bands.flatMap((b) => (b.horizon ? [b.id, b.horizon.flagBand] : [b.id]));
  return [...new Set(ids)];
}

/** The columns of one scenario's group: `<prefix>scenario` (its name), then its key bands' columns. */
export function scenarioColumns(set: ScenarioKeyBands, system: UnitSystem = 'SI'): ExportColumn[] {
  return [
    { name: `${set.prefix}scenario`, type: 'text', unit: '' },
    ...set.bands.flatMap((b) => bandColumns(b, set.prefix, system)),
  ];
}

/** Every scenario's group of one place (scenarioColumns' names), values converted and rounded as the record's. */
export function scenarioRecord(
  sets: readonly ScenarioKeyBands[],
  valueOf: ScenarioValues['valueOf'],
  system: UnitSystem = 'SI',
): Record<string, ExportValue> {
  const r: Record<string, ExportValue> = {};
  sets.forEach((set, i) => {
    r[`${set.prefix}scenario`] = set.name;
    for (const b of set.bands)
      Object.assign(
        r,
        bandEntries(b, (id) => valueOf(i, id), set.prefix, system),
      );
  });
  return r;
}
