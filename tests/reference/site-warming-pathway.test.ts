/**
 * Warming as a pathway in the site simulator (issue 17 item 1): the simulator's surface forcing
 * (site-setup.ts surfaceForcing with the climate's warmingPathway) drives its conduction solver in a
 * 1D column (no phase change, no annual wave, n-factors 1), and the column temperature at depth is
 * checked against the per-cell model's superposed Carslaw & Jaeger ramps for the same pathway
 * (surface-warming-history.ts; Carslaw & Jaeger 1959 §2.5, superposition by Duhamel's theorem §1.14).
 * The full simulator with a straight-line pathway equal to the linear trend gives the linear run.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { createConductionSolver } from '../../layers/site/conduction-solver';
import { materialTable } from '../../layers/site/ground-enthalpy';
import { meshFromFaces } from '../../layers/site/site-mesh';
import { probeStencil, probeTemperature } from '../../layers/site/site-probes';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { surfaceForcing } from '../../layers/site/site-setup';
import { simulateSite } from '../../layers/site/simulate-site';
import { SECONDS_PER_YEAR } from '../../layers/physics/surface-forcing';
import { buildResponseTables } from '../../layers/screening/response-tables';
import { DEFAULT_SCENARIO } from '../../layers/screening/scenario';
import {
  createWarmingHistory,
  historyWarming_K,
  setPathwayHistory,
} from '../../layers/screening/surface-warming-history';

const example = JSON.parse(readFileSync(new URL('../../examples/site-demo.json', import.meta.url), 'utf8'));
const k = 2;
const C = 2e6; // α = 1e-6 m²/s
const table = materialTable([
  {
    kFrozen_W_mK: k,
    kThawed_W_mK: k,
    cFrozen_J_m3K: C,
    cThawed_J_m3K: C,
    latent_J_m3: 1e8,
    freezingPoint_C: -100,
    freezingInterval_K: 0.5,
  },
]);
const pathway = [
  { time_yr: 0, airWarming_K: 0 },
  { time_yr: 25, airWarming_K: 1.2 },
  { time_yr: 50, airWarming_K: 3.5 },
  { time_yr: 75, airWarming_K: 4.0 },
];

describe('site surface forcing with a warming pathway against the per-cell superposed ramps', () => {
  it('column temperature at 3, 8 and 15 m after 40 and 80 years within 1 % of the peak warming', () => {
    const input = siteInputSchema.parse({
      ...example,
      climate: {
        meanAirTemp_C: -5,
        amplitude_C: 0,
        warming_C_per_yr: 0,
        nThaw: 1,
        nFreeze: 1,
        warmingPathway: pathway,
      },
    });
    const surface = surfaceForcing(input, true);
    const f = [0];
    let step = 0.1;
    while (f[f.length - 1] < 300) {
      f.push(f[f.length - 1] + step);
      step = Math.min(step * 1.08, 5);
    }
    const mesh = meshFromFaces([1, 2], f);
    const Ti = -5;
    const s = createConductionSolver({
      mesh,
      materials: table,
      rowMaterial: new Array(mesh.nz).fill(0),
      surfaceTemperature_C: surface,
      bottomFlux_W_m2: 0,
      initialT_C: new Array(mesh.nz).fill(Ti),
      inner: null,
    });
    const h = setPathwayHistory(
      createWarmingHistory(),
      { time_yr: pathway.map((p) => p.time_yr), airOffset_K: pathway.map((p) => p.airWarming_K) },
      1,
      { meanAirTemp_C: Ti, airAmplitude_C: 0, nFreeze: 1, nThaw: 1, sensitivity: 1 },
    );
    const tables = buildResponseTables(DEFAULT_SCENARIO);
    const at = (z: number) =>
      probeTemperature(probeStencil(mesh, table, new Array(mesh.nz).fill(0), 1.5, z), s.T);
    const dt = (5 / 365.25) * SECONDS_PER_YEAR;
    let t = 0;
    for (const year of [40, 80]) {
      while (t < year * SECONDS_PER_YEAR - 1) {
        s.step(dt);
        t += dt;
      }
      for (const z of [3, 8, 15]) {
        const expected = historyWarming_K(tables, h, z, year, (k / C) * SECONDS_PER_YEAR);
        expect(expected).toBeGreaterThan(0.3);
        expect(Math.abs(at(z) - Ti - expected)).toBeLessThan(0.01 * 4.0);
      }
    }
  });
});

describe('simulateSite with a warming pathway', () => {
  it('a straight-line pathway equal to warming_C_per_yr gives the linear run', () => {
    const base = { ...example, years: 3, numerics: { fidelity: 'coarse' } };
    const linear = simulateSite(siteInputSchema.parse(base));
    const path = simulateSite(
      siteInputSchema.parse({
        ...base,
        climate: {
          ...base.climate,
          warming_C_per_yr: 0,
          warmingPathway: [
            { time_yr: 0, airWarming_K: 0 },
            { time_yr: 10, airWarming_K: 10 * base.climate.warming_C_per_yr },
          ],
        },
      }),
    );
    const a = linear.withPile?.probes[0].T_C ?? [];
    const b = path.withPile?.probes[0].T_C ?? [];
    expect(a.length).toBeGreaterThan(10);
    expect(b).toEqual(a);
  });
  it('rejects pathway times out of order, naming the field', () => {
    const r = siteInputSchema.safeParse({
      ...example,
      climate: {
        ...example.climate,
        warmingPathway: [
          { time_yr: 0, airWarming_K: 0 },
          { time_yr: 0, airWarming_K: 1 },
        ],
      },
    });
    expect(r.success).toBe(false);
    expect(JSON.stringify(r.error?.issues.map((i) => i.path))).toContain('"warmingPathway",1,"time_yr"');
  });
});
