/**
 * The site study: the schema-driven form on the left, the run (Web Worker, progress bar, cancel) and
 * the results on the right; print gives the one-page site sheet (inputs, results, charts, cautions).
 * Rendered into document.body so it covers the dashboard and prints on its own.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { createPortal } from 'react-dom';
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../../layers/cautions';
import { siteInputSchema, type SiteInputDraft } from '../../../layers/site/site-input-schema';
import { screenCell, type CellScreening } from '../../../layers/screening/cell-screening-model';
import type { Manifest } from '../../../layers/screening/manifest';
import { shortlistStore } from '../shortlist/shortlist-store';
import { formatLonLat, type UnitSystem } from '../units/display-units';
import { SchemaField } from './site-form';
import { fieldId, type FormContext } from './form-inputs';
import { flattenInputs, issuesByPath } from './schema-form-model';
import { cellInputsFromSite, scenarioFromManifest, type SitePrefill } from './site-prefill';
import { withProfileProbes } from './site-profile';
import { runSiteInWorker, SiteRunCancelled, type SiteRunHandle } from './run-site-in-worker';
import { SiteCharts, SiteSummaryTable, useSiteDerived, type SiteRunOutcome } from './site-results';
import type { SitePlace } from './site-panel';

type RunState =
  | { kind: 'idle' }
  | { kind: 'running'; progress: number; phase: 'simulating' | 'sizing' }
  | { kind: 'done'; outcome: SiteRunOutcome }
  | { kind: 'failed'; message: string }
  | { kind: 'cancelled' };

const TOP_GROUPS = ['ground', 'climate', 'pile', 'operation', 'probes', 'domain', 'numerics'] as const;
const RUN_FIELDS = ['years', 'timeStep_days', 'outputStep_days'] as const;

export function SiteStudy(props: {
  place: SitePlace;
  prefill: SitePrefill;
  manifest: Manifest;
  units: UnitSystem;
  onClose(): void;
}) {
  const { place, prefill, manifest, units } = props;
  const scenario = useMemo(() => scenarioFromManifest(manifest.scenario), [manifest.scenario]);
  const [draft, setDraft] = useState<unknown>(prefill.draft);
  const [formKey, setFormKey] = useState(0);
  const issues = useMemo(() => issuesByPath(siteInputSchema, draft), [draft]);
  const [run, setRun] = useState<RunState>({ kind: 'idle' });
  const [blocked, setBlocked] = useState(false);
  const [added, setAdded] = useState<string | null>(null);
  const handle = useRef<SiteRunHandle | null>(null);
  const heading = useRef<HTMLHeadingElement>(null);
  const onClose = useRef(props.onClose);
  onClose.current = props.onClose;

  useEffect(() => {
    // A modal dialog: the page behind it is inert (no focus, no clicks, hidden from assistive
    // technology) while it is open, so Tab stays inside the study; Escape closes it.
    const page = [...document.body.children].filter(
      (el): el is HTMLElement => el instanceof HTMLElement && !el.classList.contains('site-overlay'),
    );
    const wasInert = page.map((el) => el.inert);
    page.forEach((el) => (el.inert = true));
    heading.current?.focus();
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') onClose.current();
    };
    window.addEventListener('keydown', onKey);
    return () => {
      window.removeEventListener('keydown', onKey);
      page.forEach((el, i) => (el.inert = wasInert[i]));
      handle.current?.cancel();
    };
  }, []);

  const quick: CellScreening | null = useMemo(() => {
    try {
      const parsed = siteInputSchema.safeParse(draft);
      const ci = cellInputsFromSite((parsed.success ? parsed.data : draft) as SiteInputDraft, scenario);
      return ci ? screenCell(ci, scenario) : null;
    } catch {
      return null;
    }
  }, [draft, scenario]);

  const start = () => {
    const parsed = siteInputSchema.safeParse(draft);
    if (!parsed.success) {
      setBlocked(true);
      const first = parsed.error.issues[0];
      const el = first ? document.getElementById(fieldId(first.path as (string | number)[])) : null;
      el?.focus();
      return;
    }
    setBlocked(false);
    const inputParsed = parsed.data;
    const pileR = inputParsed.pile ? inputParsed.pile.outerDiameter_m / 2 : 0;
    const r = Math.min(Math.max(scenario.referenceRadius_m, pileR + 0.05), inputParsed.domain.radius_m);
    const { input, column } = withProfileProbes(inputParsed, r);
    setRun({ kind: 'running', progress: 0, phase: 'simulating' });
    let last = 0;
    const h = runSiteInWorker(input, { scenario, column }, (f, phase) => {
      if (phase === 'sizing' || f - last >= 0.01) {
        last = f;
        setRun({ kind: 'running', progress: f, phase });
      }
    });
    handle.current = h;
    h.result.then(
      ({ result, sizing, elapsed_ms }) => {
        handle.current = null;
        setRun({
          kind: 'done',
          outcome: { input: siteInputSchema.parse(input), result, column, sizing, elapsed_ms },
        });
      },
      (e: unknown) => {
        handle.current = null;
        setRun(
          e instanceof SiteRunCancelled
            ? { kind: 'cancelled' }
            : { kind: 'failed', message: (e as Error).message },
        );
      },
    );
  };

  const ctx: FormContext = { root: draft, issues, onChange: setDraft, units };
  const issueCount = [...issues.values()].reduce((n, m) => n + m.length, 0);
  const running = run.kind === 'running';

  const addToShortlist = (derived: ReturnType<typeof useSiteDerived> | null) => {
    const metrics: Record<string, number | string | null> = {};
    if (quick) {
      metrics.quickThawDelay_yr = quick.metrics.thawDelay.value;
      metrics.quickPilesPerTon = quick.metrics.pilesPerTon.value;
    }
    if (derived && run.kind === 'done') {
      metrics.thawDelay_yr = derived.thawDelay[0] ?? null;
      metrics.thawDelayIsLowerBound = derived.lowerBound[0] ? 'yes' : 'no';
      metrics.thawDelayIsUpperBound = derived.upperBound[0] ? 'yes' : 'no';
      metrics.pileCount = derived.sizing?.ok ? derived.sizing.sizing.pileCount : null;
      metrics.peakLoad_kW = derived.peakLoad_W !== null ? derived.peakLoad_W / 1000 : null;
      metrics.lowestFluid_C = run.outcome.result.fluid?.lowest_C ?? null;
      metrics.fuelSaved_L_per_yr = derived.savings?.fuelSaved_L ?? null;
      metrics.co2Avoided_t_per_yr = derived.savings?.co2Avoided_t ?? null;
      metrics.systemCop = derived.savings?.system?.systemCop ?? null;
      metrics.capitalCost = derived.savings?.system?.capitalCost ?? null;
      metrics.simplePayback_yr = derived.savings?.system?.payback_yr ?? null;
      metrics.simulatedYears_yr = run.outcome.input.years;
    }
    const item = shortlistStore.add({
      name: place.name,
      lon: place.lon,
      lat: place.lat,
      origin: 'site',
      values: place.values,
      metrics,
    });
    setAdded(
      `Added “${item.name}” to the shortlist${run.kind === 'done' ? ' with the simulated results' : ''}.`,
    );
  };

  const overlay = (
    <div
      className="site-overlay"
      role="dialog"
      aria-modal="true"
      aria-labelledby="site-study-title"
      data-testid="site-study"
    >
      <div className="site-study">
        <header className="site-head">
          <h2 id="site-study-title" tabIndex={-1} ref={heading}>
            Site study <span className="muted">· {place.name}</span>
          </h2>
          <span className="site-where small muted">{formatLonLat(place.lon, place.lat, 4)}</span>
          <div className="site-actions">
            <button type="button" onClick={() => window.print()} data-testid="print-site-sheet">
              Print site sheet
            </button>
            <button
              type="button"
              onClick={() => {
                setDraft(prefill.draft);
                setFormKey((k) => k + 1);
              }}
            >
              Reset to map values
            </button>
            <button type="button" className="icon" onClick={props.onClose} aria-label="Close site study">
              ×
            </button>
          </div>
        </header>
        <div className="site-runbar">
          <button type="button" className="primary" onClick={start} disabled={running} data-testid="run-site">
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
              <button type="button" onClick={() => handle.current?.cancel()} data-testid="cancel-site">
                Cancel
              </button>
            </>
          ) : null}
          <span role="status" className="small run-status" data-testid="run-status">
            {blocked && issueCount > 0
              ? `Not run: ${issueCount} input${issueCount > 1 ? 's need' : ' needs'} attention (marked in the form).`
              : run.kind === 'running'
                ? run.phase === 'sizing'
                  ? 'Sizing the pile field by design pulse…'
                  : 'Simulating in the background; the page stays responsive (Cancel stops it).'
                : run.kind === 'done'
                  ? `Done in ${(run.outcome.elapsed_ms / 1000).toFixed(1)} s (${run.outcome.result.mesh.nr}×${run.outcome.result.mesh.nz} cells, ${run.outcome.result.mesh.timeSteps} steps).`
                  : run.kind === 'failed'
                    ? `The run stopped: ${run.message}`
                    : run.kind === 'cancelled'
                      ? 'Run cancelled.'
                      : 'Edit the inputs, then run.'}
          </span>
        </div>
        <div className="site-body">
          <form
            className="site-form"
            key={formKey}
            onSubmit={(e) => {
              e.preventDefault();
              start();
            }}
            aria-label="Site inputs"
          >
            {issueCount > 0 ? (
              <div className="notice warn" data-testid="site-issues">
                {issueCount} input{issueCount > 1 ? 's' : ''} to fix:
                <ul>
                  {[...issues.entries()].flatMap(([path, ms]) =>
                    ms.map((msg) => (
                      <li key={`${path}:${msg}`}>
                        <code>{path || 'input'}</code>: {msg}
                      </li>
                    )),
                  )}
                </ul>
              </div>
            ) : null}
            {prefill.notes.length ? (
              <div className="notice small">
                {prefill.notes.map((n) => (
                  <p key={n.path}>{n.text}</p>
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
          <section className="site-output" aria-label="Site results">
            <p className="print-only small" data-testid="sheet-header">
              Pile Atlas site sheet · {place.name} · {place.lat.toFixed(4)}° N, {place.lon.toFixed(4)}° E ·
              printed {new Date().toISOString().slice(0, 10)}
              {manifest.fictional ? ` · ${FICTIONAL_DATA_NOTICE}` : ''}
            </p>
            <div className="notice caution" role="note" data-testid="site-cautions">
              <strong>{SCREENING_CAUTION}</strong>
              <ul>
                {GROUND_CAUTIONS.map((c) => (
                  <li key={c}>{c}</li>
                ))}
              </ul>
            </div>
            {run.kind === 'done' ? (
              <SiteOutcome
                outcome={run.outcome}
                quick={quick}
                scenario={scenario}
                units={units}
                onAdd={addToShortlist}
                added={added}
              />
            ) : (
              <>
                <p className="muted">
                  Run the simulation to see the charts. The quick estimate for these inputs:
                </p>
                <QuickOnly quick={quick} />
                <button type="button" onClick={() => addToShortlist(null)} data-testid="site-add-shortlist">
                  Add to shortlist
                </button>
                {added ? (
                  <p className="small" role="status">
                    {added}
                  </p>
                ) : null}
              </>
            )}
            <section className="print-only site-sheet-inputs">
              <h3>Inputs</h3>
              <table className="values">
                <tbody>
                  {flattenInputs(
                    siteInputSchema,
                    run.kind === 'done'
                      ? {
                          ...run.outcome.input,
                          probes: run.outcome.input.probes.slice(0, run.outcome.column.firstProbe),
                        }
                      : draft,
                  ).map((l, i) => (
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
          </section>
        </div>
      </div>
    </div>
  );
  return createPortal(overlay, document.body);
}

function QuickOnly(props: { quick: CellScreening | null }) {
  const m = props.quick?.metrics;
  if (!m) return <p className="small">No quick estimate for explicit layer properties.</p>;
  const rows: [string, { value: number | null; unit: string }][] = [
    ['Thaw delay', m.thawDelay],
    ['Piles per ton of peak heating', m.pilesPerTon],
    ['Heat per pile', m.extractionPerPile],
    ['Fuel saved', m.fuelSaved],
  ];
  return (
    <table className="values" data-testid="site-quick">
      <tbody>
        {rows.map(([label, v]) => (
          <tr key={label}>
            <th scope="row">{label}</th>
            <td>{v.value === null ? '—' : `${Number(v.value.toPrecision(3))} ${v.unit}`}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function SiteOutcome(props: {
  outcome: SiteRunOutcome;
  quick: CellScreening | null;
  scenario: ReturnType<typeof scenarioFromManifest>;
  units: UnitSystem;
  onAdd(d: ReturnType<typeof useSiteDerived>): void;
  added: string | null;
}) {
  const derived = useSiteDerived(props.outcome, props.scenario);
  return (
    <div className="site-outcome" data-testid="site-outcome">
      <SiteSummaryTable
        run={props.outcome}
        derived={derived}
        quick={props.quick}
        scenario={props.scenario}
        units={props.units}
      />
      <button type="button" onClick={() => props.onAdd(derived)} data-testid="site-add-shortlist">
        Add to shortlist
      </button>
      {props.added ? (
        <p className="small" role="status">
          {props.added}
        </p>
      ) : null}
      {derived.notes.length ? (
        <ul className="site-notes" data-testid="site-notes">
          {derived.notes.map((n, i) => (
            <li key={i} className={`note-${n.kind}`}>
              {n.text}
            </li>
          ))}
        </ul>
      ) : null}
      <SiteCharts run={props.outcome} derived={derived} quick={props.quick} units={props.units} />
    </div>
  );
}
