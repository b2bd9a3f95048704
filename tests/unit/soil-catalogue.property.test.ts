import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  johansenConductivity_W_mK,
  johansenDryConductivity_W_mK,
  johansenSaturatedConductivity_W_mK,
  johansenSolidsConductivity_W_mK,
} from '../../layers/physics/johansen-conductivity';
import { soilThermalProperties, TEXTURE_CATALOGUE } from '../../layers/physics/soil-catalogue';
import { unfrozenWaterContent_m3m3 } from '../../layers/physics/unfrozen-water';

const SEED = 20261201;
const params = { seed: SEED, numRuns: 300 };

describe('soil property invariants (seeded property tests)', () => {
  it('Johansen conductivity lies between k_dry and k_sat, for both states and gradings', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1000, max: 2100, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.constantFrom('coarse' as const, 'fine' as const),
        fc.constantFrom('thawed' as const, 'frozen' as const),
        (rhoD, sr, q, grading, state) => {
          const n = 1 - rhoD / 2650;
          const ks = johansenSolidsConductivity_W_mK(q, grading);
          const kdry = johansenDryConductivity_W_mK(rhoD);
          const ksat = johansenSaturatedConductivity_W_mK({
            porosity: n,
            solidsConductivity_W_mK: ks,
            state,
          });
          const k = johansenConductivity_W_mK({
            porosity: n,
            waterContent_m3m3: sr * n,
            solidsConductivity_W_mK: ks,
            dryConductivity_W_mK: kdry,
            grading,
            state,
          });
          expect(k).toBeGreaterThanOrEqual(Math.min(kdry, ksat) - 1e-12);
          expect(k).toBeLessThanOrEqual(Math.max(kdry, ksat) + 1e-12);
        },
      ),
      params,
    );
  });
  it('conductivity never decreases with water content (fixed soil and state)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(
          'gravel' as const,
          'sand' as const,
          'silt' as const,
          'clay' as const,
          'peat' as const,
        ),
        fc.double({ min: 0, max: 0.99, noNaN: true }),
        fc.double({ min: 0, max: 0.99, noNaN: true }),
        (texture, f1, f2) => {
          const d = TEXTURE_CATALOGUE[texture];
          const n = 1 - d.dryDensity_kg_m3 / d.solidsDensity_kg_m3;
          const [lo, hi] = f1 < f2 ? [f1, f2] : [f2, f1];
          const a = soilThermalProperties({ texture, waterContent_m3m3: lo * n });
          const b = soilThermalProperties({ texture, waterContent_m3m3: hi * n });
          expect(b.kThawed_W_mK).toBeGreaterThanOrEqual(a.kThawed_W_mK - 1e-12);
        },
      ),
      params,
    );
  });
  it('frozen conductivity exceeds thawed for saturated mineral soil', () => {
    fc.assert(
      fc.property(
        fc.constantFrom('gravel' as const, 'sand' as const, 'silt' as const, 'clay' as const),
        fc.double({ min: 1100, max: 2000, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0.5, max: 20, noNaN: true }),
        (texture, rhoD, q, belowFreezing) => {
          // "Frozen" means below the soil's own (depressed) freezing point.
          const n = 1 - rhoD / 2650;
          const layer = { texture, dryDensity_kg_m3: rhoD, waterContent_m3m3: n, quartzFraction: q };
          const fp = soilThermalProperties(layer).freezingPoint_C;
          const p = soilThermalProperties({ ...layer, frozenTemperature_C: fp - belowFreezing });
          expect(p.kFrozen_W_mK).toBeGreaterThan(p.kThawed_W_mK);
          expect(p.cFrozen_J_m3K).toBeLessThan(p.cThawed_J_m3K);
        },
      ),
      params,
    );
  });
  it('every resolved property is finite and positive across the catalogue', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...(Object.keys(TEXTURE_CATALOGUE) as (keyof typeof TEXTURE_CATALOGUE)[])),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (texture, f) => {
          const d = TEXTURE_CATALOGUE[texture];
          const n = 1 - d.dryDensity_kg_m3 / d.solidsDensity_kg_m3;
          const p = soilThermalProperties({ texture, waterContent_m3m3: f * n });
          for (const v of [p.kFrozen_W_mK, p.kThawed_W_mK, p.cFrozen_J_m3K, p.cThawed_J_m3K]) {
            expect(Number.isFinite(v) && v > 0).toBe(true);
          }
          expect(p.latent_J_m3).toBeGreaterThanOrEqual(0);
          expect(p.freezingPoint_C).toBeLessThanOrEqual(0);
        },
      ),
      params,
    );
  });
  it('unfrozen water falls as the soil gets colder and rises with specific surface', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: -0.1, noNaN: true }),
        fc.double({ min: 0.1, max: 5, noNaN: true }),
        fc.double({ min: 5, max: 400, noNaN: true }),
        (t, dt, s) => {
          const base = { specificSurface_m2_g: s, dryDensity_kg_m3: 1300, waterContent_m3m3: 0.5 };
          const warm = unfrozenWaterContent_m3m3({ ...base, temperature_C: t });
          const cold = unfrozenWaterContent_m3m3({ ...base, temperature_C: t - dt });
          expect(cold).toBeLessThanOrEqual(warm);
          const more = unfrozenWaterContent_m3m3({
            ...base,
            specificSurface_m2_g: s * 1.5,
            temperature_C: t,
          });
          expect(more).toBeGreaterThanOrEqual(warm);
        },
      ),
      params,
    );
  });
});
