/**
 * Discrete maximum principle of the site simulator under seasonal forcing (property test, seeded).
 * With no geothermal flux, no pile and an insulated far radius, heat conduction with phase change has
 * no source: every cell must stay within [coldest, warmest] of the initial field and the surface
 * temperature over the run (e.g. Evans, Partial Differential Equations, §2.3.3, for the heat equation;
 * the enthalpy form keeps it because H(T) is increasing). The solver's fully implicit enthalpy
 * iteration converges to that discrete solution, so a bound violation beyond its tolerance is a bug (the
 * earlier two-pass scheme let a cell at 5 cm fall to −34.8 °C under a surface that never went below
 * −11 °C, with 7-day steps). Inputs: seeded random climates, soils, layerings, steps and fidelities.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { TEXTURE_CATALOGUE } from '../../layers/physics/soil-catalogue';
import { SECONDS_PER_DAY, SECONDS_PER_YEAR } from '../../layers/physics/surface-forcing';
import { createConductionSolver } from '../../layers/site/conduction-solver';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import {
  buildMeshes,
  initialState,
  resolveGround,
  rowMaterials,
  surfaceForcing,
} from '../../layers/site/site-setup';

const TEXTURES = ['gravel', 'sand', 'silt', 'clay', 'peat', 'bedrock'] as const;

const layerArb = fc.record({
  texture: fc.constantFrom(...TEXTURES),
  saturation: fc.double({ min: 0.05, max: 0.95, noNaN: true }),
  thickness_m: fc.double({ min: 0.2, max: 6, noNaN: true }),
});

const caseArb = fc.record({
  meanAirTemp_C: fc.double({ min: -16, max: 3, noNaN: true }),
  amplitude_C: fc.double({ min: 4, max: 25, noNaN: true }),
  warming_C_per_yr: fc.double({ min: -0.05, max: 0.15, noNaN: true }),
  nFreeze: fc.double({ min: 0.2, max: 1, noNaN: true }),
  nThaw: fc.double({ min: 0.6, max: 1.4, noNaN: true }),
  timeStep_days: fc.double({ min: 1, max: 31, noNaN: true }),
  fidelity: fc.constantFrom('coarse' as const, 'standard' as const),
  layers: fc.array(layerArb, { minLength: 1, maxLength: 3 }),
  initial: fc.oneof(
    fc.constant('equilibrium' as const),
    fc.record({ uniform_C: fc.double({ min: -8, max: 2, noNaN: true }) }),
  ),
});

function porosity(texture: (typeof TEXTURES)[number]): number {
  const d = TEXTURE_CATALOGUE[texture];
  return 1 - d.dryDensity_kg_m3 / d.solidsDensity_kg_m3;
}

describe('site simulator: maximum principle under seasonal forcing', () => {
  it('every cell stays within the initial and surface temperature range at every step (50 seeded draws)', () => {
    let runs = 0;
    fc.assert(
      fc.property(caseArb, (c) => {
        let top = 0;
        const layers = c.layers.map((l, i) => {
          const bottom = i === c.layers.length - 1 ? 30 : top + l.thickness_m;
          const layer = {
            top_m: top,
            bottom_m: bottom,
            soil: { texture: l.texture, waterContent_m3m3: l.saturation * porosity(l.texture) },
          };
          top = bottom;
          return layer;
        });
        const parsed = siteInputSchema.safeParse({
          years: 3,
          timeStep_days: c.timeStep_days,
          outputStep_days: 31,
          ground: { layers, geothermalFlux_W_m2: 0, initial: c.initial },
          climate: {
            meanAirTemp_C: c.meanAirTemp_C,
            amplitude_C: c.amplitude_C,
            warming_C_per_yr: c.warming_C_per_yr,
            nThaw: c.nThaw,
            nFreeze: c.nFreeze,
          },
          pile: null,
          operation: { mode: 'heatRate', extraction_W: 0 },
          probes: [],
          domain: { radius_m: 20, depth_m: 30 },
          numerics: { fidelity: c.fidelity },
        });
        // Only inputs the schema accepts (a very dry fine soil is refused: its unfrozen-water curve
        // gives no usable freezing point).
        fc.pre(parsed.success);
        if (!parsed.success) return;
        const input = parsed.data;
        const ground = resolveGround(input);
        const meshes = buildMeshes(input, ground);
        const rowMat = rowMaterials(meshes.column, ground.bottoms_m);
        const init = initialState(input, ground, meshes.column, rowMat);
        const surface = surfaceForcing(input, true);
        const solver = createConductionSolver({
          mesh: meshes.column,
          materials: ground.table,
          rowMaterial: rowMat,
          surfaceTemperature_C: surface,
          bottomFlux_W_m2: 0,
          initialT_C: init.rowT_C,
          inner: null,
        });
        const total = input.years * SECONDS_PER_YEAR;
        const steps = Math.ceil(total / (input.timeStep_days * SECONDS_PER_DAY));
        const dt = total / steps;
        let lo = Math.min(...init.rowT_C);
        let hi = Math.max(...init.rowT_C);
        const slack = 1e-3; // K: the Newton iteration's tolerance (1e-4 K) with room for round-off
        for (let s = 1; s <= steps; s++) {
          // The surface values the solver can see up to this step (it samples the step's end).
          const ts = surface(s * dt);
          lo = Math.min(lo, ts);
          hi = Math.max(hi, ts);
          solver.step(dt);
          for (let k = 0; k < solver.T.length; k++) {
            const T = solver.T[k];
            if (!(T >= lo - slack && T <= hi + slack)) {
              throw new Error(
                `cell ${k} at step ${s}: ${T} °C outside [${lo.toFixed(3)}, ${hi.toFixed(3)}] (${JSON.stringify(c)})`,
              );
            }
          }
        }
        runs++;
      }),
      { seed: 20261202, numRuns: 50 },
    );
    expect(runs).toBeGreaterThanOrEqual(40);
  });
});
