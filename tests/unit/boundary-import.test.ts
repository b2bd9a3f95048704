import { describe, expect, it } from 'vitest';
import { boundaryFromVertices, boundaryRings, parseBoundary } from '../../web/src/filters/boundary-import';

const ring = [
  [-3, 75],
  [-2, 75],
  [-2, 75.5],
  [-3, 75],
];

describe('boundary import', () => {
  it('accepts a bare Polygon, a Feature and a FeatureCollection', () => {
    const poly = { type: 'Polygon', coordinates: [ring] };
    expect(parseBoundary(poly).boundary?.geometry.type).toBe('Polygon');
    expect(parseBoundary({ type: 'Feature', properties: {}, geometry: poly }).boundary?.geometry.type).toBe(
      'Polygon',
    );
    const two = {
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: {}, geometry: poly },
        { type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [0, 0] } },
        { type: 'Feature', properties: {}, geometry: poly },
      ],
    };
    const b = parseBoundary(two).boundary;
    expect(b?.geometry.type).toBe('MultiPolygon');
    expect(boundaryRings(b!)).toHaveLength(2);
  });

  it('reports problems with their paths', () => {
    expect(
      parseBoundary({
        type: 'Polygon',
        coordinates: [
          [
            [0, 0],
            [1, 1],
          ],
        ],
      }).problems[0],
    ).toMatch(/^\(root\)\.coordinates\.0/);
    expect(parseBoundary({ type: 'FeatureCollection', features: [] }).problems[0]).toMatch(/no Polygon/);
    expect(
      parseBoundary({
        type: 'Polygon',
        coordinates: [
          [
            [0, 95],
            [1, 1],
            [2, 2],
            [0, 95],
          ],
        ],
      }).boundary,
    ).toBeNull();
  });

  it('closes drawn vertices and needs three of them', () => {
    expect(
      boundaryFromVertices([
        [0, 0],
        [1, 0],
      ]),
    ).toBeNull();
    const b = boundaryFromVertices([
      [0, 0],
      [1, 0],
      [1, 1],
    ]);
    expect(b?.geometry.coordinates).toEqual([
      [
        [0, 0],
        [1, 0],
        [1, 1],
        [0, 0],
      ],
    ]);
  });
});
