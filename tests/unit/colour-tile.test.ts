import { describe, expect, it } from 'vitest';
import {
  CLEAR_CLASS_RGB,
  classColours,
  colourTile,
  FADED_ALPHA,
  FADED_RGB,
  NONE_CLASS_RGB,
  OKABE_ITO,
} from '../../web/src/map/colour-tile';
import { compileFilter, EMPTY_FILTER } from '../../web/src/filters/cell-filter';
import { rampColour } from '../../layers/screening/colour-ramps';
import { testManifest } from './web-test-manifest';

const bands = testManifest().bands;
const plane = (vals: number[]) => Float32Array.from(vals);

describe('tile colouring', () => {
  it('colours continuous values on the band ramp over the legend range, nodata transparent', () => {
    const planes = [plane([-10, 2, -4, NaN]), plane([0, 0, 0, 0]), plane([3, 3, 3, 3])];
    const rgba = colourTile(planes, {
      band: bands[0],
      bandIndex: 0,
      opacity: 1,
      filter: compileFilter(EMPTY_FILTER, bands),
    });
    expect(Array.from(rgba.slice(0, 4))).toEqual([...rampColour('blueOrange', 0, 0, 1), 255]);
    expect(Array.from(rgba.slice(4, 8))).toEqual([...rampColour('blueOrange', 1, 0, 1), 255]);
    expect(rgba[15]).toBe(0);
  });

  it('fades cells failing the filter and applies the opacity', () => {
    const planes = [plane([-8, -1]), plane([0, 0]), plane([3, 3])];
    const f = compileFilter({ ranges: [{ bandId: 'groundTemp', max: -5 }], excluded: [] }, bands);
    const rgba = colourTile(planes, { band: bands[0], bandIndex: 0, opacity: 0.5, filter: f });
    expect(rgba[3]).toBe(128);
    expect(Array.from(rgba.slice(4, 7))).toEqual(FADED_RGB);
    expect(rgba[7]).toBeLessThan(rgba[3]);
  });

  it('gives each class its own colour, none/excluded in neutral grey', () => {
    // The test band's classes: 0 excluded, 1 poor, 2 fair, 3 good.
    const unrampedClasses = { ...bands[2], ramp: undefined };
    const colours = classColours(unrampedClasses);
    expect(colours.get(0)).toEqual(NONE_CLASS_RGB);
    expect([1, 2, 3].map((v) => colours.get(v))).toEqual(OKABE_ITO.slice(0, 3));
    const planes = [plane([0]), plane([0]), plane([2])];
    const filter = compileFilter(EMPTY_FILTER, bands);
    const rgba = colourTile(planes, { band: unrampedClasses, bandIndex: 2, opacity: 1, filter });
    expect(Array.from(rgba.slice(0, 3))).toEqual(OKABE_ITO[1]);
    // With a ramp the ordinal classes run along it, ends included.
    const ramped = classColours({ ...bands[2], ramp: 'viridis' });
    expect(ramped.get(1)).toEqual(rampColour('viridis', 0, 0, 1));
    expect(ramped.get(3)).toEqual(rampColour('viridis', 1, 0, 1));
    // A nominal band without a "none" class uses the palette from its first class.
    const nominal = classColours({
      ...bands[2],
      ramp: undefined,
      classes: [
        { value: 0, label: 'gravel' },
        { value: 1, label: 'sand' },
      ],
    });
    expect(nominal.get(0)).toEqual(OKABE_ITO[0]);
  });
});

/** Straight alpha compositing of a colour over the base map (Porter & Duff 1984, "over"). */
const over = (c: readonly number[], a: number, base: readonly number[]) =>
  c.map((v, i) => a * v + (1 - a) * base[i]);
const distance = (p: readonly number[], q: readonly number[]) => Math.hypot(...p.map((v, i) => v - q[i]));
const rgbOf = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));

describe('filtered, no-data and excluded read apart (issue 18 item 4)', () => {
  const exclusion = {
    classes: [
      { value: 0, label: 'not excluded' },
      { value: 1, label: 'outside the data' },
      { value: 2, label: 'rock within the pile length' },
      { value: 3, label: 'no permafrost' },
    ],
  };
  const suitability = { classes: bands[2].classes };

  it('the exclusion layer paints "not excluded" apart from the grey of "excluded"', () => {
    const ex = classColours(exclusion);
    expect(ex.get(0)).toEqual(CLEAR_CLASS_RGB);
    expect(classColours(suitability).get(0)).toEqual(NONE_CLASS_RGB);
    // The reasons keep the palette from its first colour.
    expect([1, 2, 3].map((v) => ex.get(v))).toEqual(OKABE_ITO.slice(0, 3));
    // Absence words still read as absence.
    const frozen = classColours({
      classes: [
        { value: 0, label: 'not frozen' },
        { value: 1, label: 'warm' },
      ],
    });
    expect(frozen.get(0)).toEqual(NONE_CLASS_RGB);
  });

  it('at the default layer opacity, the veil, the land, the sea and the excluded grey are far apart', async () => {
    const { LAND_COLOUR, SEA_COLOUR } = await import('../../web/src/map/base-style');
    const opacity = 0.85; // the app's default layer opacity (app.tsx)
    const land = rgbOf(LAND_COLOUR);
    const sea = rgbOf(SEA_COLOUR);
    const veil = over(FADED_RGB, opacity * FADED_ALPHA, land);
    const excluded = over(NONE_CLASS_RGB, opacity, land);
    const clear = over(CLEAR_CLASS_RGB, opacity, land);
    // 40 in RGB is a design threshold for a map key (common practice), far above the just-noticeable
    // difference of about 2.3 ΔE (recalled from memory); the old veil (alpha 0.35) sat 25 from the sea.
    for (const [a, b] of [
      [veil, land],
      [veil, sea],
      [veil, excluded],
      [veil, clear],
      [excluded, land],
      [clear, land],
      [clear, excluded],
    ])
      expect(distance(a, b)).toBeGreaterThan(40);
  });
});

describe('hatching of places whose class is uncertain (ensemble builds)', () => {
  it('draws dark stripes over uncertain cells and fades their colour between the stripes', async () => {
    const { HATCH_RGB, HATCH_FILL_ALPHA, onHatchStripe } = await import('../../web/src/map/colour-tile');
    const size = 8;
    const n = size * size;
    const values = plane(Array.from({ length: n }, () => -4));
    // Robust class plane: 4 (uncertain) in the top half, 3 (good) in the bottom half.
    const robust = plane(Array.from({ length: n }, (_, k) => (k < n / 2 ? 4 : 3)));
    const planes = [values, plane(new Array(n).fill(0)), plane(new Array(n).fill(3)), robust];
    const style = {
      band: bands[0],
      bandIndex: 0,
      opacity: 1,
      filter: compileFilter(EMPTY_FILTER, bands),
      uncertainty: { bandIndex: 3, value: 4 },
    };
    const rgba = colourTile(planes, style);
    const plain = colourTile(planes, { ...style, uncertainty: null });
    let stripes = 0;
    for (let k = 0; k < n; k++) {
      const px = Array.from(rgba.slice(4 * k, 4 * k + 4));
      if (k >= n / 2) expect(px).toEqual(Array.from(plain.slice(4 * k, 4 * k + 4)));
      else if (onHatchStripe(k, size)) {
        expect(px).toEqual([...HATCH_RGB, 255]);
        stripes++;
      } else {
        expect(px.slice(0, 3)).toEqual(Array.from(plain.slice(4 * k, 4 * k + 3)));
        expect(px[3]).toBe(Math.round(255 * HATCH_FILL_ALPHA));
      }
    }
    // Stripes 2 of every 6 diagonals: about a third of the uncertain half.
    expect(stripes).toBeGreaterThan(n / 2 / 4);
    expect(stripes).toBeLessThan(n / 2 / 2);
  });
});
