/**
 * Shortlist exports in either unit system (issue 18, item 3): column names, values, rounding and the
 * re-import of SI and North American files back to the same SI values.
 *
 * Check values come from the unit definitions (exact by definition, not from memory):
 *   °F = °C × 9/5 + 32; 1 K (difference) = 1.8 °F;
 *   1 ft = 0.3048 m, 1 mi = 1609.344 m, 1 lb = 0.45359237 kg, 1 US gal = 3.785411784 L
 *     (international yard and pound agreement, 1959; US gallon = 231 in³);
 *   1 Btu_IT = 1055.05585262 J (International Steam Table calorie, 1956), so 1 W = 3.412142 Btu/h;
 *   1 lbf = 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N, 1 kip = 1000 lbf;
 *   1 short ton = 2000 lb; 1 ton of refrigeration = 12 000 Btu/h = 3.516853 kW.
 */
import { describe, expect, it } from 'vitest';
import { BAND_REGISTRY } from '../../layers/screening/band-registry';
import {
  bandColumnName,
  exportColumns,
  exportRecord,
  exportStep,
  exportUnits,
  exportValue,
  importBandValue,
  UNIT_SYSTEM_NAME,
  unitSlug,
} from '../../layers/screening/export-schema';
import type { Band } from '../../layers/screening/manifest';
import {
  exportMetric,
  importMetric,
  shortlistFromGeoJSON,
  shortlistToCsv,
  shortlistToGeoJSON,
} from '../../web/src/shortlist/shortlist-export';
import type { ShortlistItem } from '../../web/src/shortlist/shortlist-item';
import { displayConversion } from '../../web/src/units/display-units';
import { testManifest } from './web-test-manifest';

/** The fields of one RFC 4180 line (quoted fields with doubled quotes; no line breaks inside). */
function csvFields(line: string): string[] {
  return [...line.matchAll(/(?:^|,)("(?:[^"]|"")*"|[^,]*)/g)].map((m) =>
    m[1].startsWith('"') ? m[1].slice(1, -1).replace(/""/g, '"') : m[1],
  );
}

const cont = (id: string, unit: string) => ({ id, unit, kind: 'continuous' as const });

/** Bands of every unit the registry uses, as a build lists them (invented quantisation). */
function registryBands(): Band[] {
  return Object.entries(BAND_REGISTRY).map(([id, e]) => ({
    id,
    title: e.title,
    unit: e.unit.replace('¤', 'CAD'),
    kind: e.kind,
    scale: 0.001,
    offset: -100,
    min: -50,
    max: 3000,
    description: 'd',
    source: 's',
    ...(e.kind === 'class' ? { classes: [{ value: 1, label: 'one', color: '#000000' }] } : {}),
  })) as Band[];
}

describe('export column names in North American units', () => {
  it('names each converted column with the unit the dashboard shows (the registry unitNA)', () => {
    for (const [id, entry] of Object.entries(BAND_REGISTRY)) {
      if (entry.kind === 'class') continue;
      const band = cont(id, entry.unit.replace('¤', 'CAD'));
      const col = exportColumns({ bands: [{ ...band } as Band], fictional: false }, 'NA')[2];
      const shownNA = displayConversion(band.unit, 'NA').unit || '1';
      expect([id, col.unit]).toEqual([id, shownNA]);
      // The registry's North American unit is what the map's legend prints (band-registry.ts).
      if (entry.unitNA.replace('¤', 'CAD') !== band.unit) expect(col.unit).toBe(entry.unitNA);
      expect(col.name.endsWith(`_${unitSlug(shownNA)}`) || col.name === id).toBe(true);
    }
  });

  it('converts the unit in names that carry one, and leaves unconverted units alone', () => {
    expect(bandColumnName(cont('groundTemp', '°C'), 'NA')).toBe('groundTemp_degF');
    expect(bandColumnName(cont('magt_C', '°C'), 'NA')).toBe('magt_degF');
    expect(bandColumnName(cont('alt_m', 'm'), 'NA')).toBe('alt_ft');
    expect(bandColumnName(cont('settlementDistance_km', 'km'), 'NA')).toBe('settlementDistance_mi');
    expect(bandColumnName(cont('warming_C_per_yr', 'K/yr'), 'NA')).toBe('warming_degF_per_yr');
    expect(bandColumnName(cont('airAmplitude_C', 'K'), 'NA')).toBe('airAmplitude_degF');
    expect(bandColumnName(cont('pumpPower', 'W'), 'NA')).toBe('pumpPower_Btu_per_h');
    expect(bandColumnName(cont('capacityKept', 'kN'), 'NA')).toBe('capacityKept_kip');
    expect(bandColumnName(cont('fuelSaved', 'L/yr'), 'NA')).toBe('fuelSaved_USgal_per_yr');
    expect(bandColumnName(cont('co2Avoided', 't/yr'), 'NA')).toBe('co2Avoided_shortton_per_yr');
    // Piles per ton, years, kWh/yr, volume fractions and currency: the same in both systems.
    expect(bandColumnName(cont('pilesPerTon', 'piles/ton'), 'NA')).toBe('pilesPerTon_piles_per_ton');
    expect(bandColumnName(cont('thawDelay', 'yr'), 'NA')).toBe('thawDelay_yr');
    expect(bandColumnName(cont('waterContent_m3m3', 'm³/m³'), 'NA')).toBe('waterContent_m3m3');
    expect(bandColumnName(cont('costSaved', 'CAD/yr'), 'NA')).toBe('costSaved_CAD_per_yr');
    // SI names are unchanged.
    expect(bandColumnName(cont('magt_C', '°C'))).toBe('magt_C');
    expect(bandColumnName(cont('groundTemp', '°C'), 'SI')).toBe('groundTemp_degC');
  });

  it('gives no two bands of a build the same North American column', () => {
    const names = registryBands().map((b) => bandColumnName(b, 'NA'));
    expect(new Set(names).size).toBe(names.length);
  });
});

describe('export values in North American units, per unit', () => {
  const na = (id: string, unit: string, v: number) => exportValue(cont(id, unit), v, 'NA');
  it('converts by the unit definitions and rounds to a step no coarser than the SI one', () => {
    expect(na('groundTemp', '°C', -4.5)).toBe(23.9); // −4.5 × 1.8 + 32 = 23.9 °F
    expect(na('groundTemp', '°C', -40)).toBe(-40); // −40 °C = −40 °F
    expect(na('airAmplitude_C', 'K', 10)).toBe(18); // a 10 K difference = 18 °F
    expect(na('warming_C_per_yr', 'K/yr', 0.05)).toBe(0.09); // 0.05 × 1.8 °F/yr
    expect(na('alt_m', 'm', 10)).toBe(32.81); // 10 / 0.3048 = 32.808 ft, step 0.01 ft
    expect(na('settlementDistance_km', 'km', 10)).toBe(6.214); // 10 000 / 1609.344 = 6.2137 mi
    expect(na('pumpPower', 'W', 1000)).toBe(3412.1); // 1000 × 3600 / 1055.05585262 = 3412.14 Btu/h
    expect(na('capacityKept', 'kN', 100)).toBe(22.48); // 100 000 / 4448.2216 = 22.481 kip
    expect(na('fuelSaved', 'L/yr', 1000)).toBe(264.2); // 1000 / 3.785411784 = 264.17 US gal/yr
    expect(na('co2Avoided', 't/yr', 1)).toBe(1.1); // 1000 / 0.45359237 / 2000 = 1.1023 short ton/yr
    expect(na('heatPerMetre', 'W/m', 40)).toBe(41.6); // 40 × 3.412142 × 0.3048 = 41.60 Btu/h·ft
    expect(na('pilesPerTon', 'piles/ton', 2.34)).toBe(2.3); // unchanged unit, SI step 0.1
    expect(na('thawYear', 'yr', 2061.6)).toBe(2062); // calendar years stay whole years
    expect(na('groundTemp', '°C', NaN)).toBeNull();
  });

  it('uses the largest power of ten not above the SI step in the converted unit', () => {
    const steps: [string, number][] = [
      ['°C', 0.01],
      ['K', 0.01],
      ['K/yr', 0.0001],
      ['m', 0.01],
      ['km', 0.001],
      ['W', 0.1],
      ['W/m', 0.01],
      ['kN', 0.01],
      ['L/yr', 0.1],
      ['t/yr', 0.01],
      ['kWh/yr', 1],
      ['piles/ton', 0.1],
    ];
    for (const [unit, step] of steps) expect([unit, exportStep(cont('x', unit), 'NA')]).toEqual([unit, step]);
  });

  it('reads every band back to SI within one SI step (round trip through the record)', () => {
    const bands = registryBands();
    const si: Record<string, number> = {};
    bands.forEach((b, i) => (si[b.id] = b.kind === 'class' ? 1 : -37.3 + i * 13.7177));
    const manifest = { bands, fictional: false, notice: '' };
    for (const system of ['SI', 'NA'] as const) {
      const record = exportRecord(manifest, -3, 75, (id) => si[id], system);
      expect(record.unitSystem).toBe(UNIT_SYSTEM_NAME[system]);
      for (const b of bands) {
        const back = importBandValue(b, record, system);
        const tol = b.kind === 'class' ? 0 : (exportStep(b) ?? Math.abs(si[b.id]) * 1e-3);
        expect([b.id, system, Math.abs(back! - si[b.id]) <= tol + 1e-9]).toEqual([b.id, system, true]);
      }
    }
  });

  it('lists the converted units of the columns', () => {
    const units = exportUnits({ bands: [{ ...cont('alt_m', 'm') } as Band], fictional: false }, 'NA');
    expect(units).toEqual({ lon_deg: '°', lat_deg: '°', alt_ft: 'ft' });
  });
});

describe('shortlist files in North American units and their re-import', () => {
  const manifest = testManifest();
  const item: ShortlistItem = {
    id: 'a',
    name: 'Lanternhook east',
    note: '',
    lon: -3.1234567,
    lat: 75.0123456,
    addedAt: '2026-12-01T10:00:00.000Z',
    origin: 'site',
    values: { groundTemp: -4.567, pilesPerTon: 12.04, suitability: 3 },
    metrics: { lowestFluid_C: -6.25, peakLoad_kW: 8.5, fuelSaved_L_per_yr: 4200, pileCount: 16 },
  };

  it('writes NA names and values and says so in the collection and every record', () => {
    const fc = shortlistToGeoJSON([item], manifest, 'NA');
    expect(fc.unitSystem).toBe('North American');
    const p = fc.features[0].properties;
    expect(p.unitSystem).toBe('North American');
    expect(p.groundTemp_degF).toBe(23.78); // −4.567 × 1.8 + 32 = 23.7794 °F
    expect(p).not.toHaveProperty('groundTemp_degC');
    expect(p.pilesPerTon_piles_per_ton).toBe(12);
    expect(p.metric_lowestFluid_degF).toBeCloseTo(20.75, 9); // −6.25 × 1.8 + 32
    expect(p.metric_peakLoad_ton).toBeCloseTo(8.5 / 3.516852842, 6); // 1 ton = 3.516853 kW
    expect(p.metric_fuelSaved_USgal_per_yr).toBeCloseTo(4200 / 3.785411784, 6);
    expect(p.metric_pileCount).toBe(16);
    const csv = shortlistToCsv([item], manifest, 'NA').split('\r\n');
    const header = csvFields(csv[0]);
    const row = csvFields(csv[1]);
    expect(header).toContain('groundTemp_degF');
    expect(header).not.toContain('groundTemp_degC');
    expect(row[header.indexOf('unitSystem')]).toBe('North American');
    expect(row[header.indexOf('groundTemp_degF')]).toBe('23.78');
  });

  it('reads SI and NA exports back to the same SI values', () => {
    const back = (system: 'SI' | 'NA') =>
      shortlistFromGeoJSON(
        JSON.parse(JSON.stringify(shortlistToGeoJSON([item], manifest, system))),
        manifest.bands,
      );
    const a = back('SI');
    const b = back('NA');
    expect(a.issues).toEqual([]);
    expect(b.issues).toEqual([]);
    for (const id of ['groundTemp', 'pilesPerTon', 'suitability']) {
      // Within one SI step (0.01 °C, 0.1 piles/ton) of the SI file, and of the value stored.
      expect(Math.abs(b.items[0].values[id]! - a.items[0].values[id]!)).toBeLessThanOrEqual(0.1);
      expect(Math.abs(b.items[0].values[id]! - item.values[id]!)).toBeLessThanOrEqual(0.1);
    }
    expect(Math.abs(b.items[0].values.groundTemp! - -4.567)).toBeLessThanOrEqual(0.01);
    expect(b.items[0].values.suitability).toBe(3);
    for (const [k, v] of Object.entries(item.metrics)) {
      expect(b.items[0].metrics[k]).toBeCloseTo(v as number, 9);
      expect(a.items[0].metrics[k]).toBeCloseTo(v as number, 9);
    }
  });

  it('maps metric names both ways and leaves unit-less metrics alone', () => {
    expect(exportMetric('co2Avoided_t_per_yr', 2, 'NA')[0]).toBe('metric_co2Avoided_shortton_per_yr');
    expect(importMetric('metric_co2Avoided_shortton_per_yr', 2.2046226, 'NA')[1]).toBeCloseTo(2, 6);
    expect(exportMetric('lowestFluid_C', -6, 'SI')).toEqual(['metric_lowestFluid_C', -6]);
    expect(exportMetric('thawDelayIsLowerBound', 'yes', 'NA')).toEqual([
      'metric_thawDelayIsLowerBound',
      'yes',
    ]);
    expect(importMetric('metric_simplePayback_yr', 7, 'NA')).toEqual(['simplePayback_yr', 7]);
  });

  it('refuses a file whose unitSystem names no unit system, naming the field', () => {
    const fc = shortlistToGeoJSON([item], manifest, 'NA') as unknown as {
      features: { properties: Record<string, unknown> }[];
    };
    fc.features[0].properties.unitSystem = 'imperial';
    const r = shortlistFromGeoJSON(fc, manifest.bands);
    expect(r.items).toEqual([]);
    expect(r.issues).toEqual([
      'site 1 in the file, property unitSystem: "imperial" is not a unit system; expected "SI" or "North American"',
    ]);
  });

  it('reads a file from before the unit switch reached the exports as SI', () => {
    const fc = shortlistToGeoJSON([item], manifest, 'SI') as unknown as {
      unitSystem?: string;
      features: { properties: Record<string, unknown> }[];
    };
    delete fc.unitSystem;
    delete fc.features[0].properties.unitSystem;
    const r = shortlistFromGeoJSON(fc, manifest.bands);
    expect(r.items[0].values.groundTemp).toBe(-4.57);
  });
});
