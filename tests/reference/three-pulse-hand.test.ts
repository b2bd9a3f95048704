import { describe, it, expect } from 'vitest';
import {
  enteringFromLeavingFluid_C,
  loopFluidTemperatures,
  meanFluidFromEntering_C,
} from '../../layers/physics/fluid-temperature-convention';
import { cylinderSourceGBernier } from '../../layers/physics/infinite-cylinder-source';
import { fluidProperties } from '../../layers/physics/fluids';
import { monthlyPeakPerPile_W } from '../../layers/screening/monthly-peak';
import { sizePileField } from '../../layers/site/pile-sizing';

/*
 * A three-pulse design case worked by hand (Kavanaugh & Rafferty 1997, Ground-Source Heat Pumps, ASHRAE;
 * ASHRAE Handbook—HVAC Applications, geothermal chapter; the length equation of reference-values §10):
 *   L_h = [q_a R_ga + q_h (R_b + PLF_m R_gm + R_gd)] / [t_g − (t_wi + t_wo)/2]   (t_p = 0, F_sc = 1).
 *
 * Ground and pulses (reference-values §10, case ASH-1): k = 2.0 W/(m·K), α = 0.0864 m²/day (1e-6 m²/s),
 * bore diameter 0.15 m, pulses 3650 d + 30 d + 0.25 d: Fo = 4ατ/d² = 56528.6, 464.64, 3.8400;
 * cylinder-source G (Bernier 2001 fit) 0.9234, 0.5590, 0.2002, so
 *   R_ga = (0.9234 − 0.5590)/2.0 = 0.1822 m·K/W,
 *   R_gm = (0.5590 − 0.2002)/2.0 = 0.1794 m·K/W,
 *   R_gd = 0.2002/2.0           = 0.1001 m·K/W,
 *   R_b  = 0.15 m·K/W (chosen).
 * Loads: building peak 10 kW, annual heating 30 000 kWh, design month 15 % of the annual; COP 2.8 at the
 * lowest EFT (peak), 3.2 at the ground temperature (annual and month); ground load = Q (1 − 1/COP):
 *   q_h = 10 000 × (1 − 1/2.8)                  = 6428.57 W,
 *   q_a = 30 000 kWh × (1 − 1/3.2) / 8760 h     = 2354.45 W,
 *   q_m = 0.15 × 30 000 × (1 − 1/3.2) / 730 h   = 4238.01 W,  PLF_m = q_m/q_h = 0.65925.
 * Fluid (layers/physics/fluid-temperature-convention.ts): lowest EFT −5 °C, loop ΔT 3 K. In heating the
 * fluid entering the heat pump is the warmest point of the loop:
 *   mean (t_wi + t_wo)/2 = −5 − 3/2 = −6.5 °C,  leaving the heat pump (into the piles) = −5 − 3 = −8 °C.
 * Ground t_g = −2 °C, so t_g − mean = 4.5 K.
 * Numerator: q_a R_ga = 2354.45 × 0.1822 = 428.98;  q_h R_b = 964.29;  q_h PLF_m R_gm = 4238.01 × 0.1794
 *   = 760.30;  q_h R_gd = 6428.57 × 0.1001 = 643.50;  sum 2797.07 W·m·K/W.
 * Length L_h = 2797.07 / 4.5 = 621.57 m: 62.157 piles of 10 m (21.86 per ton of building peak,
 * 10 kW = 2.8435 tons), each taking Q = q_h·10/621.57 = 103.42 W at the peak.
 * (With the mean taken as EFT + ΔT/2 = −3.5 °C the driving difference would be 1.5 K and L = 1864.7 m:
 * three times as many piles.)
 */
const HAND = {
  Rga: 0.1822,
  Rgm: 0.1794,
  Rgd: 0.1001,
  qh: 6428.57,
  qa: 2354.45,
  qm: 4238.01,
  meanFluid: -6.5,
  leaving: -8,
  length: 621.57,
  piles: 62.157,
  perPile: 103.42,
};

describe('fluid-temperature convention (EFT = the heat pump entering fluid; heating: warmest point of the loop)', () => {
  it('heating: mean = EFT − ΔT/2, leaving = EFT − ΔT (hand case: −5 °C, 3 K → −6.5, −8 °C)', () => {
    const t = loopFluidTemperatures({ enteringFluid_C: -5, loopDelta_K: 3, duty: 'heating' });
    expect(t.mean_C).toBeCloseTo(HAND.meanFluid, 12);
    expect(t.leaving_C).toBeCloseTo(HAND.leaving, 12);
    expect(meanFluidFromEntering_C(-5, 3, 'heating')).toBeCloseTo(-6.5, 12);
    expect(enteringFromLeavingFluid_C(-8, 3, 'heating')).toBeCloseTo(-5, 12);
  });
  it('cooling: the opposite (EFT 25 °C, ΔT 5 K → mean 27.5, leaving 30 °C; hand computed)', () => {
    const t = loopFluidTemperatures({ enteringFluid_C: 25, loopDelta_K: 5, duty: 'cooling' });
    expect(t.mean_C).toBeCloseTo(27.5, 12);
    expect(t.leaving_C).toBeCloseTo(30, 12);
  });
  it('refuses bad input naming the parameter', () => {
    expect(() => loopFluidTemperatures({ enteringFluid_C: -5, loopDelta_K: -1, duty: 'heating' })).toThrow(
      /loopDelta_K/,
    );
    expect(() =>
      loopFluidTemperatures({ enteringFluid_C: -5, loopDelta_K: 3, duty: 'defrost' as 'heating' }),
    ).toThrow(/duty/);
  });
});

describe('three-pulse case worked by hand (Kavanaugh & Rafferty 1997; ASHRAE handbook method)', () => {
  const fo = (days: number) => (4 * 0.0864 * days) / 0.15 ** 2;
  const Gf = cylinderSourceGBernier(fo(3650 + 30 + 0.25));
  const G1 = cylinderSourceGBernier(fo(30 + 0.25));
  const G2 = cylinderSourceGBernier(fo(0.25));

  it('effective ground resistances R_ga 0.1822, R_gm 0.1794, R_gd 0.1001 m·K/W (ASH-1, 4 decimals)', () => {
    expect(Math.abs((Gf - G1) / 2 - HAND.Rga)).toBeLessThan(1e-4);
    expect(Math.abs((G1 - G2) / 2 - HAND.Rgm)).toBeLessThan(1e-4);
    expect(Math.abs(G2 / 2 - HAND.Rgd)).toBeLessThan(1e-4);
  });

  it('the per-cell monthly equation gives 103.42 W per 10 m pile, 62.16 piles (hand: 621.57 m)', () => {
    const twoPi = 2 * Math.PI;
    const out = new Float64Array(1);
    const Q = monthlyPeakPerPile_W(
      {
        groundMean_C: -2,
        surfaceAmplitude_C: 0,
        phasor: new Float64Array(2),
        meanFluid_C: meanFluidFromEntering_C(-5, 3, 'heating'),
        length_m: 10,
        resistance_mK_W: 0.15,
        conductivity_W_mK: 2,
        // g = 2πG: the per-cell equation takes the three pulses' responses in g form
        gLife: twoPi * Gf,
        gMonth: twoPi * G1,
        gPeak: twoPi * G2,
        annualFraction: HAND.qa / HAND.qh,
        monthlyFraction: new Float64Array(12).fill(HAND.qm / HAND.qh),
        peakFraction: new Float64Array(12).fill(1),
      },
      out,
    );
    // printed precision of the hand values: 5 significant digits (0.05 %); the Bernier G differ from the
    // 4-decimal G above by < 5e-5 (0.03 % of the numerator)
    expect(Math.abs(Q / HAND.perPile - 1)).toBeLessThan(1e-3);
    expect(Math.abs(HAND.qh / Q - HAND.piles) / HAND.piles).toBeLessThan(1e-3);
    expect(Math.abs((HAND.qh * 10) / Q - HAND.length) / HAND.length).toBeLessThan(1e-3);
  });

  it('the sizing module (single-pile cylinder path) needs ceil(62.16) = 63 piles and ends at EFT ≥ −5, leaving EFT − 3 K', () => {
    // COP 2.8 at −5 °C and 3.2 at −2 °C (curve held constant beyond its ends); the flow is set so the
    // loop ΔT at the peak is 3 K: ṁc_p = q_h/3.
    const rhoCp = (() => {
      const f = fluidProperties({ fluid: 'propyleneGlycol', massFraction: 0.3, temperature_C: -5 });
      return f.density_kg_m3 * f.specificHeat_J_kgK;
    })();
    const monthly = [0.15, 0.13, 0.12, 0.09, 0.06, 0.03, 0.02, 0.03, 0.05, 0.08, 0.11, 0.13];
    const r = sizePileField({
      peakHeatingLoad_W: 10_000,
      annualHeating_kWh: 30_000,
      monthlyFractions: monthly,
      pile: { length_m: 10, radius_m: 0.075, buriedDepth_m: 1, Rb_mK_W: 0.15 },
      layout: { spacing_m: 1000 },
      ground: { conductivity_W_mK: 2, diffusivity_m2_s: 1e-6, undisturbedTemperature_C: -2 },
      minEnteringFluid_C: -5,
      heatPumpCurve: {
        enteringFluid_C: [-5, -2],
        cop: [2.8, 3.2],
        capacityRatio: [1, 1],
        minEnteringFluid_C: -5,
      },
      fluid: { fluid: 'propyleneGlycol', massFraction: 0.3 },
      flowPerKilowatt_m3_s: (10_000 * (1 - 1 / 2.8)) / 3 / rhoCp / 10,
      designLife_yr: 10,
      method: 'singlePileCylinder',
      includeLifeSeries: false,
    });
    expect(r.pileCount).toBe(Math.ceil(HAND.piles));
    expect(r.groundLoad_W.peak).toBeCloseTo(HAND.qh, 1);
    expect(r.enteringFluidAtDesign_C).toBeGreaterThanOrEqual(-5);
    expect(r.enteringFluidAtDesign_C - r.lowestFluid_C).toBeCloseTo(3, 6);
  });
});
