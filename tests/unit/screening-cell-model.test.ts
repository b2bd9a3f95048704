import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  createScreeningModel,
  manifestCriteria,
  parseCellInputs,
  screenCell,
} from '../../layers/screening/cell-screening-model';
import { METRIC, METRIC_COUNT, METRIC_IDS } from '../../layers/screening/cell-layers';
import { buildCellConstants, soilAt } from '../../layers/screening/cell-constants';
import {
  createKernelScratch,
  evaluateCellMetrics,
  evaluateCellMetricsSameGround,
  pileWinterAnomaly_K,
} from '../../layers/screening/cell-kernel';
import { perturbedScenarios } from '../../layers/screening/class-robustness';
import { DEFAULT_SCENARIO, parseScenario, type Scenario } from '../../layers/screening/scenario';
import { criterionSchema, bandSchema } from '../../layers/screening/manifest';
import { soilThermalProperties } from '../../layers/physics/soil-catalogue';
import { degreeDays } from '../../layers/physics/surface-forcing';
import { ttop_C } from '../../layers/physics/ttop';
import { neumannActiveLayer_m } from '../../layers/physics/neumann-active-layer';
import type { CellInputs } from '../../layers/screening/screening-model';

const base: CellInputs = {
  meanAirTemp_C: -6,
  airAmplitude_C: 18,
  warming_C_per_yr: 0.05,
  textureClass: 3,
  waterContent_m3m3: 0.4,
  bedrockDepth_m: 20,
  groundTemp_C: NaN,
  geothermalFlux_W_m2: NaN,
  nFreeze: NaN,
  latitude_deg: 72,
};

function metrics(cell: Partial<CellInputs>, s: Scenario = DEFAULT_SCENARIO): Float64Array {
  const m = new Float64Array(METRIC_COUNT);
  evaluateCellMetrics({ ...base, ...cell }, buildCellConstants(s), createKernelScratch(), m);
  return m;
}

const cellArb = fc.record({
  meanAirTemp_C: fc.double({ min: -14, max: -2.5, noNaN: true }),
  airAmplitude_C: fc.double({ min: 10, max: 24, noNaN: true }),
  warming_C_per_yr: fc.double({ min: 0.01, max: 0.1, noNaN: true }),
  textureClass: fc.integer({ min: 1, max: 5 }),
  waterContent_m3m3: fc.double({ min: 0.05, max: 0.85, noNaN: true }),
});

describe('layers and manifest criteria', () => {
  const model = createScreeningModel();
  it('one valid manifest band per metric, ids unique, in METRIC order', () => {
    expect(model.layers.map((l) => l.id)).toEqual([...METRIC_IDS]);
    expect(new Set(METRIC_IDS).size).toBe(METRIC_COUNT);
    for (const l of model.layers) {
      const band = { ...l, scale: 1, offset: 0, min: 0, max: 1 };
      expect(bandSchema.safeParse(band).success).toBe(true);
    }
  });
  it('every criterion is valid for the manifest and reads an existing band', () => {
    for (const c of manifestCriteria()) {
      expect(criterionSchema.safeParse(c).success).toBe(true);
      expect(METRIC_IDS).toContain(c.bandId);
    }
  });
  it('a bad scenario field is refused with its path', () => {
    expect(() => createScreeningModel({ pile: { radius_m: 'thick' } })).toThrow(/pile\.radius_m/);
    expect(() => createScreeningModel({ designLife_yr: 0 })).toThrow(/designLife_yr/);
    expect(() => createScreeningModel({ referenceRadius_m: 0.05 })).toThrow(/referenceRadius_m/);
    expect(() => createScreeningModel({ economics: { furnaceEficiency: 0.8 } })).toThrow(/furnaceEficiency/);
  });
  it('bad cell JSON is refused with its path; texture names are accepted', () => {
    expect(() => parseCellInputs({ ...base, waterContent_m3m3: 2 })).toThrow(/waterContent_m3m3/);
    expect(parseCellInputs({ ...base, textureClass: 'peat', groundTemp_C: null }).textureClass).toBe(5);
  });
});

describe('the kernel reuses the science core (cross-checks against direct calls)', () => {
  it('ground temperature = TTOP + geothermal gradient below the Neumann thaw-season active layer', () => {
    const m = metrics({});
    const p = soilThermalProperties({ texture: 'silt', waterContent_m3m3: 0.4 });
    const dd = degreeDays({ meanAirTemp_C: -6, amplitude_C: 18 });
    const s = DEFAULT_SCENARIO;
    const t = ttop_C({
      ...dd,
      nFreeze: 0.5,
      nThaw: 1,
      kThawed_W_mK: p.kThawed_W_mK,
      kFrozen_W_mK: p.kFrozen_W_mK,
    });
    // Issue 11 item 4: the active layer carries the sensible heat of both zones (was Stefan, all pore
    // water, no sensible heat: 7 % deeper here, up to 2.7× in rock).
    const alt = neumannActiveLayer_m({
      meanAirTemp_C: -6,
      amplitude_C: 18,
      nThaw: 1,
      ttop_C: t,
      kThawed_W_mK: p.kThawed_W_mK,
      kFrozen_W_mK: p.kFrozen_W_mK,
      cThawed_J_m3K: p.cThawed_J_m3K,
      cFrozen_J_m3K: p.cFrozen_J_m3K,
      latent_J_m3: p.latent_J_m3,
    });
    const zp = s.pile.topDepth_m + s.pile.length_m / 2;
    const expected = t + (0.06 / p.kFrozen_W_mK) * (zp - alt);
    expect(m[METRIC.activeLayer]).toBeCloseTo(alt, 2);
    expect(m[METRIC.groundTemp]).toBeCloseTo(expected, 2);
  });
  it('a ground-temperature grid value replaces TTOP at pile depth', () => {
    expect(metrics({ groundTemp_C: -4.25 })[METRIC.groundTemp]).toBe(-4.25);
  });
  it('soil table interpolation stays within 1 % of soilThermalProperties', () => {
    const k = buildCellConstants(DEFAULT_SCENARIO);
    const out = createKernelScratch().soil;
    const names = ['gravel', 'sand', 'silt', 'clay', 'peat'] as const;
    names.forEach((texture, i) => {
      const t = k.soil[i + 1];
      for (let j = 1; j < 20; j++) {
        const th = t.thetaMin + ((t.thetaMax - t.thetaMin) * j) / 20.3;
        const p = soilThermalProperties({ texture, waterContent_m3m3: th });
        soilAt(t, th, out);
        expect(Math.abs(out.kFrozen / p.kFrozen_W_mK - 1)).toBeLessThan(0.01);
        expect(Math.abs(out.kThawed / p.kThawed_W_mK - 1)).toBeLessThan(0.01);
        expect(Math.abs(out.cFrozen / p.cFrozen_J_m3K - 1)).toBeLessThan(0.01);
      }
    });
  });
  it('excess ice (issue 11 item 7): above the porosity the table follows soilThermalProperties to 1 %, latent heat exact, never clamped', () => {
    const k = buildCellConstants(DEFAULT_SCENARIO);
    const out = createKernelScratch().soil;
    const names = ['gravel', 'sand', 'silt', 'clay', 'peat', 'bedrock'] as const;
    names.forEach((texture, i) => {
      const t = k.soil[i + 1];
      for (let j = 1; j < 20; j++) {
        const th = t.thetaMax + ((0.99 - t.thetaMax) * j) / 20.3;
        const p = soilThermalProperties({ texture, waterContent_m3m3: th });
        soilAt(t, th, out);
        expect(Math.abs(out.kFrozen / p.kFrozen_W_mK - 1)).toBeLessThan(0.01);
        expect(Math.abs(out.kThawed / p.kThawed_W_mK - 1)).toBeLessThan(0.01);
        expect(Math.abs(out.cFrozen / p.cFrozen_J_m3K - 1)).toBeLessThan(0.01);
        expect(Math.abs(out.latent / p.latent_J_m3 - 1)).toBeLessThan(1e-9);
      }
    });
    // Ice-rich silt at θ 0.7: porosity 1 − 1400/2650 = 0.47170 (catalogue densities), excess ice
    // e = (0.7 − 0.47170)/(1 − 0.47170) = 0.43214 (hand); its latent heat is that of all 0.7 m³/m³.
    const ice = metrics({ waterContent_m3m3: 0.7 });
    expect(ice[METRIC.excessIce]).toBeCloseTo(0.43214, 4);
    expect(metrics({ waterContent_m3m3: 0.4 })[METRIC.excessIce]).toBe(0);
    // More ice to melt: the thaw without piles comes later than at the porosity (a warm cell whose
    // saturated ground thaws before the climate horizon: 2085 here).
    const warm = { meanAirTemp_C: -2, warming_C_per_yr: 0.08 };
    const sat = metrics({ ...warm, waterContent_m3m3: 0.4717 });
    expect(sat[METRIC.thawBeyondHorizon]).toBeLessThan(2);
    expect(metrics({ ...warm, waterContent_m3m3: 0.7 })[METRIC.thawYear]).toBeGreaterThan(
      sat[METRIC.thawYear],
    );
  });
  it('winter anomaly: deep piles see none, a pile at the surface sees about half the surface wave', () => {
    expect(
      pileWinterAnomaly_K({ surfaceAmplitude_C: 10, diffusivity_m2_s: 1e-6, top_m: 40, bottom_m: 50 }),
    ).toBeLessThan(1e-4);
    // average of e^-u cos u over u in [0, small] -> 1
    expect(
      pileWinterAnomaly_K({ surfaceAmplitude_C: 10, diffusivity_m2_s: 1e-6, top_m: 0, bottom_m: 0.01 }),
    ).toBeCloseTo(10, 1);
  });
});

describe('exclusions', () => {
  it('missing input → outside the data, nothing else evaluated', () => {
    const m = metrics({ meanAirTemp_C: NaN });
    expect(m[METRIC.exclusion]).toBe(1);
    expect(m[METRIC.suitability]).toBe(0);
    expect(m[METRIC.groundTemp]).toBeNaN();
  });
  it('bedrock texture or shallow bedrock → 2; warm climate → no permafrost 3', () => {
    expect(metrics({ textureClass: 6, waterContent_m3m3: 0.03 })[METRIC.exclusion]).toBe(2);
    expect(metrics({ bedrockDepth_m: 3 })[METRIC.exclusion]).toBe(2);
    expect(metrics({ meanAirTemp_C: 1 })[METRIC.exclusion]).toBe(3);
  });
  it('a very cold cell reaches the fluid limit (5) with a -5 °C heat pump', () => {
    const s = parseScenario({ heatPump: { minEnteringFluid_C: -5 } });
    expect(metrics({ meanAirTemp_C: -14, groundTemp_C: -9 }, s)[METRIC.exclusion]).toBe(5);
  });
  it('an active layer below the reference depth → already thawed (4)', () => {
    const s = parseScenario({ referenceDepth_m: 1, pile: { topDepth_m: 0, length_m: 2 } });
    const m = metrics({ meanAirTemp_C: -3, textureClass: 1, waterContent_m3m3: 0.05, groundTemp_C: -1 }, s);
    expect(m[METRIC.activeLayer]).toBeGreaterThan(1);
    expect(m[METRIC.exclusion]).toBe(4);
  });
});

describe('operating window and binding limit', () => {
  it('default heat pump: gravel (6 K allowed) fluid-limited; silt in the 4 × 4 group (2 K) and strict over-cooling: over-cooling binds', () => {
    // Silt was fluid-limited before the group: one pile cooled the point between piles 2.6 times less.
    expect(metrics({ textureClass: 1, waterContent_m3m3: 0.15 })[METRIC.bindingLimit]).toBe(2);
    expect(metrics({})[METRIC.bindingLimit]).toBe(3);
    const s = parseScenario({ heatPump: { minEnteringFluid_C: -18 }, maxOvercooling_K: 0.5 });
    const m = metrics({}, s);
    expect(m[METRIC.bindingLimit]).toBe(3);
    expect(m[METRIC.windowUpper]).toBeCloseTo(m[METRIC.windowUpperOvercool], 9);
  });
  // A small load on the standard 16 piles (a 5 W/K building). Spreading a small load over many piles
  // no longer shows it: 400 piles at 3 m cool the point between them together (group superposition),
  // and their 0.6 W/m each clears the 0.56 W/m the ground needs; at 12 m spacing it needs 5.6 W/m again.
  it('warm permafrost with a small load: thaw binds', () => {
    const s = parseScenario({ building: { heatLossCoefficient_W_K: 5 } });
    const m = metrics({ groundTemp_C: -0.3, textureClass: 1, waterContent_m3m3: 0.15 }, s);
    expect(m[METRIC.windowLower]).toBeGreaterThan(m[METRIC.extractionCarried]);
    expect(m[METRIC.bindingLimit]).toBe(1);
  });
  it('invariants over the demo ranges (property)', () => {
    fc.assert(
      fc.property(cellArb, (c) => {
        const m = metrics(c);
        if (m[METRIC.exclusion] !== 0) return;
        const share = m[METRIC.loadShare];
        expect(share).toBeGreaterThanOrEqual(0);
        expect(share).toBeLessThanOrEqual(1);
        expect(m[METRIC.windowUpper]).toBeLessThanOrEqual(m[METRIC.windowUpperFluid] + 1e-9);
        expect(m[METRIC.windowUpper]).toBeLessThanOrEqual(m[METRIC.windowUpperOvercool] + 1e-9);
        // Issue 11 item 8: thaw years never past the climate horizon; the delay is undetermined (NaN)
        // exactly when neither case thaws before it.
        const flag = m[METRIC.thawBeyondHorizon];
        if (Number.isFinite(flag)) {
          expect(m[METRIC.thawYearPiles]).toBeLessThanOrEqual(DEFAULT_SCENARIO.climateHorizonYear);
          expect(Number.isNaN(m[METRIC.thawDelay])).toBe(flag === 2);
          if (flag !== 2) expect(m[METRIC.thawDelay]).toBeGreaterThanOrEqual(0);
          if (flag >= 1) expect(m[METRIC.thawYearPiles]).toBe(DEFAULT_SCENARIO.climateHorizonYear);
          expect(m[METRIC.thawYearPiles]).toBeGreaterThanOrEqual(m[METRIC.thawYear]);
        }
        // Issue 13: the fuel-increase flag follows the system COP (pumps, backup, auxiliaries), which
        // never exceeds the unit's seasonal COP.
        expect(m[METRIC.fuelIncrease]).toBe(m[METRIC.systemCop] < m[METRIC.breakEvenCopFuel] ? 1 : 0);
        expect(m[METRIC.systemCop]).toBeLessThanOrEqual(m[METRIC.seasonalCop]);
        // Issue 13: the piles' cooling never lowers the end-of-life capacity; the start has the most.
        expect(m[METRIC.capacityKept]).toBeGreaterThanOrEqual(-1e-9);
        expect(m[METRIC.capacityEnd]).toBeLessThanOrEqual(m[METRIC.capacityStart] + 1e-9);
        const score = m[METRIC.suitabilityScore];
        expect(score).toBeGreaterThanOrEqual(0);
        expect(score).toBeLessThanOrEqual(1);
      }),
      { seed: 5, numRuns: 150 },
    );
  });
});

describe('end-of-life ground temperature and thaw years agree (issue 11 item 8)', () => {
  const life = DEFAULT_SCENARIO.designLife_yr;
  const endYear = DEFAULT_SCENARIO.startYear + life;
  it('default scenario: pile mid-depth = reference depth (6 m), so groundTempEnd > 0 exactly when the no-pile thaw year falls within the life; the zero curtain sits at 0 °C', () => {
    expect(DEFAULT_SCENARIO.pile.topDepth_m + DEFAULT_SCENARIO.pile.length_m / 2).toBe(
      DEFAULT_SCENARIO.referenceDepth_m,
    );
    let curtains = 0;
    fc.assert(
      fc.property(cellArb, (c) => {
        const m = metrics(c);
        if (!(m[METRIC.groundTemp] < 0)) return;
        const end = m[METRIC.groundTempEnd];
        const thawed = m[METRIC.thawYear] <= endYear && m[METRIC.thawBeyondHorizon] !== 2;
        expect(end > 0).toBe(thawed);
        if (m[METRIC.zeroCurtain] === 1) {
          curtains++;
          expect(end).toBe(0);
          expect(m[METRIC.permafrostClassEnd]).toBe(1);
        }
      }),
      { seed: 31, numRuns: 300 },
    );
    expect(curtains).toBeGreaterThan(0);
  });
  it('warm silt: the conduction ramp passes 0 °C within the life but the ice has not melted: 0 °C, zero curtain', () => {
    const m = metrics({ meanAirTemp_C: -3, warming_C_per_yr: 0.08, waterContent_m3m3: 0.4717 });
    expect(m[METRIC.groundTempEnd]).toBe(0);
    expect(m[METRIC.zeroCurtain]).toBe(1);
    expect(m[METRIC.thawYear]).toBeGreaterThan(endYear);
  });
  it('thaw years never pass the climate horizon; a later horizon reveals the capped years', () => {
    const m = metrics({});
    expect(m[METRIC.thawBeyondHorizon]).toBe(2);
    expect(m[METRIC.thawYear]).toBe(2100);
    expect(m[METRIC.thawYearPiles]).toBe(2100);
    expect(m[METRIC.thawDelay]).toBeNaN();
    expect(m[METRIC.frozenMargin]).toBe(2100 - endYear);
    const later = metrics({}, parseScenario({ climateHorizonYear: 2400 }));
    expect(later[METRIC.thawBeyondHorizon]).toBe(0);
    expect(later[METRIC.thawYear]).toBeGreaterThan(2100);
    expect(later[METRIC.thawYearPiles]).toBeLessThanOrEqual(2400);
    expect(() => parseScenario({ climateHorizonYear: 2020 })).toThrow(/climateHorizonYear/);
  });
});

describe('monotonicity (property tests over the demo ranges)', () => {
  it('colder ground never brings the thaw year without piles earlier', () => {
    fc.assert(
      fc.property(
        cellArb,
        fc.double({ min: -8, max: -0.3, noNaN: true }),
        fc.double({ min: 0.1, max: 3, noNaN: true }),
        (c, tg, d) => {
          const warm = metrics({ ...c, groundTemp_C: tg });
          const cold = metrics({ ...c, groundTemp_C: tg - d });
          expect(cold[METRIC.thawYear]).toBeGreaterThanOrEqual(warm[METRIC.thawYear] - 1e-6);
        },
      ),
      { seed: 17, numRuns: 150 },
    );
  });
  it('faster warming never delays the thaw year without piles', () => {
    fc.assert(
      fc.property(cellArb, fc.double({ min: 0.001, max: 0.05, noNaN: true }), (c, db) => {
        const slow = metrics(c);
        const fast = metrics({ ...c, warming_C_per_yr: c.warming_C_per_yr + db });
        if (Number.isNaN(slow[METRIC.thawYear])) return;
        expect(fast[METRIC.thawYear]).toBeLessThanOrEqual(slow[METRIC.thawYear] + 1e-6);
      }),
      { seed: 19, numRuns: 150 },
    );
  });
  it('a larger heating load (more extraction carried per pile) never shortens the thaw delay', () => {
    const more = parseScenario({ building: { heatLossCoefficient_W_K: 300 } });
    fc.assert(
      fc.property(cellArb, (c) => {
        const a = metrics(c);
        const b = metrics(c, more);
        if (a[METRIC.exclusion] !== 0) return;
        // Within 5 % (2.0 % the largest found): the loop's flow is sized for the design peak per pile (bivalent-operation.ts), so a
        // larger building runs a larger flow, a smaller loop difference at part load and a warmer mean
        // fluid; where every month is at the fluid limit the pile then gives slightly less.
        expect(b[METRIC.extractionCarried]).toBeGreaterThanOrEqual(a[METRIC.extractionCarried] * 0.95 - 1e-9);
        // Undetermined (NaN) when neither case thaws before the climate horizon (issue 11 item 8).
        if (Number.isNaN(a[METRIC.thawDelay])) return;
        expect(b[METRIC.thawDelay]).toBeGreaterThanOrEqual(a[METRIC.thawDelay] - 0.02);
      }),
      { seed: 23, numRuns: 100 },
    );
  });
  it('a colder allowed fluid or a lower pile resistance never needs more piles per ton', () => {
    const colder = parseScenario({ heatPump: { minEnteringFluid_C: -10 } });
    const better = parseScenario({ pile: { resistance_mK_W: 0.08 } });
    fc.assert(
      fc.property(cellArb, (c) => {
        const a = metrics(c)[METRIC.pilesPerTon];
        if (!Number.isFinite(a)) return;
        expect(metrics(c, colder)[METRIC.pilesPerTon]).toBeLessThanOrEqual(a);
        expect(metrics(c, better)[METRIC.pilesPerTon]).toBeLessThanOrEqual(a);
      }),
      { seed: 29, numRuns: 100 },
    );
  });
});

describe('robustness of the hot path', () => {
  it('evaluate never throws and always writes a class, whatever the inputs (property)', () => {
    const model = createScreeningModel();
    const out = new Float32Array(METRIC_COUNT);
    const num = (min: number, max: number) =>
      fc.oneof(fc.double({ min, max, noNaN: true }), fc.constant(NaN), fc.constant(Infinity));
    fc.assert(
      fc.property(
        fc.record({
          meanAirTemp_C: num(-70, 50),
          airAmplitude_C: num(-5, 70),
          warming_C_per_yr: num(-2, 2),
          textureClass: fc.oneof(fc.integer({ min: -1, max: 8 }), fc.constant(2.5)),
          waterContent_m3m3: num(-0.1, 1.2),
          bedrockDepth_m: num(-1, 100),
          groundTemp_C: num(-45, 35),
          geothermalFlux_W_m2: num(-0.1, 1.5),
          nFreeze: num(0, 2),
          latitude_deg: num(-90, 90),
        }),
        (c) => {
          model.evaluate(c, out);
          expect([0, 1, 2, 3]).toContain(out[METRIC.suitability]);
          expect([0, 1, 2, 3, 4, 5]).toContain(out[METRIC.exclusion]);
        },
      ),
      { seed: 37, numRuns: 400 },
    );
  });
});

describe('the robustness runs share the ground stage', () => {
  // No published source: a consistency check of two code paths of this kernel. The perturbed scenarios
  // (class-robustness.ts) change only the heat pump, so the ground stage taken from the base evaluation
  // must give every metric exactly as a full evaluation does.
  it('evaluateCellMetricsSameGround equals evaluateCellMetrics for every perturbation (property)', () => {
    const k = buildCellConstants(DEFAULT_SCENARIO);
    const perturbed = perturbedScenarios(DEFAULT_SCENARIO).map(buildCellConstants);
    const x = createKernelScratch();
    const fresh = createKernelScratch();
    const m = new Float64Array(METRIC_COUNT);
    const shared = new Float64Array(METRIC_COUNT);
    const full = new Float64Array(METRIC_COUNT);
    fc.assert(
      fc.property(
        fc.record({
          meanAirTemp_C: fc.double({ min: -14, max: -1, noNaN: true }),
          airAmplitude_C: fc.double({ min: 10, max: 24, noNaN: true }),
          warming_C_per_yr: fc.double({ min: 0, max: 0.1, noNaN: true }),
          textureClass: fc.integer({ min: 1, max: 5 }),
          waterContent_m3m3: fc.double({ min: 0.02, max: 0.8, noNaN: true }),
          groundTemp_C: fc.oneof(fc.constant(NaN), fc.double({ min: -8, max: 0, noNaN: true })),
        }),
        (c) => {
          const cell = { ...base, ...c };
          evaluateCellMetrics(cell, k, x, m);
          for (const kp of perturbed) {
            evaluateCellMetricsSameGround(cell, kp, x, shared, m);
            evaluateCellMetrics(cell, kp, fresh, full);
            METRIC_IDS.forEach((id, i) => expect([id, shared[i]]).toEqual([id, full[i]]));
          }
        },
      ),
      { seed: 11, numRuns: 150 },
    );
  });
});

describe('screenCell and evaluate agree', () => {
  it('the card shows the map value (Float32 of the same kernel) and explains the class', () => {
    const model = createScreeningModel();
    const out = new Float32Array(METRIC_COUNT);
    model.evaluate(base, out);
    const card = screenCell({ ...base, groundTemp_C: null, geothermalFlux_W_m2: null, nFreeze: null });
    METRIC_IDS.forEach((id, i) => {
      const v = card.metrics[id].value;
      if (v === null) expect(out[i]).toBeNaN();
      else expect(out[i]).toBeCloseTo(Math.fround(v), 3);
    });
    expect(card.cautions.join(' ')).toMatch(/not a design/);
    const soft = card.criteria.filter((c) => c.kind === 'soft');
    const score = soft.reduce((a, c) => a + c.weight * (c.score ?? 0), 0);
    expect(score).toBeCloseTo(card.suitability.score as number, 9);
    for (const c of card.criteria.filter((x) => x.kind === 'exclusion')) expect(c.verdict).toBe('pass');
  });
});
