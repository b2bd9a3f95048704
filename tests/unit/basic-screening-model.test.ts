import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { soilThermalProperties } from '../../layers/physics/soil-catalogue';
import { createBasicScreeningModel } from '../../layers/screening/basic-screening-model';
import type { CellInputs } from '../../layers/screening/screening-model';

const base: CellInputs = {
  meanAirTemp_C: -6,
  airAmplitude_C: 16,
  warming_C_per_yr: 0.05,
  textureClass: 3,
  waterContent_m3m3: 0.35,
  bedrockDepth_m: 20,
  groundTemp_C: NaN,
  geothermalFlux_W_m2: NaN,
  nFreeze: NaN,
  latitude_deg: 75,
};

function run(cell: Partial<CellInputs>, options = {}): Float32Array {
  const model = createBasicScreeningModel(options);
  const out = new Float32Array(model.layers.length);
  model.evaluate({ ...base, ...cell }, out);
  return out;
}

/**
 * Air indices of a sinusoidal year T(t) = M + A cos(2πt/P): with φ = acos(−M/A) the fraction of the
 * year above 0 °C is φ/π and I_t = (P/π)(M φ + A sin φ), I_f = I_t − P·M (exact integrals, P = 365 d).
 */
function sinusoidIndices(M: number, A: number) {
  const phi = Math.acos(-M / A);
  const thaw = (365 / Math.PI) * (M * phi + A * Math.sin(phi));
  return { thaw, freeze: thaw - 365 * M };
}

describe('basic screening model (TTOP + Stefan)', () => {
  it('matches the TTOP and Stefan equations evaluated by hand for a silt cell', () => {
    const soil = soilThermalProperties({ texture: 'silt', waterContent_m3m3: 0.35 });
    const { thaw, freeze } = sinusoidIndices(-6, 16);
    // TTOP, Smith & Riseborough (2002): permafrost branch (r_k n_t I_t − n_f I_f)/P with n_f 0.5, n_t 1.
    const rk = soil.kThawed_W_mK / soil.kFrozen_W_mK;
    const ttop = (rk * 1.0 * thaw - 0.5 * freeze) / 365;
    expect(ttop).toBeLessThan(0);
    // Stefan (e.g. Lunardini 1981 ch. 9): X = sqrt(2 k_t n_t I_t 86400 / L).
    const alt = Math.sqrt((2 * soil.kThawed_W_mK * thaw * 86400) / soil.latent_J_m3);
    const out = run({});
    expect(out[0]).toBeCloseTo(ttop, 4);
    expect(out[1]).toBeCloseTo(alt, 4);
    expect(out[2]).toBe(ttop > -2 ? 1 : 2);
  });

  it('uses a ground-temperature grid value when the cell has one', () => {
    const out = run({ groundTemp_C: -0.7 });
    expect(out[0]).toBeCloseTo(-0.7, 6);
    expect(out[2]).toBe(1);
    expect(run({ groundTemp_C: 1.2 })[2]).toBe(0);
  });

  it('treats water content above the catalogue porosity as saturated ice-rich soil, not an error', () => {
    const out = run({ textureClass: 3, waterContent_m3m3: 0.7 });
    expect(Number.isFinite(out[0])).toBe(true);
    expect(out[1]).toBeLessThan(run({ waterContent_m3m3: 0.35 })[1]);
  });

  it('writes nodata (NaN), never throws, for inputs outside the physics domain', () => {
    expect(Array.from(run({ textureClass: 9 })).every(Number.isNaN)).toBe(true);
    expect(Array.from(run({ airAmplitude_C: -3 })).every(Number.isNaN)).toBe(true);
  });

  it('rejects bad options with a RangeError naming the option', () => {
    expect(() => createBasicScreeningModel({ nFreeze: 0 })).toThrow(/nFreeze/);
    expect(() => createBasicScreeningModel({ warmPermafrostBelow_C: 3 })).toThrow(/warmPermafrostBelow_C/);
  });

  it('property: a colder mean air temperature gives a colder ground and a thinner active layer', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -15, max: -1, noNaN: true }),
        fc.double({ min: 0.2, max: 5, noNaN: true }),
        fc.double({ min: 10, max: 22, noNaN: true }),
        fc.integer({ min: 1, max: 5 }),
        (maat, drop, amplitude, texture) => {
          const warm = run({
            meanAirTemp_C: maat,
            airAmplitude_C: amplitude,
            textureClass: texture,
            waterContent_m3m3: 0.2,
          });
          const cold = run({
            meanAirTemp_C: maat - drop,
            airAmplitude_C: amplitude,
            textureClass: texture,
            waterContent_m3m3: 0.2,
          });
          expect(cold[0]).toBeLessThan(warm[0]);
          expect(cold[1]).toBeLessThanOrEqual(warm[1]);
        },
      ),
      { seed: 20261201, numRuns: 200 },
    );
  });
});
