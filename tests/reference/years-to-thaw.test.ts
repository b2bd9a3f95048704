import { describe, it, expect } from 'vitest';
import { yearsToThaw } from '../../layers/physics/years-to-thaw';
import { rampResponse_C } from '../../layers/physics/carslaw-jaeger-surface-response';
import { SECONDS_PER_YEAR } from '../../layers/physics/surface-forcing';

const rel = (a: number, e: number) => Math.abs(a - e) / Math.abs(e);
const base = {
  depth_m: 6,
  initialMeanTemp_C: -2.5,
  warming_C_per_yr: 0.05,
  diffusivityFrozen_m2_s: 1e-6,
  conductivityThawed_W_mK: 1.3,
  latent_J_m3: 100e6,
};

// No published worked example of this combined estimate exists; these cases check it against the two
// published solutions it is assembled from (Carslaw & Jaeger 1959 §2.5 ramp; the Stefan equation) in
// their own limits, and its derived closed forms.
describe('years to thaw at depth (sensible + latent delays)', () => {
  it('at the surface the delay is (T_f − T̄₀)/b exactly: 2.5 K at 0.05 K/yr = 50 yr', () => {
    expect(rel(yearsToThaw({ ...base, depth_m: 0 }).years, 50)).toBeLessThan(1e-8);
  });
  it('without latent heat the depth reaches T_f exactly when the C&J ramp response supplies the missing 2.5 K', () => {
    const r = yearsToThaw({ ...base, latent_J_m3: 0 });
    expect(r.latentYears).toBe(0);
    const rise = rampResponse_C({
      depth_m: 6,
      time_s: r.years * SECONDS_PER_YEAR,
      diffusivity_m2_s: 1e-6,
      rate_C_per_s: 0.05 / SECONDS_PER_YEAR,
    });
    expect(Math.abs(rise - 2.5)).toBeLessThan(1e-6);
  });
  it('the latent part is the Stefan front time z·√(L/(k·b)) for a linearly rising surface excess', () => {
    const r = yearsToThaw(base);
    const b = 0.05 / SECONDS_PER_YEAR;
    expect(rel(r.latentYears, (6 * Math.sqrt(100e6 / (1.3 * b))) / SECONDS_PER_YEAR)).toBeLessThan(1e-12);
    expect(r.years).toBeCloseTo(r.sensibleYears + r.latentYears, 9);
  });
  it('very fast conduction: the sensible part tends to the surface delay plus the geothermal offset', () => {
    const r = yearsToThaw({
      ...base,
      diffusivityFrozen_m2_s: 1e-1,
      geothermalGradient_K_m: 0.02,
      latent_J_m3: 0,
    });
    expect(rel(r.years, (2.5 - 0.12) / 0.05)).toBeLessThan(1e-3);
  });
  it('already thawed gives 0; cooling or no warming gives Infinity; beyond the horizon gives Infinity', () => {
    expect(yearsToThaw({ ...base, initialMeanTemp_C: 0.5 }).years).toBe(0);
    expect(yearsToThaw({ ...base, warming_C_per_yr: 0 }).years).toBe(Infinity);
    expect(yearsToThaw({ ...base, horizon_yr: 20 }).years).toBe(Infinity);
  });
  it('bad input names the parameter', () => {
    expect(() => yearsToThaw({ ...base, depth_m: -1 })).toThrow(/depth_m must be in \[0, 1000\]/);
    expect(() => yearsToThaw({ ...base, latent_J_m3: NaN })).toThrow(TypeError);
    expect(() => yearsToThaw({ ...base, conductivityThawed_W_mK: 0 })).toThrow(/conductivityThawed_W_mK/);
  });
});
