/**
 * Golden file for the site study's ensemble members (style.md habit 10): four members of the page's
 * plan (layers/screening/site-ensemble.ts) for examples/site-demo.json shortened to 6 years, simulated
 * by layers/site/simulate-site.ts. A speed-up of the member runs must leave their results unchanged
 * beyond float noise: the first probe's temperatures with and without the pile, the thaw delay, the
 * energy balance and the solver's work (passes, substitutions, re-factored rows: the same iteration
 * path). The golden file was written by the simulator before the speed-up of issue 14 (commit
 * 0b8908c); regenerate on purpose with `UPDATE=1 npx vitest run tests/unit/site-ensemble-members.test.ts`
 * and commit it with the change that explains it.
 */
import { readFileSync } from 'node:fs';
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';
import { planSiteEnsemble } from '../../layers/screening/site-ensemble';
import { scenarioUncertaintySchema } from '../../layers/screening/uncertainty-schema';

const GOLDEN = join(import.meta.dirname, 'golden', 'site-ensemble-members.json');

interface MemberSummary {
  thawDelay_yr: number | null;
  noPileProbe_C: number[];
  withPileProbe_C: number[];
  energyBalance: number;
  work: unknown[];
}

function members(): MemberSummary[] {
  // examples/ holds the repository's own demo site (invented, design.md section 7).
  const raw = JSON.parse(
    readFileSync(join(import.meta.dirname, '..', '..', 'examples', 'site-demo.json'), 'utf8'),
  );
  const input = siteInputSchema.parse({ ...raw, years: 6 });
  const u = scenarioUncertaintySchema.parse({});
  const plan = planSiteEnsemble({ ...input, probes: input.probes.slice(0, 1) }, u, 24, u.seed);
  return plan.members.slice(0, 4).map((m) => {
    const r = simulateSite(m);
    return {
      thawDelay_yr: r.thawDelay_yr[0],
      noPileProbe_C: r.noPile.probes[0].T_C,
      withPileProbe_C: r.withPile?.probes[0].T_C ?? [],
      energyBalance: r.energyBalance.relativeError,
      work: [r.noPile.solverWork, r.withPile?.solverWork],
    };
  });
}

describe('site ensemble members', () => {
  it('give the same results as before the speed-up (float noise at most)', async () => {
    const now = members();
    if (process.env.UPDATE === '1') await writeFile(GOLDEN, JSON.stringify(now, null, 1) + '\n');
    const golden = JSON.parse(await readFile(GOLDEN, 'utf8')) as MemberSummary[];
    expect(now).toHaveLength(golden.length);
    for (const [j, g] of golden.entries()) {
      const m = now[j];
      // Same iteration path: every count of the solver's work is equal.
      expect(m.work, `member ${j}`).toEqual(g.work);
      expect(m.thawDelay_yr === null, `member ${j}`).toBe(g.thawDelay_yr === null);
      if (g.thawDelay_yr !== null) expect(m.thawDelay_yr).toBeCloseTo(g.thawDelay_yr, 9);
      expect(m.withPileProbe_C).toHaveLength(g.withPileProbe_C.length);
      expect(m.noPileProbe_C).toHaveLength(g.noPileProbe_C.length);
      // Float noise: 1e-9 K, far below the 1e-4 K the simulator rounds its outputs to.
      g.withPileProbe_C.forEach((t, i) => expect(Math.abs(m.withPileProbe_C[i] - t)).toBeLessThan(1e-9));
      g.noPileProbe_C.forEach((t, i) => expect(Math.abs(m.noPileProbe_C[i] - t)).toBeLessThan(1e-9));
      expect(Math.abs(m.energyBalance - g.energyBalance)).toBeLessThan(1e-12);
    }
    // The members differ from one another (the golden file is not one run repeated).
    expect(new Set(golden.map((g) => g.withPileProbe_C.at(-1))).size).toBe(golden.length);
  }, 240_000);
});
