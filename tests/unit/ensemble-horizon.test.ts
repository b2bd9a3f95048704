/**
 * The ensemble's thaw-delay percentiles past the climate horizon (issue 14; climate-horizon.ts,
 * cell-ensemble-model.ts): a member whose thaw with piles comes after the horizon holds a capped delay,
 * so a percentile it reaches is a lower bound, flagged in `thawDelayRangeBound` and read "≥ value" in
 * the range text, the class card's ranges and the export's qualifier columns.
 */
import { describe, expect, it } from 'vitest';
import { percentileIsLowerBound, percentileOf } from '../../layers/screening/ensemble-statistics';
import { horizonText, RANGE_BOUND_LABELS, rangeBoundFlags } from '../../layers/screening/climate-horizon';
import { createEnsembleModel } from '../../layers/screening/cell-ensemble-model';
import { parseCellInputs } from '../../layers/screening/cell-screening-model';
import { exportRecord } from '../../layers/screening/export-schema';
import type { Band, Manifest } from '../../layers/screening/manifest';
import { rangeText } from '../../web/src/panels/ensemble-ranges';

// A warm silt cell of the demo's range: deterministic thaw 2099 without and 2195 with the piles
// (horizon 2500; computed by the per-cell model itself, used here only to place the horizon).
const cell = parseCellInputs({
  meanAirTemp_C: -3,
  airAmplitude_C: 18,
  warming_C_per_yr: 0.06,
  textureClass: 'silt',
  waterContent_m3m3: 0.38,
  bedrockDepth_m: 18,
  geothermalFlux_W_m2: 0.06,
  nFreeze: 0.5,
  latitude_deg: 75.2,
});

function evaluateAt(horizonYear: number) {
  const model = createEnsembleModel({ scenario: { climateHorizonYear: horizonYear } });
  const out = new Float32Array(model.layers.length);
  model.evaluate(cell, out, 11);
  const value = (id: string) => out[model.layers.findIndex((l) => l.id === id)];
  return { model, value };
}

describe('percentileIsLowerBound (Hyndman & Fan 1996 definition 7; order statistics)', () => {
  const scratch = new Float64Array(8);
  // Analytical: raising a value never lowers an order statistic; it changes percentile p only when it
  // sits at or below the highest order statistic with a weight in the interpolation.
  it('flags a percentile that a bounded member reaches, and only that', () => {
    const v = [1, 2, 3, 4, 5];
    const top = [false, false, false, false, true];
    // h = 4 · 0.1 = 0.4: interpolated from the 1st and 2nd values (1, 2); 5 lies above both.
    expect(percentileIsLowerBound(v, top, 5, 0.1, scratch)).toBe(false);
    // h = 4 · 0.9 = 3.6: from the 4th and 5th values; the bounded 5 is one of them.
    expect(percentileIsLowerBound(v, top, 5, 0.9, scratch)).toBe(true);
    expect(percentileIsLowerBound(v, [true, false, false, false, false], 5, 0.1, scratch)).toBe(true);
    expect(percentileIsLowerBound(v, [false, false, false, false, false], 5, 0.9, scratch)).toBe(false);
    // h = 2 · 0.5 = 1 exactly: only the 2nd value has a weight; the bounded 3rd does not reach it.
    expect(percentileIsLowerBound([1, 2, 3], [false, false, true], 3, 0.5, scratch)).toBe(false);
    expect(percentileIsLowerBound([1, 2, 3], [false, true, false], 3, 0.5, scratch)).toBe(true);
  });

  it('agrees with recomputing the percentile with the bounded values raised', () => {
    // Seeded values; a bounded member raised by 100 moves the percentile exactly when flagged.
    const scratch2 = new Float64Array(32);
    let moved = 0;
    for (let trial = 0; trial < 200; trial++) {
      const n = 5 + (trial % 20);
      const v = Array.from({ length: n }, (_, i) => ((i * 7919 + trial * 104729) % 997) / 10);
      const bound = v.map((_, i) => (i * 31 + trial) % 7 === 0);
      const raised = v.map((x, i) => (bound[i] ? x + 100 : x));
      for (const p of [0.1, 0.5, 0.9]) {
        const changed = percentileOf(raised, n, p, scratch2) !== percentileOf(v, n, p, scratch2);
        const flagged = percentileIsLowerBound(v, bound, n, p, scratch2);
        // Flagged whenever it moves (never "exact" when it is not); when flagged it moves unless a tie.
        if (changed) expect(flagged).toBe(true);
        if (changed) moved++;
      }
    }
    expect(moved).toBeGreaterThan(50);
  });
});

describe('thaw-delay percentiles past the climate horizon', () => {
  it('declares P90, P50 and P10 bounded from the top down', () => {
    expect(rangeBoundFlags('P90')).toEqual([1, 2, 3]);
    expect(rangeBoundFlags('P50')).toEqual([2, 3]);
    expect(rangeBoundFlags('P10')).toEqual([3]);
    const { model } = evaluateAt(2150);
    const layer = (id: string) => model.layers.find((l) => l.id === id)!;
    expect(layer('thawDelayP90').horizon).toMatchObject({ year: 2150, flagBand: 'thawDelayRangeBound' });
    expect(layer('thawDelayP10').horizon?.atLeast).toEqual([3]);
    expect(layer('thawDelayRangeBound').classes?.map((c) => c.label)).toEqual(
      Object.values(RANGE_BOUND_LABELS),
    );
    // No other ranged metric is bounded by the horizon.
    expect(layer('pilesPerTonP90').horizon).toBeUndefined();
  });

  it('is 0 with a horizon far beyond every thaw, and flags the top percentiles near it', () => {
    const far = evaluateAt(2500);
    expect(far.value('thawDelayRangeBound')).toBe(0);
    // Horizon at the deterministic thaw with piles (2195): the members with less warming thaw later.
    const near = evaluateAt(2195);
    const flag = near.value('thawDelayRangeBound');
    expect(flag).toBeGreaterThanOrEqual(1);
    // Never a delay past the horizon: every member's delay is capped there (start year 2025).
    expect(near.value('thawDelayP90')).toBeLessThanOrEqual(2195 - 2025);
    expect(near.value('thawDelayP90')).toBeLessThan(far.value('thawDelayP90'));
    const nearer = evaluateAt(2150);
    expect(nearer.value('thawDelayRangeBound')).toBeGreaterThanOrEqual(flag);
  });

  it('reads "≥ value" in the range text and the export qualifier columns, never a plain number', () => {
    const { model, value } = evaluateAt(2195);
    const bands = model.layers.map((l) => ({ ...l, min: 0, max: 1, unit: l.unit }) as unknown as Band);
    const manifest = { bands, fictional: true, notice: '' } as unknown as Manifest;
    const valueOf = (id: string) => value(id);
    const text = rangeText(manifest, valueOf, 'thawDelay', 'SI')!;
    expect(text).toMatch(/^P10–P90: .* – ≥ [\d.]+ yr \(lower bound: thaw with piles after 2195\)$/);
    const row = exportRecord(manifest, -3, 75, valueOf);
    expect(row.thawDelayP90_qualifier).toMatch(/^≥ [\d.]+ yr$/);
    expect(row.thawDelayRangeBound_label).toBe(RANGE_BOUND_LABELS[value('thawDelayRangeBound')]);
    const p90 = bands.find((b) => b.id === 'thawDelayP90')!;
    expect(horizonText(p90.horizon, value('thawDelayRangeBound'), '40 yr')).toBe('≥ 40 yr');
    // A range with no bounded end reads as plain numbers.
    const far = evaluateAt(2500);
    expect(rangeText(manifest, (id) => far.value(id), 'thawDelay', 'SI')).not.toMatch(/≥|lower bound/);
  });
});
