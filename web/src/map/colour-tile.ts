/**
 * Colouring of a decoded screening tile into RGBA pixels (pure; style.md habit 11: the map layer
 * only draws what this returns). Continuous bands use the band's ramp from colour-ramps.ts over the
 * legend range; class bands use one colour per class (ordinal classes sampled from the band's ramp
 * when it names one, otherwise the Okabe & Ito (2008) palette, "Color Universal Design", which stays
 * distinguishable under the common colour-vision deficiencies). Nodata is transparent (the base map's
 * land or sea shows through); cells failing the live filter are drawn as a grey veil, dense enough to
 * read apart from land without data and from the solid grey of an "excluded" class (while two
 * scenarios are compared, the filter may be tested on the other scenario's tile too, by the one rule of
 * filters/both-scenarios.ts that the counter also uses); in an ensemble build, cells whose robust class is "uncertain" can be hatched over any layer.
 */
import type { Band } from '../../../layers/screening/manifest';
import type { Rgb } from '../../../layers/screening/colour-ramps';
import { bandColourer } from '../../../layers/screening/band-colour';

// The colour of a value is shared with the pipeline's display package (layers/screening/band-colour.ts).
export { legendRange } from '../../../layers/screening/band-colour';

// The class colours are shared with the pipeline's GeoTIFF colour tables (layers/screening/class-colours.ts).
export {
  CLEAR_CLASS_RGB,
  classColours,
  NONE_CLASS_RGB,
  OKABE_ITO,
} from '../../../layers/screening/class-colours';
import type { CompiledFilter } from '../filters/cell-filter';
import { passesScoped, type ScopedFilter } from '../filters/both-scenarios';

export const FADED_RGB: Rgb = [150, 156, 162];
export const FADED_ALPHA = 0.6;

export interface TileStyle {
  band: Band;
  bandIndex: number;
  /** Layer opacity, 0..1. */
  opacity: number;
  filter: CompiledFilter;
  /**
   * Compare view: the filter tested on the other scenario's planes of the same tile (the `other`
   * argument of colourTile), compiled against that scenario's bands; absent or inactive = none.
   */
  otherFilter?: CompiledFilter | null;
  /**
   * Hatch the cells whose robust class is "uncertain" (ensemble builds): the plane of the robust-class
   * band and the class value that means uncertain.
   */
  uncertainty?: { bandIndex: number; value: number } | null;
}

/** Hatching of cells whose class is uncertain: dark diagonal stripes, the cell's colour faded between. */
export const HATCH_RGB: Rgb = [40, 40, 40];
/** Stripe period and width in tile pixels (diagonal: (x + y) mod period < width). */
export const HATCH_PERIOD = 6;
export const HATCH_WIDTH = 2;
/** Alpha of the cell's own colour between the stripes, relative to the layer opacity. */
export const HATCH_FILL_ALPHA = 0.45;

/** Whether tile pixel k (row-major, TILE_SIZE wide) lies on a hatch stripe. */
export function onHatchStripe(k: number, tileSize: number): boolean {
  const x = k % tileSize;
  const y = (k - x) / tileSize;
  return (x + y) % HATCH_PERIOD < HATCH_WIDTH;
}

/** The veil's filter of a style, in the form of the shared rule (filters/both-scenarios.ts). */
export function styleFilter(style: TileStyle): ScopedFilter {
  const own = style.filter.active ? style.filter : null;
  const other = style.otherFilter?.active ? style.otherFilter : null;
  return { own, other, otherTakesPart: other !== null, active: own !== null || other !== null };
}

/**
 * RGBA (TILE_SIZE² x 4) for one tile's planes under the given style; `other` is the other scenario's
 * planes of the same tile (null: absent there, all nodata) when the style has an `otherFilter`.
 */
export function colourTile(
  planes: Float32Array[],
  style: TileStyle,
  out?: Uint8ClampedArray,
  other: Float32Array[] | null = null,
): Uint8ClampedArray {
  const values = planes[style.bandIndex];
  const n = values.length;
  const rgba = out ?? new Uint8ClampedArray(n * 4);
  const alpha = Math.round(255 * Math.max(0, Math.min(1, style.opacity)));
  const fadedAlpha = Math.round(alpha * FADED_ALPHA);
  const { band } = style;
  const filter = styleFilter(style);
  const hatch = style.uncertainty ? planes[style.uncertainty.bandIndex] : null;
  const uncertainValue = style.uncertainty?.value ?? NaN;
  const tileSize = Math.round(Math.sqrt(n));
  const hatchFill = Math.round(alpha * HATCH_FILL_ALPHA);
  const colourOf = bandColourer(band);
  for (let k = 0; k < n; k++) {
    const v = values[k];
    const o = k * 4;
    if (Number.isNaN(v)) {
      rgba[o + 3] = 0;
      continue;
    }
    if (filter.active && !passesScoped(filter, planes, k, other, k)) {
      rgba[o] = FADED_RGB[0];
      rgba[o + 1] = FADED_RGB[1];
      rgba[o + 2] = FADED_RGB[2];
      rgba[o + 3] = fadedAlpha;
      continue;
    }
    if (hatch && hatch[k] === uncertainValue) {
      if (onHatchStripe(k, tileSize)) {
        rgba[o] = HATCH_RGB[0];
        rgba[o + 1] = HATCH_RGB[1];
        rgba[o + 2] = HATCH_RGB[2];
        rgba[o + 3] = alpha;
        continue;
      }
    }
    const a = hatch && hatch[k] === uncertainValue ? hatchFill : alpha;
    const c = colourOf(v);
    if (!c) {
      rgba[o + 3] = 0;
      continue;
    }
    rgba[o] = c[0];
    rgba[o + 1] = c[1];
    rgba[o + 2] = c[2];
    rgba[o + 3] = a;
  }
  return rgba;
}
