/**
 * The pile loop: with no channel-to-channel coupling and a uniform ground temperature the fluid follows
 * the constant-wall-temperature exchanger solution T_out − T_g = (T_in − T_g)·exp(−NTU), NTU = g·2L/(ṁc)
 * over the down-and-up path (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, mean
 * temperature for constant surface temperature, eq. 8.42b in the 6th ed.; equation number recalled from
 * memory); and the loop's energy balance ṁc(T_out − T_in) equals the heat drawn from the ground rows.
 * The loop's linear response (used by the solver to couple it without extra solves) is checked against
 * the loop itself: for a fixed command the boundary temperatures are affine in the cell temperatures.
 */
import { describe, expect, it } from 'vitest';
import { createPileLoop } from '../../layers/site/pile-loop';

const rows = 40;
const dz = new Array(rows).fill(0.25); // 10 m
const huge = 1e9; // half-cell conductance: the wall is at the cell temperature

function loopWith(command: Parameters<typeof createPileLoop>[0]['command'], gChannels = 0) {
  return createPileLoop({
    rowLength_m: dz,
    rowActive: new Array(rows).fill(true),
    gDown_W_mK: 2.5,
    gUp_W_mK: 2.5,
    gChannels_W_mK: gChannels,
    flowCapacity_W_K: 400,
    command,
  });
}

describe('pile loop', () => {
  it('matches exp(−NTU) for a uniform ground temperature without short-circuit', () => {
    const loop = loopWith(() => ({ kind: 'inlet', inlet_C: -6 }));
    loop.beginStep(0, 1);
    loop.update(new Float64Array(rows).fill(-1), new Float64Array(rows).fill(huge));
    const ntu = (2.5 * 20) / 400;
    const expected = -1 + (-6 - -1) * Math.exp(-ntu);
    expect(loop.outlet_C).toBeCloseTo(expected, 4);
  });

  it('conserves energy: ṁc(T_out − T_in) = Σ rows g (T_ground − T_fluid) with a short-circuit', () => {
    const loop = loopWith(() => ({ kind: 'inlet', inlet_C: -6 }), 1.0);
    const ground = Float64Array.from({ length: rows }, (_, j) => -2 + 0.05 * j);
    loop.beginStep(0, 1);
    loop.update(ground, new Float64Array(rows).fill(8));
    let drawn = 0;
    for (let j = 0; j < rows; j++) drawn += loop.g_W_K[j] * (ground[j] - loop.T_C[j]);
    expect(loop.extraction_W).toBeCloseTo(400 * (loop.outlet_C - loop.inlet_C), 9);
    expect(Math.abs(drawn / loop.extraction_W - 1)).toBeLessThan(1e-9);
  });

  it('delivers a commanded extraction exactly and switches off at zero', () => {
    let e = 350;
    const loop = loopWith(() => (e === 0 ? { kind: 'off' } : { kind: 'extraction', extraction_W: e }), 0.5);
    const ground = new Float64Array(rows).fill(-3);
    loop.beginStep(0, 1);
    loop.update(ground, new Float64Array(rows).fill(8));
    expect(loop.extraction_W).toBeCloseTo(350, 9);
    expect(loop.inlet_C).toBeLessThan(loop.outlet_C);
    expect(loop.outlet_C).toBeLessThan(-3);
    e = 0;
    loop.update(ground, new Float64Array(rows).fill(8));
    expect(loop.running).toBe(false);
    expect(Math.max(...loop.g_W_K)).toBe(0);
  });

  it('states its linear response: the change of the boundary temperatures between two ground states', () => {
    const commands = [
      { kind: 'inlet', inlet_C: -6 },
      { kind: 'outlet', outlet_C: -4 },
      { kind: 'extraction', extraction_W: 300 },
    ] as const;
    for (const cmd of commands) {
      const loop = loopWith(() => cmd, 0.7);
      const half = Float64Array.from({ length: rows }, (_, j) => 6 + 0.1 * j);
      const g1 = Float64Array.from({ length: rows }, (_, j) => -2 + 0.05 * j);
      const g2 = Float64Array.from({ length: rows }, (_, j) => -2 + 0.05 * j + 0.3 * Math.sin(j));
      loop.beginStep(0, 1);
      loop.update(g2, half);
      const T2 = Float64Array.from(loop.T_C);
      loop.update(g1, half);
      const T1 = Float64Array.from(loop.T_C);
      const state = [loop.inlet_C, loop.outlet_C, loop.extraction_W];
      const d = Float64Array.from(g2, (x, j) => x - g1[j]);
      const out = new Float64Array(rows);
      loop.linearResponse(d, out);
      for (let j = 0; j < rows; j++) expect(Math.abs(out[j] - (T2[j] - T1[j]))).toBeLessThan(1e-12);
      // A uniform shift of the ground moves everything by the same amount for a given extraction.
      if (cmd.kind === 'extraction') {
        loop.linearResponse(new Float64Array(rows).fill(1), out);
        for (let j = 0; j < rows; j++) expect(out[j]).toBeCloseTo(1, 12);
      }
      expect([loop.inlet_C, loop.outlet_C, loop.extraction_W]).toEqual(state);
    }
  });

  it('stays finite at hundreds of transfer units (long pile, low flow): the outlet reaches the ground', () => {
    // 100 m, 50 W/m·K per channel, ṁc = 30 W/K: NTU = 2·50·100/30 ≈ 333, so exp(−NTU) ≈ 1e-145 and
    // T_out = T_g to round-off (same constant-wall solution as above). Marching affine forms from the
    // top overflowed here (growth like exp(NTU)); the double sweep stays bounded.
    const n = 400;
    const long = createPileLoop({
      rowLength_m: new Array(n).fill(0.25),
      rowActive: new Array(n).fill(true),
      gDown_W_mK: 50,
      gUp_W_mK: 50,
      gChannels_W_mK: 0,
      flowCapacity_W_K: 30,
      command: () => ({ kind: 'inlet', inlet_C: -6 }),
    });
    long.beginStep(0, 1);
    long.update(new Float64Array(n).fill(-1), new Float64Array(n).fill(huge));
    expect(long.outlet_C).toBeCloseTo(-1, 5);
    expect(long.T_C.every(Number.isFinite)).toBe(true);
  });

  it('heat-pump command: draws the demand, or holds the outlet at its limit, or is off for the step', () => {
    // Uniform ground −3 °C, no short-circuit: at extraction E the outlet is T_g − E/(ṁc)·e^−NTU/(1 − e^−NTU)
    // (constant-wall exchanger, as above), so the outlet limit −4 °C allows E_lim = ṁc (1 − e^−NTU)/e^−NTU · 1 K.
    const demand = 40;
    let minOutlet = -4;
    const loop = loopWith(() => ({ kind: 'heatPump', extraction_W: demand, minOutlet_C: minOutlet }));
    const ground = new Float64Array(rows).fill(-3);
    const half = new Float64Array(rows).fill(huge);
    const x = Math.exp(-(2.5 * 20) / 400);
    const eLim = (400 * (1 - x)) / x;
    loop.beginStep(0, 1);
    loop.update(ground, half);
    expect(eLim).toBeGreaterThan(demand);
    expect(loop.extraction_W).toBeCloseTo(demand, 9);
    expect(loop.atLimit).toBe(false);
    minOutlet = -3.5; // E_lim halves (about 27 W): below the demand
    loop.update(ground, half);
    expect(loop.atLimit).toBe(true);
    expect(loop.outlet_C).toBeCloseTo(-3.5, 9);
    // Trapezoidal rows against the exact exponential: agreement to about 1e-4 relative.
    expect(loop.extraction_W).toBeCloseTo(eLim / 2, 2);
    // Ground at the limit: no heat above it. Within the step the draw falls to zero (pump still on);
    // at the next step the heat pump is off for the whole step.
    minOutlet = -3;
    loop.update(ground, half);
    expect(loop.extraction_W).toBeCloseTo(0, 9);
    loop.beginStep(1, 1);
    loop.update(ground, half);
    expect(loop.running).toBe(false);
    expect(Math.max(...loop.g_W_K)).toBe(0);
    // The decision holds for the step even if the ground warms during its iteration.
    loop.update(new Float64Array(rows).fill(5), half);
    expect(loop.running).toBe(false);
  });
});
