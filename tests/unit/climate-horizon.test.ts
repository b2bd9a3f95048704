/**
 * Issue 11 item 8: thaw years past the scenario's climate horizon read "after <year>" in every view,
 * never as a number past it: the layer definitions declare the qualifier, the map readouts (cell
 * panel, hover, shortlist line) and the exports apply it.
 */
import { describe, it, expect } from 'vitest';
import { horizonQualifier, horizonText, THAW_HORIZON } from '../../layers/screening/climate-horizon';
import { cellLayers } from '../../layers/screening/cell-layers';
import { DEFAULT_SCENARIO, parseScenario } from '../../layers/screening/scenario';
import { bandSchema, type Band } from '../../layers/screening/manifest';
import { bandFor } from '../../data-pipeline/build/assemble-manifest';
import { bandUnitText, bandValueText } from '../../web/src/panels/cell-panel';
import { exportProperties } from '../../web/src/shortlist/shortlist-export';
import { testManifest } from './web-test-manifest';
import { screenCell } from '../../layers/screening/cell-screening-model';

const bands: Band[] = cellLayers(DEFAULT_SCENARIO).map((l) => bandFor(l, new Float32Array([0, 1, 2])));
const band = (id: string) => bands.find((b) => b.id === id) as Band;

describe('climate horizon qualifier (issue 11 item 8)', () => {
  it('the manifest declares it on the four thaw bands, with the scenario year and a flag band that exists', () => {
    for (const id of ['thawYear', 'thawYearPiles', 'thawDelay', 'frozenMargin']) {
      const b = band(id);
      expect(bandSchema.safeParse(b).success).toBe(true);
      expect(b.horizon?.year).toBe(2100);
      expect(bands.some((x) => x.id === b.horizon?.flagBand && x.kind === 'class')).toBe(true);
    }
    const later = cellLayers(parseScenario({ climateHorizonYear: 2150 })).find((l) => l.id === 'thawYear');
    expect(later?.horizon?.year).toBe(2150);
  });
  it('per flag: after / at least / undetermined / plain', () => {
    const { within, pilesAfter, bothAfter } = THAW_HORIZON;
    expect(horizonQualifier(band('thawYear').horizon, within)).toBeNull();
    expect(horizonQualifier(band('thawYear').horizon, pilesAfter)).toBeNull();
    expect(horizonQualifier(band('thawYear').horizon, bothAfter)).toBe('after');
    expect(horizonQualifier(band('thawYearPiles').horizon, pilesAfter)).toBe('after');
    expect(horizonQualifier(band('thawDelay').horizon, pilesAfter)).toBe('atLeast');
    expect(horizonQualifier(band('thawDelay').horizon, bothAfter)).toBe('undetermined');
    expect(horizonQualifier(band('frozenMargin').horizon, bothAfter)).toBe('atLeast');
    expect(horizonQualifier(band('frozenMargin').horizon, null)).toBeNull();
    expect(horizonText(band('thawYearPiles').horizon, 1, '2100 yr')).toBe('after 2100');
    expect(horizonText(band('frozenMargin').horizon, 2, '45 yr')).toBe('≥ 45 yr');
  });
  it('readouts show "after 2100" and "≥ 45 yr", never the capped number alone', () => {
    expect(bandValueText(band('thawYear'), 2100, 'SI', 2)).toBe('after 2100');
    // A thaw year is a calendar year: the year alone, never "2087 yr" (issue 18 item 3).
    expect(bandValueText(band('thawYear'), 2087.4, 'SI', 0)).toBe('2087');
    expect(bandValueText(band('thawYearPiles'), 2094, 'NA', 0)).toBe('2094');
    expect(bandUnitText(band('thawYear'), 'SI')).toBe('calendar year');
    expect(bandUnitText(band('thawDelay'), 'NA')).toBe('yr');
    expect(bandValueText(band('frozenMargin'), 45, 'SI', 2)).toBe('≥ 45.0 yr');
    expect(bandValueText(band('thawDelay'), null, 'SI', 2)).toMatch(/no thaw before 2100/);
  });
  it('exports (GeoJSON/CSV properties) carry the qualifier beside the capped value', () => {
    const manifest = testManifest({ bands });
    const p = exportProperties(
      {
        id: 'a',
        name: 'x',
        note: '',
        lon: 0,
        lat: 70,
        addedAt: '2026-12-01T10:00:00.000Z',
        origin: 'map',
        values: { thawYear: 2100, thawYearPiles: 2100, frozenMargin: 45, thawBeyondHorizon: 2 },
        metrics: {},
      },
      1,
      manifest,
    );
    expect(p.thawYear_yr).toBe(2100);
    expect(p.thawYear_qualifier).toBe('after 2100');
    expect(p.frozenMargin_qualifier).toBe('≥ 45 yr');
    expect(p.thawDelay_qualifier).toMatch(/no thaw before 2100/);
  });
  it('the cell card (pile-atlas cell) carries the same qualifiers', () => {
    const card = screenCell({
      meanAirTemp_C: -6.5,
      airAmplitude_C: 18,
      warming_C_per_yr: 0.04,
      textureClass: 'silt',
      waterContent_m3m3: 0.38,
      bedrockDepth_m: 18,
    });
    expect(card.metrics.thawBeyondHorizon.value).toBe(2);
    expect(card.metrics.thawYear.qualifier).toBe('after 2100');
    expect(card.metrics.frozenMargin.qualifier).toBe('≥ 45 yr');
    expect(card.metrics.groundTemp.qualifier).toBeUndefined();
  });
});
