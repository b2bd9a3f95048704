/**
 * The site study under every scenario of the build's set (issue 17 item 4): one control runs the
 * planner's inputs under each scenario (its own climate and design life: layers/screening/
 * scenario-study.ts) on the page's workers, with progress and cancel; the probe chart then draws
 * each scenario's curves over the run's (site-results.tsx), and a table gives each scenario's key
 * figures in the units chosen.
 */
import { useEffect, useRef, useState } from 'react';
import type { Manifest } from '../../../layers/screening/manifest';
import { siteInputSchema, type SiteInputDraft } from '../../../layers/site/site-input-schema';
import { scenarioFromManifest } from '../../../layers/screening/site-prefill';
import { studyRunInput } from '../../../layers/screening/run-site-study';
import { siteStudyReport } from '../../../layers/screening/site-study-report';
import {
  scenarioStudyDraft,
  scenarioStudyFigures,
  type ScenarioStudyFigures,
} from '../../../layers/screening/scenario-study';
import type { Scenario } from '../../../layers/screening/scenario';
import { loadSetScenarios } from '../data/scenario-cells';
import { formatNumber, formatQuantity, displayTitle, type UnitSystem } from '../units/display-units';
import { runSitePool, type SitePoolHandle, type SitePoolResult } from './run-site-ensemble';
import { SiteRunCancelled } from './run-site-in-worker';
import type { SiteRunOutcome } from './site-results';
import type { SiteRunRequest } from './site-worker-protocol';

/** One scenario's run of the sweep. */
export interface ScenarioRun {
  name: string;
  scenario: Scenario;
  outcome: SiteRunOutcome;
  figures: ScenarioStudyFigures;
  /** Line colour of its curves (SCENARIO_COLOURS). */
  colour: string;
}

/** Colours of the scenarios' curves, apart from each other and from the run's own (Okabe & Ito 2008 palette). */
export const SCENARIO_COLOURS = ['#000000', '#009e73', '#cc79a7', '#e69f00', '#56b4e9', '#d55e00', '#0072b2'];

export type SweepState =
  | { kind: 'idle' }
  | { kind: 'running'; done: number; total: number; fraction: number }
  | { kind: 'done'; runs: ScenarioRun[]; seconds: number }
  | { kind: 'failed'; message: string }
  | { kind: 'cancelled' };

/** The jobs of the sweep: the draft under each scenario, its probe column, with sizing. */
function sweepJobs(draft: SiteInputDraft, scenarios: { name: string; scenario: Scenario }[]) {
  return scenarios.map(({ scenario }) => {
    const input = siteInputSchema.parse(scenarioStudyDraft(draft, scenario));
    const run = studyRunInput(input, scenario);
    const job: SiteRunRequest = { type: 'run', input: run.input, scenario, column: run.column };
    return { job, run };
  });
}

/** Each scenario's outcome and key figures from the pool's results. */
function sweepRuns(
  scenarios: { name: string; scenario: Scenario }[],
  jobs: ReturnType<typeof sweepJobs>,
  results: SitePoolResult[],
): ScenarioRun[] {
  return results.map((r, i) => {
    const { input, column } = jobs[i].run;
    const outcome: SiteRunOutcome = { input, column, ...r };
    const { scenario, name } = scenarios[i];
    const loadShare = siteStudyReport(outcome, scenario).loadShare;
    const figures = scenarioStudyFigures(outcome, loadShare, scenario);
    return { name, scenario, outcome, figures, colour: SCENARIO_COLOURS[i % SCENARIO_COLOURS.length] };
  });
}

/** The sweep's state, start (the form as it stands) and cancel; cancelled when the study closes. */
export function useScenarioSweep(manifest: Manifest, dataBase: URL | undefined) {
  const [state, setState] = useState<SweepState>({ kind: 'idle' });
  const handle = useRef<SitePoolHandle<SitePoolResult> | null>(null);
  const live = useRef(true);
  useEffect(() => {
    live.current = true;
    return () => {
      live.current = false;
      handle.current?.cancel();
    };
  }, []);
  const start = async (draft: unknown) => {
    if (!dataBase) return;
    const t0 = performance.now();
    try {
      const parsed = siteInputSchema.parse(draft) as SiteInputDraft;
      const scenarios = (await loadSetScenarios(manifest, dataBase)).map((s) => ({
        name: s.name,
        scenario: scenarioFromManifest(s.manifest.scenario),
      }));
      if (!live.current) return;
      const jobs = sweepJobs(parsed, scenarios);
      setState({ kind: 'running', done: 0, total: jobs.length, fraction: 0 });
      const h = runSitePool(
        jobs.map((j) => j.job),
        (done, total, fraction) => setState({ kind: 'running', done, total, fraction }),
      );
      handle.current = h;
      const results = await h.result;
      handle.current = null;
      const runs = sweepRuns(scenarios, jobs, results);
      setState({ kind: 'done', runs, seconds: (performance.now() - t0) / 1000 });
    } catch (e) {
      handle.current = null;
      if (!live.current) return;
      setState(
        e instanceof SiteRunCancelled
          ? { kind: 'cancelled' }
          : { kind: 'failed', message: (e as Error).message },
      );
    }
  };
  return { state, start, cancel: () => handle.current?.cancel() };
}

/** The control, its progress and the table of every scenario's key figures. */
export function ScenarioSweepPanel(props: {
  manifest: Manifest;
  state: SweepState;
  units: UnitSystem;
  canRun: boolean;
  onStart(): void;
  onCancel(): void;
}) {
  const { state } = props;
  const count = props.manifest.scenarioSet?.scenarios.length ?? 0;
  if (count < 2) return null;
  return (
    <section className="scenario-sweep" aria-label="Every scenario" data-testid="scenario-sweep">
      <h3>Every scenario of the build</h3>
      <p className="small">
        The inputs of the form under each of the {count} scenarios (each with its own warming and design
        life), drawn over the probe chart below and compared in the table.
      </p>
      {state.kind === 'running' ? (
        <p className="small" role="status" data-testid="sweep-progress">
          <progress value={state.fraction} max={1} /> {state.done} of {state.total} scenarios done{' '}
          <button type="button" onClick={props.onCancel} data-testid="sweep-cancel">
            Cancel
          </button>
        </p>
      ) : (
        <button type="button" onClick={props.onStart} disabled={!props.canRun} data-testid="sweep-start">
          Run under every scenario ({count})
        </button>
      )}
      {state.kind === 'failed' ? <p role="alert">The runs stopped: {state.message}</p> : null}
      {state.kind === 'cancelled' ? <p role="status">Runs under every scenario cancelled.</p> : null}
      {state.kind === 'done' ? (
        <>
          <p className="small" role="status" data-testid="sweep-done">
            {state.runs.length} scenarios in {state.seconds.toFixed(1)} s.
          </p>
          <SweepTable runs={state.runs} units={props.units} />
        </>
      ) : null}
    </section>
  );
}

const dash = '—';

function thawText(f: ScenarioStudyFigures, units: UnitSystem): string {
  if (f.thawDelay_yr === null) return 'no thaw in the run';
  const v = formatQuantity(f.thawDelay_yr, 'yr', units);
  return f.thawDelayBound === 'lower' ? `at least ${v}` : f.thawDelayBound === 'upper' ? `at most ${v}` : v;
}

function SweepTable(props: { runs: ScenarioRun[]; units: UnitSystem }) {
  const { units } = props;
  const t = (v: number | null) => (v === null ? dash : formatQuantity(v, '°C', units));
  return (
    <table className="values compare" data-testid="sweep-table">
      <thead>
        <tr>
          <th scope="col">Scenario</th>
          <th scope="col">Thaw delay bought by the pile</th>
          <th scope="col">Piles by design pulse</th>
          <th scope="col">Share of the heating load the piles carry</th>
          <th scope="col">
            {displayTitle('Ground temperature at pile mid-depth, end of life, without piles', '°C', units)}
          </th>
          <th scope="col">{displayTitle('… with the pile', '°C', units)}</th>
        </tr>
      </thead>
      <tbody>
        {props.runs.map((r) => (
          <tr key={r.name}>
            <th scope="row">
              <span className="swatch" style={{ background: r.colour }} aria-hidden="true" /> {r.name}
            </th>
            <td>{thawText(r.figures, units)}</td>
            <td>{r.figures.pileCount ?? dash}</td>
            <td>{r.figures.loadShare === null ? dash : `${formatNumber(r.figures.loadShare * 100, 2)} %`}</td>
            <td>{t(r.figures.groundTempEnd_C)}</td>
            <td>{t(r.figures.groundTempEndPiles_C)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
