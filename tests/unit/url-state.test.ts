import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatUrlState, parseUrlState, type ViewState } from '../../web/src/state/url-state';

const defaults: ViewState = {
  center: [-3, 75],
  zoom: 6,
  layer: 'suitability',
  units: 'SI',
  opacity: 0.85,
  filter: { ranges: [], excluded: [] },
};
const bandIds = ['suitability', 'groundTemp', 'pilesPerTon'];

describe('URL state', () => {
  it('round-trips view, layer, units, opacity and filters', () => {
    const s: ViewState = {
      center: [-2.5, 74.75],
      zoom: 7.5,
      layer: 'groundTemp',
      units: 'NA',
      opacity: 0.6,
      filter: {
        ranges: [
          { bandId: 'groundTemp', min: -8, max: -2.5 },
          { bandId: 'pilesPerTon', max: 12 },
        ],
        excluded: [{ bandId: 'suitability', values: [0, 1] }],
      },
    };
    const { state, problems } = parseUrlState(`?${formatUrlState(s)}`, defaults, bandIds);
    expect(problems).toEqual([]);
    expect(state).toEqual({
      ...s,
      filter: {
        ...s.filter,
        ranges: [s.filter.ranges[0], { bandId: 'pilesPerTon', min: undefined, max: 12 }],
      },
    });
  });

  it('round-trips random states (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.double({ min: -85, max: 85, noNaN: true }),
        fc.double({ min: 0, max: 22, noNaN: true }),
        fc.double({ min: -1e4, max: 1e4, noNaN: true }),
        (lon, lat, zoom, lo) => {
          const s: ViewState = {
            ...defaults,
            center: [lon, lat],
            zoom,
            filter: { ranges: [{ bandId: 'groundTemp', min: lo, max: lo + 1 }], excluded: [] },
          };
          const { state, problems } = parseUrlState(formatUrlState(s), defaults, bandIds);
          return (
            problems.length === 0 &&
            Math.abs(state.center[0] - lon) <= 5e-5 &&
            Math.abs(state.center[1] - lat) <= 5e-5 &&
            Math.abs(state.zoom - zoom) <= 5e-3 &&
            Math.abs((state.filter.ranges[0].min ?? NaN) - lo) <= 1e-6 * Math.max(1, Math.abs(lo))
          );
        },
      ),
      { seed: 11 },
    );
  });

  it('uses the defaults when the URL is empty', () => {
    expect(parseUrlState('', defaults, bandIds)).toEqual({ state: defaults, problems: [] });
  });

  it('falls back to the defaults, with the reasons, on any invalid part', () => {
    for (const [q, pattern] of [
      ['?z=banana', /^z: /],
      ['?c=200,10', /^c/],
      ['?layer=nope', /layer: no band "nope"/],
      ['?units=imperial', /^units/],
      ['?opacity=2', /^opacity/],
      ['?f=groundTemp:3:1', /minimum 3 > maximum 1/],
      ['?f=groundTemp:x:1', /^f/],
      ['?x=suitability:a', /^x/],
    ] as const) {
      const { state, problems } = parseUrlState(q, defaults, bandIds);
      expect(state, q).toBe(defaults);
      expect(problems.length, q).toBeGreaterThan(0);
      expect(problems.join('; '), q).toMatch(pattern);
    }
  });

  it('ignores parameters it does not own', () => {
    expect(parseUrlState('?utm_source=mail&z=5', defaults, bandIds).state.zoom).toBe(5);
  });
});
