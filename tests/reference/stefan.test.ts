import { describe, it, expect } from 'vitest';
import { stefanDepth_m, stefanTime_s } from '../../layers/physics/stefan';

const rel = (a: number, e: number) => Math.abs(a - e) / Math.abs(e);

describe('Stefan equation', () => {
  it('STE-1: k 1.3, I 1200 °C·d, L 140.28 MJ/m³ -> X = 1.3862 m (computed with mpmath; tol 1e-4 rel)', () => {
    expect(
      rel(stefanDepth_m({ conductivity_W_mK: 1.3, index_Cd: 1200, latent_J_m3: 140.28e6 }), 1.3862),
    ).toBeLessThan(1e-4);
  });
  it('STE-3 textbook lake-ice problem: ρ 920, L 334 kJ/kg, k 1.6, ΔT 10 K: 0.25 m in 6.0e5 s, 40 m in 1.5e10 s (read from the published worked example; tol ±1 in the last printed digit)', () => {
    const L = 920 * 334e3;
    expect(
      Math.abs(
        stefanTime_s({ conductivity_W_mK: 1.6, depth_m: 0.25, temperatureExcess_K: 10, latent_J_m3: L }) -
          6.0e5,
      ),
    ).toBeLessThan(0.1e5);
    expect(
      Math.abs(
        stefanTime_s({ conductivity_W_mK: 1.6, depth_m: 40, temperatureExcess_K: 10, latent_J_m3: L }) -
          1.5e10,
      ),
    ).toBeLessThan(0.1e10);
  });
  it('US Army English form X(ft) = √(48·k·nF/L), L = 144·γd·w/100 agrees with the SI form (unit conversion check)', () => {
    // silt γd 100 pcf, w 15 %, k 0.8 Btu/h·ft·°F, nF 750 °F·d (MB-1 inputs in the reference notes): X = 3.651 ft.
    const xFt = Math.sqrt((48 * 0.8 * 750) / (144 * 100 * 0.15));
    expect(rel(xFt, 3.651)).toBeLessThan(1e-3);
    const L_SI = 144 * 100 * 0.15 * 37258.9; // Btu/ft³ -> J/m³
    const xSI = stefanDepth_m({
      conductivity_W_mK: 0.8 * 1.730735,
      index_Cd: (750 * 5) / 9,
      latent_J_m3: L_SI,
    });
    expect(rel(xSI / 0.3048, xFt)).toBeLessThan(1e-4);
  });
});

describe('bad input', () => {
  it('Stefan with zero latent heat and negative index', () => {
    expect(() => stefanDepth_m({ conductivity_W_mK: 1, index_Cd: 100, latent_J_m3: 0 })).toThrow(
      /latent_J_m3 must be > 0/,
    );
    expect(() => stefanDepth_m({ conductivity_W_mK: 1, index_Cd: -1, latent_J_m3: 1e6 })).toThrow(/index_Cd/);
  });
});
