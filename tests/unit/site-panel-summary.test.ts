/**
 * Site panel summary (web/src/site/site-summary.ts, site-profile.ts, site-notes.ts, charts/chart-scale.ts):
 * degree-day heating energy, seasonal COP from the heat-pump energy balance, diesel-grid savings at the
 * break-even COP, profile extraction and the site cautions, on small synthetic results.
 */
import { describe, expect, it } from 'vitest';
import { siteInputSchema, type SiteResult } from '../../layers/site/site-input-schema';
import { DEFAULT_SCENARIO } from '../../layers/screening/scenario';
import { breakEvenCops } from '../../layers/screening/economics';
import { annualHeating, energyByYear, siteSavings } from '../../web/src/site/site-summary';
import { MAX_PROBES, profileAtYear, withProfileProbes } from '../../web/src/site/site-profile';
import { siteNotes } from '../../web/src/site/site-notes';
import { linePath, linearScale, niceTicks } from '../../web/src/site/charts/chart-scale';
import { sitePrefill } from '../../web/src/site/site-prefill';

const input = siteInputSchema.parse({
  ...sitePrefill({ meanAirTemp_C: -5, textureClass: 3, waterContent_m3m3: 0.35, bedrockDepth_m: 30 }).draft,
  years: 2,
});

function fakeResult(overrides: Partial<SiteResult> = {}): SiteResult {
  const months = 24;
  const caseResult = {
    time_yr: [0, 0.5, 1, 1.5, 2],
    thawDepth_m: [1, 1, 1, 1, 1],
    annualThawDepth_m: [1, 1],
    probes: input.probes.map((p) => ({ r_m: p.r_m, z_m: p.z_m, T_C: [-3, -1, -3, -1, -3], thawYear: null })),
    energyBalance: { stored_J: 0, boundaries_J: 0, surface_J: 0, bottom_J: 0, pile_J: 0, relativeError: 0 },
    unconvergedSteps: 0,
  };
  return {
    noPile: caseResult,
    withPile: caseResult,
    thawDelay_yr: input.probes.map(() => null),
    thawDelayIsLowerBound: input.probes.map(() => false),
    thawDelayIsUpperBound: input.probes.map(() => false),
    energyBalance: { relativeError: 0 },
    fluid: {
      month_yr: Array.from({ length: months }, (_, m) => m / 12),
      inlet_C: new Array(months).fill(-4),
      outlet_C: new Array(months).fill(-3),
      extracted_kWh: new Array(months).fill(100),
      delivered_kWh: new Array(months).fill(150),
      unmet_kWh: new Array(months).fill(0),
      lowest_C: -5,
      lowestAt_yr: 1.1,
      Rb_mK_W: 0.15,
      Ra_mK_W: 0.5,
      flow_L_min: 12,
    },
    overCooling: { year: [1, 2], endOfWinterDay: 120, frozenByPile_m3: [0, 0] },
    mesh: { nr: 10, nz: 10, timeSteps: 100, radius_m: 20, depth_m: 50 },
    warnings: [],
    cautions: [],
    ...overrides,
  };
}

describe('site summary', () => {
  it('annual heating by the degree-day load line equals UA·(T_b − MAAT)·8760 h when the air never reaches T_b', () => {
    // Degree-day method (common practice): with T_air = MAAT − A cos(...) below T_b all year, the cosine
    // sums to zero over the 365 daily midpoints, so E = UA (T_b − MAAT) · 24 · 365 exactly.
    const designLoad_W = 7000;
    const ua = designLoad_W / (18 - (-5 - 18));
    const h = annualHeating({
      designLoad_W,
      balancePoint_C: 18,
      meanAirTemp_C: -5,
      amplitude_C: 18,
      coldestDay: 15,
    });
    expect(h.annual_kWh).toBeCloseTo((ua * 23 * 24 * 365) / 1000, 6);
    expect(h.monthlyFractions.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    expect(h.monthlyFractions[0]).toBeGreaterThan(h.monthlyFractions[6]);
  });

  it('takes the seasonal COP from the heat-pump energy balance delivered / (delivered − ground)', () => {
    // Heat-pump energy balance Q_ground = Q_building (1 − 1/COP) (heat-pump.ts; Kavanaugh & Rafferty 1997).
    const years = energyByYear(input, fakeResult());
    expect(years).toHaveLength(2);
    expect(years[0].ground_kWh).toBeCloseTo(1200, 9);
    expect(years[0].delivered_kWh).toBeCloseTo(1800, 9);
    expect(years[0].seasonalCop).toBeCloseTo(1800 / 600, 12);
    expect(years[0].meanExtraction_W).toBeCloseTo((1200 * 1000) / 8760, 9);
  });

  it('saves no fuel at the fuel break-even COP (domain-notes central case 0.80·10.7/(3.6·0.93) ≈ 2.56)', () => {
    const be = breakEvenCops(DEFAULT_SCENARIO.economics).fuel;
    expect(be).toBeCloseTo((0.8 * 10.7) / (3.6 * 0.93), 9);
    const delivered = 1000;
    const years = [
      {
        year: 1,
        ground_kWh: delivered * (1 - 1 / be),
        delivered_kWh: delivered,
        unmet_kWh: 0,
        seasonalCop: be,
        meanExtraction_W: 50,
      },
    ];
    const s = siteSavings(years, 16, DEFAULT_SCENARIO);
    expect(s?.fuelSaved_L).toBeCloseTo(0, 9);
    expect(s?.delivered_kWh).toBeCloseTo(16000, 9);
    const better = siteSavings([{ ...years[0], seasonalCop: 3.5 }], 16, DEFAULT_SCENARIO);
    expect(better?.fuelSaved_L).toBeGreaterThan(0);
    expect(better?.system).toBeNull();
  });

  it('with a design load the study counts the system COP (pump, backup, controls): below the unit COP, fuel at the system COP', () => {
    const years = [
      {
        year: 1,
        ground_kWh: 1000 * (1 - 1 / 3.5),
        delivered_kWh: 1000,
        unmet_kWh: 0,
        seasonalCop: 3.5,
        meanExtraction_W: 50,
      },
    ];
    const s = siteSavings(years, 16, DEFAULT_SCENARIO, 8000);
    const sys = s?.system;
    expect(sys).not.toBeNull();
    expect(sys!.systemCop).toBeLessThan(3.5);
    expect(sys!.pumpPower_W).toBeGreaterThan(0);
    // capital: 16 loops × 1500 + 8 kW × 2000 + 10 000 (scenario defaults)
    expect(sys!.capitalCost).toBeCloseTo(16 * 1500 + 8 * 2000 + 10000, 6);
    const unit = siteSavings(years, 16, DEFAULT_SCENARIO);
    expect(s!.fuelSaved_L).toBeLessThan(unit!.fuelSaved_L);
    expect(s!.seasonalCop).toBeCloseTo(3.5, 12);
    if (s!.costSaved > 0) expect(sys!.payback_yr).toBeCloseTo(sys!.capitalCost / s!.costSaved, 9);
    else expect(sys!.payback_yr).toBeNaN();
  });

  it('appends profile probes within the 50-probe limit and reads the annual mean and range of a year', () => {
    const { input: withProfile, column } = withProfileProbes(
      { ...input, probes: new Array(45).fill({ r_m: 1, z_m: 1 }) },
      1.5,
    );
    expect(withProfile.probes).toHaveLength(MAX_PROBES);
    expect(column.firstProbe).toBe(45);
    const r = fakeResult();
    const col = { r_m: 1.5, depths_m: [6], firstProbe: 0 };
    const p = profileAtYear(r.noPile, col, 1);
    // Samples with time in (0, 1]: 0.5 and 1.0 -> -1 and -3.
    expect(p).toEqual([{ z_m: 6, mean_C: -2, min_C: -3, max_C: -1 }]);
    expect(profileAtYear(r.noPile, col, 5)).toEqual([]);
  });

  it('adds a frost-heave caution only when the pile freezes ground that was unfrozen, naming the soil', () => {
    const quiet = siteNotes(input, fakeResult(), [], -8, input.probes.length);
    expect(quiet.some((n) => n.kind === 'frost-heave')).toBe(false);
    const r = fakeResult({
      overCooling: { year: [1, 2], endOfWinterDay: 120, frozenByPile_m3: [0.4, 1.25] },
    });
    const notes = siteNotes(input, r, [], -8, input.probes.length);
    const heave = notes.find((n) => n.kind === 'frost-heave');
    expect(heave?.text).toContain('1.25 m³');
    expect(heave?.text).toContain('silt');
    expect(notes.some((n) => n.kind === 'adfreeze')).toBe(true);
  });

  it('says the ground is unfrozen from the start instead of giving a thaw year 0 adfreeze note', () => {
    const r = fakeResult();
    const thawed = { ...r.noPile, probes: r.noPile.probes.map((p) => ({ ...p, thawYear: 0 })) };
    const notes = siteNotes(input, { ...r, noPile: thawed }, [], -8, input.probes.length);
    const adfreeze = notes.filter((n) => n.kind === 'adfreeze');
    expect(adfreeze).toHaveLength(1);
    expect(adfreeze[0].text).toContain('unfrozen from the start');
  });

  it('notes the fluid limit when the fluid reaches the lowest entering temperature', () => {
    const notes = siteNotes(input, fakeResult(), [], -5, input.probes.length);
    expect(notes.some((n) => n.kind === 'fluid')).toBe(true);
    expect(siteNotes(input, fakeResult(), [], -8, input.probes.length).some((n) => n.kind === 'fluid')).toBe(
      false,
    );
  });
});

describe('chart scales', () => {
  it('picks nice ticks (1, 2, 2.5, 5 × 10^k; Heckbert 1990)', () => {
    expect(niceTicks(0, 10, 5)).toEqual([0, 2, 4, 6, 8, 10]);
    expect(niceTicks(-12.5, -2.5, 4)).toEqual([-12.5, -10, -7.5, -5, -2.5]);
    expect(niceTicks(-12.7, -2.5, 4)).toEqual([-10, -5]);
    expect(niceTicks(0, 1, 4)).toEqual([0, 0.25, 0.5, 0.75, 1]);
  });

  it('breaks a line at missing values', () => {
    const x = linearScale([0, 3], [0, 30]);
    const y = linearScale([0, 1], [10, 0]);
    expect(linePath([0, 1, 2, 3], [0, NaN, 1, 1], x, y)).toBe('M0.0,10.0M20.0,0.0L30.0,0.0');
  });
});

describe('pile sizing by design pulse after a run', () => {
  it('sizes the annual load alone below the full three-pulse design, which matches the sizing result', async () => {
    const { simulateSite } = await import('../../layers/site/simulate-site');
    const { sizeSiteByPulse } = await import('../../web/src/site/site-sizing');
    const draft = {
      ...sitePrefill({ meanAirTemp_C: -5, textureClass: 2, waterContent_m3m3: 0.3, bedrockDepth_m: 30 })
        .draft,
      years: 3,
    };
    const { input: withProfile, column } = withProfileProbes(siteInputSchema.parse(draft), 1.5);
    const parsed = siteInputSchema.parse(withProfile);
    const sized = sizeSiteByPulse(parsed, simulateSite(parsed), column, DEFAULT_SCENARIO);
    if (!sized || !sized.ok)
      throw new Error(`sizing failed: ${sized && !sized.ok ? sized.reason : 'no sizing'}`);
    expect(sized.byPulse.peak).toBe(sized.sizing.pileCount);
    expect(sized.byPulse.annual).not.toBeNull();
    expect(sized.byPulse.annual as number).toBeLessThanOrEqual(sized.byPulse.peak);
    // The ground temperature used is the first-year mean at the pile's mid-depth: frozen at this site.
    expect(sized.groundTemp_C).toBeLessThan(0);
  });
});
