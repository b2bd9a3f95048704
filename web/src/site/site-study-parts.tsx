/**
 * The pieces of the site study dialog: its head (title, place, print, reset, close), the run bar
 * (run, progress, cancel, status, cost), the schema-driven input form, and the sheet's printed parts
 * (header line, cautions, inputs table).
 */
import type { Ref } from 'react';
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../../layers/cautions';
import { siteInputSchema } from '../../../layers/site/site-input-schema';
import type { SitePrefill } from '../../../layers/screening/site-prefill';
import { formatLonLat, formatNoteParts } from '../units/display-units';
import { SchemaField } from './site-form';
import type { FormContext } from './form-inputs';
import { fieldLabel, flattenInputs } from './schema-form-model';
import { runStatusText, type RunCost, type RunState } from './site-study-run';
import type { SitePlace } from './site-panel';

const TOP_GROUPS = ['ground', 'climate', 'pile', 'operation', 'probes', 'domain', 'numerics'] as const;
const RUN_FIELDS = ['years', 'timeStep_days', 'outputStep_days'] as const;

export function StudyHead(props: {
  place: SitePlace;
  heading: Ref<HTMLHeadingElement>;
  onReset(): void;
  onClose(): void;
}) {
  const { place } = props;
  return (
    <header className="site-head">
      <h2 id="site-study-title" tabIndex={-1} ref={props.heading}>
        Site study <span className="muted">· {place.name}</span>
      </h2>
      <span className="site-where small muted">{formatLonLat(place.lon, place.lat, 4)}</span>
      <div className="site-actions">
        <button type="button" onClick={() => window.print()} data-testid="print-site-sheet">
          Print site sheet
        </button>
        <button type="button" onClick={props.onReset}>
          Reset to map values
        </button>
        <button type="button" className="icon" onClick={props.onClose} aria-label="Close site study">
          ×
        </button>
      </div>
    </header>
  );
}

export function RunBar(props: {
  run: RunState;
  blocked: boolean;
  issueCount: number;
  cost: RunCost | null;
  runLength: SitePrefill['runLength'];
  onStart(): void;
  onCancel(): void;
}) {
  const { run, cost } = props;
  const running = run.kind === 'running';
  return (
    <div className="site-runbar">
      <button
        type="button"
        className="primary"
        onClick={props.onStart}
        disabled={running}
        data-testid="run-site"
      >
        {run.kind === 'done' ? 'Run again' : 'Run simulation'}
      </button>
      {running ? (
        <>
          <progress
            max={1}
            value={run.progress}
            aria-label="Simulation progress"
            data-testid="site-progress"
          />
          <span className="small">{Math.round(run.progress * 100)} %</span>
          <button type="button" onClick={props.onCancel} data-testid="cancel-site">
            Cancel
          </button>
        </>
      ) : null}
      <span role="status" className="small run-status" data-testid="run-status">
        {runStatusText(run, props.blocked, props.issueCount)}
      </span>
      {!running && cost ? (
        <span className="small muted" data-testid="run-cost">
          This run: {cost.years} simulated years, {cost.cells} cells × {cost.timeSteps} steps, about{' '}
          {cost.estimate_s < 10 ? cost.estimate_s.toFixed(0) : Math.round(cost.estimate_s / 5) * 5} s.{' '}
          {props.runLength.years === cost.years ? props.runLength.reason : ''}
        </span>
      ) : null}
    </div>
  );
}

export function SiteInputsForm(props: {
  ctx: FormContext;
  issueCount: number;
  prefillNotes: SitePrefill['notes'];
  fieldMeta: Parameters<typeof fieldLabel>[1];
  onSubmit(): void;
}) {
  const { ctx, issueCount } = props;
  return (
    <form
      className="site-form"
      onSubmit={(e) => {
        e.preventDefault();
        props.onSubmit();
      }}
      aria-label="Site inputs"
    >
      {issueCount > 0 ? (
        <div className="notice warn" data-testid="site-issues">
          {issueCount} input{issueCount > 1 ? 's' : ''} to fix:
          <ul>
            {[...ctx.issues.entries()].flatMap(([path, ms]) =>
              ms.map((msg) => (
                <li key={`${path}:${msg}`}>
                  {fieldLabel(path, props.fieldMeta)}: {msg}
                </li>
              )),
            )}
          </ul>
        </div>
      ) : null}
      {props.prefillNotes.length ? (
        <div className="notice small">
          {props.prefillNotes.map((n) => (
            <p key={n.path}>{n.parts ? formatNoteParts(n.parts, ctx.units ?? 'SI') : n.text}</p>
          ))}
        </div>
      ) : null}
      <fieldset className="group">
        <legend>Run</legend>
        {RUN_FIELDS.map((k) => (
          <SchemaField key={k} ctx={ctx} schema={siteInputSchema.shape[k]} path={[k]} name={k} />
        ))}
      </fieldset>
      {TOP_GROUPS.map((k) => (
        <SchemaField key={k} ctx={ctx} schema={siteInputSchema.shape[k]} path={[k]} name={k} />
      ))}
    </form>
  );
}

/** The printed sheet's header line and the cautions every sheet carries. */
export function SheetHeaderAndCautions(props: { place: SitePlace; fictional: boolean }) {
  const { place } = props;
  return (
    <>
      <p className="print-only small" data-testid="sheet-header">
        Pile Atlas site sheet · {place.name} · {place.lat.toFixed(4)}° N, {place.lon.toFixed(4)}° E · printed{' '}
        {new Date().toISOString().slice(0, 10)}
        {props.fictional ? ` · ${FICTIONAL_DATA_NOTICE}` : ''}
      </p>
      <div className="notice caution" role="note" data-testid="site-cautions">
        <strong>{SCREENING_CAUTION}</strong>
        <ul>
          {GROUND_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </div>
    </>
  );
}

/** The printed inputs table: those of the run when there is one (the planner's own probes), else the form's. */
export function SheetInputs({ run, draft }: { run: RunState; draft: unknown }) {
  const shown =
    run.kind === 'done'
      ? { ...run.outcome.input, probes: run.outcome.input.probes.slice(0, run.outcome.column.firstProbe) }
      : draft;
  return (
    <section className="print-only site-sheet-inputs">
      <h3>Inputs</h3>
      <table className="values">
        <tbody>
          {flattenInputs(siteInputSchema, shown).map((l, i) => (
            <tr key={i}>
              <th scope="row">{l.label}</th>
              <td>
                {l.value} {l.unit}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
