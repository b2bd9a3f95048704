import { describe, it, expect } from 'vitest';
import { cylinderSourceGBernier } from '../../layers/physics/infinite-cylinder-source';
import { heatPumpAt } from '../../layers/physics/heat-pump';
import { fluidProperties } from '../../layers/physics/fluids';
import { sizePileField, type PileFieldSizingInput } from '../../layers/site/pile-sizing';

// No published sizing worked example was at hand (ASHRAE handbook example, Bernier 2006 or Philippe et
// al. 2010 not available); these checks test the method against the ASHRAE length equation itself.

describe('three-pulse effective ground resistances (reference-values.md §10 ASH-1, computed from Bernier 2001 fit)', () => {
  it('k 2.0, α 1e-6 m²/s, d 0.15 m, 3650 d + 30 d + 6 h: R_ga 0.1822, R_gm 0.1794, R_gd 0.1001 m·K/W', () => {
    const a = 0.0864; // m²/day
    const fo = (days: number) => (4 * a * days) / 0.15 ** 2;
    const gf = cylinderSourceGBernier(fo(3650 + 30 + 0.25));
    const g1 = cylinderSourceGBernier(fo(30 + 0.25));
    const g2 = cylinderSourceGBernier(fo(0.25));
    expect(Math.abs((gf - g1) / 2 - 0.1822)).toBeLessThan(1e-4);
    expect(Math.abs((g1 - g2) / 2 - 0.1794)).toBeLessThan(1e-4);
    expect(Math.abs(g2 / 2 - 0.1001)).toBeLessThan(1e-4);
  });
});

describe('single-pile cylinder path reproduces the ASHRAE length equation (Kavanaugh & Rafferty 1997)', () => {
  const input: PileFieldSizingInput = {
    peakHeatingLoad_tons: 4,
    annualHeating_kWh: 40_000,
    pile: { length_m: 15, radius_m: 0.1, buriedDepth_m: 1, Rb_mK_W: 0.1 },
    layout: { spacing_m: 4 },
    ground: { conductivity_W_mK: 2.0, diffusivity_m2_s: 1e-6, undisturbedTemperature_C: 0 },
    minEnteringFluid_C: -6,
    fluid: { fluid: 'propyleneGlycol', massFraction: 0.4 },
    designLife_yr: 10,
    method: 'singlePileCylinder',
  };
  it('N = ceil(L/H), L = [q_a R_ga + q_m R_gm + q_p (R_gd + R_b)]/(t_g − (t_wi + t_wo)/2)', () => {
    const r = sizePileField(input);
    const year = 365.25 * 86400;
    const month = year / 12;
    const k = 2;
    const fo = (t: number) => (1e-6 * t) / 0.01;
    const G = (t: number) => cylinderSourceGBernier(fo(t));
    const tp = 6 * 3600;
    const Rga = (G(10 * year) - G(month + tp)) / k;
    const Rgm = (G(month + tp) - G(tp)) / k;
    const Rgd = G(tp) / k;
    const peak = 4 * 3516.853;
    const copPeak = heatPumpAt({ enteringFluid_C: -6 }).cop;
    const copSeason = heatPumpAt({ enteringFluid_C: 0 }).cop;
    const qa = ((40_000 * 3.6e6) / year) * (1 - 1 / copSeason);
    const qm = ((40_000 * 3.6e6 * 0.15) / month) * (1 - 1 / copSeason);
    const qp = peak * (1 - 1 / copPeak);
    const fl = fluidProperties({ fluid: 'propyleneGlycol', massFraction: 0.4, temperature_C: -6 });
    const dT = qp / (5.4e-5 * (peak / 1000) * fl.density_kg_m3 * fl.specificHeat_J_kgK);
    const L = (qa * Rga + qm * Rgm + qp * (Rgd + 0.1)) / (0 - (-6 - dT / 2));
    expect(r.pileCount).toBe(Math.ceil(L / 15));
    expect(r.enteringFluidAtDesign_C).toBeGreaterThanOrEqual(-6);
  });
  it('reports the fluid temperature each year, falling towards the design value', () => {
    const r = sizePileField({ ...input, method: 'groupFls', designLife_yr: 20 });
    const s = r.fluidTemperature_C.minEnteringFluid_C;
    expect(s).toHaveLength(20);
    for (let i = 1; i < s.length; i++) expect(s[i]).toBeLessThanOrEqual(s[i - 1] + 1e-9);
    expect(Math.abs(s[19] - r.enteringFluidAtDesign_C)).toBeLessThan(0.5);
    expect(['annual', 'monthly', 'peak']).toContain(r.controllingPulse);
  });
  it('pile interaction: the group method needs at least as many piles as the single-pile method at 3 m spacing', () => {
    const single = sizePileField({ ...input, layout: { spacing_m: 3 }, includeLifeSeries: false });
    const group = sizePileField({
      ...input,
      layout: { spacing_m: 3 },
      method: 'groupFls',
      includeLifeSeries: false,
    });
    expect(group.pileCount).toBeGreaterThan(single.pileCount);
  });
});
