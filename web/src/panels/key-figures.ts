/**
 * The five figures a planner decides a cell on, in the order the decision runs:
 *  1. Suitability class and how robust it is: may piles with heat extraction go here at all, and would a
 *     nearby setting (or the declared input spread) change that answer?
 *  2. Thaw delay: the years of extra frozen ground at the foundation that the heat extraction buys, the
 *     reason for the scheme on warming permafrost (design.md §1, the thaw-mitigation margin).
 *  3. Piles per ton (per kW) of peak heating: the pile count, hence most of the cost of the scheme.
 *  4. Share of the heating load the piles carry: how big the backup heater stays (hybrids are normal,
 *     domain-notes.md "The ground heat balance decides").
 *  5. What governs: the failed foundation check when the cell is excluded, else the limit that caps the
 *     extraction (thaw, fluid limit, over-cooling); it names the input a site investigation must firm up.
 * Everything else in the cell panel is detail an engineer may open.
 */
import type { Band, Manifest } from '../../../layers/screening/manifest';
import { BAND } from '../../../layers/screening/band-ids';
import { horizonText } from '../../../layers/screening/climate-horizon';
import { displayTitle, formatNumber, formatQuantity, type UnitSystem } from '../units/display-units';
import { ROBUST_CLASS_BAND, SUCCESS_BAND, successText } from './ensemble-ranges';

export interface KeyFigure {
  /** Stable key for tests and React (not shown). */
  key: 'class' | 'delay' | 'piles' | 'share' | 'governs';
  label: string;
  value: string;
  /** A second line in plain words (robustness, bound, what the number means). */
  note?: string;
}

type Values = Record<string, number | null | undefined>;

function classLabel(band: Band | undefined, v: number | null | undefined): string | null {
  if (!band || v === null || v === undefined) return null;
  return band.classes?.find((c) => c.value === Math.round(v))?.label ?? null;
}

/** The five key figures of a cell from its band values (null values read 'no data'). */
export function keyFigures(manifest: Manifest, values: Values, units: UnitSystem): KeyFigure[] {
  const band = (id: string) => manifest.bands.find((b) => b.id === id);
  const suitability = band(BAND.suitability);
  const exclusion = band(BAND.exclusion);
  const excluded = (values[BAND.exclusion] ?? 0) > 0;
  const out: KeyFigure[] = [];

  const cls = classLabel(suitability, values[BAND.suitability]) ?? 'no data';
  const robust = band(ROBUST_CLASS_BAND);
  let note: string | undefined;
  if (robust && values[ROBUST_CLASS_BAND] !== undefined) {
    const r = classLabel(robust, values[ROBUST_CLASS_BAND]);
    note = `robust class over the input spread: ${r ?? 'no data'}; ${successText(values[SUCCESS_BAND])}`;
  } else if (values[BAND.classRobust] !== undefined && values[BAND.classRobust] !== null) {
    note =
      values[BAND.classRobust] === 1
        ? 'robust: the same class under every tested change of the settings'
        : 'not robust: a nearby setting changes the class';
  } else if (!excluded) {
    note = 'robustness not computed in this build';
  }
  out.push({ key: 'class', label: suitability?.title ?? 'Suitability class', value: cls, note });

  const delayBand = band(BAND.thawDelay);
  const delay = values[BAND.thawDelay];
  const delayText =
    delayBand && delay !== null && delay !== undefined && Number.isFinite(delay)
      ? (horizonText(
          delayBand.horizon,
          delayBand.horizon ? values[delayBand.horizon.flagBand] : undefined,
          formatQuantity(delay, delayBand.unit, units),
        ) ?? formatQuantity(delay, delayBand.unit, units))
      : 'no data';
  out.push({
    key: 'delay',
    label: 'Thaw delay bought by the piles',
    value: delayText,
    note: 'extra years of frozen ground at the foundation with the heat extraction running',
  });

  const piles = band(BAND.pilesPerTon);
  const p = values[BAND.pilesPerTon];
  out.push({
    key: 'piles',
    label: piles ? displayTitle(piles.title, piles.unit, units) : 'Piles per ton of peak heating',
    value:
      piles && p !== null && p !== undefined && Number.isFinite(p)
        ? formatQuantity(p, piles.unit, units)
        : excluded
          ? 'not sized (excluded)'
          : 'no data',
  });

  const share = values[BAND.loadShare];
  out.push({
    key: 'share',
    label: 'Share of the heating load the piles carry',
    value:
      share !== null && share !== undefined && Number.isFinite(share)
        ? `${formatNumber(share * 100, 2)} %`
        : excluded
          ? 'none (excluded)'
          : 'no data',
    note: 'the rest comes from the backup heater',
  });

  const binding = band(BAND.bindingLimit);
  out.push(
    excluded
      ? {
          key: 'governs',
          label: 'What governs',
          value: `foundation check fails: ${classLabel(exclusion, values[BAND.exclusion]) ?? 'excluded'}`,
        }
      : {
          key: 'governs',
          label: 'What governs',
          value: `foundation checks pass; limit on the extraction: ${classLabel(binding, values[BAND.bindingLimit]) ?? 'no data'}`,
        },
  );
  return out;
}
