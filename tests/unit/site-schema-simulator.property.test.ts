/**
 * One schema for what the simulator accepts (issue 20 item 6, issue 16 item 4): seeded site inputs drawn
 * from the schema's own field limits (site-input-arbitrary.ts), kept when the schema accepts them, run as
 * short coarse simulations. Every accepted input must either run to a result that passed the physical-
 * bounds check (finite, fluid liquid, ground within its initial and boundary values: site-bounds.ts) or
 * be refused for its fluid with `SiteFluidLimitError` naming pile.fluid (a freeze or boil found only by
 * running). Anything else is a disagreement between schema and simulator or a model failure, listed with
 * its class. 300 runs here; `SITE_FUZZ_RUNS=3000 npm run bench -- site-fuzz` runs ten times more.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { classifySiteRun } from '../../bench/site-fuzz.bench';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { siteDraftArbitrary } from './site-input-arbitrary';

const RUNS = 300;
const SEED = 16020;

describe('site schema and simulator agree', () => {
  it(`${RUNS} schema-valid short runs: no rejection, no NaN, no bound violation`, () => {
    const drafts = fc.sample(siteDraftArbitrary({ years: 1 }), { numRuns: RUNS * 12, seed: SEED });
    const valid = drafts.filter((d) => siteInputSchema.safeParse(d).success).slice(0, RUNS);
    expect(valid.length).toBe(RUNS);
    const failures: string[] = [];
    let refusedForFluid = 0;
    for (const draft of valid) {
      const r = classifySiteRun(draft);
      if (r.outcome === 'fluid freezes or boils (refused, names pile.fluid)') {
        expect(r.message).toMatch(/^pile\.fluid: /);
        refusedForFluid++;
      } else if (r.outcome !== 'ok') failures.push(`${r.outcome}: ${r.message.slice(0, 200)}`);
    }
    expect(refusedForFluid).toBeLessThan(RUNS / 4);
    expect(failures, failures.join('\n')).toEqual([]);
  }, 600_000);
});
