/**
 * `pile-atlas site --batch … --ensemble`: every site's own run plus its simulated ensemble (the site
 * study's ensemble, layers/screening/site-ensemble.ts: the uncertain inputs perturbed over a seeded Latin
 * hypercube with the scenario's declared spreads, coarse members with steps of at least a week), all
 * runs on one pool of worker threads (site-run-worker.ts) fed in site order, so the sites finish one
 * after the other and each site's line is printed as soon as its run and all its members are done.
 * The line carries the run's summary (site-batch-lines.ts) and `ensemble`: P10/P50/P90 of the thaw
 * delay and of the lowest fluid temperature (site-ensemble-figures.ts) and the inputs that drive the
 * spread. Progress on stderr counts the members across all sites.
 */
import {
  planSiteEnsemble,
  SITE_ENSEMBLE_INPUTS,
  summariseSiteEnsemble,
  type SiteEnsemblePlan,
} from '../../layers/screening/site-ensemble';
import { siteEnsembleFigures } from '../../layers/screening/site-ensemble-figures';
import type { ScenarioUncertainty } from '../../layers/screening/uncertainty-schema';
import type { SiteInput, SiteResult } from '../../layers/site/site-input-schema';
import { runWorkerPool } from '../worker-pool';
import { badSiteLine, siteSummary, type PreparedSite } from './site-batch-lines';

export interface BatchEnsembleOptions {
  members: number;
  seed: number;
  uncertainty: ScenarioUncertainty;
  /** Worker threads (at most the number of runs). */
  workers: number;
}

interface Job {
  id: number;
  site: number;
  /** -1: the site's own run; otherwise the member's index. */
  member: number;
  input: SiteInput;
}

type Answer = { job: number; error?: string } & (
  { result: SiteResult; elapsed_ms: number; failure?: undefined } | { failure: string; result?: undefined }
);

interface SiteRuns {
  prepared: PreparedSite;
  plan: (SiteEnsemblePlan & { seed: number }) | null;
  own: { result: SiteResult; elapsed_ms: number } | null;
  members: (SiteResult | null)[];
  failures: string[];
  pending: number;
}

/**
 * The inputs that drive the spread of the first probe's end-of-run temperature (first-order indices of
 * the regression fit, summariseSiteEnsemble), or null when there are too few members for the fit (it
 * needs more members than inputs + 1).
 */
function drivers(plan: SiteEnsemblePlan, done: SiteResult[]) {
  if (done.length <= SITE_ENSEMBLE_INPUTS.length + 1) return null;
  return summariseSiteEnsemble(plan, done).sensitivity.map((x) => ({
    input: x.title,
    share: +x.index.toFixed(3),
  }));
}

/** The site's line once its run and members are in. */
function siteLine(s: SiteRuns, full: boolean): string {
  const { head, input } = s.prepared;
  if (!input || !s.own || !s.plan) {
    return JSON.stringify({ ...head, ok: false, problems: s.failures });
  }
  const done = s.members.filter((r): r is SiteResult => r !== null);
  const ensemble =
    done.length === s.members.length
      ? {
          kind: 'simulated ensemble',
          seed: s.plan.seed,
          ...siteEnsembleFigures(done),
          drivers: drivers(s.plan, done),
        }
      : { kind: 'simulated ensemble', members: s.members.length, failed: s.failures };
  const own = full
    ? { ...head, ok: true, result: s.own.result }
    : siteSummary(head, input, s.own.result, s.own.elapsed_ms);
  return JSON.stringify({ ...own, ensemble });
}

/** Runs every site and its ensemble; `emit` gets each site's line in site order as soon as it is done. */
export async function runEnsembleBatch(
  prepared: readonly PreparedSite[],
  options: {
    emit: (line: string) => void;
    progress?: (text: string) => void;
    full?: boolean;
    ensemble: BatchEnsembleOptions;
  },
): Promise<{ ok: number; bad: number }> {
  const { members, seed, uncertainty, workers } = options.ensemble;
  const jobs: Job[] = [];
  const sites: SiteRuns[] = prepared.map((p, site) => {
    if (!p.input) return { prepared: p, plan: null, own: null, members: [], failures: [], pending: 0 };
    const plan = { ...planSiteEnsemble(p.input, uncertainty, members, seed), seed };
    jobs.push({ id: jobs.length, site, member: -1, input: p.input });
    plan.members.forEach((input, member) => jobs.push({ id: jobs.length, site, member, input }));
    return {
      prepared: p,
      plan,
      own: null,
      members: plan.members.map(() => null),
      failures: [],
      pending: 1 + members,
    };
  });
  const totalMembers = jobs.length - sites.filter((s) => s.plan).length;
  let membersDone = 0;
  let next = 0;
  let ok = 0;
  let bad = 0;
  const flush = () => {
    while (next < sites.length && sites[next].pending === 0) {
      const s = sites[next++];
      if (!s.prepared.input) {
        bad++;
        options.emit(badSiteLine(s.prepared));
        continue;
      }
      if (s.own) ok++;
      else bad++;
      options.emit(siteLine(s, options.full ?? false));
    }
  };
  flush();
  await runWorkerPool<Job, Answer>({
    script: new URL('./site-run-worker.mjs', import.meta.url),
    workerData: null,
    size: workers,
    jobs,
    message: (job) => {
      if (job.member < 0)
        options.progress?.(`site ${job.site + 1}/${sites.length}: ${sites[job.site].prepared.head.name}`);
      return { job: job.id, input: job.input };
    },
    label: 'site worker',
    onAnswer: (a) => {
      const job = jobs[a.job];
      const s = sites[job.site];
      if (job.member < 0) {
        if (a.result) s.own = { result: a.result, elapsed_ms: a.elapsed_ms };
        else s.failures.push(`the site's own run failed: ${a.failure}`);
      } else {
        if (a.result) s.members[job.member] = a.result;
        else s.failures.push(`member ${job.member + 1}: ${a.failure}`);
        membersDone++;
        options.progress?.(
          `ensemble members ${membersDone}/${totalMembers} (site ${job.site + 1}/${sites.length}: ${s.prepared.head.name})`,
        );
      }
      s.pending--;
      flush();
    },
  });
  return { ok, bad };
}
