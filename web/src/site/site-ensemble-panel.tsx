/**
 * The site study's ensemble: a few dozen runs of the simulator with the site's uncertain inputs
 * perturbed (layers/screening/site-ensemble.ts, the same declared spreads as the map's ensemble),
 * across the page's Web Workers with progress and Cancel; then a fan chart of the probe temperature,
 * a chart of the share of members thawed at the probe without and with the piles, the range of the
 * thaw delay and the inputs that drive the spread (first-order indices by squared
 * standardised regression coefficients).
 */
import { useEffect, useRef, useState } from 'react';
import {
  planSiteEnsemble,
  summariseSiteEnsemble,
  type SiteEnsembleSummary,
} from '../../../layers/screening/site-ensemble';
import { scenarioUncertaintySchema } from '../../../layers/screening/uncertainty-schema';
import type { Scenario } from '../../../layers/screening/scenario';
import { displayConversion, formatNumber, type UnitSystem } from '../units/display-units';
import { ProbeFanChart } from './charts/probe-fan-chart';
import { ThawShareChart } from './charts/thaw-share-chart';
import { runSiteEnsemble, type SiteEnsembleHandle } from './run-site-ensemble';
import { SiteRunCancelled } from './run-site-in-worker';
import type { SiteRunOutcome } from './site-results';

/** Members of the study's ensemble: 24 coarse-mesh runs finish within about 30 s on two loaded cores. */
export const SITE_ENSEMBLE_MEMBERS = 24;

type EnsembleState =
  | { kind: 'idle' }
  | { kind: 'running'; done: number; total: number }
  | { kind: 'done'; summary: SiteEnsembleSummary; seconds: number; workers: number }
  | { kind: 'error'; message: string };

/** The ensemble run of one site run's inputs: start, progress, cancel (also when the panel closes). */
function useSiteEnsemble(outcome: SiteRunOutcome, scenario: Scenario) {
  const [state, setState] = useState<EnsembleState>({ kind: 'idle' });
  const handle = useRef<SiteEnsembleHandle | null>(null);
  useEffect(() => () => handle.current?.cancel(), []);
  const start = () => {
    const u = scenarioUncertaintySchema.parse(scenario.uncertainty ?? {});
    const keep = Math.max(1, outcome.column.firstProbe);
    const base = { ...outcome.input, probes: outcome.input.probes.slice(0, keep) };
    const plan = planSiteEnsemble(base, u, SITE_ENSEMBLE_MEMBERS, u.seed);
    const t0 = performance.now();
    setState({ kind: 'running', done: 0, total: plan.members.length });
    const h = runSiteEnsemble(plan.members, { scenario, column: outcome.column }, (done, total) =>
      setState({ kind: 'running', done, total }),
    );
    handle.current = h;
    h.result.then(
      (results) => {
        handle.current = null;
        setState({
          kind: 'done',
          summary: summariseSiteEnsemble(plan, results),
          seconds: (performance.now() - t0) / 1000,
          workers: h.workers,
        });
      },
      (e: unknown) => {
        handle.current = null;
        setState(
          e instanceof SiteRunCancelled
            ? { kind: 'idle' }
            : { kind: 'error', message: e instanceof Error ? e.message : String(e) },
        );
      },
    );
  };
  return { state, start, cancel: () => handle.current?.cancel() };
}

export function SiteEnsemblePanel(props: {
  outcome: SiteRunOutcome;
  scenario: Scenario;
  units: UnitSystem;
  freezingPoint_C: number;
}) {
  const { outcome, scenario, units } = props;
  const { state, start, cancel } = useSiteEnsemble(outcome, scenario);
  const depth = displayConversion('m', units);
  const probe = outcome.input.probes[0];
  const where = probe
    ? `${(probe.r_m * depth.factor).toFixed(1)} ${depth.unit} from the pile axis, ${(probe.z_m * depth.factor).toFixed(1)} ${depth.unit} deep`
    : 'the first probe';
  return (
    <section
      className="site-ensemble"
      aria-label="Ranges over the uncertain inputs"
      data-testid="site-ensemble"
    >
      <h3>Ranges over the uncertain inputs</h3>
      <p className="small muted">
        Runs the simulator {SITE_ENSEMBLE_MEMBERS} times (coarse mesh, steps of at least a week) with air
        temperature, amplitude, warming trend, n-factors, water + ice content and geothermal flux varied over
        their declared spreads (Latin hypercube), to show how sure the result is. Screening estimate, not a
        design.
      </p>
      {state.kind === 'running' ? (
        <div role="status" data-testid="ensemble-progress">
          <progress value={state.done} max={state.total} /> {state.done} of {state.total} members{' '}
          <button type="button" onClick={cancel} data-testid="ensemble-cancel">
            Cancel
          </button>
        </div>
      ) : (
        <button type="button" onClick={start} data-testid="ensemble-run">
          Run ensemble ({SITE_ENSEMBLE_MEMBERS} members)
        </button>
      )}
      {state.kind === 'error' ? (
        <p className="notice error" role="alert">
          The ensemble failed: {state.message}
        </p>
      ) : null}
      {state.kind === 'done' ? (
        <EnsembleResult {...state} where={where} freezingPoint_C={props.freezingPoint_C} units={units} />
      ) : null}
    </section>
  );
}

/** The ensemble's fan chart, thaw-share chart, thaw-delay range and sensitivity table. */
function EnsembleResult(props: {
  summary: SiteEnsembleSummary;
  seconds: number;
  workers: number;
  where: string;
  freezingPoint_C: number;
  units: UnitSystem;
}) {
  const { summary, workers } = props;
  const yr = (v: number) => (Number.isFinite(v) ? `${formatNumber(v, 3)} yr` : 'not defined');
  return (
    <div data-testid="ensemble-result">
      <p className="small" data-testid="ensemble-timing">
        {summary.members} members in {props.seconds.toFixed(1)} s on {workers} worker
        {workers === 1 ? '' : 's'}.
      </p>
      <ProbeFanChart
        summary={summary}
        where={props.where}
        freezingPoint_C={props.freezingPoint_C}
        units={props.units}
      />
      <ThawShareChart summary={summary} where={props.where} />
      <p data-testid="ensemble-thaw-delay">
        <strong>Thaw delay at the probe:</strong>{' '}
        {summary.thawDelay.defined > 0
          ? `P10 ${yr(summary.thawDelay.p10)}, P50 ${yr(summary.thawDelay.p50)}, P90 ${yr(summary.thawDelay.p90)} (defined in ${summary.thawDelay.defined} of ${summary.members} members; elsewhere the probe does not thaw within the run)`
          : `the probe does not thaw within the run in any of the ${summary.members} members`}
      </p>
      <table className="values" data-testid="ensemble-sensitivity">
        <caption className="small">
          What drives the spread of the probe temperature at the end of the run: first-order indices (squared
          standardised regression coefficients, Saltelli et al. 2008); the linear fit explains{' '}
          {formatNumber(100 * summary.rSquared, 2)} % of the spread.
        </caption>
        <thead>
          <tr>
            <th scope="col">Input</th>
            <th scope="col">Share of the spread</th>
          </tr>
        </thead>
        <tbody>
          {summary.sensitivity.map((s) => (
            <tr key={s.id}>
              <th scope="row">{s.title}</th>
              <td>{Math.round(100 * s.index)} %</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
