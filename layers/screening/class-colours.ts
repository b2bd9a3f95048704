/**
 * Colours of the classes of a class band, shared by the map (web/src/map/colour-tile.ts) and the colour
 * tables of the exported GeoTIFFs (data-pipeline/export/write-band-cog.ts), so a class looks the same
 * in a desktop GIS as on the map. Ordinal classes are sampled from the band's ramp when it names one,
 * otherwise the Okabe & Ito (2008) palette ("Color Universal Design"), which stays distinguishable
 * under the common colour-vision deficiencies.
 */
import type { Band } from './manifest';
import { rampColour, type Rgb } from './colour-ramps';

export const OKABE_ITO: Rgb[] = [
  [230, 159, 0],
  [86, 180, 233],
  [0, 158, 115],
  [240, 228, 66],
  [0, 114, 178],
  [213, 94, 0],
  [204, 121, 167],
  [0, 0, 0],
];

/** Neutral grey for a "none / excluded" class, so that it reads as absence rather than a category. */
export const NONE_CLASS_RGB: Rgb = [120, 120, 120];
/**
 * Clear green for the "not excluded" class of the exclusion band: the places that pass, never the grey
 * that the suitability layer uses for "excluded" (the two layers mean opposite things by it).
 */
export const CLEAR_CLASS_RGB: Rgb = [120, 200, 120];
const NONE_LABEL = /^(excluded|none|no|not (?!excluded\b).*|unsuitable)\b/i;
const CLEAR_LABEL = /^not excluded\b/i;

/**
 * Colour of each class of a class band, in the band's class order. A class with value 0 whose label
 * says none/excluded/no is drawn neutral grey, one that says "not excluded" clear green; the others
 * take the band's ramp (ordinal classes) or the Okabe-Ito palette (nominal classes).
 */
export function classColours(band: Pick<Band, 'classes' | 'ramp'>): Map<number, Rgb> {
  const classes = band.classes ?? [];
  const m = new Map<number, Rgb>();
  const zero = classes.find((c) => c.value === 0);
  const special =
    zero && NONE_LABEL.test(zero.label)
      ? NONE_CLASS_RGB
      : zero && CLEAR_LABEL.test(zero.label)
        ? CLEAR_CLASS_RGB
        : null;
  const rest = special ? classes.filter((c) => c.value !== 0) : classes;
  if (special) m.set(0, special);
  rest.forEach((c, i) => {
    const colour = band.ramp
      ? rampColour(band.ramp, i, 0, Math.max(1, rest.length - 1))
      : OKABE_ITO[i % OKABE_ITO.length];
    m.set(c.value, colour);
  });
  return m;
}
