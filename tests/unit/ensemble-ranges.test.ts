import { describe, expect, it } from 'vitest';
import { rangeBaseId, rangeText, successText, uncertainClassOf } from '../../web/src/panels/ensemble-ranges';
import type { Manifest } from '../../layers/screening/manifest';
import { testManifest } from './web-test-manifest';

function ensembleManifest(): Manifest {
  const m = testManifest();
  const ground = m.bands.find((b) => b.id === 'groundTemp')!;
  return {
    ...m,
    bands: [
      ...m.bands,
      { ...ground, id: 'groundTempP10', title: 'Ground temperature, P10' },
      { ...ground, id: 'groundTempP90', title: 'Ground temperature, P90' },
      {
        ...m.bands.find((b) => b.kind === 'class')!,
        id: 'robustClass',
        classes: [
          { value: 3, label: 'good' },
          { value: 4, label: 'uncertain', description: 'Fewer than 80 % of the members agree on one class.' },
        ],
      },
    ],
  };
}

describe('ensemble ranges in the readout and the class card', () => {
  it('writes the P10–P90 range in the display units of either system', () => {
    const m = ensembleManifest();
    const v: Record<string, number> = { groundTempP10: -3, groundTempP90: -1 };
    expect(rangeText(m, (id) => v[id], 'groundTemp', 'SI')).toBe('P10–P90: -3.00 °C – -1.00 °C');
    // °F: −3 °C = 26.6 °F, −1 °C = 30.2 °F.
    expect(rangeText(m, (id) => v[id], 'groundTempP90', 'NA')).toMatch(/P10–P90: 26\.6 °F – 30\.2 °F/);
    expect(rangeText(m, () => NaN, 'groundTemp', 'SI')).toBe('P10–P90: not defined');
    expect(rangeText(m, (id) => v[id], 'suitability', 'SI')).toBeNull();
    expect(rangeBaseId('pilesPerTonP50')).toBe('pilesPerTon');
  });
  it('finds the uncertain class and words the probability of success', () => {
    expect(uncertainClassOf(ensembleManifest())?.value).toBe(4);
    expect(uncertainClassOf(testManifest())).toBeNull();
    expect(successText(0.625)).toBe('63 % of the ensemble members succeed');
    expect(successText(null)).toBe('no data');
  });
});

describe('shortlist exports carry the ensemble ranges', () => {
  it('writes the percentile bands with their unit and the robust class with its label', async () => {
    const { shortlistToGeoJSON, shortlistToCsv } = await import('../../web/src/shortlist/shortlist-export');
    const m = ensembleManifest();
    const item = {
      id: 'a',
      name: 'Lanternhook east',
      note: '',
      lon: -3.1,
      lat: 75,
      addedAt: '2026-12-01T10:00:00.000Z',
      origin: 'map' as const,
      values: {
        groundTemp: -2,
        groundTempP10: -3,
        groundTempP90: -1,
        pilesPerTon: 12,
        suitability: 3,
        robustClass: 4,
      },
      metrics: {},
    };
    const p = shortlistToGeoJSON([item], m).features[0].properties as Record<string, unknown>;
    expect(p.groundTempP10_degC).toBe(-3);
    expect(p.groundTempP90_degC).toBe(-1);
    expect(p.robustClass_label).toBe('uncertain');
    expect(shortlistToCsv([item], m).split('\n')[0]).toContain('groundTempP90_degC');
  });
});
