/**
 * Every choice the site input offers (the schema's enum and literal values) has a title in the trade's
 * words (issue 12 item 4: no internal id on a screen), and the site form shows those titles.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { optionTitle, SITE_OPTION_TITLES } from '../../layers/site/site-option-titles';

/** Every enum and const value anywhere in the schema's JSON Schema. */
function choices(node: unknown, out: Set<string>): Set<string> {
  if (Array.isArray(node)) for (const n of node) choices(n, out);
  else if (node && typeof node === 'object') {
    const o = node as Record<string, unknown>;
    if (Array.isArray(o.enum)) for (const v of o.enum) if (typeof v === 'string') out.add(v);
    if (typeof o.const === 'string') out.add(o.const);
    for (const v of Object.values(o)) choices(v, out);
  }
  return out;
}

describe('site input choices in the trade’s words', () => {
  const values = [
    ...choices(z.toJSONSchema(siteInputSchema, { unrepresentable: 'any', io: 'input' }), new Set()),
  ];

  it('finds the schema’s choices (loop types, fluids, operation modes, textures, mesh)', () => {
    for (const v of ['uTube', 'coaxial', 'propyleneGlycol', 'heatRate', 'building', 'peat', 'fine'])
      expect(values).toContain(v);
  });

  it('gives every choice a title that is not its id', () => {
    for (const v of values) {
      expect(SITE_OPTION_TITLES[v], v).toBeDefined();
      expect(optionTitle(v)).not.toBe(v);
      expect(optionTitle(v)).not.toMatch(/[a-z][A-Z]/); // no camelCase id left
    }
  });

  it('falls back to words for an unknown value', () => {
    expect(optionTitle('someNewChoice_x')).toBe('Some new choice');
  });
});
