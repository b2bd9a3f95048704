/**
 * Recolouring of one loaded tile while the planner edits the filters (issue 18: the map must follow a
 * filter edit at once). The pixels are those of colourTile (colour-tile.ts) for the same planes and
 * style, byte for byte; what is kept between calls is what an edit does not change:
 *
 * - the tile coloured without any filter (band, opacity and hatching decide it), and which of its
 *   pixels have data in the shown band;
 * - each filter condition's pass mask (cell-filter.ts conditionMask), by condition, for the map's own
 *   scenario and for the other scenario's planes of the same tile (compare view). Editing one bound
 *   computes that condition's mask again and combines it with the masks kept for the others, by the
 *   one rule of filters/both-scenarios.ts (scopedPassMask, the whole-tile form of passesScoped).
 *
 * Masks of conditions no longer in the filter are dropped after each call.
 */
import { compileFilter, conditionMask, EMPTY_FILTER, type FilterCondition } from '../filters/cell-filter';
import { scopedPassMask } from '../filters/both-scenarios';
import { colourTile, FADED_ALPHA, FADED_RGB, styleFilter, type TileStyle } from './colour-tile';

const NO_FILTER = compileFilter(EMPTY_FILTER, []);

interface Unfiltered {
  band: TileStyle['band'];
  bandIndex: number;
  opacity: number;
  uncertainty: TileStyle['uncertainty'];
  /** The tile's RGBA without a filter, as 32-bit words (one per pixel). */
  rgba: Uint32Array;
  /** 1 where the shown band has data (the veil is drawn only there). */
  hasData: Uint8Array;
}

/** The RGBA of FADED_RGB at `alpha`, as one 32-bit word in the platform's byte order. */
function fadedWord(alpha: number): number {
  const bytes = new Uint8ClampedArray([FADED_RGB[0], FADED_RGB[1], FADED_RGB[2], alpha]);
  return new Uint32Array(bytes.buffer)[0];
}

export class TileRecolourer {
  private unfiltered: Unfiltered | null = null;
  private masks = new Map<string, Uint8Array>();
  private readonly pass: Uint8Array;

  /** `planes`: the tile's band planes; `other`: the other scenario's planes of it (null: none there). */
  constructor(
    private readonly planes: Float32Array[],
    private readonly other: Float32Array[] | null = null,
  ) {
    this.pass = new Uint8Array(planes[0]?.length ?? 0);
  }

  /** The tile's RGBA under `style` into `out` (every byte written), as colourTile gives it. */
  colour(style: TileStyle, out: Uint8ClampedArray): Uint8ClampedArray {
    const base = this.unfilteredFor(style);
    const out32 = new Uint32Array(out.buffer, out.byteOffset, out.length >> 2);
    const f = styleFilter(style);
    if (!f.active) {
      this.masks.clear();
      out32.set(base.rgba);
      return out;
    }
    const used = new Set<string>();
    const maskOf = (side: 'own' | 'other', c: FilterCondition): Uint8Array => {
      const key = `${side} ${c.key}`;
      used.add(key);
      let m = this.masks.get(key);
      if (!m) {
        m = conditionMask(
          c,
          side === 'own' ? this.planes : (this.other ?? []),
          new Uint8Array(this.pass.length),
        );
        this.masks.set(key, m);
      }
      return m;
    };
    const pass = scopedPassMask(f, maskOf, this.other !== null, this.pass);
    for (const key of [...this.masks.keys()]) if (!used.has(key)) this.masks.delete(key);
    const alpha = Math.round(255 * Math.max(0, Math.min(1, style.opacity)));
    const faded = fadedWord(Math.round(alpha * FADED_ALPHA));
    const { rgba, hasData } = base;
    for (let k = 0; k < out32.length; k++) out32[k] = hasData[k] === 0 ? 0 : pass[k] ? rgba[k] : faded;
    return out;
  }

  /** The tile coloured without a filter, kept while band, opacity and hatching stay. */
  private unfilteredFor(style: TileStyle): Unfiltered {
    const u = this.unfiltered;
    const sameHatch =
      u?.uncertainty?.bandIndex === style.uncertainty?.bandIndex &&
      u?.uncertainty?.value === style.uncertainty?.value;
    if (
      u &&
      u.band === style.band &&
      u.bandIndex === style.bandIndex &&
      u.opacity === style.opacity &&
      sameHatch
    )
      return u;
    const plain: TileStyle = { ...style, filter: NO_FILTER, otherFilter: null };
    const bytes = colourTile(this.planes, plain);
    const values = this.planes[style.bandIndex];
    const hasData = new Uint8Array(values.length);
    for (let k = 0; k < values.length; k++) hasData[k] = Number.isNaN(values[k]) ? 0 : 1;
    this.unfiltered = {
      band: style.band,
      bandIndex: style.bandIndex,
      opacity: style.opacity,
      uncertainty: style.uncertainty ?? null,
      rgba: new Uint32Array(bytes.buffer, bytes.byteOffset, bytes.length >> 2),
      hasData,
    };
    return this.unfiltered;
  }
}
