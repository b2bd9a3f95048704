/**
 * The ensemble's ranges as the planner reads them: "P10–P90: a – b" for a band that has P10/P90
 * companions in the build (layers/screening/cell-ensemble-model.ts), the probability of success and
 * the robust class. Pure helpers for the hover readout and the class card.
 */
import type { Band, Manifest } from '../../../layers/screening/manifest';
import { BAND } from '../../../layers/screening/band-ids';
import { horizonText } from '../../../layers/screening/climate-horizon';
import { formatQuantity, type UnitSystem } from '../units/display-units';

/** Band id of the robust class and the value that means "uncertain" (cell-ensemble-model.ts). */
export const ROBUST_CLASS_BAND = BAND.robustClass;
export const UNCERTAIN_LABEL = 'uncertain';
export const SUCCESS_BAND = BAND.successProbability;

/** The robust-class band of an ensemble build and its "uncertain" value, or null. */
export function uncertainClassOf(
  manifest: Manifest,
): { bandIndex: number; value: number; band: Band } | null {
  const bandIndex = manifest.bands.findIndex((b) => b.id === ROBUST_CLASS_BAND);
  if (bandIndex < 0) return null;
  const band = manifest.bands[bandIndex];
  const c = band.classes?.find((x) => x.label === UNCERTAIN_LABEL);
  return c ? { bandIndex, value: c.value, band } : null;
}

/** The base band id of a percentile band (`pilesPerTonP90` → `pilesPerTon`), else the id itself. */
export function rangeBaseId(id: string): string {
  return id.replace(/P(10|50|90)$/, '');
}

/**
 * "P10–P90 a – b" for band `id` (or its base band) from the cell's values by band id; null when the
 * build has no percentile bands for it or the cell has none. An end that is only a lower bound (a thaw
 * delay whose members thaw with piles after the climate horizon: the band's `horizon`, climate-horizon.ts)
 * reads "≥ value", and the text says why.
 */
export function rangeText(
  manifest: Manifest,
  valueOf: (bandId: string) => number | null | undefined,
  id: string,
  units: UnitSystem,
): string | null {
  const base = rangeBaseId(id);
  const lo = manifest.bands.find((b) => b.id === `${base}P10`);
  const hi = manifest.bands.find((b) => b.id === `${base}P90`);
  if (!lo || !hi) return null;
  const a = valueOf(lo.id);
  const b = valueOf(hi.id);
  if (a === null || a === undefined || b === null || b === undefined) return 'P10–P90: not defined';
  if (!Number.isFinite(a) || !Number.isFinite(b)) return 'P10–P90: not defined';
  const end = (band: Band, v: number) => {
    const text = formatQuantity(v, band.unit, units);
    const bounded = horizonText(
      band.horizon,
      band.horizon ? valueOf(band.horizon.flagBand) : undefined,
      text,
    );
    return { text: bounded ?? text, bounded: bounded !== null };
  };
  const [x, y] = [end(lo, a), end(hi, b)];
  const why =
    x.bounded || y.bounded
      ? ` (lower bound: thaw with piles after ${hi.horizon?.year ?? lo.horizon?.year})`
      : '';
  return `P10–P90: ${x.text} – ${y.text}${why}`;
}

/** "62 % of the ensemble members succeed" for the probability of success. */
export function successText(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v)
    ? 'no data'
    : `${Math.round(100 * v)} % of the ensemble members succeed`;
}
