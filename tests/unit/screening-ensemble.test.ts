import { describe, expect, it } from 'vitest';
import {
  createEnsembleModel,
  RANGE_METRICS,
  UNCERTAIN_CLASS,
} from '../../layers/screening/cell-ensemble-model';
import { createScreeningModel, parseCellInputs } from '../../layers/screening/cell-screening-model';
import { METRIC, METRIC_COUNT } from '../../layers/screening/cell-layers';
import { parseScenario } from '../../layers/screening/scenario';
import {
  SPREAD_ROLES,
  zeroSpread,
  scenarioUncertaintySchema,
} from '../../layers/screening/uncertainty-schema';
import { inputsConfigSchema } from '../../data-pipeline/inputs-config';
import type { CellInputs } from '../../layers/screening/screening-model';

const demoCell = parseCellInputs({
  meanAirTemp_C: -6.5,
  airAmplitude_C: 18,
  warming_C_per_yr: 0.04,
  textureClass: 'silt',
  waterContent_m3m3: 0.38,
  bedrockDepth_m: 18,
  geothermalFlux_W_m2: 0.06,
  nFreeze: 0.5,
  latitude_deg: 75.2,
});

/** A seeded spread of cells over the demo's input ranges (README calibration sample ranges). */
function cells(count: number): CellInputs[] {
  const out: CellInputs[] = [];
  for (let i = 0; i < count; i++) {
    const f = (k: number) => ((i * 7919 + k * 104729) % 1000) / 1000;
    out.push({
      ...demoCell,
      meanAirTemp_C: -12.5 + 9.3 * f(1),
      airAmplitude_C: 12.5 + 9.3 * f(2),
      warming_C_per_yr: 0.03 + 0.05 * f(3),
      textureClass: 1 + (i % 5),
      waterContent_m3m3: 0.1 + 0.4 * f(4),
      bedrockDepth_m: 3 + 30 * f(5),
      nFreeze: i % 3 === 0 ? NaN : 0.3 + 0.4 * f(6),
    });
  }
  return out;
}

const zeroScenario = { uncertainty: zeroSpread(scenarioUncertaintySchema.parse({ members: 8 })) };

describe('per-cell ensemble', () => {
  it('with zero spread reproduces the deterministic model exactly', () => {
    const det = createScreeningModel({});
    const ens = createEnsembleModel({ scenario: zeroScenario });
    const a = new Float32Array(det.layers.length);
    const b = new Float32Array(ens.layers.length);
    expect(ens.layers.slice(0, det.layers.length)).toEqual(det.layers);
    for (const [i, cell] of cells(200).entries()) {
      det.evaluate(cell, a);
      ens.evaluate(cell, b, i);
      // Deterministic bands bit for bit.
      expect(Array.from(b.subarray(0, METRIC_COUNT))).toEqual(Array.from(a));
      // Every percentile equals the deterministic value; success is all or nothing; the class is robust.
      let o = METRIC_COUNT;
      for (const id of RANGE_METRICS) for (let p = 0; p < 3; p++) expect(b[o++]).toEqual(a[METRIC[id]]);
      const success = b[o++];
      expect(success === 0 || success === 1).toBe(true);
      expect(b[o++]).toBe(a[METRIC.suitability]);
      expect(b[o++]).toBe(1);
    }
  });

  it('gives ordered percentiles, probabilities in [0, 1] and a robust class only where members agree', () => {
    const ens = createEnsembleModel({ scenario: { uncertainty: { members: 32 } } });
    const out = new Float32Array(ens.layers.length);
    const id = (x: string) => ens.layers.findIndex((l) => l.id === x);
    let spread = 0;
    let uncertain = 0;
    for (const [i, cell] of cells(120).entries()) {
      ens.evaluate(cell, out, i);
      for (const m of RANGE_METRICS) {
        const [p10, p50, p90] = [out[id(`${m}P10`)], out[id(`${m}P50`)], out[id(`${m}P90`)]];
        if (Number.isNaN(p50)) continue;
        expect(p10).toBeLessThanOrEqual(p50);
        expect(p50).toBeLessThanOrEqual(p90);
        if (p90 > p10) spread++;
      }
      const ps = out[id('successProbability')];
      expect(ps >= 0 && ps <= 1).toBe(true);
      const agreement = out[id('classAgreement')];
      const robust = out[id('robustClass')];
      if (robust === UNCERTAIN_CLASS) {
        uncertain++;
        expect(agreement).toBeLessThan(0.8);
      } else expect(agreement).toBeGreaterThanOrEqual(0.8);
    }
    // The spreads are real: most ranges open up and some classes are uncertain.
    expect(spread).toBeGreaterThan(200);
    expect(uncertain).toBeGreaterThan(0);
  });

  it('depends only on the seed and the cell index, not on evaluation order', () => {
    const scenario = { uncertainty: { members: 16, seed: 42 } };
    const e1 = createEnsembleModel({ scenario });
    const e2 = createEnsembleModel({ scenario });
    const cs = cells(20);
    const first = cs.map((c, i) => {
      const o = new Float32Array(e1.layers.length);
      e1.evaluate(c, o, 1000 + i);
      return Array.from(o);
    });
    const reversed = [...cs.entries()].reverse().map(([i, c]) => {
      const o = new Float32Array(e2.layers.length);
      e2.evaluate(c, o, 1000 + i);
      return Array.from(o);
    });
    expect(reversed.reverse()).toEqual(first);
    const other = createEnsembleModel({ scenario: { uncertainty: { members: 16, seed: 43 } } });
    const o = new Float32Array(other.layers.length);
    other.evaluate(cs[0], o, 1000);
    expect(Array.from(o)).not.toEqual(first[0]);
  });

  it('lets the inputs config replace a grid spread and widens the range with it', () => {
    const base = { uncertainty: zeroSpread(scenarioUncertaintySchema.parse({ members: 32 })) };
    const narrow = createEnsembleModel({ scenario: base });
    const wide = createEnsembleModel({ scenario: base, gridSpreads: { meanAirTemp_C: { sd: 1.5 } } });
    expect(wide.uncertainty.grids.meanAirTemp_C).toEqual({ sd: 1.5 });
    const i10 = wide.layers.findIndex((l) => l.id === 'groundTempEndP10');
    const o1 = new Float32Array(narrow.layers.length);
    const o2 = new Float32Array(wide.layers.length);
    narrow.evaluate(demoCell, o1, 3);
    wide.evaluate(demoCell, o2, 3);
    expect(o1[i10 + 2] - o1[i10]).toBe(0);
    // sd 1.5 K of air temperature moves TTOP by about n-factor-weighted 1 K: the P10-P90 range opens.
    expect(o2[i10 + 2] - o2[i10]).toBeGreaterThan(1);
  });

  it("takes a cell's own standard deviation from a companion grid (cellSd), NaN falling back", () => {
    const base = { uncertainty: zeroSpread(scenarioUncertaintySchema.parse({ members: 32 })) };
    const plain = createEnsembleModel({ scenario: base });
    const withGrid = createEnsembleModel({ scenario: base, gridSdRoles: ['meanAirTemp_C'] });
    expect(withGrid.gridSdRoles).toEqual(['meanAirTemp_C']);
    const declared = createEnsembleModel({ scenario: base, gridSpreads: { meanAirTemp_C: { sd: 1.5 } } });
    const i10 = plain.layers.findIndex((l) => l.id === 'groundTempEndP10');
    const run = (m: typeof plain, sd?: number) => {
      const o = new Float32Array(m.layers.length);
      const cellSd = new Float64Array(SPREAD_ROLES.length).fill(NaN);
      if (sd !== undefined) cellSd[SPREAD_ROLES.indexOf('meanAirTemp_C')] = sd;
      m.evaluate(demoCell, o, 3, cellSd);
      return o;
    };
    // σ = 0 in the cell: exactly the ensemble without a spread for the role.
    expect(Array.from(run(withGrid, 0))).toEqual(Array.from(run(plain)));
    // NaN (companion grid nodata): the declared spread, here none.
    expect(Array.from(run(withGrid))).toEqual(Array.from(run(plain)));
    // σ = 1.5 K from the grid: the same draws as a declared constant sd of 1.5 K (one dimension, same
    // hash stream), so the same range.
    const g = run(withGrid, 1.5);
    const d = run(declared);
    expect(g[i10 + 2] - g[i10]).toBeGreaterThan(1);
    expect(Array.from(g)).toEqual(Array.from(d));
  });
});

describe('uncertainty declarations', () => {
  it('are validated by the scenario schema with paths', () => {
    expect(() =>
      parseScenario({ uncertainty: { parameters: { copScale: { dist: 'uniform', min: 1.2, max: 0.8 } } } }),
    ).toThrow(/uncertainty\.parameters\.copScale\.max: must be >= min/);
    expect(() => parseScenario({ uncertainty: { members: 0 } })).toThrow(/uncertainty\.members/);
    expect(() => parseScenario({ uncertainty: { grids: { textureClass: { sdd: 1 } } } })).toThrow(
      /uncertainty\.grids\.textureClass/,
    );
    // Absent: deterministic; `{}`: every default, each with its stated source in uncertainty-schema.ts.
    expect(parseScenario({}).uncertainty).toBeUndefined();
    expect(parseScenario({ uncertainty: {} }).uncertainty?.members).toBe(32);
  });

  it('are validated per grid in the inputs config (class grids take a confusion probability)', () => {
    const grid = (role: string, kind: string, uncertainty: unknown) => ({
      role,
      file: `${role}.tif`,
      unit: role === 'textureClass' ? 'class' : role === 'meanAirTemp_C' ? 'degC' : 'm',
      kind,
      uncertainty,
    });
    const config = (grids: unknown[]) => ({
      formatVersion: 1,
      region: { name: 'x', fictional: true },
      provenance: '',
      licence: '',
      grids,
    });
    const r = inputsConfigSchema.safeParse(
      config([
        grid('textureClass', 'class', { sd: 1 }),
        grid('meanAirTemp_C', 'continuous', { confusion: 0.1 }),
      ]),
    );
    expect(r.success).toBe(false);
    const paths = r.error?.issues.map((i) => i.path.join('.')) ?? [];
    expect(paths).toContain('grids.0.uncertainty');
    expect(paths).toContain('grids.1.uncertainty');
  });

  it('take a companion standard-deviation grid for continuous grids only, not with a declared spread', () => {
    const config = (grids: unknown[]) => ({
      formatVersion: 1,
      region: { name: 'x', fictional: true },
      provenance: '',
      licence: '',
      grids,
    });
    const ok = inputsConfigSchema.safeParse(
      config([
        { role: 'meanAirTemp_C', file: 'a.tif', unit: 'degC', kind: 'continuous', sdFile: 'a-sd.tif' },
        { role: 'airAmplitude_C', file: 'b.tif', unit: 'K', kind: 'continuous' },
        { role: 'warming_C_per_yr', file: 'c.tif', unit: 'K/yr', kind: 'continuous' },
        { role: 'textureClass', file: 'd.tif', unit: 'class', kind: 'class' },
        { role: 'waterContent_m3m3', file: 'e.tif', unit: 'm3/m3', kind: 'continuous' },
        { role: 'bedrockDepth_m', file: 'f.tif', unit: 'm', kind: 'continuous' },
      ]),
    );
    expect(ok.success, JSON.stringify(ok.error?.issues)).toBe(true);
    const bad = inputsConfigSchema.safeParse(
      config([
        { role: 'textureClass', file: 'd.tif', unit: 'class', kind: 'class', sdFile: 'd-sd.tif' },
        {
          role: 'meanAirTemp_C',
          file: 'a.tif',
          unit: 'degC',
          kind: 'continuous',
          sdFile: 'a-sd.tif',
          uncertainty: { sd: 1 },
        },
      ]),
    );
    expect(bad.success).toBe(false);
    const messages = bad.error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`) ?? [];
    expect(messages.some((m) => /^grids\.0\.sdFile: textureClass is a class grid/.test(m))).toBe(true);
    expect(messages.some((m) => /^grids\.1\.sdFile: .*not both/.test(m))).toBe(true);
  });
});
