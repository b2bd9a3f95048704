/**
 * Distances for the proximity bands and radius filters (layers/screening/proximity.ts) against
 * textbook values.
 */
import { describe, expect, it } from 'vitest';
import {
  circleRing,
  EARTH_MEAN_RADIUS_km,
  haversine_km,
  nearestDistance_km,
  proximityFeatures,
  segmentDistance_km,
} from '../../layers/screening/proximity';

describe('haversine distance', () => {
  it('matches the classic worked example (Nashville BNA to Los Angeles LAX)', () => {
    // Rosetta Code, "Haversine formula" task (recalled from memory): (36.12 N, 86.67 W) to
    // (33.94 N, 118.40 W) with R = 6372.8 km gives 2887.2599506 km. Our radius is the IUGG mean
    // 6371.0088 km, so the distance scales by R.
    const d = haversine_km([-86.67, 36.12], [-118.4, 33.94]);
    expect(d * (6372.8 / EARTH_MEAN_RADIUS_km)).toBeCloseTo(2887.2599506, 4);
  });

  it('gives a degree of the equator and of a meridian as 2πR/360 (sphere geometry)', () => {
    const degree_km = (2 * Math.PI * EARTH_MEAN_RADIUS_km) / 360; // 111.19508 km
    expect(haversine_km([10, 0], [11, 0])).toBeCloseTo(degree_km, 6);
    expect(haversine_km([-3, 74], [-3, 75])).toBeCloseTo(degree_km, 6);
    // A degree of longitude at 60° N along the great circle is a bit shorter than cos(60°) of it.
    expect(haversine_km([0, 60], [1, 60])).toBeLessThan(degree_km / 2);
    expect(haversine_km([0, 60], [1, 60])).toBeGreaterThan(degree_km / 2 - 0.01);
  });
});

describe('distance to points and lines', () => {
  it('takes the perpendicular foot inside a segment and the end point beyond it', () => {
    const degree_km = (2 * Math.PI * EARTH_MEAN_RADIUS_km) / 360;
    // A meridian segment from 74 N to 76 N at 0 E; a place 0.1 degree of latitude-equivalent east of 75 N.
    const east = 0.1 / Math.cos((75 * Math.PI) / 180);
    expect(segmentDistance_km([east, 75], [0, 74], [0, 76])).toBeCloseTo(0.1 * degree_km, 1);
    expect(segmentDistance_km([0, 77], [0, 74], [0, 76])).toBeCloseTo(degree_km, 6);
    expect(segmentDistance_km([0, 75], [0, 74], [0, 76])).toBe(0);
  });

  it('finds the nearest of mixed GeoJSON geometries; none gives Infinity', () => {
    const f = proximityFeatures([
      { type: 'Point', coordinates: [5, 70] },
      {
        type: 'LineString',
        coordinates: [
          [0, 74],
          [0, 76],
        ],
      },
    ]);
    expect(f.points).toHaveLength(1);
    expect(f.segments).toHaveLength(1);
    expect(nearestDistance_km([0.01, 75], f)).toBeLessThan(0.5);
    expect(nearestDistance_km([5, 70], f)).toBe(0);
    expect(nearestDistance_km([0, 0], { points: [], segments: [] })).toBe(Infinity);
  });

  it('draws a radius circle whose every vertex lies at the radius', () => {
    const ring = circleRing([-3, 75], 25);
    expect(ring[0]).toEqual(ring[ring.length - 1]);
    for (const p of ring) expect(haversine_km([-3, 75], p)).toBeCloseTo(25, 2);
  });
});
