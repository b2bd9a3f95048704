/**
 * "Study all": the site simulation for every shortlisted site, one after the other, each in its own
 * Web Worker (run-site-in-worker.ts), prefilled from the site's screening values as the one-site study
 * is (site-prefill.ts). With "simulated ensemble" ticked, each site's run is followed by the site
 * study's ensemble (layers/screening/site-ensemble.ts: the uncertain inputs varied over the scenario's
 * declared spreads, coarse members) across the page's Web Workers (run-site-ensemble.ts). Shows which
 * site runs and the overall progress, counting the members across all sites; Cancel terminates the
 * running workers at once and keeps the sites already done. Each result goes into the site's metrics
 * (`studyThawDelay_yr`, `studyThawDelayAtLeast`, `studyLowestFluid_C`; with the ensemble
 * `studyEnsembleMembers`, `studyThawDelayP10_yr` … `studyLowestFluidP90_C`, study-all-metrics.ts), so
 * the list, the exports and the report show it.
 */
import { useRef, useState } from 'react';
import type { Manifest } from '../../../layers/screening/manifest';
import { siteInputSchema } from '../../../layers/site/site-input-schema';
import type { ShortlistItem } from '../shortlist/shortlist-item';
import { shortlistStore } from '../shortlist/shortlist-store';
import { runSiteInWorker, SiteRunCancelled } from '../site/run-site-in-worker';
import { runSiteEnsemble } from '../site/run-site-ensemble';
import { SITE_ENSEMBLE_MEMBERS } from '../site/site-ensemble-panel';
import { scenarioFromManifest, sitePrefill } from '../../../layers/screening/site-prefill';
import { withProfileProbes } from '../../../layers/site/site-profile';
import { planSiteEnsemble } from '../../../layers/screening/site-ensemble';
import { siteEnsembleFigures } from '../../../layers/screening/site-ensemble-figures';
import { scenarioUncertaintySchema } from '../../../layers/screening/uncertainty-schema';
import { ensembleMetrics, studyMetrics } from './study-all-metrics';

/** Where the batch is: the site, the share of its own run, and the members done (this site, all sites). */
interface Running {
  kind: 'running';
  index: number;
  fraction: number;
  member: number;
  membersDone: number;
}

type State =
  { kind: 'idle' } | Running | { kind: 'finished'; done: number; failed: string[]; cancelled: boolean };

type StudyScenario = ReturnType<typeof scenarioFromManifest>;

/** Members per site the form allows: the plan's range (site-ensemble.ts planSiteEnsemble). */
const MIN_MEMBERS = 2;
const MAX_MEMBERS = 256;

/** A site's study input, prefilled from its screening values with the profile probes, or null when incomplete. */
function studyInputOf(item: ShortlistItem, manifest: Manifest, scenario: StudyScenario) {
  const parsed = siteInputSchema.safeParse(sitePrefill(item.values, manifest.scenario).draft);
  if (!parsed.success) return null;
  const pileR = parsed.data.pile ? parsed.data.pile.outerDiameter_m / 2 : 0;
  const r = Math.min(Math.max(scenario.referenceRadius_m, pileR + 0.05), parsed.data.domain.radius_m);
  return withProfileProbes(parsed.data, r);
}

interface BatchRun {
  scenario: StudyScenario;
  /** Ensemble members per site, or 0 for none. */
  members: number;
  /** The running workers' cancel (the site's run or its ensemble). */
  setCancel: (cancel: (() => void) | null) => void;
  report: (r: Omit<Running, 'kind'>) => void;
  membersBefore: number;
}

/** One site: its run, then (when asked) its ensemble; the metrics are stored after each. */
async function studySite(item: ShortlistItem, index: number, manifest: Manifest, b: BatchRun) {
  const study = studyInputOf(item, manifest, b.scenario);
  if (!study) throw new Error('the screening values here do not make a complete site input');
  const { input, column } = study;
  const context = { scenario: b.scenario, column };
  let last = 0;
  const h = runSiteInWorker(input, context, (f) => {
    if (f - last >= 0.02) {
      last = f;
      b.report({ index, fraction: f, member: 0, membersDone: b.membersBefore });
    }
  });
  b.setCancel(h.cancel);
  const { result } = await h.result;
  let metrics = { ...item.metrics, ...studyMetrics(result) };
  shortlistStore.update(item.id, { metrics });
  if (b.members === 0) return;
  const u = scenarioUncertaintySchema.parse(b.scenario.uncertainty ?? {});
  // The study's own probes only (not the profile column), as the site study's ensemble runs them.
  const base = siteInputSchema.parse({
    ...input,
    probes: (input.probes ?? []).slice(0, Math.max(1, column.firstProbe)),
  });
  const plan = planSiteEnsemble(base, u, b.members, u.seed);
  b.report({ index, fraction: 1, member: 0, membersDone: b.membersBefore });
  const e = runSiteEnsemble(plan.members, context, (done) =>
    b.report({ index, fraction: 1, member: done, membersDone: b.membersBefore + done }),
  );
  b.setCancel(e.cancel);
  const members = await e.result;
  metrics = { ...metrics, ...ensembleMetrics(siteEnsembleFigures(members), u.seed) };
  shortlistStore.update(item.id, { metrics });
}

/** Studies the sites one after the other; `cancel` stops the running workers and keeps the sites done. */
function useStudyAll(manifest: Manifest, items: readonly ShortlistItem[]) {
  const [state, setState] = useState<State>({ kind: 'idle' });
  const cancelRunning = useRef<(() => void) | null>(null);
  const stop = useRef(false);

  const run = async (members: number) => {
    stop.current = false;
    const b: BatchRun = {
      scenario: scenarioFromManifest(manifest.scenario),
      members,
      setCancel: (c) => (cancelRunning.current = c),
      report: (r) => setState({ kind: 'running', ...r }),
      membersBefore: 0,
    };
    const failed: string[] = [];
    let done = 0;
    for (const [index, item] of items.entries()) {
      if (stop.current) break;
      b.membersBefore = index * members;
      b.report({ index, fraction: 0, member: 0, membersDone: b.membersBefore });
      try {
        await studySite(item, index, manifest, b);
        done++;
      } catch (e) {
        if (e instanceof SiteRunCancelled) break;
        failed.push(`${item.name}: ${(e as Error).message}`);
      } finally {
        cancelRunning.current = null;
      }
    }
    setState({ kind: 'finished', done, failed, cancelled: stop.current });
  };

  const cancel = () => {
    stop.current = true;
    cancelRunning.current?.();
  };
  return { state, run, cancel };
}

/** The ensemble option: a tick box and the members per site. */
function EnsembleOption(props: {
  on: boolean;
  members: string;
  onOn: (on: boolean) => void;
  onMembers: (text: string) => void;
  valid: boolean;
}) {
  return (
    <div className="row small study-all-ensemble">
      <label>
        <input
          type="checkbox"
          checked={props.on}
          onChange={(e) => props.onOn(e.target.checked)}
          data-testid="study-all-ensemble"
        />{' '}
        with the simulated ensemble
      </label>
      <label>
        members per site{' '}
        <input
          inputMode="numeric"
          size={4}
          value={props.members}
          disabled={!props.on}
          onChange={(e) => props.onMembers(e.target.value)}
          aria-label="Simulated ensemble members per site"
          data-testid="study-all-members"
        />
      </label>
      {props.on && !props.valid ? (
        <span className="fail" role="alert">
          a whole number from {MIN_MEMBERS} to {MAX_MEMBERS}
        </span>
      ) : null}
    </div>
  );
}

export function StudyAll(props: { manifest: Manifest; items: readonly ShortlistItem[] }) {
  const items = props.items;
  const { state, run, cancel } = useStudyAll(props.manifest, items);
  const [withEnsemble, setWithEnsemble] = useState(false);
  const [membersText, setMembersText] = useState(String(SITE_ENSEMBLE_MEMBERS));
  const [runMembers, setRunMembers] = useState(0);
  const m = Number(membersText);
  const valid = Number.isInteger(m) && m >= MIN_MEMBERS && m <= MAX_MEMBERS;
  if (items.length === 0) return null;
  const start = () => {
    const members = withEnsemble ? m : 0;
    setRunMembers(members);
    void run(members);
  };
  return (
    <div className="study-all" data-testid="study-all">
      {state.kind === 'running' ? (
        <StudyProgress state={state} items={items} members={runMembers} onCancel={cancel} />
      ) : (
        <>
          <EnsembleOption
            on={withEnsemble}
            members={membersText}
            onOn={setWithEnsemble}
            onMembers={setMembersText}
            valid={valid}
          />
          <button type="button" onClick={start} disabled={withEnsemble && !valid} data-testid="study-all-run">
            Study all {items.length} sites
          </button>
          {state.kind === 'finished' ? (
            <span className="small" role="status" data-testid="study-all-status">
              {state.cancelled ? 'Cancelled: ' : ''}
              {state.done} of {items.length} site(s) studied
              {runMembers > 0 ? `, each with a simulated ensemble of ${runMembers} members` : ''}
              {state.failed.length ? `; not studied: ${state.failed.join('; ')}` : ''}.
            </span>
          ) : null}
        </>
      )}
    </div>
  );
}

/** The progress bar (each site's run counts one, each member one) and what runs now, with Cancel. */
function StudyProgress(props: {
  state: Running;
  items: readonly ShortlistItem[];
  members: number;
  onCancel: () => void;
}) {
  const { state, items, members } = props;
  const perSite = 1 + members;
  const inEnsemble = members > 0 && state.fraction >= 1;
  return (
    <>
      <progress
        max={items.length * perSite}
        value={state.index * perSite + state.fraction + state.member}
        aria-label="Study of all sites"
        data-testid="study-all-progress"
      />{' '}
      <span className="small" role="status" data-testid="study-all-status">
        Studying site {state.index + 1} of {items.length}: {items[state.index]?.name}
        {inEnsemble ? ` — simulated ensemble, member ${state.member} of ${members} done` : ''}
        {members > 0 ? ` (${state.membersDone} of ${items.length * members} members in all)` : ''}
      </span>{' '}
      <button type="button" onClick={props.onCancel} data-testid="study-all-cancel">
        Cancel
      </button>
    </>
  );
}
