import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULT_SORT, formatUrlState, parseUrlState, type ViewState } from '../../web/src/state/url-state';
import { decodeRing, encodeRing } from '../../web/src/state/polyline-code';

const defaults: ViewState = {
  center: [-3, 75],
  zoom: 6,
  layer: 'suitability',
  units: 'SI',
  opacity: 0.85,
  filter: { ranges: [], excluded: [] },
  boundary: null,
  selection: null,
  sort: DEFAULT_SORT,
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
      boundary: {
        name: 'the drawn shape',
        polygons: [
          [
            [
              [-3, 74],
              [-2, 74],
              [-2, 75],
              [-3, 74],
            ],
          ],
          [
            [
              [1.12345, 70.5],
              [1.5, 70.5],
              [1.5, 71.25],
              [1.12345, 70.5],
            ],
          ],
        ],
      },
      selection: [-2.61234, 74.80001],
      sort: { key: 'band:groundTemp', direction: 'desc' },
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

  it('names each bad part in plain words and keeps the good parts', () => {
    for (const [q, pattern] of [
      ['?z=banana', /zoom “banana” should be a number from 0 to 22/],
      ['?c=200,10', /map centre “200,10” should be longitude,latitude/],
      ['?layer=nope', /layer “nope” is not in this map's data/],
      ['?units=imperial', /units “imperial” should be SI or NA/],
      ['?opacity=2', /opacity “2” should be a number from 0 to 1/],
      ['?f=groundTemp:3:1', /minimum 3 above its maximum 1/],
      ['?f=groundTemp:x:1', /filter “groundTemp:x:1” should read layer:minimum:maximum/],
      ['?x=suitability:a', /class filter “suitability:a” should read/],
      ['?b=_p~iF~ps|U', /boundary in the link is damaged/],
      ['?sel=1,2,3', /selected place “1,2,3”/],
      ['?sort=band:nope:desc', /shortlist sort “band:nope:desc”/],
    ] as const) {
      const { state, problems } = parseUrlState(`${q}&units=NA`, defaults, bandIds);
      expect(problems, q).toHaveLength(1);
      expect(problems[0], q).toMatch(pattern);
      // No internal path syntax or validator wording.
      expect(problems[0], q).not.toMatch(/\(url\)|Invalid|Expected|\.\d+:/);
      if (q !== '?units=imperial') expect(state.units, q).toBe('NA');
    }
    const { state, problems } = parseUrlState('?z=banana&layer=nope&c=1,70', defaults, bandIds);
    expect(problems).toHaveLength(2);
    expect(state.center).toEqual([1, 70]);
    expect(state.zoom).toBe(defaults.zoom);
    expect(state.layer).toBe(defaults.layer);
  });

  it('encodes rings as the published polyline example', () => {
    // Google's Encoded Polyline Algorithm Format page, worked example (lat, lon), recalled from memory
    // (the encoder reproducing it is the independent check):
    // (38.5, -120.2), (40.7, -120.95), (43.252, -126.453) -> "_p~iF~ps|U_ulLnnqC_mqNvxq`@".
    const ring: [number, number][] = [
      [-120.2, 38.5],
      [-120.95, 40.7],
      [-126.453, 43.252],
    ];
    expect(encodeRing(ring)).toBe('_p~iF~ps|U_ulLnnqC_mqNvxq`@');
    expect(decodeRing('_p~iF~ps|U_ulLnnqC_mqNvxq`@')).toEqual(ring);
    expect(() => decodeRing('_p~iF~ps|')).toThrow(/cut short/);
  });

  it('ignores parameters it does not own', () => {
    expect(parseUrlState('?utm_source=mail&z=5', defaults, bandIds).state.zoom).toBe(5);
  });
});
