import { describe, it, expect } from 'vitest';
import {
  ETHANOL_TABLE,
  PROPYLENE_GLYCOL_TABLE,
  TABLE_TEMPERATURES_C,
  WATER_TABLE,
  type FluidTable,
} from '../../layers/physics/fluid-property-tables';
import { fluidProperties, freezingPoint_C } from '../../layers/physics/fluids';
import reference from './fixtures/fluid-properties-reference.json';
import {
  PG_HANDBOOK,
  TABLE_PROPERTIES,
  melinderRow,
  mixtureRow,
  waterRow,
  type SourcedRow,
  type TableProperty,
} from './fixtures/fluid-table-sources';

// Sources (see tests/reference/fixtures/fluid-table-sources.ts for the rule per entry):
// - IAPWS-95 (density, cp), IAPWS 2008 (viscosity), IAPWS 2011 (conductivity) at 0.101325 MPa and the
//   Melinder (2010) correlations for aqueous propylene glycol and ethanol, evaluated by the committed
//   generator fixtures/fluid-properties-reference.py (the IAPWS implementation is first checked there
//   against the releases' verification values);
// - the handbook propylene glycol design table (read values, reference-values.md §9c);
// - Lange's Handbook of Chemistry, 15th ed. (Dean 1999), Table 5.13, ethanol–water antifreeze
//   (read values; the minus signs of the °C column were lost in the copy read and are restored from
//   the °F column).

/** Half a unit of the last printed digit of the table (viscosity: 4 significant digits, relative). */
const HALF_UNIT: Record<Exclude<TableProperty, 'viscosity_mPa_s'> | 'freezingPoint_C', number> = {
  density_kg_m3: 0.05,
  specificHeat_J_kgK: 0.5,
  conductivity_W_mK: 5e-5,
  freezingPoint_C: 0.005,
};

function withinRounding(property: TableProperty | 'freezingPoint_C', table: number, source: number): boolean {
  if (property === 'viscosity_mPa_s') return Math.abs(table / source - 1) <= 5e-4 + 1e-12;
  return Math.abs(table - source) <= HALF_UNIT[property] + 1e-9;
}

function mismatches(table: FluidTable, sourced: SourcedRow[]): string[] {
  const out: string[] = [];
  if (table.rows.length !== sourced.length)
    return [`${table.rows.length} rows, sources for ${sourced.length}`];
  table.rows.forEach((row, i) => {
    const src = sourced[i];
    if (row.massFraction !== src.massFraction) out.push(`row ${i}: mass fraction ${row.massFraction}`);
    if (!withinRounding('freezingPoint_C', row.freezingPoint_C, src.freezingPoint_C.value)) {
      out.push(`x ${row.massFraction} freezing point ${row.freezingPoint_C} vs ${src.freezingPoint_C.value}`);
    }
    for (const p of TABLE_PROPERTIES) {
      TABLE_TEMPERATURES_C.forEach((t, j) => {
        const s = src.properties[p][j];
        const v = row[p][j];
        if (s === null) {
          if (!Number.isNaN(v)) out.push(`x ${row.massFraction} ${p} at ${t} °C: ${v}, expected NaN`);
        } else if (!withinRounding(p, v, s.value)) {
          out.push(`x ${row.massFraction} ${p} at ${t} °C: ${v} vs ${s.value} (${s.source})`);
        }
      });
    }
  });
  return out;
}

describe('every fluid table entry equals its named source to the printed rounding', () => {
  const mixtures = (fluid: 'propyleneGlycol' | 'ethanol'): SourcedRow[] => [
    waterRow(),
    ...[0.1, 0.2, 0.3, 0.4].map((x) => mixtureRow(fluid, x)),
  ];
  it('water row: IAPWS-95 / IAPWS 2008 / IAPWS 2011 (6 temperatures × 4 properties)', () => {
    expect(mismatches(WATER_TABLE, [waterRow()])).toEqual([]);
  });
  it('propylene glycol: handbook table (read) at 20/30/40 % and 0–40 °C, Melinder (2010) elsewhere', () => {
    expect(mismatches(PROPYLENE_GLYCOL_TABLE, mixtures('propyleneGlycol'))).toEqual([]);
  });
  it('ethanol: Melinder (2010) correlation, every entry', () => {
    expect(mismatches(ETHANOL_TABLE, mixtures('ethanol'))).toEqual([]);
  });
});

describe('propylene glycol handbook table against Melinder (2010) (two independent sources)', () => {
  const rows = PG_HANDBOOK.rows.filter((r) => r.massFraction > 0);
  // The handbook densities lie above Melinder's pure solution (inhibited glycol; measured 0.26–0.56 %);
  // specific heat agrees within 0.33 % (printed to 10 J/(kg·K)); freezing points within 0.53 K (40 %).
  it('density 0.2–0.6 % above Melinder at 20–40 % and 0–40 °C', () => {
    for (const r of rows) {
      const mel = melinderRow('propyleneGlycol', r.massFraction);
      PG_HANDBOOK.temperatures_C.forEach((t, k) => {
        const m = mel.points[TABLE_TEMPERATURES_C.indexOf(t)].density_kg_m3;
        const dev = r.density_kg_m3[k] / m - 1;
        expect(dev, `${r.massFraction} at ${t} °C`).toBeGreaterThan(0.002);
        expect(dev, `${r.massFraction} at ${t} °C`).toBeLessThan(0.006);
      });
    }
  });
  it('specific heat within 0.35 %, freezing point within 0.55 K', () => {
    for (const r of rows) {
      const mel = melinderRow('propyleneGlycol', r.massFraction);
      PG_HANDBOOK.temperatures_C.forEach((t, k) => {
        const m = mel.points[TABLE_TEMPERATURES_C.indexOf(t)].specificHeat_J_kgK;
        expect(Math.abs(r.specificHeat_J_kgK[k] / m - 1), `${r.massFraction} at ${t} °C`).toBeLessThan(
          0.0035,
        );
      });
      expect(Math.abs(r.freezingPoint_C - mel.freezingPoint_C), `${r.massFraction}`).toBeLessThan(0.55);
    }
  });
  it("the table's water column agrees with IAPWS-95 (density ±0.05 kg/m³, cp ±10 J/(kg·K) as printed)", () => {
    const water = PG_HANDBOOK.rows[0];
    PG_HANDBOOK.temperatures_C.forEach((t, k) => {
      const w = reference.water.points.find((p) => p.temperature_C === t);
      expect(w).toBeDefined();
      expect(Math.abs(water.density_kg_m3[k] - (w?.density_kg_m3 ?? NaN))).toBeLessThanOrEqual(0.05);
      expect(Math.abs(water.specificHeat_J_kgK[k] - (w?.specificHeat_J_kgK ?? NaN))).toBeLessThanOrEqual(10);
    });
  });
});

describe('interpolation between table rows against the sources at 25 % and 35 % (rows not in the table)', () => {
  it('propylene glycol: handbook density ±0.2 kg/m³ and cp ±10 J/(kg·K) at 0–40 °C; freezing ±0.3 K', () => {
    for (const r of PG_HANDBOOK.rows.filter((h) => h.massFraction === 0.25 || h.massFraction === 0.35)) {
      const spec = { fluid: 'propyleneGlycol', massFraction: r.massFraction } as const;
      expect(Math.abs(freezingPoint_C(spec) - r.freezingPoint_C)).toBeLessThan(0.3);
      PG_HANDBOOK.temperatures_C.forEach((t, k) => {
        const p = fluidProperties({ ...spec, temperature_C: t });
        expect(Math.abs(p.density_kg_m3 - r.density_kg_m3[k]), `${r.massFraction} ${t}`).toBeLessThanOrEqual(
          0.2,
        );
        expect(
          Math.abs(p.specificHeat_J_kgK - r.specificHeat_J_kgK[k]),
          `${r.massFraction} ${t}`,
        ).toBeLessThanOrEqual(10);
      });
    }
  });
  // Measured worst relative error of row interpolation (linear; viscosity in the logarithm):
  // propylene glycol conductivity 0.13 %, viscosity 0.45 %; ethanol density 0.09 %, cp 0.38 %,
  // conductivity 0.19 %, viscosity 3.1 %, freezing point 0.11 K.
  const bounds: Record<'propyleneGlycol' | 'ethanol', Partial<Record<TableProperty, number>>> = {
    propyleneGlycol: { conductivity_W_mK: 0.002, viscosity_mPa_s: 0.006 },
    ethanol: {
      density_kg_m3: 0.001,
      specificHeat_J_kgK: 0.004,
      conductivity_W_mK: 0.002,
      viscosity_mPa_s: 0.035,
    },
  };
  for (const fluid of ['propyleneGlycol', 'ethanol'] as const) {
    for (const x of [0.25, 0.35]) {
      it(`${fluid} ${x * 100} %: Melinder (2010) properties from the freezing point to 40 °C`, () => {
        const mel = melinderRow(fluid, x);
        const tf = freezingPoint_C({ fluid, massFraction: x });
        if (fluid === 'ethanol') expect(Math.abs(tf - mel.freezingPoint_C)).toBeLessThan(0.15);
        const checked = mel.points.filter((pt) => pt.temperature_C >= tf);
        expect(checked.length).toBeGreaterThanOrEqual(5);
        for (const pt of checked) {
          const p = fluidProperties({ fluid, massFraction: x, temperature_C: pt.temperature_C });
          const got: Record<TableProperty, number> = {
            density_kg_m3: p.density_kg_m3,
            specificHeat_J_kgK: p.specificHeat_J_kgK,
            conductivity_W_mK: p.conductivity_W_mK,
            viscosity_mPa_s: p.viscosity_Pa_s * 1e3,
          };
          for (const [k, bound] of Object.entries(bounds[fluid]) as [TableProperty, number][]) {
            expect(Math.abs(got[k] / pt[k] - 1), `${k} at ${pt.temperature_C} °C`).toBeLessThan(bound);
          }
        }
      });
    }
  }
});

describe("ethanol against Lange's Handbook of Chemistry Table 5.13 (read values, pure ethanol by mass)", () => {
  // [mass %, specific gravity 20/4 °C, freezing point °C]
  const lange = [
    [2.5, 0.99363, -1.0],
    [4.8, 0.98971, -2.0],
    [6.8, 0.98658, -3.0],
    [11.3, 0.98006, -5.0],
    [13.8, 0.9767, -6.1],
    [16.4, 0.97336, -7.5],
    [17.5, 0.97194, -8.7],
    [18.8, 0.97024, -9.4],
    [20.3, 0.96823, -10.6],
    [22.1, 0.96578, -12.2],
    [24.2, 0.96283, -14.0],
    [26.7, 0.95914, -16.0],
    [29.9, 0.954, -18.9],
    [33.8, 0.94715, -23.6],
    [39.0, 0.9372, -28.7],
  ] as const;
  // Specific gravity 20/4 °C times the density of water at 4 °C, 999.972 kg/m³ (IAPWS-95).
  it('density at 20 °C within 0.1 % (measured worst 0.065 %)', () => {
    for (const [pct, sg] of lange) {
      const p = fluidProperties({ fluid: 'ethanol', massFraction: pct / 100, temperature_C: 20 });
      expect(Math.abs(p.density_kg_m3 / (sg * 999.972) - 1), `${pct} %`).toBeLessThan(0.001);
    }
  });
  // The two sources disagree: Lange's freezing points lie up to 1.15 K above Melinder's between 13 and
  // 30 % (Melinder is the less conservative one there). Bound = that measured disagreement.
  it('freezing point within 1.2 K of the table (Melinder 2010)', () => {
    for (const [pct, , tf] of lange) {
      const ours = freezingPoint_C({ fluid: 'ethanol', massFraction: pct / 100 });
      expect(Math.abs(ours - tf), `${pct} %`).toBeLessThan(1.2);
    }
  });
});

describe('water between table columns against IAPWS at 25 °C (fixture)', () => {
  const w = reference.water.points.find((p) => p.temperature_C === 25);
  const p = fluidProperties({ fluid: 'water', massFraction: 0, temperature_C: 25 });
  it('density ±0.2 kg/m³, cp ±2 J/(kg·K), conductivity ±0.0005 W/(m·K), viscosity ±1 %', () => {
    expect(w).toBeDefined();
    expect(Math.abs(p.density_kg_m3 - (w?.density_kg_m3 ?? NaN))).toBeLessThan(0.2);
    expect(Math.abs(p.specificHeat_J_kgK - (w?.specificHeat_J_kgK ?? NaN))).toBeLessThan(2);
    expect(Math.abs(p.conductivity_W_mK - (w?.conductivity_W_mK ?? NaN))).toBeLessThan(5e-4);
    expect(Math.abs((p.viscosity_Pa_s * 1e3) / (w?.viscosity_mPa_s ?? NaN) - 1)).toBeLessThan(0.01);
  });
});
