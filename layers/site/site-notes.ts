/**
 * Site-specific cautions for the panel and the printed sheet (design.md section 6; domain-notes
 * "Permafrost classes and hazards"), derived from a run. Each note says why it applies.
 *
 * - Frost heave: the pile froze ground that was unfrozen at the start (SiteResult.overCooling); in
 *   frost-susceptible soil (silt, clay, peat) new freezing around a pile can heave and jack it.
 * - Adfreeze: where the summer thaw reaches the ground at a probe without the pile within the run,
 *   adfreeze strength and pile capacity fall as it warms; where the pile keeps it colder the capacity
 *   holds but frost-heave forces in the active layer can grow.
 * - Fluid: the lowest fluid temperature against the heat pump's lowest entering temperature.
 * - Backup heat: building mode with heat left unmet.
 */
import type { SiteInput, SiteResult } from './site-input-schema';
import type { SiteYearEnergy } from './site-energy';
import { notePartsText, type NotePart } from '../note-parts';

export interface SiteNote {
  kind: 'frost-heave' | 'adfreeze' | 'fluid' | 'backup' | 'model';
  /** The note in SI words. */
  text: string;
  /** The same note, words and quantities apart (the web writes the quantities in the chosen units). */
  parts: NotePart[];
}

/** A note from its parts (its SI text joined from them). */
function note(kind: SiteNote['kind'], ...parts: NotePart[]): SiteNote {
  return { kind, text: notePartsText(parts), parts };
}

const FROST_SUSCEPTIBLE = new Set(['silt', 'clay', 'peat']);

/** Frost heave: the pile freezes ground that was unfrozen at the start. */
function frostHeaveNote(input: SiteInput, result: SiteResult, notes: SiteNote[]): void {
  const frozen = result.overCooling?.frozenByPile_m3 ?? [];
  const worst = frozen.reduce((m, v) => Math.max(m, v), 0);
  if (worst > 0.001) {
    const year = frozen.indexOf(worst) + 1;
    const pile = input.pile;
    const zTop = pile ? pile.topDepth_m : 0;
    const zBottom = pile ? pile.topDepth_m + pile.length_m : input.domain.depth_m;
    const soils = input.ground.layers
      .filter(
        (l) =>
          l.top_m < zBottom &&
          l.bottom_m > Math.max(0, zTop - 2) &&
          l.soil &&
          FROST_SUSCEPTIBLE.has(l.soil.texture),
      )
      .map((l) => l.soil?.texture);
    notes.push(
      note(
        'frost-heave',
        'The pile freezes ground that was unfrozen at the start: up to ',
        { value: worst, unit: 'm³', decimals: 2 },
        ` at the end of winter ${year}. `,
        soils.length
          ? `The ${[...new Set(soils)].join(' and ')} along the pile is frost-susceptible: new freezing can heave the ground and jack the pile upward; check frost-heave forces and the uplift resistance.`
          : 'The soil along the pile is coarse (not frost-susceptible), but check for fine-grained pockets that could heave.',
      ),
    );
  }
}

/** Adfreeze: the first own probe that thaws without the pile (or is unfrozen from the start). */
function thawNote(result: SiteResult, ownProbeCount: number, notes: SiteNote[]): void {
  for (let i = 0; i < ownProbeCount; i++) {
    const p = result.noPile.probes[i];
    if (p.thawYear === null) continue;
    const at: NotePart[] = [
      { value: p.r_m, unit: 'm' },
      ' from the axis and ',
      { value: p.z_m, unit: 'm' },
      ' deep',
    ];
    if (p.thawYear === 0) {
      notes.push(
        note(
          'adfreeze',
          'The ground at ',
          ...at,
          ' is unfrozen from the start: there is no permafrost there to protect. Foundations are designed as for seasonally frozen ground; freezing it with the pile adds frost-heave risk.',
        ),
      );
      break;
    }
    const withYear = result.withPile?.probes[i]?.thawYear ?? null;
    notes.push(
      note(
        'adfreeze',
        'Without the pile the summer thaw reaches the ground at ',
        ...at,
        ` in year ${p.thawYear.toFixed(1)}` +
          (result.withPile
            ? withYear === null
              ? '; with the pile it stays frozen through the run.'
              : `; with the pile in year ${withYear.toFixed(1)}.`
            : '.') +
          ' Adfreeze strength and pile capacity fall as frozen ground warms: check the piles for the warmed ground.',
      ),
    );
    break;
  }
}

export function siteNotes(
  input: SiteInput,
  result: SiteResult,
  years: SiteYearEnergy[],
  minEnteringFluid_C: number | null,
  ownProbeCount: number,
): SiteNote[] {
  const notes: SiteNote[] = [];
  frostHeaveNote(input, result, notes);
  thawNote(result, ownProbeCount, notes);
  if (result.withPile && notes.every((n) => n.kind !== 'adfreeze')) {
    notes.push(
      note(
        'adfreeze',
        'Heat extraction keeps the ground around the pile colder, which holds adfreeze strength but can raise frost-heave forces in the active layer; pile capacity over time still needs a geotechnical check.',
      ),
    );
  }
  const lowest = result.fluid?.lowest_C ?? null;
  if (lowest !== null && minEnteringFluid_C !== null && lowest < minEnteringFluid_C + 0.05) {
    notes.push(
      note(
        'fluid',
        'The fluid reaches ',
        { value: lowest, unit: '°C', decimals: 1 },
        ", at the heat pump's lowest entering temperature ",
        { value: minEnteringFluid_C, unit: '°C' },
        ': the piles are at their fluid limit.',
      ),
    );
  }
  const delivered = years.reduce((s, y) => s + y.delivered_kWh, 0);
  const unmet = years.reduce((s, y) => s + y.unmet_kWh, 0);
  if (unmet > 0.005 * (delivered + unmet) && delivered + unmet > 0) {
    notes.push(
      note(
        'backup',
        `The piles carry ${((100 * delivered) / (delivered + unmet)).toFixed(0)} % of the heating over the run; a backup heater covers the rest.`,
      ),
    );
  }
  for (const w of result.warnings) notes.push(note('model', w));
  return notes;
}
