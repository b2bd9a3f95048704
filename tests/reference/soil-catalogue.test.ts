import { describe, it, expect } from 'vitest';
import fixtures from './fixtures/thermal-regime-mpmath.json';
import {
  johansenConductivity_W_mK,
  johansenDryConductivity_W_mK,
  johansenSolidsConductivity_W_mK,
  johansenKerstenNumber,
} from '../../layers/physics/johansen-conductivity';
import { coteKonradConductivity_W_mK } from '../../layers/physics/cote-konrad-conductivity';
import {
  deVriesHeatCapacity_J_m3K,
  volumetricLatentHeat_J_m3,
} from '../../layers/physics/soil-heat-capacity';
import {
  andersonTiceGravimetric_percent,
  freezingPoint_C,
  unfrozenWaterContent_m3m3,
} from '../../layers/physics/unfrozen-water';
import { soilThermalProperties, TEXTURE_CATALOGUE } from '../../layers/physics/soil-catalogue';
import { TEXTURE_CODES } from '../../layers/screening/screening-model';

const rel = (a: number, e: number) => Math.abs(a - e) / Math.abs(e);

// Worked examples JOH-1..4 and CK-1..2: Johansen (1975) as summarised by Farouki (1981), CRREL Monograph
// 81-1, ch. 7, and Côté & Konrad (2005), Can. Geotech. J. 42:443, computed from those equations with mpmath
// (reference-values.md section 8c; equations recalled from memory). ρd 1600 kg/m³, gravimetric w 0.15 ->
// θ = 0.24, ρs 2650, θu = 0. Tolerance 1e-4 relative (values printed to 5 significant digits).
describe('Johansen (1975) conductivity, worked examples (computed with mpmath; tol 1e-4 rel)', () => {
  const n = 1 - 1600 / 2650;
  const theta = 0.24;
  it('porosity, k_dry, k_s', () => {
    expect(rel(n, 0.39623)).toBeLessThan(1e-4);
    expect(rel(johansenDryConductivity_W_mK(1600), 0.23694)).toBeLessThan(1e-4);
    expect(rel(johansenSolidsConductivity_W_mK(0.6, 'coarse'), 4.4906)).toBeLessThan(1e-4);
    // Fine soil, q 0.2: k_o = 2.0 by the rule (3.0 only for coarse soils with q ≤ 0.2): 7.7^0.2 · 2^0.8.
    expect(rel(johansenSolidsConductivity_W_mK(0.2, 'fine'), 2.61918)).toBeLessThan(1e-4);
    // Coarse soil, q 0.2: k_o = 3.0 -> 7.7^0.2 · 3^0.8 = 3.6224 (the k_s printed with JOH-3 in the reference notes).
    expect(rel(johansenSolidsConductivity_W_mK(0.2, 'coarse'), 3.6224)).toBeLessThan(1e-4);
  });
  it('Kersten numbers: coarse thawed 0.84759, fine thawed 0.78227, frozen = Sr 0.60571', () => {
    expect(rel(johansenKerstenNumber(theta / n, 'coarse', 'thawed'), 0.84759)).toBeLessThan(1e-4);
    expect(rel(johansenKerstenNumber(theta / n, 'fine', 'thawed'), 0.78227)).toBeLessThan(1e-4);
    expect(rel(johansenKerstenNumber(theta / n, 'fine', 'frozen'), 0.60571)).toBeLessThan(1e-4);
  });
  // JOH-3/4 were computed in the notes with k_s = 3.6224 (k_o = 3.0) although the soil is fine; k_s is
  // passed explicitly so the rest of the chain (k_sat, Ke, interpolation) is what these cases check.
  const cases: [string, number, 'coarse' | 'fine', 'thawed' | 'frozen', number][] = [
    ['JOH-1 coarse thawed', johansenSolidsConductivity_W_mK(0.6, 'coarse'), 'coarse', 'thawed', 1.7161],
    ['JOH-2 coarse frozen', johansenSolidsConductivity_W_mK(0.6, 'coarse'), 'coarse', 'frozen', 2.1436],
    ['JOH-3 fine thawed', 3.6224, 'fine', 'thawed', 1.4134],
    ['JOH-4 fine frozen', 3.6224, 'fine', 'frozen', 1.8942],
  ];
  for (const [id, ks, grading, state, expected] of cases) {
    it(`${id}: k = ${expected} W/m·K`, () => {
      const k = johansenConductivity_W_mK({
        porosity: n,
        waterContent_m3m3: theta,
        solidsConductivity_W_mK: ks,
        dryConductivity_W_mK: johansenDryConductivity_W_mK(1600),
        grading,
        state,
      });
      expect(rel(k, expected)).toBeLessThan(1e-4);
    });
  }
  it('CK-1/CK-2 Côté–Konrad medium sand: 1.7138 thawed, 2.1105 frozen', () => {
    const base = {
      porosity: n,
      waterContent_m3m3: theta,
      solidsConductivity_W_mK: johansenSolidsConductivity_W_mK(0.6, 'coarse'),
      group: 'mediumFineSand',
      dryClass: 'naturalMineral',
    } as const;
    expect(rel(coteKonradConductivity_W_mK({ ...base, state: 'thawed' }), 1.7138)).toBeLessThan(1e-4);
    expect(rel(coteKonradConductivity_W_mK({ ...base, state: 'frozen' }), 2.1105)).toBeLessThan(1e-4);
  });
  it('Kersten (1949) chart value, silt-clay 100 pcf, w 15 %, frozen about 0.8 Btu/h·ft·°F = 1.38 W/m·K (read from a published frost-depth worked example; Johansen is a different model: tol 15 %)', () => {
    const rho = 100 * 16.0185; // pcf to kg/m³
    const nn = 1 - rho / 2650;
    const k = johansenConductivity_W_mK({
      porosity: nn,
      waterContent_m3m3: (0.15 * rho) / 1000,
      solidsConductivity_W_mK: johansenSolidsConductivity_W_mK(0.2, 'fine'),
      dryConductivity_W_mK: johansenDryConductivity_W_mK(rho),
      grading: 'fine',
      state: 'frozen',
    });
    expect(rel(k, 0.8 * 1.7307)).toBeLessThan(0.15);
  });
});

describe('de Vries (1963) heat capacity and latent heat (computed with mpmath; tol 1e-4 rel)', () => {
  // reference-values.md 8a: ρd 1400, w 0.30, cs 840, cw 4180, ci 2090 -> 2.932 / 2.054 MJ/m³K.
  it('ρd 1400, w 0.30: unfrozen 2.932, frozen 2.054 MJ/m³·K', () => {
    const mineral = 1400 / 2650;
    const cs = 2650 * 840;
    expect(
      rel(
        deVriesHeatCapacity_J_m3K({
          mineralFraction: mineral,
          liquidWater_m3m3: 0.42,
          mineralHeatCapacity_J_m3K: cs,
        }),
        2.9316e6,
      ),
    ).toBeLessThan(1e-4);
    const frozen = deVriesHeatCapacity_J_m3K({
      mineralFraction: mineral,
      liquidWater_m3m3: 0,
      mineralHeatCapacity_J_m3K: cs,
      ice_m3m3: 0.42 * (1000 / 916.7),
    });
    expect(rel(frozen, 2.0538e6)).toBeLessThan(1e-4);
  });
  // L = 333.6 kJ/kg × ρd × w (CRC Handbook latent heat; reference-values.md 8a).
  const latent: [number, number, number][] = [
    [1400, 0.3, 140.11e6],
    [1600, 0.15, 80.06e6],
    [1800, 0.1, 60.05e6],
    [1000, 0.6, 200.16e6],
  ];
  for (const [rho, w, L] of latent) {
    it(`latent heat ρd ${rho}, w ${w}: ${L / 1e6} MJ/m³ (tol 1e-4 rel)`, () => {
      expect(rel(volumetricLatentHeat_J_m3((rho * w) / 1000), L)).toBeLessThan(1e-4);
    });
  }
});

describe('Anderson & Tice (1972) unfrozen water (equation recalled from memory; computed with mpmath; tol 1e-10 rel)', () => {
  for (const [S, th, v] of fixtures.andersonTice) {
    it(`S ${S} m²/g, ${th} K below 0: w_u = ${Number(v).toFixed(4)} %`, () => {
      expect(rel(andersonTiceGravimetric_percent(Number(th), Number(S)), Number(v))).toBeLessThan(1e-10);
    });
  }
  for (const [S, w, v] of fixtures.freezingPoint) {
    it(`freezing point S ${S}, w ${w} %: ${Number(v).toFixed(4)} °C (root found independently)`, () => {
      const fp = freezingPoint_C({
        specificSurface_m2_g: Number(S),
        dryDensity_kg_m3: 1000,
        waterContent_m3m3: Number(w) / 100,
      });
      expect(rel(fp, Number(v))).toBeLessThan(1e-10);
    });
  }
  it('unfrozen water equals total water at and above the freezing point, less below', () => {
    const layer = { specificSurface_m2_g: 20, dryDensity_kg_m3: 1000, waterContent_m3m3: 0.2 };
    const fp = freezingPoint_C(layer);
    expect(unfrozenWaterContent_m3m3({ ...layer, temperature_C: fp * 0.5 })).toBe(0.2);
    expect(unfrozenWaterContent_m3m3({ ...layer, temperature_C: fp * 2 })).toBeLessThan(0.2);
    expect(rel(unfrozenWaterContent_m3m3({ ...layer, temperature_C: fp * (1 + 1e-9) }), 0.2)).toBeLessThan(
      1e-6,
    );
  });
});

describe('texture catalogue and resolver', () => {
  it('has one entry per texture code', () => {
    expect(Object.keys(TEXTURE_CATALOGUE).sort()).toEqual(Object.values(TEXTURE_CODES).sort());
  });
  it('sand resolves through Johansen: equals the direct call (same inputs)', () => {
    const p = soilThermalProperties({ texture: 'sand', waterContent_m3m3: 0.24, dryDensity_kg_m3: 1600 });
    expect(rel(p.kThawed_W_mK, 1.7161)).toBeLessThan(1e-4); // JOH-1
    expect(rel(p.kFrozen_W_mK, 2.1436)).toBeLessThan(1e-4); // JOH-2
    expect(rel(p.latent_J_m3, 0.24 * 333.6e6)).toBeLessThan(1e-12);
    expect(p.freezingPoint_C).toBe(0);
  });
  it('peat is in the published range of thawed saturated peat, about 0.4-0.6 W/m·K (Farouki 1981; recalled from memory)', () => {
    const p = soilThermalProperties({ texture: 'peat', waterContent_m3m3: 0.85 });
    expect(p.kThawed_W_mK).toBeGreaterThan(0.4);
    expect(p.kThawed_W_mK).toBeLessThan(0.6);
    expect(p.kFrozen_W_mK).toBeGreaterThan(p.kThawed_W_mK);
  });
  it('bedrock conductivity near its matrix value (common practice 2-4 W/m·K)', () => {
    const p = soilThermalProperties({ texture: 'bedrock', waterContent_m3m3: 0.01 });
    expect(p.kThawed_W_mK).toBeGreaterThan(2);
    expect(p.kThawed_W_mK).toBeLessThan(4);
  });
  it('fine soils get a freezing-point depression and unfrozen water', () => {
    const p = soilThermalProperties({ texture: 'clay', waterContent_m3m3: 0.35 });
    expect(p.freezingPoint_C).toBeLessThan(0);
    expect(p.unfrozenWater_m3m3).toBeGreaterThan(0);
  });
});

// Issue 11 item 7. Hand computations with the constituent constants of soil-constituents.ts (Johansen's
// k_ice 2.2 and k_water 0.57 W/m·K, quartz 7.7 and other minerals 2.0 W/m·K; ρs 2650 kg/m³, c_s 840,
// c_ice 2090 J/kg·K; L_f 333.6 kJ/kg). Gravel (coarse, quartz 0.6, ρd 1900 kg/m³): porosity
// n = 1 − 1900/2650 = 0.283019. At θ = 0.5 the excess ice is e = (0.5 − n)/(1 − n) = 0.302632 and the
// ground is the soil expanded by it: porosity 0.5, saturated, so Johansen's geometric mean gives
// k_s = 7.7^0.6·2.0^0.4 = 4.49062, k_f = k_s^0.5·2.2^0.5 = 3.14315, k_t = k_s^0.5·0.57^0.5 = 1.59989,
// C_f = 0.5·2650·840 + 0.5·1000·2090 = 2.1580e6 J/m³K, L = 1000·333.6e3·0.5 = 166.8e6 J/m³.
describe('excess ice above the porosity (soil expanded by the ice; hand computations; tol 1e-5 rel)', () => {
  const p = soilThermalProperties({ texture: 'gravel', waterContent_m3m3: 0.5 });
  const ks = 7.7 ** 0.6 * 2.0 ** 0.4;
  it('excess-ice fraction, latent heat of all the water, ice-rich heat capacity', () => {
    expect(p.porosity).toBeCloseTo(1 - 1900 / 2650, 12);
    expect(rel(p.excessIce_m3m3, (0.5 - (1 - 1900 / 2650)) / (1900 / 2650))).toBeLessThan(1e-9);
    expect(rel(p.excessIce_m3m3, 0.302632)).toBeLessThan(1e-5);
    expect(rel(p.latent_J_m3, 166.8e6)).toBeLessThan(1e-9);
    expect(rel(p.cFrozen_J_m3K, 0.5 * 2650 * 840 + 0.5 * 1000 * 2090)).toBeLessThan(1e-5);
  });
  it('conductivity: Johansen saturated geometric mean with porosity raised to θ', () => {
    expect(rel(p.kFrozen_W_mK, Math.sqrt(ks * 2.2))).toBeLessThan(1e-5);
    expect(rel(p.kFrozen_W_mK, 3.14315)).toBeLessThan(1e-5);
    expect(rel(p.kThawed_W_mK, 1.59989)).toBeLessThan(1e-5);
  });
  it('lies between the series and parallel bounds of saturated soil and segregated ice lenses', () => {
    const sat = soilThermalProperties({ texture: 'gravel', waterContent_m3m3: 1 - 1900 / 2650 });
    const e = p.excessIce_m3m3;
    const series = 1 / ((1 - e) / sat.kFrozen_W_mK + e / 2.2);
    const parallel = (1 - e) * sat.kFrozen_W_mK + e * 2.2;
    expect(p.kFrozen_W_mK).toBeGreaterThanOrEqual(series);
    expect(p.kFrozen_W_mK).toBeLessThanOrEqual(parallel);
    expect(sat.excessIce_m3m3).toBe(0);
  });
});

describe('bad input names the parameter and the range', () => {
  it('water content above the largest accepted (0.99; above the porosity is excess ice, issue 11 item 7)', () => {
    expect(() =>
      soilThermalProperties({ texture: 'sand', waterContent_m3m3: 0.995, dryDensity_kg_m3: 1600 }),
    ).toThrow(/waterContent_m3m3 must be in \[0, 0\.99/);
  });
  it('negative porosity and water content', () => {
    const base = {
      waterContent_m3m3: 0.1,
      solidsConductivity_W_mK: 3,
      dryConductivity_W_mK: 0.2,
      grading: 'fine',
      state: 'thawed',
    } as const;
    expect(() => johansenConductivity_W_mK({ ...base, porosity: -0.1 })).toThrow(RangeError);
    expect(() => johansenConductivity_W_mK({ ...base, porosity: -0.1 })).toThrow(/porosity/);
    expect(() => johansenConductivity_W_mK({ ...base, porosity: 0.4, waterContent_m3m3: -0.01 })).toThrow(
      /waterContent_m3m3/,
    );
  });
  it('non-finite numbers throw TypeError', () => {
    expect(() => soilThermalProperties({ texture: 'silt', waterContent_m3m3: NaN })).toThrow(TypeError);
    expect(() => volumetricLatentHeat_J_m3(Infinity)).toThrow(/finite/);
  });
  it('unknown texture', () => {
    expect(() => soilThermalProperties({ texture: 'loam' as 'silt', waterContent_m3m3: 0.1 })).toThrow(
      /texture must be one of/,
    );
  });
});
