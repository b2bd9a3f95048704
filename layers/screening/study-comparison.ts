/**
 * Quick estimate (the map's per-cell model) against the simulation, quantity by quantity, for the site
 * study and `pile-atlas site --report`: both values, the published calibration band where one exists
 * (calibration-bands.ts), whether they agree, and why they differ, in words, from the two models'
 * assumptions. Values in SI (the unit of each row); the screen converts them. A quantity that is also a
 * map band carries the band's id (BAND).
 */
import { notePartsText, type NotePart, type NoteQuantity } from '../note-parts';
import { WATTS_PER_TON } from '../physics/heat-pump';
import type { Scenario } from './scenario';
import { BAND } from './band-ids';
import { CALIBRATION_BANDS, withinBand, type CalibrationBand } from './calibration-bands';
import type { SiteStudyReport, SiteStudyRun } from './site-study-report';

export type StudyQuantity =
  | 'thawDelay'
  | 'noPileThaw'
  | 'pileCount'
  | 'heatPerPile'
  | 'loadShare'
  | 'groundTemp'
  | 'activeLayer'
  | 'seasonalCop'
  | 'systemCop'
  | 'simplePayback'
  | 'fuelSaved'
  | 'co2Avoided';

export type Agreement = 'within band' | 'outside band' | 'no published band' | 'not comparable';

export interface StudyComparisonRow {
  quantity: StudyQuantity;
  /** The row's title in SI words. */
  title: string;
  /** The title, words and quantities apart (the web writes the quantities in the chosen units). */
  titleParts: NotePart[];
  /** SI unit ('' for counts, shares and COP; '%' is not used: shares are 0–1). */
  unit: string;
  /** The map's value (the standard building on its foundation group). */
  quick: number | null;
  /**
   * The map model's one-pile form (one pile's share of the building): what the simulated pile is and
   * what the calibration compares; equal to `quick` for quantities the group does not change.
   */
  quickOnePile: number | null;
  /** The map's reading where a plain number would mislead ("after 2100", "≥ 45 yr"). */
  quickText?: string;
  simulated: number | null;
  /** The simulation's reading where there is no plain number ("no thaw within 30 yr either way"). */
  simulatedText?: string;
  /** quickOnePile − simulated, where both are numbers (the calibrated comparison). */
  difference: number | null;
  band: CalibrationBand | null;
  agreement: Agreement;
  /** Why the two differ (or agree), in SI words. */
  reason: string;
  /** The reason, words and quantities apart. */
  reasonParts: NotePart[];
}

type ReportBase = Omit<SiteStudyReport, 'comparison'>;

const f1 = (v: number) => v.toFixed(1);

const m_ = (value: number): NoteQuantity => ({ value, unit: 'm' });

function row(
  r: Omit<
    StudyComparisonRow,
    'difference' | 'agreement' | 'quickOnePile' | 'title' | 'titleParts' | 'reason' | 'reasonParts'
  > & {
    title: string | NotePart[];
    reason: string | NotePart[];
    quickOnePile?: number | null;
    comparable?: boolean;
  },
): StudyComparisonRow {
  const { comparable = true, title, reason, ...fields } = r;
  const titleParts = typeof title === 'string' ? [title] : title;
  const reasonParts = typeof reason === 'string' ? [reason] : reason;
  const rest = {
    ...fields,
    title: notePartsText(titleParts),
    titleParts,
    reason: notePartsText(reasonParts),
    reasonParts,
  };
  const one = r.quickOnePile === undefined ? r.quick : r.quickOnePile;
  const both = one !== null && r.simulated !== null && Number.isFinite(one) && Number.isFinite(r.simulated);
  const difference = both ? (one as number) - (r.simulated as number) : null;
  let agreement: Agreement;
  const shown =
    r.simulated !== null && Number.isFinite(r.simulated) && r.quick !== null && Number.isFinite(r.quick);
  if (!r.band) agreement = shown && comparable ? 'no published band' : 'not comparable';
  else if (!both || !comparable) agreement = 'not comparable';
  else agreement = withinBand(r.band, one as number, r.simulated as number) ? 'within band' : 'outside band';
  return { ...rest, quickOnePile: one, difference, agreement };
}

/** What every row builder reads: the run, the report so far, the scenario and the map's metrics. */
interface RowContext {
  run: SiteStudyRun;
  d: ReportBase;
  s: Scenario;
  /** The map's metrics: the building on its foundation group, and the one-pile form. */
  m: NonNullable<ReportBase['quick']>['metrics'] | undefined;
  m1: NonNullable<ReportBase['quickOnePile']>['metrics'] | undefined;
  /** Where the first probe is, in words and lengths. */
  where: NotePart[];
}

/** Thaw year without piles at the first probe: the calibrated thaw figure (no pile on either side). */
function noPileThawRow(c: RowContext): StudyComparisonRow {
  const { run, s, m, where } = c;
  const runEnd = s.startYear + run.input.years;
  const noPileThaw = run.result.noPile.probes[0]?.thawYear ?? null;
  const mapThaw = m?.thawYear.value ?? null;
  const mapAfter = m?.thawYear.qualifier !== undefined;
  const simThaw = noPileThaw !== null ? s.startYear + noPileThaw : null;
  return row({
    quantity: 'noPileThaw',
    title: ['Thaw without piles at ', ...where, ' (calendar year)'],
    unit: '',
    quick: mapAfter ? null : mapThaw,
    quickText: m?.thawYear.qualifier,
    simulated: simThaw,
    simulatedText: simThaw === null ? `after ${runEnd} (end of the run)` : undefined,
    band: CALIBRATION_BANDS.noPileThaw,
    reason:
      simThaw === null && mapAfter
        ? `Neither thaws: the map puts the thaw after its climate horizon ${s.climateHorizonYear}, and the ground is still frozen when the run ends in ${runEnd}.`
        : simThaw === null && mapThaw !== null
          ? `The run ends in ${runEnd}, before the map's thaw year; run at least ${Math.ceil(mapThaw - s.startYear) + 5} years to compare.`
          : 'The map: conduction of the surface warming to the reference depth plus the time to melt its ice (a Stefan delay); the study: the simulated ground column with freezing and thawing.',
  });
}

/** Thaw delay at the first probe: the simulated delay, or why the run cannot give one. */
function thawDelayRow(c: RowContext, onset: StudyComparisonRow): StudyComparisonRow {
  const { run, s, m, m1, where } = c;
  const res = run.result;
  const p0 = run.input.probes[0];
  const years = run.input.years;
  const runEnd = s.startYear + years;
  const noPileThaw = res.noPile.probes[0]?.thawYear ?? null;
  const delay = res.thawDelay_yr[0] ?? null;
  const lower = res.thawDelayIsLowerBound[0] ?? false;
  const upper = res.thawDelayIsUpperBound[0] ?? false;
  const models: NotePart[] = [
    `The map superposes the whole ${s.building.foundationPiles}-pile foundation (`,
    m_(s.building.pileSpacing_m),
    ' spacing) on the warming; the study simulates one pile (no neighbours), which cools the ground less, so its delay is closer to the one-pile value. No calibration bound is published for the thaw delay.',
  ];
  const base = {
    quantity: BAND.thawDelay,
    title: p0 ? ['Thaw delay at ', m_(p0.r_m), ' from the pile, ', m_(p0.z_m), ' deep'] : 'Thaw delay',
    unit: 'yr',
    quick: m?.thawDelay.value ?? null,
    quickOnePile: m1?.thawDelay.value ?? null,
    quickText: m?.thawDelay.qualifier,
    band: null,
  };
  if (noPileThaw === 0) {
    return row({
      ...base,
      simulated: null,
      simulatedText: 'ground unfrozen at the start: nothing to delay',
      comparable: false,
      reason: [
        'The simulated ground at ',
        ...where,
        ' is unfrozen from the first year, so there is no thaw to delay.',
      ],
    });
  }
  if (delay === null) {
    return row({
      ...base,
      simulated: null,
      simulatedText: res.withPile ? `no thaw within ${years} yr either way` : 'no pile in this run',
      comparable: false,
      reason: [
        'The ground at ',
        ...where,
        ' does not thaw within the run even without the pile, so the run cannot measure a delay. ',
        ...onset.reasonParts,
      ],
    });
  }
  if (upper) {
    return row({
      ...base,
      simulated: delay,
      simulatedText: `none: the pile brings the thaw forward by more than ${f1(-delay)} yr`,
      comparable: false,
      reason: ['In the run the pile thaws the ground at ', ...where, ' earlier than without it. ', ...models],
    });
  }
  if (lower) {
    return row({
      ...base,
      simulated: delay,
      simulatedText: `more than ${f1(delay)} yr (the ground with the pile is still frozen when the run ends)`,
      comparable: false,
      reason: [
        `The simulated delay is only a lower bound: the ground with the pile is still frozen in ${runEnd}. `,
        ...models,
      ],
    });
  }
  return row({ ...base, simulated: delay, reason: models });
}

/** Piles for the design-day load: the map's piles per ton against the study's sizing. */
function pileCountRow(c: RowContext): StudyComparisonRow {
  const { d, m } = c;
  const peak_W = d.peakLoad_W;
  const quickPiles =
    m && peak_W && m.pilesPerTon.value !== null
      ? Math.ceil((m.pilesPerTon.value * peak_W) / WATTS_PER_TON)
      : null;
  const sized = d.sizing;
  return row({
    quantity: 'pileCount',
    title: peak_W
      ? ['Piles for the design-day load ', { value: peak_W / 1000, unit: 'kW', decimals: 1 }]
      : 'Piles for the peak load',
    unit: '',
    quick: quickPiles,
    simulated: sized?.ok ? sized.sizing.pileCount : null,
    simulatedText: sized && !sized.ok ? `not sized: ${sized.reason}` : undefined,
    band: CALIBRATION_BANDS.pileCount,
    reason: pileCountReason(c),
  });
}

/** Why the map's and the study's pile counts differ, in words and quantities. */
function pileCountReason(c: RowContext): NotePart[] {
  const { run, d, s, m } = c;
  const degC = (value: number): NoteQuantity => ({ value, unit: '°C', decimals: 1 });
  const rb = run.result.fluid?.Rb_mK_W;
  return [
    'Both count a field of as many piles as the load needs (near-square at the foundation spacing, ',
    m_(s.building.pileSpacing_m),
    `), for the same building, pile and fluid limit over the design life (${s.designLife_yr} yr), with the design-day peak. `,
    'The map checks every month against the seasonal ground wave along the pile computed by conduction alone (TTOP ground',
    ...(m && m.groundTemp.value !== null ? [' ', degC(m.groundTemp.value)] : []),
    '); the study checks every month against the simulated ground along the pile',
    ...(Number.isFinite(d.groundTemp_C) ? [' (', degC(d.groundTemp_C), ' at mid-pile)'] : []),
    ', whose winter dip is smaller because the freezing active layer releases latent heat, so it needs fewer piles',
    ...(rb !== undefined
      ? [
          '; pile resistance ',
          { value: rb, unit: 'm·K/W', decimals: 2 },
          " against the map's ",
          { value: s.pile.resistance_mK_W, unit: 'm·K/W', decimals: 2 },
          '.',
        ]
      : ['.']),
  ];
}

/** Heat per pile and the load share: the simulated pile against the map's one-pile form. */
function heatRows(c: RowContext): StudyComparisonRow[] {
  const { run, d, s, m, m1 } = c;
  const length_m = run.input.pile?.length_m ?? s.pile.length_m;
  const onePile: NotePart[] = [
    "The simulated pile carries one pile's share of the building; the map's one-pile form (one pile, that share of the load) is its calibrated counterpart, " +
      `while the map itself shows a pile of the ${s.building.foundationPiles}-pile foundation at `,
    m_(s.building.pileSpacing_m),
    ' spacing, whose neighbours cool its ground (the group carries about 0.6 × what an isolated pile carries, README).',
  ];
  const atLimit = d.window?.fluidAtLimit ?? false;
  const carried = m?.extractionCarried.value ?? null;
  const carried1 = m1?.extractionCarried.value ?? null;
  const operation =
    ' Both run the heat pump bivalently: each month (the study: each time step) the piles give what the building asks for unless that would take the fluid entering the heat pump below its limit, and backup heat covers the rest' +
    (atLimit
      ? '; in this run the fluid reaches the limit.'
      : '; in this run the fluid stays above the limit.') +
    ' What remains between them is the ground: the map computes the seasonal wave along the pile by conduction alone, while the simulated active layer freezes and thaws, releasing latent heat, so the simulated winter ground is a little warmer and its pile gives a little more.';
  const heat = row({
    quantity: 'heatPerPile',
    title: `Heat from the ground per pile, annual mean over the design life (${s.designLife_yr} yr)`,
    unit: 'W',
    quick: carried !== null ? carried * length_m : null,
    quickOnePile: carried1 !== null ? carried1 * length_m : null,
    simulated: d.extraction_W,
    band: CALIBRATION_BANDS.heatPerPile,
    reason: [...onePile, operation],
  });
  const share = row({
    quantity: BAND.loadShare,
    title: `Share of the building's heating the piles carry over the design life (${s.designLife_yr} yr)`,
    unit: '',
    quick: m?.loadShare.value ?? null,
    quickOnePile: m1?.loadShare.value ?? null,
    simulated: d.loadShare,
    band: CALIBRATION_BANDS.loadShare,
    reason: [...onePile, operation],
  });
  return [heat, share];
}

/** Ground temperature and active layer: the map's TTOP and Neumann models against the simulated column. */
function groundRows(c: RowContext): StudyComparisonRow[] {
  const { run, d, m } = c;
  const alt = run.result.noPile.annualThawDepth_m[0] ?? null;
  const noPermafrost = alt !== null && alt >= run.result.mesh.depth_m - 0.01;
  return [
    row({
      quantity: BAND.groundTemp,
      title: 'Ground temperature at pile mid-depth, today',
      unit: '°C',
      quick: m?.groundTemp.value ?? null,
      simulated: Number.isFinite(d.groundTemp_C) ? d.groundTemp_C : null,
      band: CALIBRATION_BANDS.groundTemp,
      reason:
        'The map: the TTOP model (thawing and freezing indices with n-factors, thermal offset of the soil) plus the geothermal gradient; ' +
        'the study: the simulated ground column without the pile, first-year mean, from the same air, n-factors and heat flux. The bound is for the mean along the pile.',
    }),
    row({
      quantity: BAND.activeLayer,
      title: 'Active layer (thaw depth), first year',
      unit: 'm',
      quick: m?.activeLayer.value ?? null,
      simulated: noPermafrost ? null : alt,
      simulatedText: noPermafrost ? 'no permafrost in the column' : undefined,
      band: CALIBRATION_BANDS.activeLayer,
      reason:
        'The map: the two-phase Neumann solution over the thaw season (the thawing index as one step into ground at its TTOP temperature); ' +
        "the study: the deepest thaw of the simulated first year, with the year's full temperature cycle.",
    }),
  ];
}

/** Seasonal and system COP, payback, fuel and CO2: they follow the heat and COP of each side. */
function economicsRows(c: RowContext): StudyComparisonRow[] {
  const { d, m, m1 } = c;
  return [
    row({
      quantity: BAND.seasonalCop,
      title: 'Seasonal COP',
      unit: '',
      quick: m?.seasonalCop.value ?? null,
      quickOnePile: m1?.seasonalCop.value ?? null,
      simulated: d.savings?.seasonalCop ?? null,
      band: null,
      reason:
        "The map: the heat pump's curve at the seasonal mean fluid temperature of undisturbed ground; " +
        'the study: the heat pump step by step at the simulated fluid temperature, weighted by the heat delivered. No calibration bound is published.',
    }),
    row({
      quantity: BAND.systemCop,
      title: 'System seasonal COP (pump, backup, controls)',
      unit: '',
      quick: m?.systemCop.value ?? null,
      simulated: d.savings?.system?.systemCop ?? null,
      band: null,
      reason:
        'Both from the same system model (circulation pump, backup heat, controls) applied to each side’s heat-pump COP and carried heat. No calibration bound is published.',
    }),
    row({
      quantity: BAND.simplePayback,
      title: 'Simple payback against an oil furnace',
      unit: 'yr',
      quick: m?.simplePayback.value ?? null,
      simulated: d.savings?.system?.payback_yr ?? null,
      band: null,
      reason:
        'Capital cost over the yearly cost saved, both at the system COP: it follows the heat and COP rows.',
    }),
    row({
      quantity: BAND.fuelSaved,
      title: 'Fuel saved on a diesel grid',
      unit: 'L/yr',
      quick: m?.fuelSaved.value ?? null,
      // The one-pile form carries the building's system overheads on one pile: not a building figure.
      quickOnePile: null,
      simulated: d.savings?.fuelSaved_L ?? null,
      band: null,
      reason:
        'Same diesel-grid balance for both (oil avoided minus generator diesel added): it follows the heat the piles deliver and the COP, so it differs as the heat-per-pile and COP rows do.',
    }),
    row({
      quantity: BAND.co2Avoided,
      title: 'CO2 avoided',
      unit: 't/yr',
      quick: m?.co2Avoided.value ?? null,
      quickOnePile: null,
      simulated: d.savings?.co2Avoided_t ?? null,
      band: null,
      reason: 'Follows the fuel row (same balance, CO2 per litre of each fuel).',
    }),
  ];
}

/** Every shared quantity (module comment). */
export function compareStudy(input: {
  run: SiteStudyRun;
  report: ReportBase;
  scenario: Scenario;
}): StudyComparisonRow[] {
  const { run, report: d, scenario: s } = input;
  const p0 = run.input.probes[0];
  const c: RowContext = {
    run,
    d,
    s,
    m: d.quick?.metrics,
    m1: d.quickOnePile?.metrics,
    where: p0 ? [m_(p0.r_m), ' from the pile axis, ', m_(p0.z_m), ' deep'] : ['the reference point'],
  };
  const onset = noPileThawRow(c);
  return [
    onset,
    thawDelayRow(c, onset),
    pileCountRow(c),
    ...heatRows(c),
    ...groundRows(c),
    ...economicsRows(c),
  ];
}
