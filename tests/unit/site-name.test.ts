import { describe, expect, it } from 'vitest';
import type { FeatureCollection } from 'geojson';
import { bearing_deg, defaultSiteName } from '../../web/src/shortlist/site-name';

const towns: FeatureCollection = {
  type: 'FeatureCollection',
  features: [
    { type: 'Feature', properties: { name: 'Northby' }, geometry: { type: 'Point', coordinates: [0, 75] } },
    { type: 'Feature', properties: { name: 'Southby' }, geometry: { type: 'Point', coordinates: [0, 74] } },
  ],
};

describe('default site names', () => {
  it('names the nearest settlement, the distance and the direction', () => {
    // 0.1° of latitude north of Northby ≈ 11.1 km (2π·6371 km / 3600, computed).
    expect(defaultSiteName(0, 75.1, towns, 2)).toBe('Site 2, 11 km N of Northby');
    expect(defaultSiteName(0.5, 74.1, towns, 3)).toMatch(/^Site 3, \d+ km (E|NE) of Southby$/);
    expect(defaultSiteName(0.001, 75, towns, 1)).toBe('Site 1, at Northby');
    expect(defaultSiteName(0, 75, null, 4)).toBe('Site 4');
  });

  it('gives the distance in miles in North American units', () => {
    // 0.3° of latitude ≈ 33.36 km (2π·6371 km · 0.3/360, computed) = 20.7 international miles
    // (1 mi = 1609.344 m exactly).
    expect(defaultSiteName(0, 75.3, towns, 5, 'NA')).toBe('Site 5, 21 mi N of Northby');
    expect(defaultSiteName(0, 75.3, towns, 5, 'SI')).toBe('Site 5, 33 km N of Northby');
  });

  it('computes compass bearings', () => {
    // Due east along the equator is 90°, due north 0°, due west 270° (spherical trigonometry).
    expect(bearing_deg([0, 0], [1, 0])).toBeCloseTo(90, 9);
    expect(bearing_deg([0, 0], [0, 1])).toBeCloseTo(0, 9);
    expect(bearing_deg([0, 0], [-1, 0])).toBeCloseTo(270, 9);
  });
});
