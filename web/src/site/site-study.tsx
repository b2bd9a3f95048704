/**
 * The site study: the schema-driven form on the left, the run (Web Worker, progress bar, cancel) and
 * the results on the right; print gives the one-page site sheet (inputs, results, charts, cautions).
 * Rendered into document.body so it covers the dashboard and prints on its own.
 */
import { useEffect, useMemo, useRef, useState, type ReactNode, type RefObject } from 'react';
import { createPortal } from 'react-dom';
import { siteInputSchema } from '../../../layers/site/site-input-schema';
import type { CellScreening } from '../../../layers/screening/cell-screening-model';
import type { Manifest } from '../../../layers/screening/manifest';
import { shortlistStore } from '../shortlist/shortlist-store';
import { displayTitle, formatNoteParts, formatQuantity, type UnitSystem } from '../units/display-units';
import type { FormContext } from './form-inputs';
import { issuesByPath } from './schema-form-model';
import { siteFieldMeta } from '../../../layers/site/site-input-schema';
import { scenarioFromManifest, type SitePrefill } from '../../../layers/screening/site-prefill';
import { SiteEnsemblePanel } from './site-ensemble-panel';
import { ScenarioSweepPanel, useScenarioSweep, type ScenarioRun } from './scenario-sweep';
import { scenarioMetrics } from '../data/scenario-urls';
import {
  SiteCharts,
  SiteSummaryTable,
  useSiteDerived,
  type SiteDerived,
  type SiteRunOutcome,
} from './site-results';
import type { SitePlace } from './site-panel';
import {
  quickEstimateOf,
  runCostOf,
  shortlistMetrics,
  useSiteRun,
  type RunState,
  type StudyScenario,
} from './site-study-run';
import { RunBar, SheetHeaderAndCautions, SheetInputs, SiteInputsForm, StudyHead } from './site-study-parts';

/**
 * A modal dialog: the page behind it is inert (no focus, no clicks, hidden from assistive technology)
 * while it is open, so Tab stays inside the study; the heading takes the focus; Escape closes it.
 */
function useModalDialog(heading: RefObject<HTMLHeadingElement | null>, onClose: () => void): void {
  const close = useRef(onClose);
  close.current = onClose;
  useEffect(() => {
    const page = [...document.body.children].filter(
      (el): el is HTMLElement => el instanceof HTMLElement && !el.classList.contains('site-overlay'),
    );
    const wasInert = page.map((el) => el.inert);
    page.forEach((el) => (el.inert = true));
    heading.current?.focus();
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') close.current();
    };
    window.addEventListener('keydown', onKey);
    return () => {
      window.removeEventListener('keydown', onKey);
      page.forEach((el, i) => (el.inert = wasInert[i]));
    };
  }, [heading]);
}

export function SiteStudy(props: {
  place: SitePlace;
  prefill: SitePrefill;
  manifest: Manifest;
  units: UnitSystem;
  /** Where the build's data lives (the other scenarios of a set are read from beside it). */
  dataBase?: URL;
  onClose(): void;
}) {
  const { place, prefill, manifest, units } = props;
  const scenario = useMemo(() => scenarioFromManifest(manifest.scenario), [manifest.scenario]);
  const [draft, setDraft] = useState<unknown>(prefill.draft);
  const [formKey, setFormKey] = useState(0);
  const issues = useMemo(() => issuesByPath(siteInputSchema, draft), [draft]);
  const fieldMeta = useMemo(() => siteFieldMeta(), []);
  // The cost of the run as the form stands, stated before it starts.
  const cost = useMemo(() => runCostOf(draft), [draft]);
  const quick = useMemo(() => quickEstimateOf(draft, scenario), [draft, scenario]);
  const { run, blocked, start, cancel } = useSiteRun(scenario);
  const heading = useRef<HTMLHeadingElement>(null);
  useModalDialog(heading, props.onClose);

  const ctx: FormContext = { root: draft, issues, onChange: setDraft, units };
  const issueCount = [...issues.values()].reduce((n, m) => n + m.length, 0);

  const { added, addToShortlist } = useAddToShortlist(place, quick, run, scenarioMetrics(manifest));
  const sweep = useScenarioSweep(manifest, props.dataBase);
  const sweepPanel = (
    <ScenarioSweepPanel
      manifest={manifest}
      state={sweep.state}
      units={units}
      canRun={issueCount === 0 && props.dataBase !== undefined}
      onStart={() => void sweep.start(draft)}
      onCancel={sweep.cancel}
    />
  );
  const { stale, startNow } = useStaleMark(run, draft, issueCount, start);

  const overlay = (
    <div
      className="site-overlay"
      role="dialog"
      aria-modal="true"
      aria-labelledby="site-study-title"
      data-testid="site-study"
    >
      <div className="site-study">
        <StudyHead
          place={place}
          heading={heading}
          onReset={() => {
            setDraft(prefill.draft);
            setFormKey((k) => k + 1);
          }}
          onClose={props.onClose}
        />
        <RunBar
          {...{ run, blocked, issueCount, cost }}
          runLength={prefill.runLength}
          onStart={startNow}
          onCancel={cancel}
        />
        <div className="site-body">
          <SiteInputsForm
            key={formKey}
            {...{ ctx, issueCount, fieldMeta }}
            prefillNotes={prefill.notes}
            onSubmit={startNow}
          />
          <section className="site-output" aria-label="Site results">
            <SheetHeaderAndCautions place={place} fictional={manifest.fictional} />
            <SiteResultsOrQuick
              {...{ run, quick, scenario, units, added, stale, sweepPanel }}
              scenarioRuns={sweep.state.kind === 'done' ? sweep.state.runs : undefined}
              onAdd={addToShortlist}
            />
            <SheetInputs run={run} draft={draft} />
          </section>
        </div>
      </div>
    </div>
  );
  return createPortal(overlay, document.body);
}

/** Shortlist the studied place (a second add at the same place updates it) and say which it was. */
function useAddToShortlist(
  place: SitePlace,
  quick: CellScreening | null,
  run: RunState,
  recorded: ReturnType<typeof scenarioMetrics>,
) {
  const [added, setAdded] = useState<string | null>(null);
  const addToShortlist = (derived: SiteDerived | null) => {
    const listed = shortlistStore.atPlace(place.lon, place.lat);
    const item = shortlistStore.add({
      name: place.name,
      lon: place.lon,
      lat: place.lat,
      origin: 'site',
      values: place.values,
      // The scenario the study and the cell's values are of, as a site added from the map records it.
      metrics: { ...recorded, ...shortlistMetrics(quick, derived, run) },
    });
    const withResults = run.kind === 'done' ? ' with the simulated results' : '';
    setAdded(
      listed
        ? `“${item.name}” is already on the shortlist at this place: updated${withResults}, not added twice.`
        : `Added “${item.name}” to the shortlist${withResults}.`,
    );
  };
  return { added, addToShortlist };
}

/**
 * The inputs a finished run was started with: once the form differs from them, the results are stale
 * (issue 18 item 4) and say so, and whether the inputs as they now stand can be run at all.
 */
function useStaleMark(run: RunState, draft: unknown, issueCount: number, start: (d: unknown) => void) {
  const [ranWith, setRanWith] = useState<string | null>(null);
  const now = useMemo(() => JSON.stringify(draft), [draft]);
  const startNow = () => {
    if (issueCount === 0) setRanWith(now);
    start(draft);
  };
  const stale: StaleState =
    run.kind !== 'done' || ranWith === now ? null : issueCount > 0 ? 'invalid' : 'edited';
  return { stale, startNow };
}

type StaleState = null | 'edited' | 'invalid';

/** The mark over results whose inputs were edited after the run. */
function StaleNote(props: { stale: StaleState }) {
  if (!props.stale) return null;
  return (
    <p className="stale-note" role="status" data-testid="site-stale">
      {props.stale === 'invalid'
        ? 'These results are for the inputs of the last run; the inputs have changed since and some need attention (marked in the form). Correct them and run again.'
        : 'These results are for the inputs of the last run; the inputs have changed since. Run again to update them.'}
    </p>
  );
}

/** The run's results when there is one, else the quick estimate of the inputs; either can be shortlisted. */
function SiteResultsOrQuick(props: {
  run: RunState;
  quick: CellScreening | null;
  scenario: StudyScenario;
  units: UnitSystem;
  added: string | null;
  stale: StaleState;
  sweepPanel: ReactNode;
  scenarioRuns: ScenarioRun[] | undefined;
  onAdd(d: SiteDerived | null): void;
}) {
  const { run, added } = props;
  if (run.kind === 'done')
    return (
      <SiteOutcome
        stale={props.stale}
        sweepPanel={props.sweepPanel}
        scenarioRuns={props.scenarioRuns}
        outcome={run.outcome}
        quick={props.quick}
        scenario={props.scenario}
        units={props.units}
        onAdd={props.onAdd}
        added={added}
      />
    );
  return (
    <>
      <p className="muted">Run the simulation to see the charts. The quick estimate for these inputs:</p>
      <QuickOnly quick={props.quick} units={props.units} />
      <button type="button" onClick={() => props.onAdd(null)} data-testid="site-add-shortlist">
        Add to shortlist
      </button>
      {added ? (
        <p className="small" role="status">
          {added}
        </p>
      ) : null}
      {props.sweepPanel}
    </>
  );
}

function QuickOnly(props: { quick: CellScreening | null; units: UnitSystem }) {
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
            <th scope="row">{displayTitle(label, v.unit, props.units)}</th>
            <td>{v.value === null ? '—' : formatQuantity(v.value, v.unit, props.units)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function SiteOutcome(props: {
  outcome: SiteRunOutcome;
  quick: CellScreening | null;
  scenario: StudyScenario;
  units: UnitSystem;
  onAdd(d: SiteDerived): void;
  added: string | null;
  stale: StaleState;
  sweepPanel: ReactNode;
  scenarioRuns: ScenarioRun[] | undefined;
}) {
  const derived = useSiteDerived(props.outcome, props.scenario);
  return (
    <div className={props.stale ? 'site-outcome stale' : 'site-outcome'} data-testid="site-outcome">
      <StaleNote stale={props.stale} />
      <SiteSummaryTable derived={derived} units={props.units} />
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
              {formatNoteParts(n.parts, props.units)}
            </li>
          ))}
        </ul>
      ) : null}
      {props.sweepPanel}
      <SiteCharts
        run={props.outcome}
        derived={derived}
        units={props.units}
        scenarioRuns={props.scenarioRuns}
      />
      <SiteEnsemblePanel
        outcome={props.outcome}
        scenario={props.scenario}
        units={props.units}
        freezingPoint_C={derived.freezingAt(props.outcome.input.probes[0]?.z_m ?? 5)}
      />
    </div>
  );
}
