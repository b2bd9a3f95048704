/**
 * Darcy friction factor and Darcy–Weisbach pressure drop. Turbulent values: the Colebrook (1939)
 * equation behind the Moody (1944) chart, solved to 1e-12 with tests/reference/fixtures/
 * pipe-friction-colebrook.py (JSON never edited by hand); the code's Haaland (1983) formula must lie
 * within its published accuracy of about 1.5 %.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { darcyFrictionFactor, pipePressureDrop_Pa } from '../../layers/physics/pipe-friction';

const colebrook = JSON.parse(
  readFileSync(new URL('./fixtures/pipe-friction-colebrook.json', import.meta.url), 'utf8'),
) as { cases: { reynolds: number; relativeRoughness: number; colebrook: number }[] };

describe('Darcy friction factor', () => {
  it('laminar: 64/Re (Hagen–Poiseuille)', () => {
    expect(darcyFrictionFactor({ reynolds: 1000, relativeRoughness: 0.01 })).toBeCloseTo(0.064, 12);
    expect(darcyFrictionFactor({ reynolds: 100, relativeRoughness: 0 })).toBeCloseTo(0.64, 12);
  });
  it(`turbulent: Haaland within 1.5 % of Colebrook over ${colebrook.cases.length} cases, Re 4e3–1e8, ε/D 0–0.05 (computed from Colebrook 1939 with Python)`, () => {
    let worst = 0;
    for (const c of colebrook.cases) {
      const f = darcyFrictionFactor({ reynolds: c.reynolds, relativeRoughness: c.relativeRoughness });
      worst = Math.max(worst, Math.abs(f / c.colebrook - 1));
    }
    expect(worst).toBeLessThan(0.015);
    expect(worst).toBeGreaterThan(0); // a different formula, not a copy of the reference
  });
  it('Moody chart readings [M, from memory of the chart]: smooth pipe Re 1e5 ≈ 0.018, ε/D 0.001 at Re 1e6 ≈ 0.020, fully rough ε/D 0.01 ≈ 0.038', () => {
    expect(darcyFrictionFactor({ reynolds: 1e5, relativeRoughness: 0 })).toBeCloseTo(0.018, 3);
    expect(darcyFrictionFactor({ reynolds: 1e6, relativeRoughness: 0.001 })).toBeCloseTo(0.02, 3);
    expect(darcyFrictionFactor({ reynolds: 1e8, relativeRoughness: 0.01 })).toBeCloseTo(0.038, 3);
  });
  it('transition 2300–4000: continuous at both ends and between them', () => {
    const lam = darcyFrictionFactor({ reynolds: 2299.999, relativeRoughness: 1e-4 });
    const at = darcyFrictionFactor({ reynolds: 2300, relativeRoughness: 1e-4 });
    const top = darcyFrictionFactor({ reynolds: 3999.999, relativeRoughness: 1e-4 });
    const turb = darcyFrictionFactor({ reynolds: 4000, relativeRoughness: 1e-4 });
    expect(at).toBeCloseTo(lam, 6);
    expect(top).toBeCloseTo(turb, 6);
  });
  it('refuses Re ≤ 0 naming it', () => {
    expect(() => darcyFrictionFactor({ reynolds: 0, relativeRoughness: 0 })).toThrow(/reynolds/);
  });
});

describe('Darcy–Weisbach pressure drop', () => {
  it('water-like laminar flow: Δp = 128·μ·L·V̇/(π·D⁴) (Hagen–Poiseuille closed form)', () => {
    const p = {
      flow_m3_s: 1e-5,
      diameter_m: 0.02,
      length_m: 10,
      roughness_m: 0,
      density_kg_m3: 1000,
      viscosity_Pa_s: 0.01,
    };
    // Re = ρ·v·D/μ = 1000 · 0.0318 · 0.02 / 0.01 = 63.7: laminar
    expect(pipePressureDrop_Pa(p)).toBeCloseTo((128 * 0.01 * 10 * 1e-5) / (Math.PI * 0.02 ** 4), 6);
  });
  it('turbulent: f·(L/D)·ρv²/2 with the Colebrook factor to 1.5 %', () => {
    // D 0.05 m, v 2 m/s, ρ 1000, μ 1e-3: Re = 1e5, smooth; Colebrook f = 0.017990 (fixture script)
    const flow = (2 * Math.PI * 0.05 ** 2) / 4;
    const dp = pipePressureDrop_Pa({
      flow_m3_s: flow,
      diameter_m: 0.05,
      length_m: 100,
      roughness_m: 0,
      density_kg_m3: 1000,
      viscosity_Pa_s: 1e-3,
    });
    const expected = (0.01799 * (100 / 0.05) * 1000 * 2 * 2) / 2;
    expect(Math.abs(dp / expected - 1)).toBeLessThan(0.015);
  });
  it('zero flow has no drop', () => {
    expect(
      pipePressureDrop_Pa({
        flow_m3_s: 0,
        diameter_m: 0.02,
        length_m: 10,
        roughness_m: 0,
        density_kg_m3: 1000,
        viscosity_Pa_s: 1e-3,
      }),
    ).toBe(0);
  });
});
