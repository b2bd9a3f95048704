/**
 * Results of one site run: the summary beside the quick per-cell estimate, the site's cautions, and the
 * charts (probe temperature, operating window, ground temperature against depth, fluid temperatures,
 * heat by month, piles by design pulse).
 */
import { useMemo, useState } from 'react';
import type { SiteInput, SiteResult } from '../../../layers/site/site-input-schema';
import type { CellScreening } from '../../../layers/screening/cell-screening-model';
import type { Scenario } from '../../../layers/screening/scenario';
import { DEFAULT_HEAT_PUMP_CURVE, WATTS_PER_TON } from '../../../layers/physics/heat-pump';
import { freezingPoint_C as fluidFreezingPoint_C } from '../../../layers/physics/fluids';
import { formatQuantity, type UnitSystem } from '../units/display-units';
import { annualMeanAt, ownProbes, profileAtYear, type ProfileColumn } from './site-profile';
import { energyByYear, groundPropertiesAt, meanExtraction_W_m, siteSavings } from './site-summary';
import type { SiteSizing } from './site-sizing';
import { siteNotes } from './site-notes';
import { ProbeTemperatureChart } from './charts/probe-temperature-chart';
import { DepthProfileChart } from './charts/depth-profile-chart';
import { FluidTemperatureChart } from './charts/fluid-temperature-chart';
import { MonthlyHeatChart } from './charts/monthly-heat-chart';
import { OperatingWindowChart } from './charts/operating-window-chart';
import { PileCountChart } from './charts/pile-count-chart';

export interface SiteRunOutcome {
  input: SiteInput;
  result: SiteResult;
  column: ProfileColumn;
  /** Pile sizing by design pulse, done in the worker (site-sizing.ts). */
  sizing: SiteSizing | null;
  elapsed_ms: number;
}

/** Headline numbers of a run (also stored with a shortlisted site). */
export function useSiteDerived(run: SiteRunOutcome, scenario: Scenario) {
  return useMemo(() => {
    const { input, result, column } = run;
    const years = energyByYear(input, result);
    const pile = input.pile;
    const mid = pile ? pile.topDepth_m + pile.length_m / 2 : scenario.referenceDepth_m;
    const groundTemp_C = annualMeanAt(profileAtYear(result.noPile, column, 1), mid);
    const peakLoad_W = input.operation.mode === 'building' ? input.operation.designLoad_W : null;
    const piles =
      input.operation.mode === 'building' ? input.operation.pileCount : scenario.building.foundationPiles;
    const sizing = run.sizing;
    const savings = siteSavings(years, piles, scenario, peakLoad_W);
    const curve =
      input.operation.mode === 'building' && input.operation.heatPump
        ? input.operation.heatPump
        : DEFAULT_HEAT_PUMP_CURVE;
    let fluidFreeze: number | null = null;
    if (pile) {
      try {
        fluidFreeze = fluidFreezingPoint_C({
          fluid: pile.fluid.name,
          massFraction: pile.fluid.name === 'water' ? 0 : pile.fluid.massFraction,
        });
      } catch {
        fluidFreeze = null;
      }
    }
    const own = column.firstProbe;
    return {
      years,
      groundTemp_C,
      peakLoad_W,
      piles,
      sizing,
      savings,
      minEft: pile ? curve.minEnteringFluid_C : null,
      fluidFreeze,
      extraction_W_m: pile ? meanExtraction_W_m(years, pile.length_m) : NaN,
      notes: siteNotes(input, result, years, pile ? curve.minEnteringFluid_C : null, own),
      freezingAt: (z: number) => groundPropertiesAt(input, z, true)?.freezingPoint_C ?? 0,
      noPile: ownProbes(result.noPile, column),
      withPile: result.withPile ? ownProbes(result.withPile, column) : null,
      thawDelay: result.thawDelay_yr.slice(0, own),
      lowerBound: result.thawDelayIsLowerBound.slice(0, own),
      upperBound: result.thawDelayIsUpperBound.slice(0, own),
    };
  }, [run, scenario]);
}

export type SiteDerived = ReturnType<typeof useSiteDerived>;

const q = (v: number | null | undefined, unit: string, units: UnitSystem, sig = 3) =>
  v === null || v === undefined || !Number.isFinite(v) ? '—' : formatQuantity(v, unit, units, sig);

function Row(props: { label: string; quick: string; sim: string; testId?: string }) {
  return (
    <tr data-testid={props.testId}>
      <th scope="row">{props.label}</th>
      <td>{props.quick}</td>
      <td>{props.sim}</td>
    </tr>
  );
}

export function SiteSummaryTable(props: {
  run: SiteRunOutcome;
  derived: SiteDerived;
  quick: CellScreening | null;
  scenario: Scenario;
  units: UnitSystem;
}) {
  const { run, derived: d, quick, units } = props;
  const m = quick?.metrics;
  const delay = d.thawDelay[0];
  const startsThawed = run.result.noPile.probes[0]?.thawYear === 0;
  const delayText = startsThawed
    ? 'ground unfrozen at the start: nothing to delay'
    : delay === null || delay === undefined
      ? run.result.withPile
        ? `no thaw within ${run.input.years} yr either way`
        : '—'
      : d.upperBound[0]
        ? `none: the pile brings the thaw forward by more than ${(-delay).toFixed(1)} yr`
        : `${d.lowerBound[0] ? 'more than ' : ''}${delay.toFixed(1)} yr`;
  const p0 = run.input.probes[0];
  const peak_kW = d.peakLoad_W ? d.peakLoad_W / 1000 : null;
  const quickPiles =
    m && peak_kW && m.pilesPerTon.value !== null
      ? Math.ceil(m.pilesPerTon.value * ((peak_kW * 1000) / WATTS_PER_TON))
      : null;
  const simExtraction = d.years.length
    ? d.years.reduce((s, y) => s + y.meanExtraction_W, 0) / d.years.length
    : null;
  return (
    <table className="values compare" data-testid="site-summary">
      <thead>
        <tr>
          <th scope="col">Result</th>
          <th scope="col">Quick estimate (map model)</th>
          <th scope="col">Simulated (this run)</th>
        </tr>
      </thead>
      <tbody>
        <Row
          testId="summary-thaw-delay"
          label={p0 ? `Thaw delay at ${p0.r_m} m from the pile, ${p0.z_m} m deep` : 'Thaw delay'}
          quick={m ? q(m.thawDelay.value, 'yr', units) : '—'}
          sim={delayText}
        />
        <Row
          testId="summary-piles"
          label={peak_kW ? `Piles for the peak load ${q(peak_kW, 'kW', units)}` : 'Piles for the peak load'}
          quick={quickPiles !== null ? `${quickPiles}` : '—'}
          sim={
            d.sizing
              ? d.sizing.ok
                ? `${d.sizing.sizing.pileCount} (three-pulse sizing, ${d.sizing.sizing.controllingPulse} pulse controls)${
                    d.sizing.sizing.pileCount > 4 * d.piles
                      ? '; far more piles than the foundation has: plan a hybrid with a backup heater'
                      : ''
                  }`
                : `not sized: ${d.sizing.reason}`
              : '—'
          }
        />
        <Row
          label="Heat from the ground per pile, annual mean (quick: sustainable)"
          quick={m ? q(m.extractionPerPile.value, 'W', units) : '—'}
          sim={q(simExtraction, 'W', units)}
        />
        <Row
          label="Ground temperature at pile mid-depth, today"
          quick={m ? q(m.groundTemp.value, '°C', units) : '—'}
          sim={q(d.groundTemp_C, '°C', units)}
        />
        <Row
          label="Active layer (thaw depth), first year"
          quick={m ? q(m.activeLayer.value, 'm', units) : '—'}
          sim={
            (run.result.noPile.annualThawDepth_m[0] ?? 0) >= run.result.mesh.depth_m - 0.01
              ? 'no permafrost in the column'
              : q(run.result.noPile.annualThawDepth_m[0], 'm', units)
          }
        />
        <Row label="Lowest fluid temperature" quick="—" sim={q(run.result.fluid?.lowest_C, '°C', units)} />
        <Row
          label="Seasonal COP of the heat pump unit"
          quick={m ? q(m.seasonalCop.value, '', units) : '—'}
          sim={q(d.savings?.seasonalCop, '', units)}
        />
        <Row
          label="System seasonal COP (pump, backup, controls)"
          quick={m ? q(m.systemCop.value, '', units) : '—'}
          sim={q(d.savings?.system?.systemCop, '', units)}
        />
        <Row
          label="Simple payback against an oil furnace"
          quick={m ? q(m.simplePayback.value, 'yr', units) : '—'}
          sim={d.savings?.system ? q(d.savings.system.payback_yr, 'yr', units) : '—'}
        />
        <Row
          testId="summary-fuel"
          label="Fuel saved on a diesel grid"
          quick={m ? q(m.fuelSaved.value, 'L/yr', units) : '—'}
          sim={
            d.savings
              ? `${q(d.savings.fuelSaved_L, 'L/yr', units)}${d.savings.fuelIncrease ? ' (heat pump burns more fuel)' : ''}`
              : '—'
          }
        />
        <Row
          label="CO2 avoided"
          quick={m ? q(m.co2Avoided.value, 't CO2/yr', units) : '—'}
          sim={q(d.savings?.co2Avoided_t, 't CO2/yr', units)}
        />
      </tbody>
    </table>
  );
}

export function SiteCharts(props: {
  run: SiteRunOutcome;
  derived: SiteDerived;
  quick: CellScreening | null;
  units: UnitSystem;
}) {
  const { run, derived: d, quick, units } = props;
  const [probe, setProbe] = useState(0);
  const last = run.input.years;
  const [heatYear, setHeatYear] = useState(1);
  const profileYears = [...new Set([1, Math.max(1, Math.round(last / 2)), last])];
  const series = profileYears.map((year) => ({
    year,
    noPile: profileAtYear(run.result.noPile, run.column, year),
    withPile: run.result.withPile ? profileAtYear(run.result.withPile, run.column, year) : null,
  }));
  const probes = d.noPile.probes;
  const m = quick?.metrics;
  const pile = run.input.pile;
  const window =
    m &&
    m.windowLower.value !== null &&
    m.windowUpperFluid.value !== null &&
    m.windowUpperOvercool.value !== null
      ? {
          lower_W_m: m.windowLower.value,
          upperFluid_W_m: m.windowUpperFluid.value,
          upperOvercool_W_m: m.windowUpperOvercool.value,
        }
      : null;
  const simResult = { ...run.result, noPile: d.noPile, withPile: d.withPile };
  return (
    <div className="site-charts">
      {probes.length ? (
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
                  {i + 1}: r {p.r_m} m, z {p.z_m} m
                </option>
              ))}
            </select>
          </label>
          <ProbeTemperatureChart
            result={simResult}
            probe={Math.min(probe, probes.length - 1)}
            freezingPoint_C={d.freezingAt(probes[Math.min(probe, probes.length - 1)].z_m)}
            units={units}
          />
        </div>
      ) : null}
      {window && pile ? (
        <div className="chart-block">
          <OperatingWindowChart window={window} simulated_W_m={d.extraction_W_m} units={units} />
          <p className="hint">
            Window bounds from the quick estimate for these inputs; the blue mark is this run&apos;s mean heat
            per metre of pile.
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
              minEnteringFluid_C={d.minEft}
              fluidFreezing_C={d.fluidFreeze}
              units={units}
            />
          </div>
          <div className="chart-block">
            <label className="chart-control">
              Year{' '}
              <select
                value={heatYear}
                onChange={(e) => setHeatYear(Number(e.target.value))}
                aria-label="Year shown in the monthly heat chart"
              >
                {Array.from({ length: last }, (_, i) => (
                  <option key={i} value={i + 1}>
                    {i + 1}
                  </option>
                ))}
              </select>
            </label>
            <MonthlyHeatChart fluid={run.result.fluid} year={Math.min(heatYear, last)} />
          </div>
        </>
      ) : null}
      {d.sizing?.ok ? (
        <div className="chart-block">
          <PileCountChart sizing={d.sizing.sizing} byPulse={d.sizing.byPulse} />
        </div>
      ) : null}
    </div>
  );
}
