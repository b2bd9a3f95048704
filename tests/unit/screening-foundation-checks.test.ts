/**
 * Hard foundation checks, structural layers, class robustness and system economics of the per-cell
 * model (issue 13).
 */
import { describe, expect, it } from 'vitest';
import { screenCell, createScreeningModel } from '../../layers/screening/cell-screening-model';
import { METRIC, METRIC_COUNT } from '../../layers/screening/cell-layers';
import { classifyCell, exclusionOf } from '../../layers/screening/cell-class';
import { EXCLUSION, softWeights } from '../../layers/screening/suitability';
import { DEFAULT_SCENARIO, parseScenario } from '../../layers/screening/scenario';
import { perturbedScenarios, perturbedWeights } from '../../layers/screening/class-robustness';
import { simplePayback_yr } from '../../layers/screening/system-cop';

// A cool, ice-poor silt cell of the demo region (blind fixture B21).
const silt = {
  meanAirTemp_C: -6.7,
  airAmplitude_C: 16.287,
  warming_C_per_yr: 0.053,
  textureClass: 3,
  waterContent_m3m3: 0.43,
  bedrockDepth_m: 20.968,
};
const criterion = (r: ReturnType<typeof screenCell>, id: string) => r.criteria.find((c) => c.id === id);

describe('hard foundation checks (exclusions with value, limit and verdict)', () => {
  it('the base cell passes every hard check, listed before the soft criteria', () => {
    const r = screenCell(silt);
    const hard = r.criteria.filter((c) => c.kind === 'exclusion');
    expect(r.criteria.slice(0, hard.length).every((c) => c.kind === 'exclusion')).toBe(true);
    for (const c of hard) expect(c.verdict, c.id).toBe('pass');
    expect(r.exclusion.code).toBe(0);
  });
  it('rock within the pile tip plus the 1 m margin excludes (tip at 11 m): 11.5 m fails, 12 m passes', () => {
    expect(screenCell({ ...silt, bedrockDepth_m: 11.5 }).exclusion.code).toBe(EXCLUSION.bedrockShallow);
    expect(screenCell({ ...silt, bedrockDepth_m: 12 }).exclusion.code).not.toBe(EXCLUSION.bedrockShallow);
    // the case: rock at 6-11 m was admitted before
    expect(screenCell({ ...silt, bedrockDepth_m: 8 }).suitability.label).toBe('excluded');
  });
  it('adfreeze zone warmer than the limit at the end of life with the piles operating excludes', () => {
    const r = screenCell(silt);
    const v = criterion(r, 'adfreezeTemp')?.value as number;
    expect(v).toBeLessThan(-1);
    // the piles cool the adfreeze zone below the no-pile end-of-life temperature
    expect(v).toBeLessThan(r.metrics.groundTempEnd.value as number);
    const strict = screenCell(silt, { suitability: { foundation: { maxAdfreezeTempEnd_C: v - 0.1 } } });
    expect(strict.exclusion.code).toBe(EXCLUSION.adfreezeWarm);
    expect(criterion(strict, 'adfreezeTemp')?.verdict).toBe('fail');
  });
  it('ice-rich ground thawing within the life plus margin excludes; ice-poor ground passes the check', () => {
    // warm ice-rich silt under a steep trend: thaws at 6 m within the life
    const iceRich = {
      ...silt,
      meanAirTemp_C: -2.5,
      airAmplitude_C: 16,
      warming_C_per_yr: 0.5,
      waterContent_m3m3: 0.6,
    };
    const r = screenCell(iceRich, { suitability: { foundation: { maxAdfreezeTempEnd_C: 0 } } });
    expect(r.metrics.excessIce.value as number).toBeGreaterThan(0);
    expect(r.metrics.iceRichThawYear.value as number).toBeLessThanOrEqual(2065);
    expect(r.exclusion.code).toBe(EXCLUSION.thawUnstable);
    const poor = screenCell(silt);
    expect(poor.metrics.iceRichThawYear.value).toBeNull();
    expect(criterion(poor, 'thawUnstable')?.verdict).toBe('pass');
  });
  it('frost-jacking demand above the anchorage excludes', () => {
    const r = screenCell(silt, { suitability: { foundation: { heaveStressFrostSusceptible_kPa: 2000 } } });
    expect(r.metrics.frostJackingRatio.value as number).toBeGreaterThan(1);
    expect(r.exclusion.code).toBe(EXCLUSION.frostJacking);
  });
  it('classification is a pure function of the outputs and the scenario (same class from the metric array)', () => {
    const model = createScreeningModel();
    const out = new Float32Array(METRIC_COUNT);
    model.evaluate(
      { ...silt, groundTemp_C: NaN, geothermalFlux_W_m2: NaN, nFreeze: NaN, latitude_deg: NaN },
      out,
    );
    const c = classifyCell(
      Float64Array.from(out),
      silt.textureClass,
      DEFAULT_SCENARIO,
      softWeights(DEFAULT_SCENARIO),
    );
    expect(c.suitability).toBe(out[METRIC.suitability]);
    expect(exclusionOf(out, 6, DEFAULT_SCENARIO)).toBe(EXCLUSION.bedrockShallow);
  });
});

describe('structural layers', () => {
  const r = screenCell(silt);
  const v = (id: keyof typeof r.metrics) => r.metrics[id].value as number;
  it('capacity falls with warming and the piles keep part of it (capacity kept ≥ 0)', () => {
    expect(v('capacityStart')).toBeGreaterThan(0);
    expect(v('capacityEnd')).toBeLessThan(v('capacityStart'));
    expect(v('capacityEndPiles')).toBeGreaterThan(v('capacityEnd'));
    expect(v('capacityKept')).toBeCloseTo(v('capacityEndPiles') - v('capacityEnd'), 9);
  });
  it('capacity is bounded by the −10 °C strength (400 kPa) over the embedment below the active layer', () => {
    const embed = 11 - v('activeLayer');
    expect(v('capacityStart')).toBeLessThanOrEqual(400 * 2 * Math.PI * 0.08415 * embed + 1e-9);
  });
  it('frost-jacking uplift is 200 kPa (silt) over the end-of-life active layer', () => {
    expect(v('frostJackingUplift')).toBeCloseTo(200 * 2 * Math.PI * 0.08415 * v('activeLayerEnd'), 6);
    expect(v('activeLayerEnd')).toBeGreaterThanOrEqual(v('activeLayer'));
  });
  it('thaw settlement is 0 without excess ice', () => {
    expect(v('thawSettlement')).toBe(0);
  });
});

describe('class robustness', () => {
  it('perturbs the fluid limit by ±1.5 K and the COP curve by ±20 %', () => {
    const [warm, cold, low, high] = perturbedScenarios(DEFAULT_SCENARIO);
    expect(warm.heatPump.minEnteringFluid_C).toBe(-6.5);
    expect(cold.heatPump.minEnteringFluid_C).toBe(-9.5);
    expect(low.heatPump.curve.cop[3]).toBeCloseTo(3.7 * 0.8, 12);
    expect(high.heatPump.curve.cop[3]).toBeCloseTo(3.7 * 1.2, 12);
  });
  it('each weight doubled and halved: 8 normalised weight sets', () => {
    const sets = perturbedWeights(DEFAULT_SCENARIO);
    expect(sets).toHaveLength(8);
    for (const w of sets) expect(w.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });
  it('the card says whether the class is robust and what moves it', () => {
    const r = screenCell(silt);
    expect(typeof r.robustness.robust).toBe('boolean');
    expect(r.robustness.robust).toBe(r.metrics.classRobust.value === 1);
    if (r.robustness.robust) expect(r.robustness.changedBy).toBe('none');
    else expect(r.robustness.changedBy).not.toBe('none');
  });
  it('a class far from every boundary is robust: cell excluded by rock stays excluded', () => {
    const r = screenCell({ ...silt, bedrockDepth_m: 2 });
    expect(r.robustness.robust).toBe(true);
  });
});

describe('system COP and payback', () => {
  const r = screenCell(silt);
  const v = (id: keyof typeof r.metrics) => r.metrics[id].value as number;
  it('system COP below the unit seasonal COP; pump power positive', () => {
    expect(v('systemCop')).toBeLessThan(v('seasonalCop'));
    expect(v('pumpPower')).toBeGreaterThan(0);
  });
  it('the fuel-increase flag follows the system COP: a 20 % lower COP curve and a dear generator flag it', () => {
    const s = {
      heatPump: {
        curve: {
          ...DEFAULT_SCENARIO.heatPump.curve,
          cop: DEFAULT_SCENARIO.heatPump.curve.cop.map((c) => c * 0.8),
        },
      },
      economics: { generatorOutput_kWh_L: 2.5 },
    };
    const low = screenCell(silt, s);
    expect(low.metrics.systemCop.value as number).toBeLessThan(low.metrics.breakEvenCopFuel.value as number);
    expect(low.flags.fuelIncrease).toBe(true);
    expect(low.metrics.fuelSaved.value as number).toBeLessThan(0);
  });
  it('capital = 16 loops + heat pump per kW + installation; payback = capital / cost saved, none when nothing is saved', () => {
    const none = screenCell(silt, {
      economics: { loopCostPerPile: 0, heatPumpCost_per_kW: 0, installationCost: 1234 },
    });
    expect(none.metrics.capitalCost.value).toBeCloseTo(1234, 6);
    expect(simplePayback_yr(10000, 500)).toBe(20);
    expect(simplePayback_yr(10000, -5)).toBeNaN();
  });
  it('scenario refuses a pump efficiency above 1 naming the field', () => {
    expect(() => parseScenario({ system: { pumpEfficiency: 1.5 } })).toThrow(/system\.pumpEfficiency/);
  });
});
