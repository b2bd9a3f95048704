import { describe, it, expect } from 'vitest';
import {
  DEFAULT_HEAT_PUMP_CURVE,
  WATTS_PER_TON,
  compressorPower_W,
  groundLoad_W,
  groundRejection_W,
  heatPumpAt,
  heatPumpCurveAt,
} from '../../layers/physics/heat-pump';

// Energy balance Q_ground = Q(1 − 1/COP) (ASHRAE Handbook—HVAC Applications, geothermal chapter;
// Kavanaugh & Rafferty 1997; recalled from memory); values from reference-values.md §10 (computed).
describe('ground load from building load (reference-values.md §10 HP-1…HP-3)', () => {
  it('HP-1: 10 kW heating at COP 3 → 6.6667 kW from the ground, 3.3333 kW compressor', () => {
    expect(groundLoad_W({ buildingLoad_W: 10_000, cop: 3 })).toBeCloseTo(6666.67, 1);
    expect(compressorPower_W({ buildingLoad_W: 10_000, cop: 3 })).toBeCloseTo(3333.33, 1);
  });
  it('HP-2: COP 2.5 / 4 → 6.0000 / 7.5000 kW', () => {
    expect(groundLoad_W({ buildingLoad_W: 10_000, cop: 2.5 })).toBeCloseTo(6000, 6);
    expect(groundLoad_W({ buildingLoad_W: 10_000, cop: 4 })).toBeCloseTo(7500, 6);
  });
  it('HP-3: 10 kW cooling at COP 4 → 12.5 kW rejected', () => {
    expect(groundRejection_W({ coolingLoad_W: 10_000, cop: 4 })).toBeCloseTo(12_500, 6);
  });
  it('1 ton of refrigeration = 12 000 Btu/h = 3516.853 W (reference-values.md §12, 1 Btu = 1055.05585 J)', () => {
    expect(Math.abs(WATTS_PER_TON - (12000 * 1055.05585) / 3600)).toBeLessThan(1e-3);
  });
});

describe('default heat pump curve (common practice)', () => {
  it('COP and capacity rise with entering fluid temperature', () => {
    let prev = heatPumpAt({ enteringFluid_C: -20 });
    for (let t = -19; t <= 20; t++) {
      const c = heatPumpAt({ enteringFluid_C: t });
      expect(c.cop).toBeGreaterThanOrEqual(prev.cop);
      expect(c.capacityRatio).toBeGreaterThanOrEqual(prev.capacityRatio);
      prev = c;
    }
    expect(heatPumpAt({ enteringFluid_C: 0 }).capacityRatio).toBe(1);
  });
  it('an edited curve is validated with its path', () => {
    const bad = { ...DEFAULT_HEAT_PUMP_CURVE, cop: [3, 0.5, 3, 3, 3, 3, 3] };
    expect(() => heatPumpAt({ enteringFluid_C: 0, curve: bad })).toThrow(/curve\.cop\.1/);
  });
  it('validated once (heatPumpCurveAt) gives what heatPumpAt gives, and refuses a bad curve up front', () => {
    // The site simulator's heat pump evaluates one curve every step (site-operation.ts).
    const curve = { ...DEFAULT_HEAT_PUMP_CURVE, cop: DEFAULT_HEAT_PUMP_CURVE.cop.map((c) => c * 1.1) };
    const at = heatPumpCurveAt(curve);
    // The curve's own definition: its tabulated values at the knots, linear in between, held beyond.
    const { enteringFluid_C: knots, cop } = curve;
    knots.forEach((t, i) => expect(at(t).cop).toBeCloseTo(cop[i], 12));
    for (let i = 0; i + 1 < knots.length; i++)
      expect(at((knots[i] + knots[i + 1]) / 2).cop).toBeCloseTo((cop[i] + cop[i + 1]) / 2, 12);
    expect(at(knots[0] - 5).cop).toBe(cop[0]);
    expect(at(3.3)).toEqual(heatPumpAt({ enteringFluid_C: 3.3, curve }));
    expect(() => at(61)).toThrow(/enteringFluid_C/);
    const bad = { ...DEFAULT_HEAT_PUMP_CURVE, cop: [3, 0.5, 3, 3, 3, 3, 3] };
    expect(() => heatPumpCurveAt(bad)).toThrow(/curve\.cop\.1/);
  });
});
