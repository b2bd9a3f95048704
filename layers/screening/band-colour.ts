/**
 * The map colour of one band value (pure; shared by the web map's tile colouring, web/src/map/
 * colour-tile.ts, and the pipeline's display package, data-pipeline/export/write-display-package.ts,
 * so a cell has the same colour in both). Continuous bands: the band's ramp (colour-ramps.ts) sampled
 * into RAMP_STEPS colours over the legend range, the value clamped to the range and rounded to the
 * nearest step. Class bands: one colour per class (class-colours.ts). Nodata (NaN) and a value that is
 * no class have no colour (null: drawn transparent).
 */
import type { Band } from './manifest';
import { rampColour, type Rgb } from './colour-ramps';
import { classColours } from './class-colours';

/** Colours sampled from a continuous band's ramp (the web's lookup table size). */
export const RAMP_STEPS = 256;

/** Legend range of a band (legendMin/legendMax when set, else the build's min/max). */
export function legendRange(band: Pick<Band, 'legendMin' | 'legendMax' | 'min' | 'max'>): [number, number] {
  return [band.legendMin ?? band.min, band.legendMax ?? band.max];
}

export type BandColourBand = Pick<
  Band,
  'kind' | 'ramp' | 'classes' | 'legendMin' | 'legendMax' | 'min' | 'max'
>;

/**
 * The colours of `band` as a palette: `colours` and, for a value, the index of its colour in it (-1
 * for none). Continuous bands: the RAMP_STEPS ramp samples; class bands: one entry per class.
 */
export interface BandPalette {
  colours: Rgb[];
  indexOf: (value: number) => number;
}

export function bandPalette(band: BandColourBand): BandPalette {
  if (band.kind === 'class') {
    const byValue = classColours(band);
    const colours = [...byValue.values()];
    const index = new Map([...byValue.keys()].map((value, i) => [value, i]));
    return { colours, indexOf: (v) => (v === v ? (index.get(Math.round(v)) ?? -1) : -1) };
  }
  const [lo, hi] = legendRange(band);
  const span = hi - lo;
  const colours: Rgb[] = Array.from({ length: RAMP_STEPS }, (_, i) =>
    rampColour(band.ramp ?? 'viridis', i, 0, RAMP_STEPS - 1),
  );
  return {
    colours,
    indexOf: (v) => {
      if (v !== v) return -1;
      const t = span > 0 ? (v - lo) / span : 0.5;
      return t <= 0 ? 0 : t >= 1 ? RAMP_STEPS - 1 : Math.round(t * (RAMP_STEPS - 1));
    },
  };
}

/**
 * The colouring of `band`: a function from a value to its colour (null for none). The colours are
 * computed once here; the returned function allocates nothing (it returns shared tuples: do not modify).
 */
export function bandColourer(band: BandColourBand): (value: number) => Readonly<Rgb> | null {
  const { colours, indexOf } = bandPalette(band);
  return (v) => {
    const i = indexOf(v);
    return i < 0 ? null : colours[i];
  };
}
