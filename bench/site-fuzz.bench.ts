/**
 * Site simulator fuzz (issue 16 item 7, issue 20 items 5–6): seeded schema-valid short runs drawn from
 * the schema's own limits (tests/unit/site-input-arbitrary.ts), counted by outcome. The unit suite runs
 * the same property on fewer inputs (tests/unit/site-schema-simulator.property.test.ts); this is the
 * nightly size. `SITE_FUZZ_RUNS` (default 10,000 schema-valid runs), `SITE_FUZZ_SEED` (default 20),
 * `SITE_FUZZ_YEARS` (default 1). Prints the counts and the first examples of every failing outcome.
 */
import fc from 'fast-check';
import { simulateSite } from '../layers/site/simulate-site';
import { SiteFluidLimitError, SitePhysicalBoundsError } from '../layers/site/site-bounds';
import { siteInputSchema } from '../layers/site/site-input-schema';
import { siteDraftArbitrary } from '../tests/unit/site-input-arbitrary';

export type FuzzOutcome =
  | 'ok'
  | 'fluid freezes or boils (refused, names pile.fluid)'
  | 'unconverged coupling'
  | 'maximum principle, no-pile column'
  | 'maximum principle, pile case only'
  | 'below absolute zero'
  | 'diverged (non-finite)'
  | 'rejected by the simulator';

/** Runs one schema-valid draft and classifies the outcome. */
export function classifySiteRun(draft: unknown): { outcome: FuzzOutcome; message: string; seconds: number } {
  const t0 = performance.now();
  let outcome: FuzzOutcome = 'ok';
  let message = '';
  try {
    simulateSite(draft as Parameters<typeof simulateSite>[0]);
  } catch (e) {
    message = (e as Error).message;
    if (e instanceof SiteFluidLimitError) outcome = 'fluid freezes or boils (refused, names pile.fluid)';
    else if (e instanceof SitePhysicalBoundsError) {
      outcome = /non-finite|diverged/.test(message)
        ? 'diverged (non-finite)'
        : /absolute zero/.test(message)
          ? 'below absolute zero'
          : /maximum principle/.test(message)
            ? // The no-pile case is the ground alone (no loop): a violation there is the ground scheme's.
              /no-pile ground reaches/.test(message)
              ? 'maximum principle, no-pile column'
              : 'maximum principle, pile case only'
            : 'unconverged coupling';
    } else outcome = 'rejected by the simulator';
  }
  return { outcome, message, seconds: (performance.now() - t0) / 1000 };
}

export async function run(): Promise<void> {
  const runs = Number(process.env.SITE_FUZZ_RUNS ?? 10_000);
  const seed = Number(process.env.SITE_FUZZ_SEED ?? 20);
  const years = Number(process.env.SITE_FUZZ_YEARS ?? 1);
  const drafts = fc.sample(siteDraftArbitrary({ years }), { numRuns: runs * 12, seed });
  const counts = new Map<string, number>();
  const examples = new Map<string, { message: string; draft: unknown }[]>();
  let valid = 0;
  let schemaRefused = 0;
  let total = 0;
  let slowest = 0;
  for (const draft of drafts) {
    if (valid >= runs) break;
    if (!siteInputSchema.safeParse(draft).success) {
      schemaRefused++;
      continue;
    }
    valid++;
    const r = classifySiteRun(draft);
    total += r.seconds;
    slowest = Math.max(slowest, r.seconds);
    counts.set(r.outcome, (counts.get(r.outcome) ?? 0) + 1);
    const ex = examples.get(r.outcome) ?? [];
    if (r.outcome !== 'ok' && ex.length < 3) ex.push({ message: r.message, draft });
    examples.set(r.outcome, ex);
  }
  console.log(
    `seed ${seed}, ${years}-year coarse runs: ${valid} schema-valid (${schemaRefused} drafts refused by the schema)`,
  );
  for (const [k, v] of counts) console.log(`  ${k}: ${v}`);
  console.log(
    `  time: ${total.toFixed(1)} s in all, ${(total / Math.max(1, valid)).toFixed(3)} s a run, slowest ${slowest.toFixed(2)} s`,
  );
  for (const [k, ex] of examples) {
    for (const e of ex) {
      console.log(`\n[${k}] ${e.message.slice(0, 400)}`);
      if (process.env.SITE_FUZZ_DUMP) console.log(JSON.stringify(e.draft));
    }
  }
}
