/**
 * `npm run bench -- site-ensemble`: the site study's ensemble before and after its speed-up (issue 14),
 * side by side in one run. The members are the page's (layers/screening/site-ensemble.ts: 24 members of
 * examples/site-demo.json at the browser test's 30 years, first probe only, coarse mesh, 7-day steps).
 * The simulator as it was at BEFORE_COMMIT is taken from git into .cache/ (as site.bench.ts does;
 * skipped with a note when git or the commit is missing) and run member by member alternately with the
 * current one on this thread, so that load changes hit both. Printed: CPU time per member and in total
 * for each, the wall time two workers would take with the page's schedule (run-site-ensemble.ts: each
 * worker takes the next member when it finishes one), and the largest difference between the two
 * versions' results (probe temperatures, thaw delays; float noise at most).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { siteInputSchema, type SiteResult } from '../layers/site/site-input-schema';
import { simulateSite } from '../layers/site/simulate-site';
import { planSiteEnsemble } from '../layers/screening/site-ensemble';
import { scenarioUncertaintySchema } from '../layers/screening/uncertainty-schema';

/** The last commit before the speed-up (the heat-pump curve validated once per run). */
export const BEFORE_COMMIT = '0b8908c';
const MEMBERS = 24;
const WORKERS = 2;

type Simulate = (input: unknown) => SiteResult;

async function simulatorAt(commit: string): Promise<Simulate | null> {
  const root = join(dirname(fileURLToPath(import.meta.url)), '..');
  const dir = join(root, '.cache', `site-${commit}`);
  try {
    if (!existsSync(join(dir, 'layers', 'site', 'simulate-site.ts'))) {
      mkdirSync(dir, { recursive: true });
      const tar = execFileSync('git', ['-C', root, 'archive', commit, 'layers'], { maxBuffer: 1 << 28 });
      execFileSync('tar', ['-x', '-C', dir], { input: tar });
    }
    const mod = (await import(pathToFileURL(join(dir, 'layers', 'site', 'simulate-site.ts')).href)) as {
      simulateSite: Simulate;
    };
    return mod.simulateSite;
  } catch (e) {
    console.log(
      `simulator at ${commit} not available (${e instanceof Error ? e.message.split('\n')[0] : e})`,
    );
    return null;
  }
}

function cpu<T>(f: () => T): { value: T; cpu_ms: number } {
  const c0 = process.cpuUsage();
  const value = f();
  const c = process.cpuUsage(c0);
  return { value, cpu_ms: (c.user + c.system) / 1000 };
}

/** Wall time of the page's schedule: each of `workers` takes the next member when it is free. */
export function greedyMakespan(times: readonly number[], workers: number): number {
  const free = new Array<number>(workers).fill(0);
  for (const t of times) {
    const k = free.indexOf(Math.min(...free));
    free[k] += t;
  }
  return Math.max(...free);
}

/** Largest |difference| of the first probe's temperatures (K) and of the thaw delays (yr). */
function difference(a: SiteResult, b: SiteResult): { probe_K: number; delay_yr: number } {
  let probe = 0;
  for (const c of ['noPile', 'withPile'] as const) {
    const pa = a[c]?.probes[0].T_C ?? [];
    const pb = b[c]?.probes[0].T_C ?? [];
    if (pa.length !== pb.length) return { probe_K: Infinity, delay_yr: Infinity };
    for (let i = 0; i < pa.length; i++) probe = Math.max(probe, Math.abs(pa[i] - pb[i]));
  }
  const da = a.thawDelay_yr[0];
  const db = b.thawDelay_yr[0];
  const delay = da === null || db === null ? (da === db ? 0 : Infinity) : Math.abs(da - db);
  return { probe_K: probe, delay_yr: delay };
}

export async function run(): Promise<void> {
  const raw = JSON.parse(readFileSync(new URL('../examples/site-demo.json', import.meta.url), 'utf8'));
  const input = siteInputSchema.parse({ ...raw, years: 30 });
  const u = scenarioUncertaintySchema.parse({});
  const plan = planSiteEnsemble({ ...input, probes: input.probes.slice(0, 1) }, u, MEMBERS, u.seed);
  const load = () =>
    loadavg()
      .map((x) => x.toFixed(1))
      .join(' ');
  console.log(`load average ${load()} at the start (other work on this machine slows both alike)`);
  const before = await simulatorAt(BEFORE_COMMIT);
  const after: number[] = [];
  const old: number[] = [];
  let worst = { probe_K: 0, delay_yr: 0 };
  for (const [j, member] of plan.members.entries()) {
    const b = before ? cpu(() => before(member)) : null;
    const a = cpu(() => simulateSite(member));
    after.push(a.cpu_ms);
    if (b) {
      old.push(b.cpu_ms);
      const d = difference(a.value, b.value);
      worst = { probe_K: Math.max(worst.probe_K, d.probe_K), delay_yr: Math.max(worst.delay_yr, d.delay_yr) };
    }
    if (j === 0) console.log(`mesh ${a.value.mesh.nr} x ${a.value.mesh.nz}, ${a.value.mesh.timeSteps} steps`);
  }
  const sum = (xs: number[]) => xs.reduce((s, x) => s + x, 0);
  const line = (name: string, xs: number[]) =>
    console.log(
      `${name}: ${MEMBERS} members ${(sum(xs) / 1000).toFixed(1)} s cpu (${Math.min(...xs).toFixed(0)}–` +
        `${Math.max(...xs).toFixed(0)} ms each), on ${WORKERS} workers ${(greedyMakespan(xs, WORKERS) / 1000).toFixed(1)} s`,
    );
  if (old.length) line(`before (${BEFORE_COMMIT})`, old);
  line('after (this tree)', after);
  if (old.length) {
    console.log(`after / before (cpu): ${(sum(after) / sum(old)).toFixed(3)}`);
    console.log(
      `largest difference of the results: probe ${worst.probe_K.toExponential(1)} K, thaw delay ${worst.delay_yr.toExponential(1)} yr`,
    );
  }
  console.log(`load average ${load()} at the end`);
}
