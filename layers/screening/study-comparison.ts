/**
 * Quick estimate (the map's per-cell model) against the simulation, quantity by quantity, for the site
 * study and `pile-atlas site --report`: both values, the published calibration band where one exists
 * (calibration-bands.ts), whether they agree, and why they differ, in words, from the two models'
 * assumptions. Values in SI (the unit of each row); the screen converts them. A quantity that is also a
 * map band carries the band's id (BAND).
 */
import { WATTS_PER_TON } from '../physics/heat-pump';
import type { CellScreening } from './cell-screening-model';
import type { Scenario } from './scenario';
import { BAND } from './band-ids';
import { CALIBRATION_BANDS, withinBand, type CalibrationBand } from './calibration-bands';
import type { SiteStudyReport, SiteStudyRun } from './site-study-report';

export type StudyQuantity =
  | 'thawDelay'
  | 'pileCount'
  | 'heatPerPile'
  | 'loadShare'
  | 'groundTemp'
  | 'activeLayer'
  | 'seasonalCop'
  | 'fuelSaved'
  | 'co2Avoided';

export type Agreement = 'within band' | 'outside band' | 'no published band' | 'not comparable';

export interface StudyComparisonRow {
  quantity: StudyQuantity;
  title: string;
  /** SI unit ('' for counts, shares and COP; '%' is not used: shares are 0–1). */
  unit: string;
  quick: number | null;
  /** The map's reading where a plain number would mislead ("after 2100", "≥ 45 yr"). */
  quickText?: string;
  simulated: number | null;
  /** The simulation's reading where there is no plain number ("no thaw within 30 yr either way"). */
  simulatedText?: string;
  /** quick − simulated, where both are numbers. */
  difference: number | null;
  band: CalibrationBand | null;
  agreement: Agreement;
  /** Why the two differ (or agree), in words. */
  reason: string;
}

type ReportBase = Omit<SiteStudyReport, 'comparison'>;

const f1 = (v: number) => v.toFixed(1);

function row(
  r: Omit<StudyComparisonRow, 'difference' | 'agreement'> & { comparable?: boolean },
): StudyComparisonRow {
  const { comparable = true, ...rest } = r;
  const both =
    r.quick !== null && r.simulated !== null && Number.isFinite(r.quick) && Number.isFinite(r.simulated);
  const difference = both ? (r.quick as number) - (r.simulated as number) : null;
  let agreement: Agreement;
  if (!both || !comparable) agreement = 'not comparable';
  else if (!r.band) agreement = 'no published band';
  else
    agreement = withinBand(r.band, r.quick as number, r.simulated as number) ? 'within band' : 'outside band';
  return { ...rest, difference, agreement };
}

function thawDelayRow(run: SiteStudyRun, quick: CellScreening | null, s: Scenario): StudyComparisonRow {
  const res = run.result;
  const p0 = run.input.probes[0];
  const m = quick?.metrics;
  const where = p0 ? `${p0.r_m} m from the pile axis, ${p0.z_m} m deep` : 'the reference point';
  const title = p0 ? `Thaw delay at ${p0.r_m} m from the pile, ${p0.z_m} m deep` : 'Thaw delay';
  const delay = res.thawDelay_yr[0] ?? null;
  const lower = res.thawDelayIsLowerBound[0] ?? false;
  const upper = res.thawDelayIsUpperBound[0] ?? false;
  const noPileThaw = res.noPile.probes[0]?.thawYear ?? null;
  const years = run.input.years;
  const qv = m?.thawDelay.value ?? null;
  const group = `${s.building.foundationPiles}-pile foundation (${s.building.pileSpacing_m} m spacing)`;
  const models =
    `The map superposes the whole ${group} on a conduction ramp with a latent-heat delay; ` +
    'the study simulates one pile with freezing and thawing in the ground (no neighbouring piles), so its ground is cooled less.';
  const base = {
    quantity: BAND.thawDelay,
    title,
    unit: 'yr',
    quick: qv,
    quickText: m?.thawDelay.qualifier,
  };
  if (noPileThaw === 0) {
    return row({
      ...base,
      simulated: null,
      simulatedText: 'ground unfrozen at the start: nothing to delay',
      band: CALIBRATION_BANDS.thawDelay,
      comparable: false,
      reason: `The simulated ground at ${where} is unfrozen from the first year, so there is no thaw to delay; the map's TTOP ground temperature is colder here.`,
    });
  }
  if (delay === null) {
    const mapThaw = m?.thawYear.value ?? null;
    const needed = mapThaw !== null ? Math.ceil(mapThaw - s.startYear) : null;
    return row({
      ...base,
      simulated: null,
      simulatedText: res.withPile ? `no thaw within ${years} yr either way` : 'no pile in this run',
      band: CALIBRATION_BANDS.thawDelay,
      comparable: false,
      reason:
        `The run ends after ${years} years, before the ground at ${where} thaws even without the pile` +
        (needed !== null && m?.thawYear.qualifier === undefined
          ? ` (the map's thaw without piles: about ${needed} years from ${s.startYear}); run at least ${needed + 5} years to compare.`
          : m?.thawYear.qualifier
            ? ` (the map: ${m.thawYear.qualifier}).`
            : '.'),
    });
  }
  if (upper) {
    return row({
      ...base,
      simulated: delay,
      simulatedText: `none: the pile brings the thaw forward by more than ${f1(-delay)} yr`,
      band: CALIBRATION_BANDS.thawDelay,
      comparable: false,
      reason: `In the run the pile thaws the ground at ${where} earlier than without it (the pile heats, or its ground warms with the trend first). ${models}`,
    });
  }
  if (lower) {
    const consistent = qv !== null && qv >= delay - CALIBRATION_BANDS.thawDelay.value;
    return row({
      ...base,
      simulated: delay,
      simulatedText: `more than ${f1(delay)} yr (the ground with the pile is still frozen when the run ends)`,
      band: CALIBRATION_BANDS.thawDelay,
      comparable: false,
      reason:
        `The simulated delay is only a lower bound: the ground with the pile is still frozen after ${years} years. ` +
        (qv === null
          ? ''
          : consistent
            ? 'The map is consistent with it. '
            : `The map's delay is shorter than the bound by more than the band: conservative. `) +
        models,
    });
  }
  return row({
    ...base,
    simulated: delay,
    band: CALIBRATION_BANDS.thawDelay,
    reason: models,
  });
}

/** Every shared quantity (module comment). */
export function compareStudy(input: {
  run: SiteStudyRun;
  report: ReportBase;
  scenario: Scenario;
}): StudyComparisonRow[] {
  const { run, report: d, scenario: s } = input;
  const m = d.quick?.metrics;
  const pile = run.input.pile;
  const length_m = pile?.length_m ?? s.pile.length_m;
  const peak_W = d.peakLoad_W;
  const group = `${s.building.foundationPiles}-pile foundation at ${s.building.pileSpacing_m} m spacing`;
  const rows: StudyComparisonRow[] = [thawDelayRow(run, d.quick, s)];

  const quickPiles =
    m && peak_W && m.pilesPerTon.value !== null
      ? Math.ceil((m.pilesPerTon.value * peak_W) / WATTS_PER_TON)
      : null;
  const sized = d.sizing;
  rows.push(
    row({
      quantity: 'pileCount',
      title: peak_W ? `Piles for the peak load ${f1(peak_W / 1000)} kW` : 'Piles for the peak load',
      unit: '',
      quick: quickPiles,
      simulated: sized?.ok ? sized.sizing.pileCount : null,
      simulatedText: sized && !sized.ok ? `not sized: ${sized.reason}` : undefined,
      band: CALIBRATION_BANDS.pileCount,
      reason:
        'Both by the three-pulse method (annual, design month, 6-hour peak) for the same building load and design life. ' +
        `The map takes the ground temperature of its TTOP model and the standard pile's resistance; the study sizes with the simulated ground temperature at mid-pile` +
        (Number.isFinite(d.groundTemp_C) ? ` (${f1(d.groundTemp_C)} °C)` : '') +
        ' and the resistance of the loop entered in the form.',
    }),
  );

  const carried = m?.extractionCarried.value ?? null;
  const windowText = d.window
    ? d.window.zone === 'too much' && !d.window.fluidAtLimit
      ? ` Here the single pile takes more than the group's bound allows without reaching its fluid limit.`
      : ''
    : '';
  rows.push(
    row({
      quantity: 'heatPerPile',
      title: 'Heat from the ground per pile, annual mean',
      unit: 'W',
      quick: carried !== null ? carried * length_m : null,
      simulated: d.extraction_W,
      band: null,
      reason:
        `The heat each of the building's ${d.piles} piles takes from the ground. The map caps it at the operating window of a pile in the ${group} ` +
        `(neighbours cool each other's ground over the years); the study simulates one pile alone, whose ground stays warmer.` +
        windowText,
    }),
  );
  rows.push(
    row({
      quantity: BAND.loadShare,
      title: "Share of the building's heating the piles carry",
      unit: '',
      quick: m?.loadShare.value ?? null,
      simulated: d.loadShare,
      band: null,
      reason:
        'The map: the window-limited heat over the heat the whole load would need, for the group. ' +
        'The study: heat the heat pump delivered over the heating demand of the run, with the fluid limit applied week by week to one pile.',
    }),
  );
  rows.push(
    row({
      quantity: BAND.groundTemp,
      title: 'Ground temperature at pile mid-depth, today',
      unit: '°C',
      quick: m?.groundTemp.value ?? null,
      simulated: Number.isFinite(d.groundTemp_C) ? d.groundTemp_C : null,
      band: null,
      reason:
        'The map: the TTOP model (thawing and freezing indices with n-factors, thermal offset of the soil) plus the geothermal gradient below. ' +
        'The study: the simulated ground column without the pile, first-year mean, from the same air temperatures, n-factors and heat flux.',
    }),
  );
  const alt = run.result.noPile.annualThawDepth_m[0] ?? null;
  const noPermafrost = alt !== null && alt >= run.result.mesh.depth_m - 0.01;
  rows.push(
    row({
      quantity: BAND.activeLayer,
      title: 'Active layer (thaw depth), first year',
      unit: 'm',
      quick: m?.activeLayer.value ?? null,
      simulated: noPermafrost ? null : alt,
      simulatedText: noPermafrost ? 'no permafrost in the column' : undefined,
      band: null,
      reason:
        'The map: the two-phase Neumann solution over the thaw season (thawing index as one step into ground at its TTOP temperature). ' +
        "The study: the deepest thaw of the simulated first year, with the year's full temperature cycle.",
    }),
  );
  rows.push(
    row({
      quantity: BAND.seasonalCop,
      title: 'Seasonal COP',
      unit: '',
      quick: m?.seasonalCop.value ?? null,
      simulated: d.savings?.seasonalCop ?? null,
      band: null,
      reason:
        "The map: the heat pump's curve at the seasonal mean fluid temperature of undisturbed ground; " +
        'the study: the heat pump step by step at the simulated fluid temperature, energy-weighted over the run.',
    }),
  );
  rows.push(
    row({
      quantity: BAND.fuelSaved,
      title: 'Fuel saved on a diesel grid',
      unit: 'L/yr',
      quick: m?.fuelSaved.value ?? null,
      simulated: d.savings?.fuelSaved_L ?? null,
      band: null,
      reason:
        'Same diesel-grid balance for both (oil avoided minus generator diesel added): it follows the heat the piles deliver and the COP, so it differs as the heat-per-pile and COP rows do.',
    }),
  );
  rows.push(
    row({
      quantity: BAND.co2Avoided,
      title: 'CO2 avoided',
      unit: 't/yr',
      quick: m?.co2Avoided.value ?? null,
      simulated: d.savings?.co2Avoided_t ?? null,
      band: null,
      reason: 'Follows the fuel row (same balance, CO2 per litre of each fuel).',
    }),
  );
  return rows;
}
