import { describe, it, expect } from 'vitest';
import fixtures from './fixtures/thermal-regime-mpmath.json';
import { neumannOnePhase, neumannOnePhaseLambda, neumannTwoPhase } from '../../layers/physics/neumann';
import { stefanDepth_m } from '../../layers/physics/stefan';
import { SECONDS_PER_DAY } from '../../layers/physics/surface-forcing';

const rel = (a: number, e: number) => Math.abs(a - e) / Math.abs(e);

describe('Neumann one-phase λ (Carslaw & Jaeger 1959 §11.2; Crank 1984 eq. 3.14; computed with mpmath; tol 1e-6)', () => {
  const cases: [string, number, number][] = [
    ['NEU-1', 0.01, 0.0705933],
    ['NEU-2', 0.05, 0.1568209],
    ['NEU-3', 0.1, 0.2200163],
    ['NEU-4', 0.2, 0.3064239],
  ];
  for (const [id, ste, lambda] of cases) {
    it(`${id}: Ste ${ste} -> λ ${lambda}`, () =>
      expect(Math.abs(neumannOnePhaseLambda(ste) - lambda)).toBeLessThan(1e-6));
  }
  for (const [ste, lambda] of fixtures.neumannOnePhase) {
    it(`Ste ${ste} -> λ ${Number(lambda).toFixed(7)} (mpmath findroot; tol 1e-12 rel)`, () => {
      expect(rel(neumannOnePhaseLambda(Number(ste)), Number(lambda))).toBeLessThan(1e-12);
    });
  }
  it('textbook values as recalled: λ ≈ 0.220 at Ste 0.1, 0.620 at Ste 1 (recalled from memory; tol 5e-4)', () => {
    expect(Math.abs(neumannOnePhaseLambda(0.1) - 0.22)).toBeLessThan(5e-4);
    expect(Math.abs(neumannOnePhaseLambda(1) - 0.62)).toBeLessThan(5e-4);
  });
  it('small Ste tends to the Stefan limit λ = √(Ste/2)', () => {
    expect(rel(neumannOnePhaseLambda(1e-6), Math.sqrt(0.5e-6))).toBeLessThan(1e-6);
  });
  it('the Stefan condition L·dX/dt = −k·∂T/∂x holds at the front (finite differences; tol 1e-5 rel)', () => {
    const phase = { conductivity_W_mK: 1.3, heatCapacity_J_m3K: 2.9e6 };
    const args = { phase, latent_J_m3: 140e6, surfaceTemp_C: 8, meltTemp_C: 0 };
    const t = 50 * SECONDS_PER_DAY;
    const r = neumannOnePhase({ ...args, time_s: t });
    const dt = 1;
    const v =
      (neumannOnePhase({ ...args, time_s: t + dt }).frontPosition_m -
        neumannOnePhase({ ...args, time_s: t - dt }).frontPosition_m) /
      (2 * dt);
    const h = 1e-5;
    const grad =
      (r.temperatureAt_C(r.frontPosition_m - h) - r.temperatureAt_C(r.frontPosition_m - 2 * h)) / h;
    const gradAtFront =
      grad +
      (grad -
        (r.temperatureAt_C(r.frontPosition_m - 2 * h) - r.temperatureAt_C(r.frontPosition_m - 3 * h)) / h) *
        1.5;
    expect(rel(140e6 * v, -1.3 * gradAtFront)).toBeLessThan(1e-3);
  });
});

describe('Neumann two-phase (Carslaw & Jaeger 1959 §11.2 eq. for two phases; computed with mpmath)', () => {
  // NEU-9: silt thaw, k1 1.3, k2 1.9, C1 2.9e6, C2 2.1e6, L 140.28 MJ/m³, Ts−Tm 10, Tm−Ti 2.
  const near = { conductivity_W_mK: 1.3, heatCapacity_J_m3K: 2.9e6 };
  const far = { conductivity_W_mK: 1.9, heatCapacity_J_m3K: 2.1e6 };
  const base = {
    near,
    far,
    latent_J_m3: 140.28e6,
    surfaceTemp_C: 10,
    meltTemp_C: 0,
    time_s: 100 * SECONDS_PER_DAY,
  };
  it('NEU-9: λ 0.2974922, X(100 d) 1.17094 m (tol 1e-6 on λ, 1e-5 rel on X); an enthalpy FD model in the notes gave 1.1719 m', () => {
    const r = neumannTwoPhase({ ...base, initialTemp_C: -2 });
    expect(Math.abs(r.lambda - 0.2974922)).toBeLessThan(1e-6);
    expect(rel(r.frontPosition_m, 1.17094)).toBeLessThan(1e-5);
    expect(rel(r.frontPosition_m, 1.1719)).toBeLessThan(5e-3);
  });
  it('NEU-10: initial temperature at the melting point reduces to one phase (λ 0.3112247, X 1.22499 m)', () => {
    const r = neumannTwoPhase({ ...base, initialTemp_C: 0 });
    expect(Math.abs(r.lambda - 0.3112247)).toBeLessThan(1e-6);
    expect(rel(r.frontPosition_m, 1.22499)).toBeLessThan(1e-5);
    const one = neumannOnePhase({
      phase: near,
      latent_J_m3: 140.28e6,
      surfaceTemp_C: 10,
      meltTemp_C: 0,
      time_s: base.time_s,
    });
    expect(rel(one.lambda, r.lambda)).toBeLessThan(1e-12);
  });
  it('Stefan depth 1.26545 m bounds the fronts from above (Stefan neglects sensible heat)', () => {
    const x = stefanDepth_m({ conductivity_W_mK: 1.3, index_Cd: 10 * 100, latent_J_m3: 140.28e6 });
    expect(rel(x, 1.26545)).toBeLessThan(1e-5);
    expect(neumannTwoPhase({ ...base, initialTemp_C: -2 }).frontPosition_m).toBeLessThan(x);
  });
  it('temperatures: surface value, melting point at the front from both sides, initial value far away', () => {
    const r = neumannTwoPhase({ ...base, initialTemp_C: -2 });
    expect(r.temperatureAt_C(0)).toBeCloseTo(10, 12);
    expect(r.temperatureAt_C(r.frontPosition_m * (1 - 1e-12))).toBeCloseTo(0, 9);
    expect(r.temperatureAt_C(r.frontPosition_m)).toBeCloseTo(0, 12);
    expect(r.temperatureAt_C(100)).toBeCloseTo(-2, 12);
  });
  it('freezing is the mirror image of thawing (same λ for mirrored temperatures)', () => {
    const thaw = neumannTwoPhase({ ...base, initialTemp_C: -2 });
    const freeze = neumannTwoPhase({ ...base, surfaceTemp_C: -10, initialTemp_C: 2 });
    expect(freeze.lambda).toBe(thaw.lambda);
  });
});

describe('bad input', () => {
  it('initial temperature on the wrong side, zero latent heat, surface at the melting point', () => {
    expect(() =>
      neumannTwoPhase({
        near: { conductivity_W_mK: 1, heatCapacity_J_m3K: 2e6 },
        far: { conductivity_W_mK: 1, heatCapacity_J_m3K: 2e6 },
        latent_J_m3: 1e8,
        surfaceTemp_C: 5,
        meltTemp_C: 0,
        initialTemp_C: 1,
        time_s: 1,
      }),
    ).toThrow(/initialTemp_C/);
    expect(() =>
      neumannOnePhase({
        phase: { conductivity_W_mK: 1, heatCapacity_J_m3K: 2e6 },
        latent_J_m3: 0,
        surfaceTemp_C: 5,
        meltTemp_C: 0,
        time_s: 1,
      }),
    ).toThrow(/latent_J_m3/);
    expect(() =>
      neumannOnePhase({
        phase: { conductivity_W_mK: 1, heatCapacity_J_m3K: 2e6 },
        latent_J_m3: 1e8,
        surfaceTemp_C: 0,
        meltTemp_C: 0,
        time_s: 1,
      }),
    ).toThrow(/surfaceTemp_C/);
    expect(() => neumannOnePhaseLambda(NaN)).toThrow(TypeError);
  });
});
