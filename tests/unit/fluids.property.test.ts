import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { fluidProperties, freezingPoint_C, MAX_MASS_FRACTION } from '../../layers/physics/fluids';

const params = { seed: 20261202, numRuns: 400 };
const mixture = fc.constantFrom('propyleneGlycol' as const, 'ethanol' as const);
const fraction = fc.double({ min: 0, max: MAX_MASS_FRACTION, noNaN: true });
const unit = fc.double({ min: 0, max: 1, noNaN: true });

/** A temperature between the mixture's freezing point (or −30 °C) and 40 °C, from u in [0, 1]. */
function liquidTemperature(fluid: 'propyleneGlycol' | 'ethanol', x: number, u: number): number {
  const low = Math.max(freezingPoint_C({ fluid, massFraction: x }), -30);
  return low + u * (40 - low);
}

describe('fluid property invariants over the whole liquid range (seeded property tests)', () => {
  it('every property is finite and within physical bounds (no NaN from the table layout)', () => {
    fc.assert(
      fc.property(mixture, fraction, unit, (fluid, x, u) => {
        const p = fluidProperties({ fluid, massFraction: x, temperature_C: liquidTemperature(fluid, x, u) });
        expect(p.density_kg_m3).toBeGreaterThan(900);
        expect(p.density_kg_m3).toBeLessThan(1100);
        expect(p.specificHeat_J_kgK).toBeGreaterThan(3400);
        expect(p.specificHeat_J_kgK).toBeLessThan(4500);
        expect(p.conductivity_W_mK).toBeGreaterThan(0.3);
        expect(p.conductivity_W_mK).toBeLessThan(0.7);
        expect(p.viscosity_Pa_s).toBeGreaterThan(0.5e-3);
        expect(p.viscosity_Pa_s).toBeLessThan(0.1);
      }),
      params,
    );
  });

  it('viscosity falls with temperature; conductivity falls with concentration', () => {
    fc.assert(
      fc.property(mixture, fraction, unit, unit, (fluid, x, u1, u2) => {
        const [a, b] = u1 < u2 ? [u1, u2] : [u2, u1];
        fc.pre(b - a > 1e-3);
        const cold = fluidProperties({
          fluid,
          massFraction: x,
          temperature_C: liquidTemperature(fluid, x, a),
        });
        const warm = fluidProperties({
          fluid,
          massFraction: x,
          temperature_C: liquidTemperature(fluid, x, b),
        });
        expect(warm.viscosity_Pa_s).toBeLessThan(cold.viscosity_Pa_s);
        const t = Math.max(liquidTemperature(fluid, MAX_MASS_FRACTION, 0), 0) + a * 20;
        const dilute = fluidProperties({ fluid, massFraction: x * 0.5, temperature_C: t });
        const strong = fluidProperties({ fluid, massFraction: x, temperature_C: t });
        if (x > 1e-3) expect(strong.conductivity_W_mK).toBeLessThan(dilute.conductivity_W_mK);
      }),
      params,
    );
  });

  it('the freezing point falls as the mass fraction rises', () => {
    fc.assert(
      fc.property(mixture, fraction, fraction, (fluid, x1, x2) => {
        fc.pre(Math.abs(x1 - x2) > 1e-6);
        const [lo, hi] = x1 < x2 ? [x1, x2] : [x2, x1];
        expect(freezingPoint_C({ fluid, massFraction: hi })).toBeLessThan(
          freezingPoint_C({ fluid, massFraction: lo }),
        );
      }),
      params,
    );
  });

  it('properties are continuous across table rows and columns (a 1e-6 step moves them < 1e-4 relative)', () => {
    fc.assert(
      fc.property(mixture, fraction, unit, (fluid, x, u) => {
        const t = liquidTemperature(fluid, x, u); // liquid at both mass fractions (freezing falls with x)
        const xs = [x, Math.min(x + 1e-6, MAX_MASS_FRACTION)];
        const [p, q] = xs.map((m) => fluidProperties({ fluid, massFraction: m, temperature_C: t }));
        const r = fluidProperties({ fluid, massFraction: xs[1], temperature_C: Math.min(t + 1e-6, 40) });
        for (const k of [
          'density_kg_m3',
          'specificHeat_J_kgK',
          'conductivity_W_mK',
          'viscosity_Pa_s',
        ] as const) {
          expect(Math.abs(q[k] / p[k] - 1)).toBeLessThan(1e-4);
          expect(Math.abs(r[k] / q[k] - 1)).toBeLessThan(1e-4);
        }
      }),
      params,
    );
  });
});
