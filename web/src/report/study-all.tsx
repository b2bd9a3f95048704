/**
 * "Study all": the site simulation for every shortlisted site, one after the other, each in its own
 * Web Worker (run-site-in-worker.ts), prefilled from the site's screening values as the one-site study
 * is (site-prefill.ts). Shows which site runs and the overall progress; Cancel stops the running
 * worker at once and keeps the sites already done. Each result goes into the site's metrics
 * (`studyThawDelay_yr`, `studyThawDelayAtLeast`, `studyLowestFluid_C`), so the list, the exports and
 * the report show it.
 */
import { useRef, useState } from 'react';
import type { Manifest } from '../../../layers/screening/manifest';
import { siteInputSchema } from '../../../layers/site/site-input-schema';
import type { ShortlistItem } from '../shortlist/shortlist-item';
import { shortlistStore } from '../shortlist/shortlist-store';
import { runSiteInWorker, SiteRunCancelled, type SiteRunHandle } from '../site/run-site-in-worker';
import { scenarioFromManifest, sitePrefill } from '../../../layers/screening/site-prefill';
import { withProfileProbes } from '../../../layers/site/site-profile';

type State =
  | { kind: 'idle' }
  | { kind: 'running'; index: number; fraction: number }
  | { kind: 'finished'; done: number; failed: string[]; cancelled: boolean };

type StudyScenario = ReturnType<typeof scenarioFromManifest>;

/** A site's study input, prefilled from its screening values with the profile probes, or null when incomplete. */
function studyInputOf(item: ShortlistItem, manifest: Manifest, scenario: StudyScenario) {
  const parsed = siteInputSchema.safeParse(sitePrefill(item.values, manifest.scenario).draft);
  if (!parsed.success) return null;
  const pileR = parsed.data.pile ? parsed.data.pile.outerDiameter_m / 2 : 0;
  const r = Math.min(Math.max(scenario.referenceRadius_m, pileR + 0.05), parsed.data.domain.radius_m);
  return withProfileProbes(parsed.data, r);
}

/** Studies the sites one after the other; `cancel` stops the running worker and keeps the sites done. */
function useStudyAll(manifest: Manifest, items: readonly ShortlistItem[]) {
  const [state, setState] = useState<State>({ kind: 'idle' });
  const handle = useRef<SiteRunHandle | null>(null);
  const stop = useRef(false);

  const run = async () => {
    stop.current = false;
    const scenario = scenarioFromManifest(manifest.scenario);
    const failed: string[] = [];
    let done = 0;
    for (const [index, item] of items.entries()) {
      if (stop.current) break;
      setState({ kind: 'running', index, fraction: 0 });
      const study = studyInputOf(item, manifest, scenario);
      if (!study) {
        failed.push(`${item.name}: the screening values here do not make a complete site input`);
        continue;
      }
      const { input, column } = study;
      let last = 0;
      const h = runSiteInWorker(input, { scenario, column }, (f) => {
        if (f - last >= 0.02) {
          last = f;
          setState({ kind: 'running', index, fraction: f });
        }
      });
      handle.current = h;
      try {
        const { result } = await h.result;
        shortlistStore.update(item.id, {
          metrics: {
            ...item.metrics,
            studyThawDelay_yr: result.thawDelay_yr[0] ?? null,
            studyThawDelayAtLeast: result.thawDelayIsLowerBound[0] ? 'yes' : 'no',
            studyLowestFluid_C: result.fluid?.lowest_C ?? null,
          },
        });
        done++;
      } catch (e) {
        if (e instanceof SiteRunCancelled) break;
        failed.push(`${item.name}: ${(e as Error).message}`);
      } finally {
        handle.current = null;
      }
    }
    setState({ kind: 'finished', done, failed, cancelled: stop.current });
  };

  const cancel = () => {
    stop.current = true;
    handle.current?.cancel();
  };
  return { state, run, cancel };
}

export function StudyAll(props: { manifest: Manifest; items: readonly ShortlistItem[] }) {
  const items = props.items;
  const { state, run, cancel } = useStudyAll(props.manifest, items);
  if (items.length === 0) return null;
  return (
    <div className="study-all" data-testid="study-all">
      {state.kind === 'running' ? (
        <>
          <progress
            max={items.length}
            value={state.index + state.fraction}
            aria-label="Study of all sites"
            data-testid="study-all-progress"
          />{' '}
          <span className="small" role="status" data-testid="study-all-status">
            Studying site {state.index + 1} of {items.length}: {items[state.index]?.name}
          </span>{' '}
          <button type="button" onClick={cancel} data-testid="study-all-cancel">
            Cancel
          </button>
        </>
      ) : (
        <>
          <button type="button" onClick={() => void run()} data-testid="study-all-run">
            Study all {items.length} sites
          </button>
          {state.kind === 'finished' ? (
            <span className="small" role="status" data-testid="study-all-status">
              {state.cancelled ? 'Cancelled: ' : ''}
              {state.done} of {items.length} site(s) studied
              {state.failed.length ? `; not studied: ${state.failed.join('; ')}` : ''}.
            </span>
          ) : null}
        </>
      )}
    </div>
  );
}
