/**
 * The site study's operating window: the map's bounds for this site's inputs (operating-window.ts:
 * lower = thaw, upper = min(fluid limit, over-cooling), for a pile of the standard foundation group),
 * where this run's mean extraction per metre falls on them, and what the run's own fluid did. The chart
 * draws `zones` and `simulated_W_m`; the note in the study's notes is `note`. Both come from this one
 * object, so the picture and the words cannot disagree (tests/unit/site-study-report.test.ts).
 *
 * Why the run can sit above the map's upper bound with its fluid still above the limit: the map loads
 * each pile as one of the scenario's foundation group (e.g. 16 piles, 4 × 4 at 3 m), whose neighbours
 * cool its ground over the years; the study simulates one pile alone in an axisymmetric domain, so its
 * ground stays warmer and the same fluid limit allows more heat.
 */
import type { CellScreening } from './cell-screening-model';
import type { Scenario } from './scenario';

export type WindowZone = 'too little' | 'window' | 'too much';

export interface StudyWindow {
  lower_W_m: number;
  upperFluid_W_m: number;
  upperOvercool_W_m: number;
  /** min(upperFluid, upperOvercool), ≥ 0. */
  upper_W_m: number;
  /** The bound that sets the upper limit. */
  upperLimit: 'fluid limit' | 'soil over-cooled';
  /** Extraction that would carry the whole heating load of the standard building, W/m (null: unknown). */
  full_W_m: number | null;
  /** The run's mean extraction per metre of pile, W/m. */
  simulated_W_m: number | null;
  /** Zone of the map's window the run's mean extraction falls in. */
  zone: WindowZone | null;
  /** The run's fluid reached the heat pump's lowest entering temperature. */
  fluidAtLimit: boolean;
  /** The chart's bands, in W/m, left to right. */
  zones: { zone: WindowZone; from_W_m: number; to_W_m: number }[];
  note: string;
}

const fmt = (v: number) => v.toFixed(1);

/** Zone of a value on the window (lower ≤ v ≤ upper: window). */
export function windowZone(v: number, lower_W_m: number, upper_W_m: number): WindowZone {
  if (v < lower_W_m) return 'too little';
  if (v > Math.max(upper_W_m, lower_W_m)) return 'too much';
  return upper_W_m >= lower_W_m ? 'window' : 'too much';
}

export function studyWindow(input: {
  quick: CellScreening;
  extraction_W_m: number | null;
  lowestFluid_C: number | null;
  minEnteringFluid_C: number | null;
  loadShare: number | null;
  scenario: Scenario;
}): StudyWindow | null {
  const m = input.quick.metrics;
  const lower = m.windowLower.value;
  const fluid = m.windowUpperFluid.value;
  const over = m.windowUpperOvercool.value;
  if (lower === null || fluid === null || over === null) return null;
  const lo = Math.max(0, lower);
  const up = Math.max(0, Math.min(fluid, over));
  const upperLimit = fluid <= over ? 'fluid limit' : 'soil over-cooled';
  const carried = m.extractionCarried.value;
  const share = m.loadShare.value;
  const full = carried !== null && share !== null && share > 0 ? carried / share : null;
  const sim = input.extraction_W_m;
  const zone = sim === null ? null : windowZone(sim, lo, up);
  const fluidAtLimit =
    input.lowestFluid_C !== null &&
    input.minEnteringFluid_C !== null &&
    input.lowestFluid_C < input.minEnteringFluid_C + 0.05;
  const top = Math.max(up, lo);
  const hi = Math.max(top, sim ?? 0, full ?? 0) * 1.35 || 10;
  const zones: StudyWindow['zones'] = [{ zone: 'too little', from_W_m: 0, to_W_m: lo }];
  if (up > lo) zones.push({ zone: 'window', from_W_m: lo, to_W_m: up });
  zones.push({ zone: 'too much', from_W_m: top, to_W_m: hi });
  const b = input.scenario.building;
  const group = `${b.foundationPiles}-pile foundation at ${b.pileSpacing_m} m spacing`;
  const bounds = `the map's window for these inputs is ${fmt(lo)} to ${fmt(up)} W/m (upper bound: ${upperLimit})`;
  let note: string;
  if (sim === null || zone === null) {
    note = `No extraction in this run; ${bounds}.`;
  } else {
    const took = `This run takes ${fmt(sim)} W/m of pile on average`;
    if (zone === 'too much' && !fluidAtLimit) {
      note =
        `${took}, above the map's upper bound (${bounds}), yet its fluid stays above the heat pump's lowest entering temperature: ` +
        `the map loads each pile as one of the ${group}, whose neighbours cool its ground over the years; the study simulates one pile alone, ` +
        `whose ground stays warmer, so the same fluid limit allows more heat. For the whole foundation, trust the map's bound.`;
    } else if (zone === 'too much') {
      note = `${took}, above the map's upper bound (${bounds}), and its fluid reaches the heat pump's limit: the run confirms the ${upperLimit} binds.`;
    } else if (zone === 'window' && fluidAtLimit) {
      note =
        `${took}, inside the map's window (${bounds}), and its fluid just reaches the heat pump's limit in the coldest weeks: ` +
        'the heat pump holds the fluid there by drawing less heat for those weeks (the run shows it as heat left to the backup).';
    } else if (zone === 'window') {
      note = `${took}, inside the map's window (${bounds}).`;
    } else {
      note =
        `${took}, below the map's lower bound (${bounds}): too little heat is taken to hold the foundation ground frozen through the design life` +
        (input.loadShare !== null && input.loadShare > 0.995
          ? ' even though the piles carry the whole load.'
          : '.');
    }
  }
  return {
    lower_W_m: lo,
    upperFluid_W_m: fluid,
    upperOvercool_W_m: over,
    upper_W_m: up,
    upperLimit,
    full_W_m: full,
    simulated_W_m: sim,
    zone,
    fluidAtLimit,
    zones,
    note,
  };
}
