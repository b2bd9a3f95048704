/**
 * Site panel prefill: the mapping from a clicked cell's tile bands to the site input (documented in
 * layers/screening/site-prefill.ts), and back to the quick estimate's cell inputs.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { soilThermalProperties } from '../../layers/physics/soil-catalogue';
import { heatPumpAt } from '../../layers/physics/heat-pump';
import { fluidProperties } from '../../layers/physics/fluids';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { DEFAULT_SCENARIO } from '../../layers/screening/scenario';
import { screenCell } from '../../layers/screening/cell-screening-model';
import {
  cellInputsFromSite,
  MAX_SITE_WATER_CONTENT_M3M3,
  PREFILL_FALLBACKS,
  sitePrefill,
  standardDesignLoad_W,
} from '../../layers/screening/site-prefill';

const cell = { meanAirTemp_C: -6.2, textureClass: 3, waterContent_m3m3: 0.38, bedrockDepth: 22.4 };

describe('sitePrefill', () => {
  it('maps climate, soil and bedrock from the tile bands into a valid site input', () => {
    const { draft, notes } = sitePrefill(cell);
    expect(draft.climate.meanAirTemp_C).toBe(-6.2);
    expect(draft.ground.layers).toHaveLength(2);
    expect(draft.ground.layers[0]).toMatchObject({
      top_m: 0,
      bottom_m: 22.4,
      soil: { texture: 'silt', waterContent_m3m3: 0.38 },
    });
    expect(draft.ground.layers[1]).toMatchObject({ top_m: 22.4, bottom_m: 50, soil: { texture: 'bedrock' } });
    const parsed = siteInputSchema.safeParse(draft);
    expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
    // Amplitude and warming are not tile bands in this build: the regional defaults apply, with a note.
    // The pile resistance is the map's standard pile's, said in a note beside the field.
    expect(notes.map((n) => n.path)).toEqual([
      'climate.amplitude_C',
      'climate.warming_C_per_yr',
      'pile.resistance',
    ]);
  });

  it("prefills the map's standard pile: its resistance, 40 % glycol and the flow of the map's 3 K loop difference", () => {
    const s = DEFAULT_SCENARIO;
    const { draft, notes } = sitePrefill(cell);
    const pile = draft.pile!;
    expect(pile.resistance).toEqual({ Rb_mK_W: s.pile.resistance_mK_W, Ra_mK_W: 1 });
    expect(pile.fluid).toEqual({ name: 'propyleneGlycol', massFraction: 0.4 });
    expect(notes.find((n) => n.path === 'pile.resistance')?.text).toContain(
      `${s.pile.resistance_mK_W} m·K/W`,
    );
    // Hand check of the flow: ground share of the design-day peak over the 16 piles, over ρc_p·ΔT.
    const peak_W = standardDesignLoad_W(s, -6.2, PREFILL_FALLBACKS.amplitude_C);
    const cop = heatPumpAt({ enteringFluid_C: s.heatPump.minEnteringFluid_C }).cop;
    const fl = fluidProperties({ fluid: 'propyleneGlycol', massFraction: 0.4, temperature_C: -8 });
    const perPile_W = (peak_W * (1 - 1 / cop)) / s.building.foundationPiles;
    const dT = perPile_W / (((pile.flow_L_min as number) / 60000) * fl.density_kg_m3 * fl.specificHeat_J_kgK);
    expect(dT).toBeGreaterThan(2 * s.heatPump.fluidHalfDelta_K - 0.1);
    expect(dT).toBeLessThan(2 * s.heatPump.fluidHalfDelta_K + 0.1);
  });

  it('takes amplitude and warming from the tiles when they are there (no fallback notes)', () => {
    const { draft, notes } = sitePrefill({ ...cell, airAmplitude_C: 21.5, warming_C_per_yr: 0.06 });
    expect(draft.climate.amplitude_C).toBe(21.5);
    expect(draft.climate.warming_C_per_yr).toBe(0.06);
    expect(notes.map((n) => n.path)).toEqual(['pile.resistance']);
  });

  it('passes water above the porosity through as excess ice (issue 11 item 7), capping only at the site input limit', () => {
    // Gravel at its catalogue dry density 1900 kg/m³ and solids 2650 kg/m³: porosity 0.283; 0.6 m³/m³ is
    // ice-rich gravel (excess ice), no longer clipped to 95 % of the porosity.
    const { draft, notes } = sitePrefill({ ...cell, textureClass: 1, waterContent_m3m3: 0.6 });
    expect(draft.ground.layers[0].soil?.waterContent_m3m3).toBe(0.6);
    expect(notes.some((n) => n.path === 'ground.layers.0.soil.waterContent_m3m3')).toBe(false);
    expect(siteInputSchema.safeParse(draft).success).toBe(true);
    const massive = sitePrefill({ ...cell, textureClass: 1, waterContent_m3m3: 0.98 });
    expect(massive.draft.ground.layers[0].soil?.waterContent_m3m3).toBe(MAX_SITE_WATER_CONTENT_M3M3);
    expect(massive.notes.some((n) => n.path === 'ground.layers.0.soil.waterContent_m3m3')).toBe(true);
  });

  it('makes the whole column bedrock for a bedrock cell or bedrock at the surface', () => {
    for (const values of [
      { ...cell, textureClass: 6 },
      { ...cell, bedrockDepth: 0.1 },
    ]) {
      const { draft } = sitePrefill(values);
      expect(draft.ground.layers).toHaveLength(1);
      expect(draft.ground.layers[0]).toMatchObject({ top_m: 0, bottom_m: 50, soil: { texture: 'bedrock' } });
    }
  });

  it('gives the study the load at the coldest air, UA·(balance − (MAAT − amplitude)), and the map’s design-day load with the margin', () => {
    // Scenario defaults (layers/screening/scenario.ts): UA 150 W/K, balance 18 °C, margin 8 K (recalled from memory).
    // The site input's designLoad_W is the load line's top (site-input-schema.ts: "at the coldest air");
    // the design-day margin belongs to the peak pulse only (site-load-line.ts), as in the map's kernel.
    expect(standardDesignLoad_W(DEFAULT_SCENARIO, -6.2, 18)).toBeCloseTo(150 * (18 - (-6.2 - 18 - 8)), 9);
    const { draft } = sitePrefill(cell);
    expect(draft.operation).toMatchObject({
      mode: 'building',
      designLoad_W: Math.round((150 * (18 - (-6.2 - 18))) / 100) * 100,
      pileCount: 16,
      balancePoint_C: 18,
    });
    expect(draft.operation.mode === 'building' && draft.operation.designLoad_W).toBe(6300);
  });

  it('puts the scenario reference point first among the probes (same point as the map thaw delay)', () => {
    const { draft } = sitePrefill(cell);
    expect(draft.probes[0]).toEqual({
      r_m: DEFAULT_SCENARIO.referenceRadius_m,
      z_m: DEFAULT_SCENARIO.referenceDepth_m,
    });
  });

  it('turns the form back into the quick estimate inputs (same texture, water, bedrock, climate)', () => {
    const { draft } = sitePrefill(cell);
    const ci = cellInputsFromSite(draft, DEFAULT_SCENARIO);
    expect(ci).toMatchObject({
      meanAirTemp_C: -6.2,
      textureClass: 3,
      waterContent_m3m3: 0.38,
      bedrockDepth_m: 22.4,
    });
    const quick = screenCell(ci, DEFAULT_SCENARIO);
    expect(quick.metrics.groundTemp.value).not.toBeNull();
  });

  it('has no quick estimate for explicit layer properties', () => {
    const { draft } = sitePrefill(cell);
    const explicit = {
      ...draft,
      ground: {
        ...draft.ground,
        layers: [
          {
            top_m: 0,
            bottom_m: 50,
            kFrozen_W_mK: 2,
            kThawed_W_mK: 1.5,
            cFrozen_J_m3K: 2e6,
            cThawed_J_m3K: 2.5e6,
            latent_J_m3: 1e8,
            freezingPoint_C: 0,
          },
        ],
      },
    };
    expect(cellInputsFromSite(explicit, DEFAULT_SCENARIO)).toBeNull();
  });
});

describe('sitePrefill over the whole input range', () => {
  it('always gives an input the schema and the soil catalogue accept (property, seeded)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 5, noNaN: true }),
        fc.integer({ min: 1, max: 6 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 200, noNaN: true }),
        (maat, texture, water, bedrock) => {
          const { draft } = sitePrefill({
            meanAirTemp_C: maat,
            textureClass: texture,
            waterContent_m3m3: water,
            bedrockDepth: bedrock,
          });
          const parsed = siteInputSchema.safeParse(draft);
          expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
          for (const layer of draft.ground.layers) {
            const soil = layer.soil;
            if (!soil) throw new Error('prefill layers carry soil descriptions');
            expect(() =>
              soilThermalProperties({ texture: soil.texture, waterContent_m3m3: soil.waterContent_m3m3 }),
            ).not.toThrow();
          }
        },
      ),
      { seed: 11, numRuns: 300 },
    );
  });
});
