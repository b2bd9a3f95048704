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
import { notePartsText, type NotePart, type NoteQuantity } from '../note-parts';

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
  /** The note in SI words. */
  note: string;
  /** The same note, words and quantities apart. */
  noteParts: NotePart[];
}

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
  const noteParts = windowNote(input, { lo, up, upperLimit, sim, zone, fluidAtLimit });
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
    note: notePartsText(noteParts),
    noteParts,
  };
}

/** The window note in words and quantities (the web writes the quantities in the chosen units). */
function windowNote(
  input: { scenario: Scenario; loadShare: number | null },
  w: Pick<StudyWindow, 'upperLimit' | 'zone' | 'fluidAtLimit'> & {
    lo: number;
    up: number;
    sim: number | null;
  },
): NotePart[] {
  const b = input.scenario.building;
  const perMetre = (value: number): NoteQuantity => ({ value, unit: 'W/m', decimals: 1 });
  const group: NotePart[] = [
    `${b.foundationPiles}-pile foundation at `,
    { value: b.pileSpacing_m, unit: 'm' },
    ' spacing',
  ];
  const bounds: NotePart[] = [
    "the map's window for these inputs is ",
    perMetre(w.lo),
    ' to ',
    perMetre(w.up),
    ` (upper bound: ${w.upperLimit})`,
  ];
  if (w.sim === null || w.zone === null) return ['No extraction in this run; ', ...bounds, '.'];
  const took: NotePart[] = ['This run takes ', perMetre(w.sim), ' of pile on average'];
  if (w.zone === 'too much' && !w.fluidAtLimit)
    return [
      ...took,
      ", above the map's upper bound (",
      ...bounds,
      "), yet its fluid stays above the heat pump's lowest entering temperature: the map loads each pile as one of the ",
      ...group,
      ', whose neighbours cool its ground over the years; the study simulates one pile alone, ' +
        "whose ground stays warmer, so the same fluid limit allows more heat. For the whole foundation, trust the map's bound.",
    ];
  if (w.zone === 'too much')
    return [
      ...took,
      ", above the map's upper bound (",
      ...bounds,
      `), and its fluid reaches the heat pump's limit: the run confirms the ${w.upperLimit} binds.`,
    ];
  if (w.zone === 'window' && w.fluidAtLimit)
    return [
      ...took,
      ", inside the map's window (",
      ...bounds,
      "), and its fluid just reaches the heat pump's limit in the coldest weeks: " +
        'the heat pump holds the fluid there by drawing less heat for those weeks (the run shows it as heat left to the backup).',
    ];
  if (w.zone === 'window') return [...took, ", inside the map's window (", ...bounds, ').'];
  return [
    ...took,
    ", below the map's lower bound (",
    ...bounds,
    '): too little heat is taken to hold the foundation ground frozen through the design life' +
      (input.loadShare !== null && input.loadShare > 0.995
        ? ' even though the piles carry the whole load.'
        : '.'),
  ];
}
