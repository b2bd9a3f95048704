/**
 * The calibration bands the site study shows (layers/screening/calibration-bands.ts) are the P95 bounds
 * the calibration test enforces (tests/unit/screening-calibration-bounds.ts, README "Calibration"): one
 * set of figures, so the study cannot claim a band the calibration does not hold.
 */
import { describe, expect, it } from 'vitest';
import { CALIBRATION_BANDS, withinBand } from '../../layers/screening/calibration-bands';
import { BOUNDS } from './screening-calibration-bounds';

describe('calibration bands of the site study', () => {
  it('equal the enforced P95 bounds, quantity by quantity', () => {
    expect(CALIBRATION_BANDS.groundTemp).toMatchObject({ kind: 'absolute', value: BOUNDS.groundPile_K.p95 });
    expect(CALIBRATION_BANDS.activeLayer).toMatchObject({
      kind: 'relative',
      value: BOUNDS.activeLayer_rel.p95,
    });
    expect(CALIBRATION_BANDS.heatPerPile).toMatchObject({
      kind: 'relative',
      value: BOUNDS.heatCarried_rel.p95,
    });
    expect(CALIBRATION_BANDS.pileCount).toMatchObject({
      kind: 'relative',
      value: BOUNDS.pilesPerTon_rel.p95,
    });
    expect(CALIBRATION_BANDS.loadShare).toMatchObject({ kind: 'absolute', value: BOUNDS.loadShare_abs.p95 });
    expect(CALIBRATION_BANDS.noPileThaw).toMatchObject({ kind: 'absolute', value: BOUNDS.noPileThaw_yr.p95 });
  });

  it('reads a band as |quick − simulated| ≤ bound (absolute) or ≤ bound × |simulated| (relative)', () => {
    expect(withinBand({ kind: 'absolute', value: 0.12, source: '' }, -1.0, -1.12)).toBe(true);
    expect(withinBand({ kind: 'absolute', value: 0.12, source: '' }, -1.0, -1.13)).toBe(false);
    expect(withinBand({ kind: 'relative', value: 0.1, source: '' }, 110, 100)).toBe(true);
    expect(withinBand({ kind: 'relative', value: 0.1, source: '' }, 111, 100)).toBe(false);
  });
});
