import { describe, expect, it } from 'vitest';
import {
  bandPropertyName,
  csvCell,
  shortlistFromGeoJSON,
  shortlistToCsv,
  shortlistToGeoJSON,
  sortShortlist,
  unitSlug,
} from '../../web/src/shortlist/shortlist-export';
import type { ShortlistItem } from '../../web/src/shortlist/shortlist-item';
import { BAND_REGISTRY } from '../../layers/screening/band-registry';
import {
  bandColumnName,
  exportColumns,
  exportRecord,
  exportStep,
  exportUnits,
  exportValue,
  roundToStep,
} from '../../layers/screening/export-schema';
import {
  createEnsembleModel,
  RANGE_METRICS,
  UNCERTAIN_CLASS,
} from '../../layers/screening/cell-ensemble-model';
import { createScreeningModel } from '../../layers/screening/cell-screening-model';
import { bandFor } from '../../data-pipeline/build/assemble-manifest';
import { testManifest } from './web-test-manifest';

const manifest = testManifest();
const item = (over: Partial<ShortlistItem>): ShortlistItem => ({
  id: 'a',
  name: 'Lanternhook east',
  note: '',
  lon: -3.1234567,
  lat: 75.0123456,
  addedAt: '2026-12-01T10:00:00.000Z',
  origin: 'map',
  values: { groundTemp: -4.5, pilesPerTon: 12, suitability: 3 },
  metrics: {},
  ...over,
});

describe('shortlist export', () => {
  it('puts units into property names', () => {
    expect(unitSlug('°C')).toBe('degC');
    expect(unitSlug('piles/ton')).toBe('piles_per_ton');
    expect(unitSlug('W/m·K')).toBe('W_per_mK');
    expect(unitSlug('km²')).toBe('km2');
    expect(manifest.bands.map(bandPropertyName)).toEqual([
      'groundTemp_degC',
      'pilesPerTon_piles_per_ton',
      'suitability_class',
    ]);
  });

  it('writes RFC 7946 GeoJSON: lon/lat order, no crs, cautions, scenario and provenance', () => {
    const fc = shortlistToGeoJSON([item({})], manifest);
    expect(fc.type).toBe('FeatureCollection');
    expect('crs' in fc).toBe(false);
    const f = fc.features[0];
    expect(f.geometry).toEqual({ type: 'Point', coordinates: [-3.123457, 75.012346] });
    const p = f.properties;
    expect(p.groundTemp_degC).toBe(-4.5);
    expect(p.suitability_class).toBe(3);
    expect(p.suitability_label).toBe('good');
    expect(p.lon_deg).toBe(-3.123457);
    expect(String(p.cautions)).toContain('Screening estimate, not a design');
    expect(String(p.cautions)).toContain('frost heave');
    expect(String(p.fictionalData)).toContain('invented');
    expect(p.scenario).toEqual({ name: 'test', warming_C_per_yr: 0.05 });
    expect(String(p.provenance)).toContain('pile-atlas 9.9.9-test');
    expect(String(p.provenance)).toContain('air.tif');
    expect(p.rank).toBe(1);
  });

  it('neutralises spreadsheet formulas in CSV text cells', () => {
    // OWASP "CSV Injection": cells starting with = + - @ tab or CR are prefixed with an apostrophe.
    expect(csvCell('=SUM(A1)')).toBe("'=SUM(A1)");
    expect(csvCell('+1')).toBe("'+1");
    expect(csvCell('-cmd')).toBe("'-cmd");
    expect(csvCell('@x')).toBe("'@x");
    expect(csvCell('\tx')).toBe("'\tx");
    expect(csvCell('\rx')).toBe(`"'\rx"`);
    expect(csvCell('a "b", c')).toBe('"a ""b"", c"');
    expect(csvCell(-4.5)).toBe('-4.5'); // numbers we write are plain decimals
    expect(csvCell(null)).toBe('');
    expect(csvCell({ a: 1 })).toBe('"{""a"":1}"');
  });

  it('writes CSV with the GeoJSON columns, one row per site', () => {
    const csv = shortlistToCsv(
      [item({ name: '=HYPERLINK("x")', note: 'north, dry' }), item({ id: 'b', name: 'B' })],
      manifest,
    );
    const lines = csv.split('\r\n');
    expect(lines).toHaveLength(4); // header, 2 rows, trailing empty
    const header = lines[0].split(',');
    const geo = Object.keys(shortlistToGeoJSON([item({})], manifest).features[0].properties);
    expect(header).toEqual(geo);
    expect(lines[1]).toContain(`"'=HYPERLINK(""x"")"`);
    expect(lines[1]).toContain('"north, dry"');
  });

  it('re-imports its own export', () => {
    const original = [
      item({ note: 'n', metrics: { pileCount: 14, thawDelay_yr: 22.5 } }),
      item({ id: 'b', name: 'B', values: { groundTemp: null } }),
    ];
    const json = JSON.parse(JSON.stringify(shortlistToGeoJSON(original, manifest)));
    const { items, issues } = shortlistFromGeoJSON(json, manifest.bands);
    expect(issues).toEqual([]);
    expect(items).toHaveLength(2);
    expect(items[0]).toEqual({ ...original[0], lon: -3.123457, lat: 75.012346 });
    expect(items[1].values.groundTemp).toBeNull();
  });

  it('reports what is wrong with a file that is not a point collection', () => {
    expect(shortlistFromGeoJSON({ type: 'Feature' }, manifest.bands).issues[0]).toMatch(/^type/);
    const bad = {
      type: 'FeatureCollection',
      features: [{ type: 'Feature', geometry: { type: 'Point', coordinates: [200, 0] }, properties: {} }],
    };
    expect(shortlistFromGeoJSON(bad, manifest.bands).issues[0]).toMatch(
      /^features\.0\.geometry\.coordinates\.0/,
    );
  });

  it('sorts by name, date or any metric, nodata last', () => {
    const list = [
      item({ id: '1', name: 'b', values: { pilesPerTon: 20 } }),
      item({ id: '2', name: 'a', values: { pilesPerTon: null } }),
      item({ id: '3', name: 'c', values: { pilesPerTon: 5 } }),
    ];
    expect(sortShortlist(list, 'band:pilesPerTon', 'asc').map((i) => i.id)).toEqual(['3', '1', '2']);
    expect(sortShortlist(list, 'band:pilesPerTon', 'desc').map((i) => i.id)).toEqual(['1', '3', '2']);
    expect(sortShortlist(list, 'name', 'asc').map((i) => i.id)).toEqual(['2', '1', '3']);
  });
});

describe('shared export schema (layers/screening/export-schema.ts)', () => {
  it('gives every registry band a rounding rule and a column name with its unit once', () => {
    for (const [id, entry] of Object.entries(BAND_REGISTRY)) {
      const band = { id, unit: entry.unit.replace('¤', 'CAD'), kind: entry.kind };
      // A missing rule would fall back to 4 significant figures; every band the builds write has one.
      expect([id, exportStep(band)]).not.toEqual([id, null]);
      const name = bandColumnName(band);
      expect(name.startsWith(id)).toBe(true);
      const slug = unitSlug(band.unit);
      if (slug && band.kind !== 'class') expect(name.endsWith(`_${slug}_${slug}`)).toBe(false);
    }
    expect(bandColumnName({ id: 'waterContent_m3m3', unit: 'm³/m³', kind: 'continuous' })).toBe(
      'waterContent_m3m3',
    );
    expect(bandColumnName({ id: 'warming_C_per_yr', unit: 'K/yr', kind: 'continuous' })).toBe(
      'warming_C_per_yr',
    );
    expect(bandColumnName({ id: 'costSaved', unit: 'CAD/yr', kind: 'continuous' })).toBe(
      'costSaved_CAD_per_yr',
    );
  });

  it('rounds to the step without float noise', () => {
    // Steps per unit: common practice for screening figures (export-schema.ts EXPORT_STEPS).
    expect(roundToStep(0.1 + 0.2, 0.01)).toBe(0.3);
    expect(roundToStep(-4.565001, 0.01)).toBe(-4.57);
    expect(roundToStep(-0.004, 0.01)).toBe(0); // not -0
    expect(exportValue({ id: 'groundTemp', unit: '°C', kind: 'continuous' }, -4.56789)).toBe(-4.57);
    expect(exportValue({ id: 'thawYear', unit: 'yr', kind: 'continuous' }, 2061.6)).toBe(2062);
    expect(exportValue({ id: 'thawDelay', unit: 'yr', kind: 'continuous' }, 22.46)).toBe(22.5);
    expect(exportValue({ id: 'costSaved', unit: 'CAD/yr', kind: 'continuous' }, 1234.5678)).toBe(1235);
    expect(exportValue({ id: 'groundTemp', unit: '°C', kind: 'continuous' }, NaN)).toBeNull();
  });
});

describe('ensemble ranges in the shared export schema (issue 14)', () => {
  // The bands of an ensemble build and of the same build without one, as the build lists them.
  const values = new Float32Array([0.2, 4]);
  const ens = createEnsembleModel({ scenario: { uncertainty: { members: 4 } } });
  const det = createScreeningModel({});
  const ensManifest = testManifest({ bands: ens.layers.map((l) => bandFor(l, values)) });
  const detManifest = testManifest({ bands: det.layers.map((l) => bandFor(l, values)) });

  it('carries P10/P50/P90 of each key figure with its unit, success probability and robust class', () => {
    const cols = exportColumns(ensManifest);
    const byName = new Map(cols.map((c) => [c.name, c]));
    for (const id of RANGE_METRICS) {
      const base = ensManifest.bands.find((b) => b.id === id)!;
      for (const p of ['P10', 'P50', 'P90']) {
        const slug = unitSlug(base.unit);
        const name = slug ? `${id}${p}_${slug}` : `${id}${p}`;
        expect(byName.get(name), name).toEqual({ name, type: 'real', unit: base.unit || '1' });
      }
    }
    expect(byName.get('pilesPerTonP10_piles_per_ton')?.unit).toBe('piles/ton');
    expect(byName.get('thawDelayP90_yr')?.unit).toBe('yr');
    expect(byName.get('successProbability')).toEqual({ name: 'successProbability', type: 'real', unit: '1' });
    expect(byName.get('robustClass_class')).toEqual({
      name: 'robustClass_class',
      type: 'integer',
      unit: 'class code',
    });
    expect(byName.get('robustClass_label')?.type).toBe('text');
    expect(exportUnits(ensManifest)['groundTempEndP50_degC']).toBe('°C');
  });

  it('rounds the ranges like their key figure and labels the robust class in words', () => {
    const raw: Record<string, number> = {
      pilesPerTonP10: 11.04,
      pilesPerTonP50: 12.46,
      pilesPerTonP90: 15.951,
      groundTempEndP10: -3.4567,
      successProbability: 0.87549,
      robustClass: UNCERTAIN_CLASS,
    };
    const r = exportRecord(ensManifest, -3, 75, (id) => raw[id]);
    // Steps of export-schema.ts EXPORT_STEPS (common practice): piles per ton 0.1, °C 0.01, shares 0.001.
    expect(r.pilesPerTonP10_piles_per_ton).toBe(11);
    expect(r.pilesPerTonP50_piles_per_ton).toBe(12.5);
    expect(r.pilesPerTonP90_piles_per_ton).toBe(16);
    expect(r.groundTempEndP10_degC).toBe(-3.46);
    expect(r.successProbability).toBe(0.875);
    expect(r.robustClass_class).toBe(UNCERTAIN_CLASS);
    expect(r.robustClass_label).toBe('uncertain');
    // A range not computed for the cell (fewer than half the members defined) is empty, not 0.
    expect(r.thawDelayP50_yr).toBeNull();
    // The cautions stay on every record.
    expect(String(r.cautions)).toContain('Screening estimate, not a design');
  });

  it('adds nothing when the build has no ensemble', () => {
    const names = exportColumns(detManifest).map((c) => c.name);
    const ensNames = exportColumns(ensManifest).map((c) => c.name);
    expect(names.some((n) => /P(10|50|90)|successProbability|robustClass|classAgreement/.test(n))).toBe(
      false,
    );
    // The ensemble build's columns are the deterministic build's plus the range columns, in the same order.
    expect(ensNames.filter((n) => names.includes(n))).toEqual(names);
    // Plus, for the thaw delay, an "after the horizon" qualifier per percentile (3) and the band saying
    // how many of them are lower bounds (thawDelayRangeBound: class and label, issue 14).
    expect(ensNames.length - names.length).toBe(RANGE_METRICS.length * 3 + 4 + 3 + 2);
    expect(ensNames).toContain('thawDelayP90_qualifier');
    expect(ensNames).toContain('thawDelayRangeBound_label');
  });
});
