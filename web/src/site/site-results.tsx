/**
 * Results of one site run: the comparison with the quick per-cell estimate, the site's cautions, and the
 * charts (probe temperature, operating window, ground temperature against depth, fluid temperatures,
 * heat by month, piles by design pulse).
 */
import { useMemo, useState } from 'react';
import type { SiteInput, SiteResult } from '../../../layers/site/site-input-schema';
import type { Scenario } from '../../../layers/screening/scenario';
import { BAND } from '../../../layers/screening/band-ids';
import { groundPropertiesAt } from '../../../layers/site/site-setup';
import { ownProbes, profileAtYear, type ProfileColumn } from '../../../layers/site/site-profile';
import type { SiteSizing } from '../../../layers/site/site-sizing';
import { siteStudyReport, type SiteStudyReport } from '../../../layers/screening/site-study-report';
import type { StudyComparisonRow } from '../../../layers/screening/study-comparison';
import { formatNoteParts, formatQuantity, type UnitSystem } from '../units/display-units';
import { ProbeTemperatureChart, type ProbeOverlay } from './charts/probe-temperature-chart';
import type { ScenarioRun } from './scenario-sweep';
import { DepthProfileChart } from './charts/depth-profile-chart';
import { FluidTemperatureChart } from './charts/fluid-temperature-chart';
import { MonthlyHeatChart } from './charts/monthly-heat-chart';
import { OperatingWindowChart } from './charts/operating-window-chart';
import { PileCountChart } from './charts/pile-count-chart';

export interface SiteRunOutcome {
  input: SiteInput;
  result: SiteResult;
  column: ProfileColumn;
  /** Pile sizing by design pulse, done in the worker (layers/site/site-sizing.ts). */
  sizing: SiteSizing | null;
  elapsed_ms: number;
}

/**
 * The study's report of a run (layers/screening/site-study-report.ts: the same figures and notes
 * `pile-atlas site --report` prints) plus what the charts need (the planner's own probes).
 */
export function siteDerived(run: SiteRunOutcome, scenario: Scenario) {
  const { input, result, column } = run;
  const report: SiteStudyReport = siteStudyReport(run, scenario);
  const own = column.firstProbe;
  return {
    ...report,
    freezingAt: (z: number) => groundPropertiesAt(input, z, true)?.freezingPoint_C ?? 0,
    noPile: ownProbes(result.noPile, column),
    withPile: result.withPile ? ownProbes(result.withPile, column) : null,
    thawDelay: result.thawDelay_yr.slice(0, own),
    lowerBound: result.thawDelayIsLowerBound.slice(0, own),
    upperBound: result.thawDelayIsUpperBound.slice(0, own),
  };
}

/** Headline numbers of a run (also stored with a shortlisted site). */
export function useSiteDerived(run: SiteRunOutcome, scenario: Scenario) {
  return useMemo(() => siteDerived(run, scenario), [run, scenario]);
}

export type SiteDerived = ReturnType<typeof siteDerived>;

const q = (v: number | null | undefined, unit: string, units: UnitSystem, sig = 3) =>
  v === null || v === undefined || !Number.isFinite(v) ? '—' : formatQuantity(v, unit, units, sig);

/** A row's value as shown: shares in %, counts as integers, the rest in the chosen units. */
export function comparisonValueText(
  r: StudyComparisonRow,
  v: number | null,
  text: string | undefined,
  units: UnitSystem,
): string {
  if (text) return text;
  if (v === null || !Number.isFinite(v)) return '—';
  if (r.quantity === BAND.loadShare) return `${(100 * v).toFixed(0)} %`;
  if (r.quantity === 'pileCount') return String(Math.round(v));
  return q(v, r.unit, units);
}

/** The calibration band as shown ("± 5.5 yr", "± 33 %", "none published"). */
export function bandText(r: StudyComparisonRow, units: UnitSystem): string {
  if (!r.band) return 'none published';
  return r.band.kind === 'relative'
    ? `± ${(100 * r.band.value).toFixed(0)} %`
    : `± ${formatQuantity(r.band.value, r.quantity === 'noPileThaw' ? 'yr' : r.unit, units, 2)}`;
}

const AGREEMENT_TEXT: Record<StudyComparisonRow['agreement'], string> = {
  'within band': 'agree (within the band)',
  'outside band': 'differ (outside the band)',
  'no published band': 'not calibrated',
  'not comparable': 'not comparable',
};

export function SiteSummaryTable(props: { derived: SiteDerived; units: UnitSystem }) {
  const { derived: d, units } = props;
  return (
    <table className="values compare" data-testid="site-summary">
      <thead>
        <tr>
          <th scope="col">Result</th>
          <th scope="col">Quick estimate (map)</th>
          <th scope="col">Map model, one pile&apos;s share</th>
          <th scope="col">Simulated (this run)</th>
          <th scope="col">Calibration band</th>
          <th scope="col">Agreement and why</th>
        </tr>
      </thead>
      <tbody>
        {d.comparison.map((r) => (
          <tr key={r.quantity} data-testid={`summary-${r.quantity}`} data-agreement={r.agreement}>
            <th scope="row">{formatNoteParts(r.titleParts, units)}</th>
            <td>{comparisonValueText(r, r.quick, r.quickText, units)}</td>
            <td>
              {r.quickOnePile === r.quick ? 'same' : comparisonValueText(r, r.quickOnePile, undefined, units)}
            </td>
            <td>{comparisonValueText(r, r.simulated, r.simulatedText, units)}</td>
            <td>{bandText(r, units)}</td>
            <td className="small">
              <strong>{AGREEMENT_TEXT[r.agreement]}.</strong> {formatNoteParts(r.reasonParts, units)}
            </td>
          </tr>
        ))}
        <tr data-testid="summary-lowestFluid">
          <th scope="row">Lowest fluid temperature</th>
          <td>—</td>
          <td>—</td>
          <td>{q(d.lowestFluid_C, '°C', units)}</td>
          <td>—</td>
          <td className="small">Simulated only: the map works at the fluid limit itself.</td>
        </tr>
      </tbody>
    </table>
  );
}

export function SiteCharts(props: {
  run: SiteRunOutcome;
  derived: SiteDerived;
  units: UnitSystem;
  /** The study's runs under every scenario, drawn over the probe chart. */
  scenarioRuns?: ScenarioRun[];
}) {
  const { run, derived: d, units } = props;
  const last = run.input.years;
  const profileYears = [...new Set([1, Math.max(1, Math.round(last / 2)), last])];
  const series = profileYears.map((year) => ({
    year,
    noPile: profileAtYear(run.result.noPile, run.column, year),
    withPile: run.result.withPile ? profileAtYear(run.result.withPile, run.column, year) : null,
  }));
  return (
    <div className="site-charts">
      {d.noPile.probes.length ? (
        <ProbeChartBlock run={run} derived={d} units={units} scenarioRuns={props.scenarioRuns} />
      ) : null}
      {d.window && run.input.pile ? (
        <div className="chart-block">
          <OperatingWindowChart window={d.window} units={units} />
          <p className="hint">
            Window bounds from the quick estimate for these inputs; the blue mark is this run&apos;s mean heat
            per metre of pile (see the window note above).
          </p>
        </div>
      ) : null}
      {run.column.depths_m.length > 1 ? (
        <div className="chart-block">
          <DepthProfileChart
            series={series}
            r_m={run.column.r_m}
            freezingPoint_C={d.freezingAt(run.input.probes[0]?.z_m ?? 5)}
            units={units}
          />
        </div>
      ) : null}
      {run.result.fluid ? (
        <>
          <div className="chart-block">
            <FluidTemperatureChart
              fluid={run.result.fluid}
              minEnteringFluid_C={d.minEnteringFluid_C}
              fluidFreezing_C={d.fluidFreezing_C}
              units={units}
            />
          </div>
          <MonthlyHeatBlock fluid={run.result.fluid} years={last} />
        </>
      ) : null}
      {d.sizing?.ok ? (
        <div className="chart-block">
          <PileCountChart sizing={d.sizing.sizing} byPulse={d.sizing.byPulse} units={units} />
        </div>
      ) : null}
    </div>
  );
}

/** The temperature at one of the planner's probes, chosen in a selector. */
function ProbeChartBlock(props: {
  run: SiteRunOutcome;
  derived: SiteDerived;
  units: UnitSystem;
  scenarioRuns?: ScenarioRun[];
}) {
  const { run, derived: d } = props;
  const [probe, setProbe] = useState(0);
  const probes = d.noPile.probes;
  const shown = Math.min(probe, probes.length - 1);
  const overlay = (props.scenarioRuns ?? []).flatMap((r): ProbeOverlay[] => {
    const { result, column } = r.outcome;
    const noPile = ownProbes(result.noPile, column).probes[shown];
    if (!noPile) return [];
    const withPile = result.withPile ? (ownProbes(result.withPile, column).probes[shown] ?? null) : null;
    const withPileTime_yr = result.withPile?.time_yr ?? [];
    return [
      { label: r.name, colour: r.colour, time_yr: result.noPile.time_yr, noPile, withPile, withPileTime_yr },
    ];
  });
  const simResult = { ...run.result, noPile: d.noPile, withPile: d.withPile };
  return (
    <div className="chart-block">
      <label className="chart-control">
        Probe{' '}
        <select
          value={probe}
          onChange={(e) => setProbe(Number(e.target.value))}
          aria-label="Probe shown in the temperature chart"
        >
          {probes.map((p, i) => (
            <option key={i} value={i}>
              {i + 1}: r {formatQuantity(p.r_m, 'm', props.units)}, z{' '}
              {formatQuantity(p.z_m, 'm', props.units)}
            </option>
          ))}
        </select>
      </label>
      <ProbeTemperatureChart
        result={simResult}
        probe={shown}
        freezingPoint_C={d.freezingAt(probes[shown].z_m)}
        units={props.units}
        overlay={overlay}
      />
      {overlay.length ? (
        <p className="hint">
          Coloured curves: the same inputs under each scenario of the build (solid with the pile, dashed
          without; filled circle: thaw with the pile, open circle: thaw without).
        </p>
      ) : null}
    </div>
  );
}

/** Heat by month for one simulated year, chosen in a selector. */
function MonthlyHeatBlock(props: { fluid: NonNullable<SiteResult['fluid']>; years: number }) {
  const { fluid, years } = props;
  const [heatYear, setHeatYear] = useState(1);
  return (
    <div className="chart-block">
      <label className="chart-control">
        Year{' '}
        <select
          value={heatYear}
          onChange={(e) => setHeatYear(Number(e.target.value))}
          aria-label="Year shown in the monthly heat chart"
        >
          {Array.from({ length: years }, (_, i) => (
            <option key={i} value={i + 1}>
              {i + 1}
            </option>
          ))}
        </select>
      </label>
      <MonthlyHeatChart fluid={fluid} year={Math.min(heatYear, years)} />
    </div>
  );
}
