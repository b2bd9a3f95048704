/**
 * Boundary import (web/src/filters/boundary-import.ts): the GeoJSON shapes accepted, and each check
 * of issue 21 item 1 (closed rings, orientation, self-crossing, finite coordinates, crs member). Check
 * values are hand computations on small shapes; the rules are RFC 7946 sections 3.1.6 and 4.
 */
import { describe, expect, it } from 'vitest';
import { parseBoundary, polygonFromVertices } from '../../web/src/filters/boundary-import';
import { ringSignedArea2, unflattenPolygons } from '../../web/src/geometry/flat-rings';

const ring = [
  [-3, 75],
  [-2, 75],
  [-2, 75.5],
  [-3, 75],
];
const square = (x0: number, y0: number, d: number) => [
  [x0, y0],
  [x0 + d, y0],
  [x0 + d, y0 + d],
  [x0, y0 + d],
  [x0, y0],
];

describe('boundary import: accepted shapes', () => {
  it('accepts a bare Polygon, a Feature and a FeatureCollection (polygons merged)', () => {
    const poly = { type: 'Polygon', coordinates: [ring] };
    expect(parseBoundary(poly).boundary?.polygons).toBe(1);
    expect(parseBoundary({ type: 'Feature', properties: {}, geometry: poly }).boundary?.polygons).toBe(1);
    const two = {
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: {}, geometry: poly },
        { type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [0, 0] } },
        { type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [square(0, 0, 1)] } },
      ],
    };
    const b = parseBoundary(two).boundary;
    expect(b?.polygons).toBe(2);
    // Triangle (3 corners) + square (4 corners).
    expect(b?.vertices).toBe(7);
  });

  it('accepts a crs member naming OGC CRS84, at the root or on a feature', () => {
    const crs = { type: 'name', properties: { name: 'urn:ogc:def:crs:OGC:1.3:CRS84' } };
    expect(parseBoundary({ type: 'Polygon', coordinates: [ring], crs }).boundary).not.toBeNull();
    expect(
      parseBoundary({
        type: 'Feature',
        crs,
        properties: {},
        geometry: { type: 'Polygon', coordinates: [ring] },
      }).boundary,
    ).not.toBeNull();
  });

  it('drops repeated consecutive positions', () => {
    const b = parseBoundary({
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [1, 0],
          [1, 0],
          [1, 1],
          [0, 1],
          [0, 0],
        ],
      ],
    }).boundary;
    expect(b?.vertices).toBe(4);
  });

  it('rewinds rings to the RFC 7946 orientation and says so', () => {
    // Clockwise exterior (0,0) -> (0,1) -> (1,1) -> (1,0): signed area -1 (x2 = -2), so it is reversed;
    // the hole given counter-clockwise (+0.25 x2 = 0.5) is reversed too.
    const cw = [
      [0, 0],
      [0, 1],
      [1, 1],
      [1, 0],
      [0, 0],
    ];
    const hole = square(0.25, 0.25, 0.5);
    const b = parseBoundary({ type: 'Polygon', coordinates: [cw, hole] }).boundary;
    expect(b).not.toBeNull();
    expect(ringSignedArea2(b!.rings, 0)).toBeCloseTo(2, 12);
    expect(ringSignedArea2(b!.rings, 1)).toBeCloseTo(-0.5, 12);
    expect(b!.notes.join(' ')).toMatch(/2 ring\(s\) rewound/);
    expect(unflattenPolygons(b!.rings)[0][0]).toEqual([...cw].reverse());
  });
});

describe('boundary import: refused shapes, with paths', () => {
  it('reports bad structure with its path', () => {
    const r = parseBoundary({
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [1, 1],
        ],
      ],
    });
    expect(r.boundary).toBeNull();
    expect(r.problems[0]).toMatch(/^\(root\)\.coordinates\.0: a ring needs at least 4 positions/);
    expect(parseBoundary({ type: 'FeatureCollection', features: [] }).problems[0]).toMatch(/no Polygon/);
  });

  it('refuses a ring that is not closed, naming both end positions', () => {
    const open = [
      [0, 0],
      [1, 0],
      [1, 1],
      [0, 1],
    ];
    const r = parseBoundary({
      type: 'Feature',
      properties: {},
      geometry: { type: 'Polygon', coordinates: [open] },
    });
    expect(r.boundary).toBeNull();
    expect(r.problems[0]).toBe(
      'geometry.coordinates.0: the ring is not closed: its last position [0, 1] must repeat its first [0, 0] (RFC 7946 section 3.1.6)',
    );
  });

  it('refuses coordinates that are not finite or out of range', () => {
    // JSON.parse turns 1e999 into Infinity.
    const parsed = JSON.parse('{"type":"Polygon","coordinates":[[[0,0],[1e999,0],[1,1],[0,0]]]}');
    expect(parseBoundary(parsed).problems[0]).toMatch(
      /coordinates\.0\.1\.0: longitude must be a finite number .* got Infinity/,
    );
    const lat = parseBoundary({
      type: 'Polygon',
      coordinates: [
        [
          [0, 95],
          [1, 1],
          [2, 2],
          [0, 95],
        ],
      ],
    });
    expect(lat.boundary).toBeNull();
    expect(lat.problems[0]).toMatch(/coordinates\.0\.0\.1: latitude .* got 95/);
    expect(lat.problems).toHaveLength(2);
  });

  it('lists at most eight problems and counts the rest', () => {
    const bad = Array.from({ length: 20 }, (_, i) => [200 + i, 0]);
    const r = parseBoundary({ type: 'Polygon', coordinates: [[...bad, bad[0]]] });
    expect(r.problems).toHaveLength(9);
    expect(r.problems[8]).toBe('… and 13 more problem(s)');
  });

  it('refuses any crs other than CRS84, saying what to do', () => {
    const polar = { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::3413' } };
    const r = parseBoundary({
      type: 'FeatureCollection',
      crs: polar,
      features: [{ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [ring] } }],
    });
    expect(r.boundary).toBeNull();
    expect(r.problems[0]).toMatch(
      /^crs: coordinate reference system "urn:ogc:def:crs:EPSG::3413" is not supported; .*WGS 84/,
    );
    const linked = parseBoundary({
      type: 'Polygon',
      coordinates: [ring],
      crs: { type: 'link', properties: { href: 'x' } },
    });
    expect(linked.problems).toEqual([
      expect.stringMatching(/^crs: coordinate reference system of type "link"/),
    ]);
  });

  it('refuses a self-crossing ring and says where it crosses', () => {
    // Bow tie: edge (0,0)-(2,2) crosses edge (2,0)-(0,2) at (1,1) (hand computation).
    const r = parseBoundary({
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [2, 2],
          [2, 0],
          [0, 2],
          [0, 0],
        ],
      ],
    });
    expect(r.boundary).toBeNull();
    expect(r.problems[0]).toMatch(
      /^\(root\)\.coordinates\.0: the ring crosses itself near lon 1\.00000, lat 1\.00000 \(edges 0 and 2\)/,
    );
  });

  it('refuses a hole that crosses its exterior', () => {
    const r = parseBoundary({ type: 'MultiPolygon', coordinates: [[square(0, 0, 2), square(1, 1, 2)]] });
    expect(r.problems[0]).toMatch(/coordinates\.0\.0 and .*coordinates\.0\.1: the rings cross/);
  });
});

describe('drawn shapes', () => {
  it('closes drawn vertices and needs three of them', () => {
    expect(
      polygonFromVertices([
        [0, 0],
        [1, 0],
      ]),
    ).toBeNull();
    expect(
      polygonFromVertices([
        [0, 0],
        [1, 0],
        [1, 1],
      ])?.coordinates,
    ).toEqual([
      [
        [0, 0],
        [1, 0],
        [1, 1],
        [0, 0],
      ],
    ]);
  });
});
