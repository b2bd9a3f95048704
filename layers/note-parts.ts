/**
 * Notes with quantities in them (the site study's cautions, the prefill's notes): the words and each
 * quantity apart, so that the edge that shows the note writes every quantity in the reader's unit
 * system (web/src/units/display-units.ts formatNoteParts) while the note's plain `text` stays SI (the
 * CLI, logs, tests).
 */

/** A quantity inside a note: its SI value and unit label, and the decimals it is written with in SI. */
export interface NoteQuantity {
  value: number;
  unit: string;
  /** Decimals in SI; absent: the value as it is (a probe's 0.5 m). */
  decimals?: number;
}

export type NotePart = string | NoteQuantity;

/** A quantity in SI words: '0.12 m³', '-6.3 °C'. */
export function siQuantityText(q: NoteQuantity): string {
  const v = q.decimals === undefined ? String(q.value) : q.value.toFixed(q.decimals);
  return q.unit ? `${v} ${q.unit}` : v;
}

/** A note's text in SI: its words with each quantity as `value unit`. */
export function notePartsText(parts: readonly NotePart[]): string {
  return parts.map((p) => (typeof p === 'string' ? p : siQuantityText(p))).join('');
}
