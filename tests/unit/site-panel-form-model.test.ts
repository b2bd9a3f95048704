/** The pure half of the schema-driven site form (web/src/site/schema-form-model.ts). */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { z } from 'zod';
import { groundLayerSchema, siteInputSchema } from '../../layers/site/site-input-schema';
import {
  emptyValue,
  flattenInputs,
  getAt,
  issuesByPath,
  parseNumberText,
  setAt,
  unwrapSchema,
} from '../../web/src/site/schema-form-model';
import { sitePrefill } from '../../layers/screening/site-prefill';

const base = () =>
  sitePrefill({ meanAirTemp_C: -5, textureClass: 3, waterContent_m3m3: 0.35, bedrockDepth_m: 30 }).draft;

describe('schema form model', () => {
  it('reads title, unit and limits from the schema metadata through default wrappers', () => {
    const u = unwrapSchema(siteInputSchema.shape.years);
    expect(u.hasDefault).toBe(true);
    expect(u.defaultValue).toBe(40);
    expect(u.meta).toMatchObject({ title: 'Simulated years', unit: 'yr' });
    expect(u.base).toBeInstanceOf(z.ZodNumber);
    expect(unwrapSchema(siteInputSchema.shape.pile).nullable).toBe(true);
  });

  it('setAt copies along the path and leaves the original untouched (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.constantFrom('a', 'b', 'c'), fc.nat(3)), { minLength: 1, maxLength: 4 }),
        fc.double({ noNaN: true }),
        (path, v) => {
          const root = { a: { b: [1, 2, 3] }, c: 4 };
          const before = JSON.stringify(root);
          const next = setAt(root, path, v);
          expect(getAt(next, path)).toBe(v);
          expect(JSON.stringify(root)).toBe(before);
        },
      ),
      { seed: 7, numRuns: 200 },
    );
  });

  it('removes an object key when set to undefined (the schema default then applies)', () => {
    const next = setAt({ years: 10, probes: [] }, ['years'], undefined) as Record<string, unknown>;
    expect('years' in next).toBe(false);
  });

  it('parses typed numbers, keeps bad text for the schema to report, and maps empty to undefined', () => {
    expect(parseNumberText(' 12.5 ')).toBe(12.5);
    expect(parseNumberText('\u22123')).toBe(-3);
    expect(parseNumberText('1e-3')).toBe(0.001);
    expect(parseNumberText('')).toBeUndefined();
    expect(parseNumberText('12,5x')).toBe('12,5x');
  });

  it('groups issues by field path with plain messages, cross-field checks included', () => {
    let draft: unknown = base();
    expect(issuesByPath(siteInputSchema, draft).size).toBe(0);
    draft = setAt(draft, ['years'], 0);
    draft = setAt(draft, ['climate', 'amplitude_C'], 'warm');
    const issues = issuesByPath(siteInputSchema, draft);
    expect(issues.get('years')).toEqual(['must be ≥ 1']);
    expect(issues.get('climate.amplitude_C')).toEqual(['enter a number']);
    // Cross-field checks run once every field has the right type (zod runs refinements on valid shapes).
    const cross = issuesByPath(siteInputSchema, setAt(base(), ['pile', 'length_m'], 80));
    expect(cross.get('pile.length_m')?.[0]).toMatch(/domain depth 50 m/);
  });

  it('starts a new ground layer with its required fields only', () => {
    const v = emptyValue(groundLayerSchema) as Record<string, unknown>;
    expect(Object.keys(v).sort()).toEqual(['bottom_m', 'top_m']);
  });

  it('flattens the input for the printed sheet with titles and units', () => {
    const lines = flattenInputs(siteInputSchema, siteInputSchema.parse(base()));
    const maat = lines.find((l) => l.label.endsWith('Mean annual air temperature'));
    expect(maat).toMatchObject({ value: '-5', unit: '°C' });
    expect(lines.some((l) => l.label.includes('Layer top') && l.unit === 'm')).toBe(true);
    expect(lines.some((l) => l.value === 'building')).toBe(true);
  });
});
