/**
 * The recolouring kept per tile while the filters are edited (web/src/map/tile-recolour.ts) must give
 * the pixels of colourTile (colour-tile.ts, whose colours and veil are checked in colour-tile.test.ts
 * and filter-scope-veil.test.ts) byte for byte, through a sequence of edits like the planner's: bounds
 * typed one after another, a class left out, a condition removed, opacity, layer and hatching changed,
 * and in the compare view every filter scope, with the other scenario's tile present or absent. The
 * tile is an invented 32 x 32 one with nodata, values outside the legend range and an uncertain class.
 * Also checked here: the per-condition pass masks follow the filter's definition (cell-filter.ts).
 */
import { describe, expect, it } from 'vitest';
import { colourTile, FADED_RGB, type TileStyle } from '../../web/src/map/colour-tile';
import { TileRecolourer } from '../../web/src/map/tile-recolour';
import {
  compileFilter,
  conditionMask,
  EMPTY_FILTER,
  filterConditions,
  type FilterSpec,
} from '../../web/src/filters/cell-filter';
import { FILTER_SCOPES, scopedFilter } from '../../web/src/filters/both-scenarios';
import { testManifest } from './web-test-manifest';

const { bands } = testManifest();
const N = 32 * 32;

/** Deterministic pseudo-random numbers in [0, 1) (a linear congruential generator). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

/** Planes: ground temperature (-15..5 °C, some nodata), piles per ton, suitability class 0..3, robust class 3/4. */
function inventedTile(seed: number): Float32Array[] {
  const r = lcg(seed);
  const gt = Float32Array.from({ length: N }, () => (r() < 0.1 ? NaN : -15 + 20 * r()));
  const ppt = Float32Array.from({ length: N }, (_, k) => (Number.isNaN(gt[k]) ? NaN : 5 + 10 * r()));
  const cls = Float32Array.from({ length: N }, (_, k) =>
    Number.isNaN(gt[k]) || r() < 0.05 ? NaN : Math.floor(4 * r()),
  );
  const robust = Float32Array.from({ length: N }, () => (r() < 0.3 ? 4 : 3));
  return [gt, ppt, cls, robust];
}

const specs: FilterSpec[] = [
  EMPTY_FILTER,
  { ranges: [{ bandId: 'groundTemp', max: -10 }], excluded: [] },
  { ranges: [{ bandId: 'groundTemp', max: -7.5 }], excluded: [] },
  { ranges: [{ bandId: 'groundTemp', min: -12, max: -7.5 }], excluded: [] },
  {
    ranges: [{ bandId: 'groundTemp', min: -12, max: -7.5 }],
    excluded: [{ bandId: 'suitability', values: [0] }],
  },
  {
    ranges: [{ bandId: 'groundTemp', min: -12, max: -2 }],
    excluded: [{ bandId: 'suitability', values: [0] }],
  },
  {
    ranges: [
      { bandId: 'groundTemp', min: -12, max: -2 },
      { bandId: 'pilesPerTon', min: 8 },
    ],
    excluded: [{ bandId: 'suitability', values: [0, 1] }],
  },
  { ranges: [{ bandId: 'pilesPerTon', min: 8 }], excluded: [{ bandId: 'suitability', values: [0, 1] }] },
  { ranges: [], excluded: [{ bandId: 'suitability', values: [1, 0] }] },
  EMPTY_FILTER,
];

function expectSamePixels(got: Uint8ClampedArray, want: Uint8ClampedArray): void {
  expect(got.length).toBe(want.length);
  let differing = 0;
  for (let i = 0; i < want.length; i++) if (got[i] !== want[i]) differing++;
  expect(differing).toBe(0);
}

describe('recolouring a tile while the filters are edited', () => {
  it('gives the pixels of colourTile through a sequence of edits on one map', () => {
    const planes = inventedTile(1);
    const recolour = new TileRecolourer(planes);
    // One output buffer reused, as the map does: every byte must be written each time.
    const out = new Uint8ClampedArray(N * 4).fill(77);
    const looks: Omit<TileStyle, 'filter'>[] = [
      { band: bands[0], bandIndex: 0, opacity: 0.8 },
      { band: bands[0], bandIndex: 0, opacity: 0.5 },
      { band: bands[2], bandIndex: 2, opacity: 0.5 },
      { band: bands[2], bandIndex: 2, opacity: 0.5, uncertainty: { bandIndex: 3, value: 4 } },
    ];
    let veiled = 0;
    for (const look of looks)
      for (const spec of specs) {
        const style: TileStyle = { ...look, filter: compileFilter(spec, bands) };
        recolour.colour(style, out);
        expectSamePixels(out, colourTile(planes, style));
        for (let k = 0; k < N; k++) if (out[4 * k] === FADED_RGB[0] && out[4 * k + 3] > 0) veiled++;
      }
    // The sequence does veil cells (the comparison is not between two unfiltered tiles only).
    expect(veiled).toBeGreaterThan(1000);
  });

  it('gives the pixels of colourTile in the compare view, every scope, other tile present or absent', () => {
    const own = inventedTile(2);
    const other = inventedTile(3);
    for (const otherPlanes of [other, null]) {
      const recolour = new TileRecolourer(own, otherPlanes);
      const out = new Uint8ClampedArray(N * 4);
      for (const scope of FILTER_SCOPES)
        for (const side of ['shown', 'compared'] as const)
          for (const spec of specs) {
            const compiled = compileFilter(spec, bands);
            const f = scopedFilter(scope, side, compiled, compiled);
            const style: TileStyle = {
              band: bands[0],
              bandIndex: 0,
              opacity: 0.7,
              filter: f.own ?? compileFilter(EMPTY_FILTER, bands),
              otherFilter: f.other,
            };
            recolour.colour(style, out);
            expectSamePixels(out, colourTile(own, style, undefined, otherPlanes));
          }
    }
  });

  it('computes each condition pass mask by the filter definition (inclusive bounds, nodata fails)', () => {
    const planes = [
      Float32Array.from([-10, -5, -4.99, NaN, 3]),
      new Float32Array(5),
      Float32Array.from([0, 1, NaN, 2, 3]),
    ];
    const f = compileFilter(
      {
        ranges: [{ bandId: 'groundTemp', min: -10, max: -5 }],
        excluded: [{ bandId: 'suitability', values: [1, 3] }],
      },
      bands,
    );
    const [range, classes] = filterConditions(f);
    // min <= v <= max, bounds included (cell-filter.ts module comment); NaN is not in any range.
    expect(Array.from(conditionMask(range, planes, new Uint8Array(5)))).toEqual([1, 1, 0, 0, 0]);
    // Classes 1 and 3 left out; a cell without a class fails.
    expect(Array.from(conditionMask(classes, planes, new Uint8Array(5)))).toEqual([1, 0, 0, 1, 0]);
    // A condition's key changes with its bounds (an edited bound is computed again).
    const g = compileFilter({ ranges: [{ bandId: 'groundTemp', min: -10, max: -4 }], excluded: [] }, bands);
    expect(filterConditions(g)[0].key).not.toBe(range.key);
  });
});
