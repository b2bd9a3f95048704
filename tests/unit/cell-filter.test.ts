import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cellPasses, compileFilter, EMPTY_FILTER, passesAt } from '../../web/src/filters/cell-filter';
import { testManifest } from './web-test-manifest';

const bands = testManifest().bands; // groundTemp, pilesPerTon, suitability

describe('cell filter', () => {
  it('is inactive without bounds and passes everything', () => {
    const f = compileFilter(EMPTY_FILTER, bands);
    expect(f.active).toBe(false);
    expect(cellPasses(f, [NaN, NaN, NaN])).toBe(true);
    const open = compileFilter(
      { ranges: [{ bandId: 'groundTemp' }], excluded: [{ bandId: 'suitability', values: [] }] },
      bands,
    );
    expect(open.active).toBe(false);
  });

  it('applies inclusive min and max bounds in SI', () => {
    const f = compileFilter({ ranges: [{ bandId: 'groundTemp', min: -5, max: -2 }], excluded: [] }, bands);
    expect(cellPasses(f, [-5, 0, 3])).toBe(true);
    expect(cellPasses(f, [-2, 0, 3])).toBe(true);
    expect(cellPasses(f, [-1.99, 0, 3])).toBe(false);
    expect(cellPasses(f, [-5.01, 0, 3])).toBe(false);
  });

  it('fails cells with no data in a filtered band, and excluded classes', () => {
    const f = compileFilter(
      { ranges: [{ bandId: 'pilesPerTon', max: 20 }], excluded: [{ bandId: 'suitability', values: [0, 1] }] },
      bands,
    );
    expect(cellPasses(f, [0, NaN, 3])).toBe(false);
    expect(cellPasses(f, [0, 10, 1])).toBe(false);
    expect(cellPasses(f, [0, 10, NaN])).toBe(false);
    expect(cellPasses(f, [NaN, 10, 2])).toBe(true); // groundTemp not filtered
  });

  it('ignores bands the build does not have', () => {
    const f = compileFilter(
      { ranges: [{ bandId: 'nope', min: 1 }], excluded: [{ bandId: 'gone', values: [1] }] },
      bands,
    );
    expect(f.active).toBe(false);
  });

  it('band-planar and per-cell tests agree (property)', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.double({ min: -12, max: 4, noNaN: true }),
            fc.double({ min: 0, max: 50, noNaN: true }),
            fc.integer({ min: 0, max: 3 }),
          ),
          { minLength: 1, maxLength: 30 },
        ),
        fc.double({ min: -12, max: 4, noNaN: true }),
        fc.integer({ min: 0, max: 3 }),
        (cells, tMax, excludedClass) => {
          const f = compileFilter(
            {
              ranges: [{ bandId: 'groundTemp', max: tMax }],
              excluded: [{ bandId: 'suitability', values: [excludedClass] }],
            },
            bands,
          );
          const planes = [0, 1, 2].map((b) => Float32Array.from(cells.map((c) => c[b])));
          return cells.every(
            (_, k) => passesAt(f, planes, k) === cellPasses(f, [planes[0][k], planes[1][k], planes[2][k]]),
          );
        },
      ),
      { seed: 7 },
    );
  });
});
