/**
 * Per-cell model fuzz (issue 16 items 4 and 7): seeded cells drawn from everything the pipeline accepts
 * (the plausible ranges of data-pipeline/inputs-config.ts GRID_ROLES, optional grids present or absent),
 * run through the kernel the build uses. Every cell must give finite, physically bounded results or be
 * excluded with a reason code: no NaN where a value is defined, no infinity, temperatures within the
 * range the surface forcing allows, shares in [0, 1], counts positive, thaw years inside
 * [start year, climate horizon]. 2,000 cells here; `npm run bench -- cell-fuzz` runs 10,000.
 */
import { describe, it, expect } from 'vitest';
import { fuzzCells, checkCell } from '../../bench/cell-fuzz';

describe('per-cell model fuzz over the accepted input ranges', () => {
  it('2,000 seeded cells: no crash, no NaN or infinity, every figure within its physical bounds', () => {
    const { cells, crashes, violations } = fuzzCells(2000, 20261202, checkCell);
    expect(cells).toBe(2000);
    expect(crashes, crashes.slice(0, 3).join('\n')).toEqual([]);
    expect(violations, violations.slice(0, 3).join('\n')).toEqual([]);
  }, 120_000);
  it('the checks can fail: a NaN pile count or a share above 1 is reported', () => {
    const bad = new Float64Array(64).fill(0);
    const problems = checkCell(
      {
        meanAirTemp_C: -5,
        airAmplitude_C: 15,
        warming_C_per_yr: 0.05,
        textureClass: 2,
        waterContent_m3m3: 0.2,
        bedrockDepth_m: 40,
        groundTemp_C: NaN,
        geothermalFlux_W_m2: NaN,
        nFreeze: NaN,
        latitude_deg: NaN,
      },
      bad.map((_, i) => (i === 0 ? 1 : NaN)),
    );
    expect(problems.length).toBeGreaterThan(0);
  });
});
