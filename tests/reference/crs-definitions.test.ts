/**
 * Our proj4 definition strings (data-pipeline/crs/crs-definitions.ts) against published coordinates.
 *
 * Source of the check points: the coordinate-transform test suite of Proj4J (Java port of PROJ,
 * `CoordinateTransformTest`), whose expected values were produced with PROJ: EPSG:3573 (North Pole
 * LAEA Canada), EPSG:3031 (Antarctic polar stereographic, latitude of true scale 71° S), UTM zones 15N
 * and 12N, and Web Mercator (EPSG:3785, identical to 3857).
 *
 * EPSG:3995 (Arctic polar stereographic, true scale at 71° N, WGS 84) is the mirror image of EPSG:3031
 * (true scale at 71° S, WGS 84): the polar stereographic formulas (Snyder 1987, "Map Projections — A
 * Working Manual", eqs. 21-33 to 21-35 and the south-pole variant after eq. 21-41) give, for the north
 * pole, x = ρ sin(λ − λ0), y = −ρ cos(λ − λ0), and for the south pole x = ρ sin(λ − λ0),
 * y = ρ cos(λ − λ0), with the same ρ(|φ|). So (λ, −φ) -> (x, y) in 3031 means (λ, φ) -> (x, −y) in 3995.
 */
import { describe, expect, it } from 'vitest';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';

const cases: { crs: string; lon: number; lat: number; x: number; y: number; why: string }[] = [
  {
    crs: 'EPSG:3573',
    lon: 9.84375,
    lat: 61.875,
    x: 2923052.02009,
    y: 1054885.46559,
    why: 'Proj4J CoordinateTransformTest.testLambertAzimuthalEqualArea (PROJ values)',
  },
  {
    crs: 'EPSG:3995',
    lon: 0,
    lat: 75,
    x: 0,
    y: -1638783.238407,
    why: 'Proj4J testStereographicAzimuthal, EPSG:3031 (0°, 75° S) mirrored to the north',
  },
  {
    crs: 'EPSG:3995',
    lon: -57.65625,
    lat: 79.21875,
    x: -992481.633786,
    y: -628482.06328,
    why: 'Proj4J testStereographicAzimuthal, EPSG:3031 (57.65625° W, 79.21875° S) mirrored',
  },
  {
    crs: 'EPSG:32615',
    lon: -93,
    lat: 42,
    x: 500000,
    y: 4649776.22482,
    why: 'Proj4J testUTM (PROJ values)',
  },
  {
    crs: 'EPSG:32612',
    lon: -113.109375,
    lat: 60.28125,
    x: 383357.429537,
    y: 6684599.06392,
    why: 'Proj4J testUTM (PROJ values)',
  },
  {
    crs: 'EPSG:3857',
    lon: -76.640625,
    lat: 49.921875,
    x: -8531595.34908,
    y: 6432756.94421,
    why: 'Proj4J testMercator, EPSG:3785 (PROJ values)',
  },
];

describe('CRS definitions against published coordinates', () => {
  for (const c of cases) {
    it(`${c.crs}: (${c.lon}, ${c.lat}) -> (${c.x}, ${c.y}) [${c.why}]`, () => {
      const [x, y] = createTransform('EPSG:4326', c.crs)(c.lon, c.lat);
      // Published to 1 mm or better; allow 1 cm for floating-point differences between implementations.
      expect(Math.abs(x - c.x)).toBeLessThan(0.01);
      expect(Math.abs(y - c.y)).toBeLessThan(0.01);
      const [lon, lat] = createTransform(c.crs, 'EPSG:4326')(c.x, c.y);
      expect(Math.abs(lon - c.lon)).toBeLessThan(1e-7);
      expect(Math.abs(lat - c.lat)).toBeLessThan(1e-7);
    });
  }

  it('EPSG:3413 has true scale at 70° N and the pole at the origin (definition of the CRS)', () => {
    const f = createTransform('EPSG:4326', 'EPSG:3413');
    const [px, py] = f(-45, 90);
    expect(Math.hypot(px, py)).toBeLessThan(1e-6);
    // Along the central meridian (45° W, pointing down the y axis), the grid distance for a small
    // step in latitude equals the ellipsoid's meridian arc at 70° N: scale factor 1.
    const a = 6378137;
    const e2 = 0.00669437999014; // WGS 84 (NIMA TR8350.2)
    const phi = (70 * Math.PI) / 180;
    const M = (a * (1 - e2)) / Math.pow(1 - e2 * Math.sin(phi) ** 2, 1.5); // meridian radius
    const dLat = 1e-4;
    const [, y1] = f(-45, 70 - dLat / 2);
    const [, y2] = f(-45, 70 + dLat / 2);
    const k = Math.abs(y2 - y1) / ((M * dLat * Math.PI) / 180);
    expect(Math.abs(k - 1)).toBeLessThan(1e-6);
  });
});
