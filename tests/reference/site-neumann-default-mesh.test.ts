/**
 * Thaw depth reported by `simulateSite` at its DEFAULT mesh and time step against the Neumann
 * solutions (Carslaw & Jaeger 1959 §11.2; Crank 1984 eq. 3.14; layers/physics/neumann.ts, itself checked
 * against mpmath values in neumann.test.ts): a surface held at +10 °C from t = 0 over ground at a
 * uniform initial temperature, no geothermal flux, no pile. The thaw depth must be resolved inside the
 * front cell (from its liquid fraction), so that a one-phase case (ground at its solidus) and two-phase
 * cases (colder ground) give different depths, each within 3 % of its own solution at 5, 10 and 20 years.
 * The freezing interval is the simulator's default (0.1 K) about 0 °C; the Neumann solutions are taken
 * with the melt temperature at its middle (0 °C) and, for the one-phase case, the latent heat plus the
 * interval's sensible heat c̄·w (what the ground at the solidus must absorb to thaw).
 */
import { describe, expect, it } from 'vitest';
import { neumannOnePhase, neumannTwoPhase } from '../../layers/physics/neumann';
import { SITE_DEFAULTS } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';

const kF = 1.9;
const kT = 1.3;
const cF = 2.1e6;
const cT = 2.9e6;
const L = 334e3 * 1400 * 0.3; // 140.28 MJ/m³, reference-values §5b inputs
const W = SITE_DEFAULTS.freezingInterval_K.value; // the simulator's default freezing interval, K
const SURFACE_C = 10;
const YEAR_S = 365 * 86400;

function simulate(initial_C: number) {
  return simulateSite({
    years: 20,
    ground: {
      layers: [
        {
          top_m: 0,
          bottom_m: 50,
          kFrozen_W_mK: kF,
          kThawed_W_mK: kT,
          cFrozen_J_m3K: cF,
          cThawed_J_m3K: cT,
          latent_J_m3: L,
          freezingPoint_C: 0,
        },
      ],
      geothermalFlux_W_m2: 0,
      initial: { uniform_C: initial_C },
    },
    climate: { meanAirTemp_C: SURFACE_C, amplitude_C: 0, warming_C_per_yr: 0, nThaw: 1, nFreeze: 1 },
    pile: null,
    operation: { mode: 'heatRate', extraction_W: 0 },
    probes: [],
  });
}

/** The output sample nearest to `years` (outputs fall on time steps): its time and thaw depth. */
function sampleAt(r: ReturnType<typeof simulate>, years: number): { time_s: number; depth_m: number } {
  const t = r.noPile.time_yr;
  let i = 0;
  for (let k = 1; k < t.length; k++) if (Math.abs(t[k] - years) < Math.abs(t[i] - years)) i = k;
  expect(Math.abs(t[i] - years)).toBeLessThan(0.05);
  return { time_s: t[i] * YEAR_S, depth_m: r.noPile.thawDepth_m[i] };
}

const near = { conductivity_W_mK: kT, heatCapacity_J_m3K: cT };
const far = { conductivity_W_mK: kF, heatCapacity_J_m3K: cF };

describe('simulateSite thaw depth at the default mesh and step against Neumann', () => {
  const cases: { name: string; initial_C: number }[] = [
    { name: `one-phase (ground at its solidus, ${-W / 2} °C)`, initial_C: -W / 2 },
    { name: 'two-phase, ground at -0.5 °C', initial_C: -0.5 },
    { name: 'two-phase, ground at -3 °C', initial_C: -3 },
    { name: 'two-phase, ground at -8 °C', initial_C: -8 },
  ];
  const fronts: Record<string, number[]> = {};
  for (const c of cases) {
    it(`${c.name}: thaw depth within 3 % at 5, 10 and 20 years`, () => {
      const r = simulate(c.initial_C);
      fronts[c.name] = [];
      for (const years of [5, 10, 20]) {
        const { time_s, depth_m: got } = sampleAt(r, years);
        const exact =
          c.initial_C === -W / 2
            ? neumannOnePhase({
                phase: near,
                latent_J_m3: L + 0.5 * (cF + cT) * W,
                surfaceTemp_C: SURFACE_C,
                meltTemp_C: W / 2,
                time_s,
              }).frontPosition_m
            : neumannTwoPhase({
                near,
                far,
                latent_J_m3: L,
                surfaceTemp_C: SURFACE_C,
                meltTemp_C: 0,
                initialTemp_C: c.initial_C,
                time_s,
              }).frontPosition_m;
        fronts[c.name].push(got);
        expect(Math.abs(got / exact - 1), `${years} yr: ${got} m against ${exact} m`).toBeLessThan(0.03);
      }
    });
  }
  it('one- and two-phase fronts differ (resolved inside cells, not at cell faces)', () => {
    const a = fronts[cases[0].name];
    const b = fronts[cases[2].name];
    expect(a && b).toBeTruthy();
    for (let i = 0; i < 3; i++) expect(a[i] - b[i]).toBeGreaterThan(0.02 * b[i]);
  });
});
