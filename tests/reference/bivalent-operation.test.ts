import { describe, expect, it } from 'vitest';
import {
  bivalentOperation,
  bivalentResolve,
  createBivalentResult,
  type BivalentInput,
} from '../../layers/screening/bivalent-operation';

/*
 * Bivalent operation of one pile (layers/screening/bivalent-operation.ts): the monthly form of the
 * three-pulse design equation (Kavanaugh & Rafferty 1997, ASHRAE Handbook—HVAC Applications, geothermal
 * chapter), hand-computed here with every intermediate shown. No seasonal wave (phasor 0), so every month
 * has the same capacity; first with no loop temperature difference (entering = mean fluid):
 *   2πk = 2π·2 = 12.566 W/m·K;  D = g_M/(2πk) + R_b = 3/12.566 + 0.1 = 0.33873 m·K/W
 *   α = (T_g − T_lim)·H/D = (−2 − (−6))·10/0.33873 = 118.09 W
 *   β = (g_L − g_M)/(2πk·D) = (10 − 3)/(12.566·0.33873) = 1.6445
 *   capacity of a month c(a) = α − β·a
 */
const base = (requested: number[]): BivalentInput => ({
  groundMean_C: -2,
  surfaceAmplitude_C: 0,
  phasor: new Float64Array([0, 0]),
  enteringLimit_C: -6,
  loopDelta_K_W: 0,
  length_m: 10,
  resistance_mK_W: 0.1,
  conductivity_W_mK: 2,
  gLife: 10,
  gMonth: 3,
  requested_W: Float64Array.from(requested),
});

describe('bivalent operation of one pile, hand-computed three-pulse monthly case', () => {
  it('a load that fits: all carried, the fluid bound is the request scaled to the limit', () => {
    // 30 W every month: c(30) = 118.09 − 1.6445·30 = 68.75 W > 30, nothing cut.
    // Scaled until the months reach the limit: λ = α/(r + β·r) = 118.09/(30 + 49.34) = 1.4884 → 44.65 W.
    const r = bivalentOperation(base(Array(12).fill(30)), createBivalentResult());
    expect(r.carried_W).toBeCloseTo(30, 4);
    expect(r.monthsCut).toBe(0);
    expect(r.fluidBound_W).toBeCloseTo(44.65, 1);
  });

  it('a winter-heavy load: the winter months are cut at the fluid limit', () => {
    // 80 W for six months, 0 for six (mean 40 W). Cut months carry c(a): a = ½(α − β·a) →
    // a = α/(2 + β) = 118.09/3.6445 = 32.40 W; c(32.40) = 64.80 W < 80 (cut), share 32.40/40 = 0.81.
    const r = bivalentOperation(base([80, 80, 80, 80, 80, 80, 0, 0, 0, 0, 0, 0]), createBivalentResult());
    expect(r.carried_W).toBeCloseTo(32.4, 1);
    expect(r.requested_W).toBeCloseTo(40, 6);
    expect(r.monthsCut).toBe(6);
    expect(r.fluidBound_W).toBeCloseTo(r.carried_W, 6);
  });

  it("the fixed point is solved exactly on the months' states: a = α/(2 + β) to rounding", () => {
    // The winter-heavy case above with α and β in full precision (module comment's formulas).
    const twoPiK = 4 * Math.PI;
    const D = 3 / twoPiK + 0.1;
    const alpha = (4 * 10) / D;
    const beta = 7 / (twoPiK * D);
    const r = bivalentOperation(base([80, 80, 80, 80, 80, 80, 0, 0, 0, 0, 0, 0]), createBivalentResult());
    expect(Math.abs(r.carried_W - alpha / (2 + beta))).toBeLessThan(1e-12 * r.carried_W);
  });

  it('bivalentResolve after new requests gives what a fresh bivalentOperation gives', () => {
    // Consistency of the two entry points (no published source): same input but the requests.
    const out = createBivalentResult();
    bivalentOperation(base([80, 80, 80, 80, 80, 80, 0, 0, 0, 0, 0, 0]), out);
    for (const w of [20, 60, 75, 90, 150]) {
      const p = base([w, w, w, 0.8 * w, 0.4 * w, 0, 0, 0, 0, 0.4 * w, 0.8 * w, w]);
      const fresh = bivalentOperation(p, createBivalentResult());
      const again = bivalentResolve(p, out);
      expect(again.carried_W).toBe(fresh.carried_W);
      expect(again.monthsCut).toBe(fresh.monthsCut);
      expect(again.fluidBound_W).toBe(fresh.fluidBound_W);
      expect(Array.from(again.monthly_W)).toEqual(Array.from(fresh.monthly_W));
    }
  });

  it('ground no warmer than the fluid limit: nothing carried', () => {
    const r = bivalentOperation({ ...base(Array(12).fill(30)), enteringLimit_C: -1 }, createBivalentResult());
    expect(r.carried_W).toBeLessThan(1e-4); // nothing to carry: the bisection stops within 1e-7 of the request
    expect(r.monthsCut).toBe(12);
  });

  it('more load never carries less, and never more than asked', () => {
    let last = 0;
    for (const w of [10, 30, 50, 80, 120, 200, 400]) {
      const r = bivalentOperation(
        base([w, w, w, w, 0.5 * w, 0, 0, 0, 0, 0.5 * w, w, w]),
        createBivalentResult(),
      );
      expect(r.carried_W).toBeGreaterThanOrEqual(last - 1e-4); // saturated: equal within the bisection tolerance
      expect(r.carried_W).toBeLessThanOrEqual(r.requested_W + 1e-9);
      last = r.carried_W;
    }
  });

  it('fixed loop flow: the entering fluid of a cut month sits exactly at the limit', () => {
    // ΔT_d = 3 K at Q_d = 300 W per pile: δ = 0.01 K/W, H·δ/2 = 0.05 m·K/W, D = 0.33873 − 0.05 = 0.28873,
    // α = 40/0.28873 = 138.54 W, β = 7/(12.566·0.28873) = 1.9293; a = α/(2 + β) = 35.26 W, c = 70.51 W.
    const p = { ...base([80, 80, 80, 80, 80, 80, 0, 0, 0, 0, 0, 0]), loopDelta_K_W: 0.01 };
    const r = bivalentOperation(p, createBivalentResult());
    expect(r.carried_W).toBeCloseTo(35.26, 1);
    // Independent check from the three-pulse equation: the winter months carry 2a (the others nothing).
    const a = r.carried_W;
    const q = 2 * a;
    const twoPiK = 4 * Math.PI;
    const meanFluid = -2 - (a * (10 - 3) + q * 3) / (twoPiK * 10) - (q * 0.1) / 10;
    expect(meanFluid + (0.01 * q) / 2).toBeCloseTo(-6, 4);
  });
});
