/**
 * simulateSite end to end on a short version of the example: output shapes, the energy balance of both
 * cases, the fluid energy against the ground's pile heat, and the one-dimensional no-pile shortcut
 * against an (r, z) run whose pile never runs.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { simulateSite, SiteCancelledError } from '../../layers/site/simulate-site';

const example = JSON.parse(readFileSync(new URL('../../examples/site-demo.json', import.meta.url), 'utf8'));

function shortRun(mutate: (d: typeof example) => void = () => {}) {
  const d = structuredClone(example);
  d.years = 3;
  d.numerics = { fidelity: 'coarse' };
  mutate(d);
  return simulateSite(d);
}

describe('simulateSite', () => {
  // 250 W for 3 years takes the fluid to about −14 °C: 40 % propylene glycol (freezing point about
  // −21 °C, fluids.ts table) keeps it liquid (30 % would freeze and the run would refuse).
  const r = shortRun((d) => {
    d.operation = { mode: 'heatRate', extraction_W: 250 };
    d.pile.fluid.massFraction = 0.4;
  });

  it('returns consistent shapes', () => {
    const wp = r.withPile!;
    for (const c of [r.noPile, wp]) {
      expect(c.thawDepth_m.length).toBe(c.time_yr.length);
      expect(c.annualThawDepth_m.length).toBe(3);
      for (const p of c.probes) expect(p.T_C.length).toBe(c.time_yr.length);
    }
    expect(r.thawDelay_yr.length).toBe(example.probes.length);
    expect(r.fluid!.extracted_kWh.length).toBe(36);
    expect(r.cautions[0]).toMatch(/not a design/);
  });

  it('closes the energy balance of both cases', () => {
    expect(r.energyBalance.relativeError).toBeLessThan(0.005);
    expect(r.warnings.filter((w) => /energy balance/.test(w))).toEqual([]);
  });

  it('the heat the fluid carries equals the heat the ground loses through the pile wall', () => {
    const fluid_J = r.fluid!.extracted_kWh.reduce((a, b) => a + b, 0) * 3.6e6;
    const ground_J = -r.withPile!.energyBalance.pile_J;
    expect(Math.abs(fluid_J / ground_J - 1)).toBeLessThan(0.005);
    expect(fluid_J / (3 * 365 * 86400)).toBeCloseTo(250, -1);
  });

  it('extraction cools the ground near the pile', () => {
    const last = r.noPile.time_yr.length - 1;
    expect(r.withPile!.probes[0].T_C[last]).toBeLessThan(r.noPile.probes[0].T_C[last] - 0.5);
  });

  it('the one-column no-pile case equals the far field of an (r, z) run with the pump off', () => {
    const off = shortRun((d) => (d.operation = { mode: 'heatRate', extraction_W: 0 }));
    const far = off.withPile!.probes[4].T_C;
    const col = off.noPile.probes[4].T_C;
    for (let i = 0; i < far.length; i++) expect(Math.abs(far[i] - col[i])).toBeLessThan(2e-4);
  });

  it('building mode: the heat pump delivers heat and the entering fluid is held at its lower limit', () => {
    const b = shortRun();
    const f = b.fluid!;
    expect(f.delivered_kWh).not.toBeNull();
    const delivered = f.delivered_kWh!.reduce((a, x) => a + x, 0);
    expect(delivered).toBeGreaterThan(0);
    expect(f.lowest_C!).toBeGreaterThan(-8 - 0.5);
  });

  it('a pile that injects heat thaws the ground sooner: the (negative) delay is flagged as an upper bound', () => {
    // 400 W put into the ground (cooling mode) at a warm permafrost site: the ground around the pile
    // thaws within the first year, the ground without the pile not within the 6-year run.
    const hot = shortRun((d) => {
      d.years = 6;
      d.operation = { mode: 'heatRate', extraction_W: -400 };
    });
    const wp = hot.withPile!;
    let flagged = 0;
    hot.thawDelay_yr.forEach((delay, i) => {
      const a = hot.noPile.probes[i].thawYear;
      const b = wp.probes[i].thawYear;
      expect(hot.thawDelayIsLowerBound[i] && hot.thawDelayIsUpperBound[i]).toBe(false);
      if (a === null && b !== null) {
        flagged++;
        expect(hot.thawDelayIsUpperBound[i]).toBe(true);
        expect(delay).toBeCloseTo(b - 6, 3);
        expect(delay!).toBeLessThan(0);
      } else {
        expect(hot.thawDelayIsUpperBound[i]).toBe(false);
      }
    });
    expect(flagged).toBeGreaterThan(0);
    // Extraction never brings the thaw forward, so nothing is flagged as an upper bound there.
    expect(r.thawDelayIsUpperBound.every((f) => !f)).toBe(true);
  });

  it('can be cancelled', () => {
    const d = structuredClone(example);
    d.numerics = { fidelity: 'coarse' };
    expect(() => simulateSite(d, { shouldCancel: () => true })).toThrow(SiteCancelledError);
  });
});
