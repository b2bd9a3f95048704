import { describe, it, expect } from 'vitest';
import { degreeDays } from '../../layers/physics/surface-forcing';
import { stefanDepth_m } from '../../layers/physics/stefan';
import { kudryavtsevTtop_C, kudryavtsevActiveLayer_m } from '../../layers/physics/kudryavtsev';

describe('Kudryavtsev (computed with mpmath from the recalled equations; tol 1e-4)', () => {
  const ttops: [string, number, number, number, number, number][] = [
    ['KUD-1', -2, 15, 1.2, 1.8, -3.2724],
    ['KUD-2', -5, 20, 1.3, 1.9, -6.2841],
    ['KUD-3', 0, 15, 1.2, 1.8, -1.5915],
  ];
  for (const [id, ts, as, kt, kf, v] of ttops) {
    it(`${id}: TTOP ${v}`, () => {
      expect(
        Math.abs(
          kudryavtsevTtop_C({
            meanSurfaceTemp_C: ts,
            surfaceAmplitude_C: as,
            kThawed_W_mK: kt,
            kFrozen_W_mK: kf,
          }) - v,
        ),
      ).toBeLessThan(1e-4);
    });
  }
  it('KUD-3 closed form −Ās(k_f−k_t)/(π k_f) and KUD-4 equal conductivities give T̄s', () => {
    expect(
      kudryavtsevTtop_C({
        meanSurfaceTemp_C: 0,
        surfaceAmplitude_C: 15,
        kThawed_W_mK: 1.2,
        kFrozen_W_mK: 1.8,
      }),
    ).toBeCloseTo((-15 * 0.6) / (Math.PI * 1.8), 12);
    expect(
      kudryavtsevTtop_C({
        meanSurfaceTemp_C: -2.5,
        surfaceAmplitude_C: 15,
        kThawed_W_mK: 1.5,
        kFrozen_W_mK: 1.5,
      }),
    ).toBeCloseTo(-2.5, 12);
  });
  it('KUD-5: Ās 15, TTOP −3, k 1.3, C 2.9e6, Q_L 140e6 -> ALT 1.1955 m', () => {
    const z = kudryavtsevActiveLayer_m({
      surfaceAmplitude_C: 15,
      ttop_C: -3,
      conductivity_W_mK: 1.3,
      heatCapacity_J_m3K: 2.9e6,
      latent_J_m3: 140e6,
    });
    expect(Math.abs(z - 1.1955)).toBeLessThan(1e-4);
  });
  it('KUD-8 limit Q_L -> 0 is pure conduction, d·ln(Ās/T) = 3.4141 m (derived limit)', () => {
    const z = kudryavtsevActiveLayer_m({
      surfaceAmplitude_C: 15,
      ttop_C: -3,
      conductivity_W_mK: 1.3,
      heatCapacity_J_m3K: 2.9e6,
      latent_J_m3: 1,
    });
    expect(Math.abs(z - 3.4141)).toBeLessThan(1e-4);
    expect(
      kudryavtsevActiveLayer_m({
        surfaceAmplitude_C: 15,
        ttop_C: -3,
        conductivity_W_mK: 1.3,
        heatCapacity_J_m3K: 2.9e6,
        latent_J_m3: 0,
      }),
    ).toBeCloseTo(3.41409, 4);
  });
  it('Kudryavtsev ALT lies below the Stefan depth for the same thaw index (sensible heat is not free)', () => {
    // Surface sinusoid about TTOP -3 with Ās 15: thawing index of that sinusoid drives Stefan.
    const dd = degreeDays({ meanAirTemp_C: -3, amplitude_C: 15 });
    const stefan = stefanDepth_m({
      conductivity_W_mK: 1.3,
      index_Cd: dd.thawingIndex_Cd,
      latent_J_m3: 140e6,
    });
    const kud = kudryavtsevActiveLayer_m({
      surfaceAmplitude_C: 15,
      ttop_C: -3,
      conductivity_W_mK: 1.3,
      heatCapacity_J_m3K: 2.9e6,
      latent_J_m3: 140e6,
    });
    expect(kud).toBeLessThan(stefan);
    expect(kud).toBeGreaterThan(0.5 * stefan);
  });
});

describe('bad input', () => {
  it('Kudryavtsev with non-positive heat capacity', () => {
    expect(() =>
      kudryavtsevActiveLayer_m({
        surfaceAmplitude_C: 15,
        ttop_C: -3,
        conductivity_W_mK: 1.3,
        heatCapacity_J_m3K: 0,
        latent_J_m3: 1e8,
      }),
    ).toThrow(/heatCapacity_J_m3K/);
  });
});
