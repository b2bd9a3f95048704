/**
 * Temporal superposition of a variable heat load on a step response, exact and with load aggregation.
 *
 * Superposition (Duhamel, for a piecewise constant load q_i on [(i−1)Δt, iΔt), q_0 = 0):
 *   θ_n = Σ_{i=1}^{n} (q_i − q_{i−1}) g((n − i + 1)Δt),
 * where g is any step response (g-function, E1/2, cylinder source ...) and θ has the units of q·g
 * (divide by 2πk for a temperature when g is the dimensionless 2πkΔT/q'). Exact cost O(n²).
 *
 * Load aggregation: past loads are held in cells whose widths double every `cellsPerLevel` cells
 * (1, 1, …, 2, 2, …, 4, …), the cell structure of Claesson & Javed (2012), "A load-aggregation method to
 * calculate extraction temperatures of borehole heat exchangers", ASHRAE Trans. 118(1):530–539. Unlike
 * their relaxation shift, cells here have fixed boundaries in absolute time and two equal cells merge
 * into one of double width when a level holds more than `cellsPerLevel` cells (exact averages, as in the
 * multiple-load aggregation of Bernier et al. 2004, HVAC&R Research 10(4):471–487), so
 *   θ_n = Σ_cells Q_c [g((n − s_c)Δt) − g((n − s_c − w_c)Δt)]
 * is exact whenever the load is constant within each cell (a constant load is reproduced exactly). g is
 * tabulated once: at every step age up to 256 steps, then 32 points per octave, linear in ln t
 * (~ 300 calls of g for a century of hours). Cost O(n log n). Measured error on two years of hourly load
 * with strong daily and annual cycles: < 0.1 % of the largest |θ| with 8 cells per level
 * (tests/unit/load-aggregation.test.ts).
 */
import { requireRange } from './validate';

function checkLoads(loads: ArrayLike<number>): void {
  for (let i = 0; i < loads.length; i++) requireRange(`loads[${i}]`, loads[i], -Infinity, Infinity);
}

/** Exact superposition; `stepResponse[j]` = g((j + 1)Δt). Returns θ after each step. */
export function superposeExact(input: {
  loads: ArrayLike<number>;
  stepResponse: ArrayLike<number>;
}): Float64Array {
  const { loads, stepResponse } = input;
  checkLoads(loads);
  if (stepResponse.length < loads.length) {
    throw new RangeError(
      `stepResponse.length must be >= loads.length ${loads.length}; received ${stepResponse.length}`,
    );
  }
  const n = loads.length;
  const dq = new Float64Array(n);
  for (let i = 0; i < n; i++) dq[i] = loads[i] - (i > 0 ? loads[i - 1] : 0);
  const out = new Float64Array(n);
  for (let m = 0; m < n; m++) {
    let s = 0;
    for (let i = 0; i <= m; i++) s += dq[i] * stepResponse[m - i];
    out[m] = s;
  }
  return out;
}

const EXACT_AGES = 256;
const PER_OCTAVE = 32;

/** g at integer step ages 0…n (g(0) = 0): exact up to 256 steps, interpolated in ln t beyond. */
function tabulate(g: (time_s: number) => number, dt: number, n: number): (age: number) => number {
  const exact = new Float64Array(Math.min(n, EXACT_AGES) + 1);
  for (let a = 1; a < exact.length; a++) exact[a] = g(a * dt);
  if (n <= EXACT_AGES) return (age) => exact[age];
  const octaves = Math.log2(n / EXACT_AGES);
  const m = Math.ceil(octaves * PER_OCTAVE) + 1;
  const tab = new Float64Array(m + 1);
  for (let j = 0; j <= m; j++) tab[j] = g(EXACT_AGES * Math.pow(2, j / PER_OCTAVE) * dt);
  const all = new Float64Array(n + 1);
  all.set(exact);
  for (let age = EXACT_AGES + 1; age <= n; age++) {
    const u = Math.log2(age / EXACT_AGES) * PER_OCTAVE;
    const j = Math.min(Math.floor(u), m - 1);
    const w = u - j;
    all[age] = (1 - w) * tab[j] + w * tab[j + 1];
  }
  return (age) => all[age];
}

/**
 * Aggregated superposition (see the module comment). `g(time_s)` is tabulated once.
 * Returns θ after each step.
 */
export function superposeAggregated(input: {
  loads: ArrayLike<number>;
  timeStep_s: number;
  g: (time_s: number) => number;
  cellsPerLevel?: number;
}): Float64Array {
  const { loads } = input;
  checkLoads(loads);
  const dt = requireRange('timeStep_s', input.timeStep_s, Number.MIN_VALUE, Infinity, 's');
  const nc = requireRange('cellsPerLevel', input.cellsPerLevel ?? 8, 1, 1000);
  const n = loads.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  const G = tabulate(input.g, dt, n);
  // cells, oldest first: start step, width (steps), mean load
  const start: number[] = [];
  const width: number[] = [];
  const load: number[] = [];
  for (let m = 0; m < n; m++) {
    start.push(m);
    width.push(1);
    load.push(loads[m]);
    // merge the two oldest cells of a level when it holds more than nc cells (newest levels first)
    let i = start.length - 1;
    while (i >= 0) {
      const w = width[i];
      let j = i;
      while (j - 1 >= 0 && width[j - 1] === w) j--;
      const count = i - j + 1;
      if (count > nc) {
        load[j] = (load[j] * w + load[j + 1] * w) / (2 * w);
        width[j] = 2 * w;
        start.splice(j + 1, 1);
        width.splice(j + 1, 1);
        load.splice(j + 1, 1);
        i = j; // the merged cell may overflow the next level
      } else {
        break; // levels below this one did not change
      }
    }
    let s = 0;
    const now = m + 1;
    for (let c = 0; c < start.length; c++) {
      const ageStart = now - start[c];
      s += load[c] * (G(ageStart) - G(ageStart - width[c]));
    }
    out[m] = s;
  }
  return out;
}
