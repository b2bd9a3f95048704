/**
 * The thaw-season Neumann active layer (layers/physics/neumann-active-layer.ts) against hand
 * computations built on tabulated error-function values, Abramowitz & Stegun (1964) Table 7.1:
 * erf 0.5 = 0.5204998778, so erfc 0.5 = 0.4795001222; e^0.25 = 1.2840254167 (A&S Table 4.4).
 *
 * Climate of every case: MAAT 0 °C, amplitude 10 K, n_t 1: the thaw season is half the year
 * (f_t = 1/2, t_s = 182.5 d) and I_t = 365·10/π °C·day (degreeDays at T̄ = 0), so the step is
 * V_s = I_t/182.5 d = 20/π = 6.366198 K.
 */
import { describe, it, expect } from 'vitest';
import { neumannActiveLayer_m } from '../../layers/physics/neumann-active-layer';
import { stefanDepth_m } from '../../layers/physics/stefan';
import { degreeDays } from '../../layers/physics/surface-forcing';

const ERF05 = 0.5204998778;
const ERFC05 = 0.4795001222;
const E025 = 1.2840254167;
const VS = 20 / Math.PI;
const TS_S = 182.5 * 86400;
const k = 1.5;
const C = 2.5e6;
const alpha = k / C;
const climate = { meanAirTemp_C: 0, amplitude_C: 10, nThaw: 1 };

describe('Neumann active layer (hand computations on A&S Table 7.1; tol 1e-6 relative)', () => {
  it('NAL-1 one phase (TTOP 0): λ = 0.5 needs Ste = √π·λ·e^(λ²)·erf λ = 0.5923; ALT = 2λ√(α·t_s)', () => {
    const ste = Math.sqrt(Math.PI) * 0.5 * E025 * ERF05; // = 0.592303
    const L = (C * VS) / ste;
    const alt = neumannActiveLayer_m({
      ...climate,
      ttop_C: 0,
      kThawed_W_mK: k,
      kFrozen_W_mK: k,
      cThawed_J_m3K: C,
      cFrozen_J_m3K: C,
      latent_J_m3: L,
    });
    const expected = 2 * 0.5 * Math.sqrt(alpha * TS_S); // 3.0752 m
    expect(Math.abs(alt - expected) / expected).toBeLessThan(1e-6);
  });
  it('NAL-2 two phases (equal properties, ν = 1): λ = 0.5 at Ste 1 needs B = erfcx(0.5)·(e^−0.25/erf 0.5 − 0.5√π) = 0.37559, i.e. TTOP = −B·V_s = −2.3911 °C', () => {
    const erfcx05 = E025 * ERFC05; // 0.615690
    const B = erfcx05 * (1 / (E025 * ERF05) - 0.5 * Math.sqrt(Math.PI)); // 0.375588
    const alt = neumannActiveLayer_m({
      ...climate,
      ttop_C: -B * VS,
      kThawed_W_mK: k,
      kFrozen_W_mK: k,
      cThawed_J_m3K: C,
      cFrozen_J_m3K: C,
      latent_J_m3: C * VS, // Ste = 1
    });
    const expected = 2 * 0.5 * Math.sqrt(alpha * TS_S);
    expect(Math.abs(alt - expected) / expected).toBeLessThan(1e-6);
  });
  it('NAL-3 Stefan limit: tiny Ste and TTOP → 0 gives √(2k·n_t·I_t/L) (derived limit; tol 1e-4)', () => {
    const L = 1e12;
    const alt = neumannActiveLayer_m({
      ...climate,
      ttop_C: -1e-9,
      kThawed_W_mK: k,
      kFrozen_W_mK: 2,
      cThawed_J_m3K: C,
      cFrozen_J_m3K: 2e6,
      latent_J_m3: L,
    });
    const index = degreeDays({ meanAirTemp_C: 0, amplitude_C: 10 }).thawingIndex_Cd;
    const stefan = stefanDepth_m({ conductivity_W_mK: k, index_Cd: index, latent_J_m3: L });
    expect(Math.abs(alt - stefan) / stefan).toBeLessThan(1e-4);
  });
  it('NAL-4 no thaw season (MAAT ≤ −A) is 0; colder permafrost thaws less (sensible heat of the frozen zone)', () => {
    const base = {
      ...climate,
      kThawed_W_mK: k,
      kFrozen_W_mK: 2,
      cThawed_J_m3K: C,
      cFrozen_J_m3K: 2e6,
      latent_J_m3: 100e6,
    };
    expect(neumannActiveLayer_m({ ...base, meanAirTemp_C: -12, ttop_C: -10 })).toBe(0);
    const warm = neumannActiveLayer_m({ ...base, ttop_C: -1 });
    const cold = neumannActiveLayer_m({ ...base, ttop_C: -6 });
    expect(cold).toBeLessThan(warm);
    expect(() => neumannActiveLayer_m({ ...base, ttop_C: -1, kThawed_W_mK: 0 })).toThrow(/kThawed_W_mK/);
  });
});
