/**
 * The site study's run and what it knows before one: the run itself (Web Worker, progress, cancel,
 * cancelled when the study closes), the cost of a run as the form stands, the quick per-cell estimate
 * of the inputs, and the figures stored with a shortlisted site.
 */
import { useEffect, useRef, useState } from 'react';
import { siteInputSchema, type SiteInputDraft } from '../../../layers/site/site-input-schema';
import { siteRunCost, type SiteRunCost } from '../../../layers/site/site-run-cost';
import { cellInputsFromSite, scenarioFromManifest } from '../../../layers/screening/site-prefill';
import { screenCell, type CellScreening } from '../../../layers/screening/cell-screening-model';
import { studyRunInput } from '../../../layers/screening/run-site-study';
import { fieldId } from './form-inputs';
import { runSiteInWorker, SiteRunCancelled, type SiteRunHandle } from './run-site-in-worker';
import type { SiteDerived, SiteRunOutcome } from './site-results';

export type StudyScenario = ReturnType<typeof scenarioFromManifest>;

export type RunState =
  | { kind: 'idle' }
  | { kind: 'running'; progress: number; phase: 'simulating' | 'sizing' }
  | { kind: 'done'; outcome: SiteRunOutcome }
  | { kind: 'failed'; message: string }
  | { kind: 'cancelled' };

export interface SiteRun {
  run: RunState;
  /** The last start was refused because inputs need attention (the first one is focused). */
  blocked: boolean;
  start(draft: unknown): void;
  cancel(): void;
}

export function useSiteRun(scenario: StudyScenario): SiteRun {
  const [run, setRun] = useState<RunState>({ kind: 'idle' });
  const [blocked, setBlocked] = useState(false);
  const handle = useRef<SiteRunHandle | null>(null);
  useEffect(() => () => handle.current?.cancel(), []);

  const start = (draft: unknown) => {
    const parsed = siteInputSchema.safeParse(draft);
    if (!parsed.success) {
      setBlocked(true);
      const first = parsed.error.issues[0];
      const el = first ? document.getElementById(fieldId(first.path as (string | number)[])) : null;
      el?.focus();
      return;
    }
    setBlocked(false);
    const { input, column } = studyRunInput(parsed.data, scenario);
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
        setRun({ kind: 'done', outcome: { input, result, column, sizing, elapsed_ms } });
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
  return { run, blocked, start, cancel: () => handle.current?.cancel() };
}

export type RunCost = SiteRunCost & { years: number };

/** The cost of the run as the form stands (null while the inputs are not valid). */
export function runCostOf(draft: unknown): RunCost | null {
  const parsed = siteInputSchema.safeParse(draft);
  if (!parsed.success) return null;
  try {
    return { years: parsed.data.years, ...siteRunCost(parsed.data) };
  } catch {
    return null;
  }
}

/** The quick per-cell estimate of the inputs (null for explicit layer properties or unreadable inputs). */
export function quickEstimateOf(draft: unknown, scenario: StudyScenario): CellScreening | null {
  try {
    const parsed = siteInputSchema.safeParse(draft);
    const ci = cellInputsFromSite((parsed.success ? parsed.data : draft) as SiteInputDraft, scenario);
    return ci ? screenCell(ci, scenario) : null;
  } catch {
    return null;
  }
}

/** The figures stored with a site added from the study: the quick estimate, and the run's when there is one. */
export function shortlistMetrics(
  quick: CellScreening | null,
  derived: SiteDerived | null,
  run: RunState,
): Record<string, number | string | null> {
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
  return metrics;
}

/** The run bar's status line. */
export function runStatusText(run: RunState, blocked: boolean, issueCount: number): string {
  if (blocked && issueCount > 0)
    return `Not run: ${issueCount} input${issueCount > 1 ? 's need' : ' needs'} attention (marked in the form).`;
  switch (run.kind) {
    case 'running':
      return run.phase === 'sizing'
        ? 'Sizing the pile field by design pulse…'
        : 'Simulating in the background; the page stays responsive (Cancel stops it).';
    case 'done': {
      const { mesh } = run.outcome.result;
      return `Done in ${(run.outcome.elapsed_ms / 1000).toFixed(1)} s (${mesh.nr}×${mesh.nz} cells, ${mesh.timeSteps} steps).`;
    }
    case 'failed':
      return `The run stopped: ${run.message}`;
    case 'cancelled':
      return 'Run cancelled.';
    default:
      return 'Edit the inputs, then run.';
  }
}
