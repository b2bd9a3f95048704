/**
 * The site-study prefill read against a real demo build's manifest and tiles (not a hand-written
 * manifest): every band the prefill reads is a band the build writes, and a clicked settlement's depth
 * to bedrock, soil and climate reach the study with no "not in the map data" note.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BAND } from '../../layers/screening/band-ids';
import { PREFILL_BANDS, sitePrefill } from '../../layers/screening/site-prefill';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { buildSmallDemo, type DemoBuild } from './demo-build-fixture';
import { removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

let demo: DemoBuild;
beforeAll(async () => {
  demo = await buildSmallDemo();
}, 180_000);

describe('site prefill on a real demo build', () => {
  it('reads only bands the build writes', () => {
    const ids = demo.manifest.bands.map((b) => b.id);
    for (const band of PREFILL_BANDS) expect(ids, band).toContain(band);
  });

  it('carries each settlement cell’s bedrock depth, soil and climate into the study without fallbacks', async () => {
    expect(demo.settlements.length).toBeGreaterThan(2);
    for (const s of demo.settlements) {
      const values = await demo.valuesAt(s.lon, s.lat);
      expect(values, s.name).not.toBeNull();
      if (!values) continue;
      const { draft, notes } = sitePrefill(values, demo.manifest.scenario);
      // No fallback notes; the one note is the standard pile's resistance (an assumption, not missing data).
      expect(
        notes.filter((n) => n.path !== 'pile.resistance').map((n) => n.text),
        s.name,
      ).toEqual([]);
      expect(notes.map((n) => n.path)).toEqual(['pile.resistance']);
      const rock = values[BAND.bedrockDepth];
      expect(rock, s.name).not.toBeNull();
      const layers = draft.ground.layers;
      const soilBottom = layers[0].bottom_m;
      // Rock within the 50 m domain: the soil stops at the map's bedrock depth (0.1 m rounding).
      if (rock !== null && rock < 50) {
        expect(Math.abs(soilBottom - rock), s.name).toBeLessThanOrEqual(0.05 + 1e-9);
        expect(layers[1]?.soil?.texture, s.name).toBe('bedrock');
      }
      expect(draft.climate.meanAirTemp_C).toBeCloseTo(values[BAND.meanAirTemp_C] ?? NaN, 2);
      expect(siteInputSchema.safeParse(draft).success, s.name).toBe(true);
    }
  });
});
