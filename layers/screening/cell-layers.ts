/**
 * The output layers (manifest bands) of the per-cell screening model, in output order. `METRIC` gives
 * each layer's index in the model's output array. Units are SI (legend text in the manifest).
 */
import type { ScreeningLayer } from './screening-model';
import type { Scenario } from './scenario';
import { EXCLUSION_LABELS, PERMAFROST_CLASS_LABELS, SUITABILITY_LABELS } from './suitability';
import { BINDING_LABELS } from './operating-window';
import { THAW_HORIZON, THAW_HORIZON_LABELS } from './climate-horizon';
import { FOUNDATION_BAND_IDS, foundationBands } from './foundation-bands';

const IDS = [
  'suitability',
  'suitabilityScore',
  'exclusion',
  'groundTemp',
  'groundTempEnd',
  'permafrostClassToday',
  'permafrostClassEnd',
  'activeLayer',
  'thawYear',
  'thawYearPiles',
  'thawDelay',
  'frozenMargin',
  'extractionPerPile',
  'pilesPerTon',
  'windowLower',
  'windowUpper',
  'windowUpperFluid',
  'windowUpperOvercool',
  'loadShare',
  'extractionCarried',
  'bindingLimit',
  'seasonalCop',
  'heatingDemand',
  'fuelSaved',
  'co2Avoided',
  'costSaved',
  'breakEvenCopFuel',
  'breakEvenCopCo2',
  'breakEvenCopCost',
  'fuelIncrease',
  'bedrockDepth',
  'thawStability',
  'excessIce',
  'zeroCurtain',
  'thawBeyondHorizon',
  ...FOUNDATION_BAND_IDS,
] as const;

export type MetricId = (typeof IDS)[number];
export const METRIC_IDS: readonly MetricId[] = IDS;
export const METRIC = Object.fromEntries(IDS.map((id, i) => [id, i])) as Record<MetricId, number>;
export const METRIC_COUNT = IDS.length;

const classes = (labels: Record<number, string>) =>
  Object.entries(labels).map(([value, label]) => ({ value: Number(value), label }));

const TTOP_SRC =
  'TTOP (Smith & Riseborough 1996, 2002) with geothermal gradient; or the ground-temperature grid';
const RAMP_SRC =
  'Carslaw & Jaeger (1959) §2.5 linear surface warming plus a Stefan latent-heat delay (years-to-thaw)';
const FLS_SRC =
  'finite line source of the foundation group at the reference point (Eskilson 1987; Zeng, Diao & Fang 2002) superposed on the warming';
const SIZING_SRC =
  'three-pulse method (Kavanaugh & Rafferty 1997), month by month against the lagged ground, with the foundation group field response';
const ECON_SRC = 'degree-day demand; diesel-grid vs oil-furnace balance (reference-values §12)';

/** The layer definitions for a scenario (units and texts; ranges come from the build). */
export function cellLayers(s: Scenario): ScreeningLayer[] {
  const cur = s.economics.currency;
  const life = s.designLife_yr;
  const z = s.referenceDepth_m;
  const r = s.referenceRadius_m;
  const group = `${s.building.foundationPiles}-pile, ${s.building.pileSpacing_m} m spacing`;
  const hy = s.climateHorizonYear;
  const horizon = (
    after: number[],
    atLeast: number[],
    undetermined: number[],
  ): ScreeningLayer['horizon'] => ({ year: hy, flagBand: 'thawBeyondHorizon', after, atLeast, undetermined });
  const { pilesAfter, bothAfter } = THAW_HORIZON;
  const L: Record<MetricId, Omit<ScreeningLayer, 'id'>> = {
    suitability: {
      title: 'Suitability class',
      unit: '',
      kind: 'class',
      classes: classes(SUITABILITY_LABELS),
      description: 'Hard exclusions first, then the weighted soft criteria (see criteria).',
      source: 'Pile Atlas screening rules (scenario weights)',
    },
    suitabilityScore: {
      title: 'Suitability score',
      unit: '',
      kind: 'continuous',
      ramp: 'viridis',
      legendMin: 0,
      legendMax: 1,
      description: 'Weighted soft-criterion score, 0 to 1 (NaN where excluded).',
      source: 'Pile Atlas screening rules',
    },
    exclusion: {
      title: 'Exclusion reason',
      unit: '',
      kind: 'class',
      classes: classes(EXCLUSION_LABELS),
      description: 'First hard criterion that fails (0 = none).',
      source: 'Pile Atlas screening rules',
    },
    groundTemp: {
      title: 'Ground temperature at pile depth',
      unit: '°C',
      kind: 'continuous',
      ramp: 'blueOrange',
      legendMin: -10,
      legendMax: 2,
      description: `Mean annual ground temperature at the pile's mid-depth (${s.pile.topDepth_m + s.pile.length_m / 2} m), today.`,
      source: TTOP_SRC,
    },
    groundTempEnd: {
      title: 'Ground temperature at pile depth, end of life',
      unit: '°C',
      kind: 'continuous',
      ramp: 'blueOrange',
      legendMin: -10,
      legendMax: 2,
      description: `As groundTemp after ${life} years of warming, without piles; latent-aware: where the conduction ramp reaches 0 °C but the ground's ice has not melted by then, 0 °C (zero curtain, see zeroCurtain); once thawed, the ramp delayed by the melting time.`,
      source: `${TTOP_SRC}; ${RAMP_SRC}`,
    },
    permafrostClassToday: {
      title: 'Permafrost class today',
      unit: '',
      kind: 'class',
      classes: classes(PERMAFROST_CLASS_LABELS),
      description: `warm > ${s.permafrostClasses.warmAbove_C} °C, cold < ${s.permafrostClasses.coldBelow_C} °C.`,
      source: 'thresholds after Ran et al. (2022), ESSD (scenario settings)',
    },
    permafrostClassEnd: {
      title: 'Permafrost class, end of design life',
      unit: '',
      kind: 'class',
      classes: classes(PERMAFROST_CLASS_LABELS),
      description: `Class of groundTempEnd (${life} years).`,
      source: 'thresholds after Ran et al. (2022), ESSD (scenario settings)',
    },
    activeLayer: {
      title: 'Active layer thickness',
      unit: 'm',
      kind: 'continuous',
      ramp: 'cividis',
      legendMin: 0,
      legendMax: 4,
      description:
        'Seasonal thaw depth with the sensible heat of the thawed and frozen ground (thaw-season step of the surface thawing index into ground at TTOP).',
      source:
        'two-phase Neumann solution over the thaw season (Carslaw & Jaeger 1959 §11.2), as in the modified Berggren method (Aldrich & Paynter 1953)',
    },
    thawYear: {
      title: 'Thaw year without piles',
      unit: 'yr',
      kind: 'continuous',
      ramp: 'viridis',
      description: `Year the ground at ${z} m thaws under the warming trend: conduction to 0 °C plus melting of its ice; ${hy} with thawBeyondHorizon = 2 means after ${hy} (the scenario's climate horizon).`,
      source: RAMP_SRC,
      horizon: horizon([bothAfter], [], []),
    },
    thawYearPiles: {
      title: 'Thaw year with piles',
      unit: 'yr',
      kind: 'continuous',
      ramp: 'viridis',
      description: `As thawYear at ${r} m from a foundation pile (between piles), every pile of the group operating at its carried extraction; ${hy} with thawBeyondHorizon ≥ 1 means after ${hy}.`,
      source: FLS_SRC,
      horizon: horizon([pilesAfter, bothAfter], [], []),
    },
    thawDelay: {
      title: 'Thaw delay',
      unit: 'yr',
      kind: 'continuous',
      ramp: 'viridis',
      legendMin: 0,
      legendMax: 50,
      description: `Years of frozen ground the piles buy at the reference depth and radius (a lower bound where the thaw with piles falls after ${hy}; not determined where neither thaws before ${hy}).`,
      source: FLS_SRC,
      horizon: horizon([], [pilesAfter], [bothAfter]),
    },
    frozenMargin: {
      title: 'Frozen-ground margin',
      unit: 'yr',
      kind: 'continuous',
      ramp: 'viridis',
      legendMin: -20,
      legendMax: 100,
      description: `Thaw year with piles minus the end of the design life (${life} yr); a lower bound where the thaw falls after ${hy}.`,
      source: FLS_SRC,
      horizon: horizon([], [pilesAfter, bothAfter], []),
    },
    extractionPerPile: {
      title: 'Sustainable extraction per pile',
      unit: 'W',
      kind: 'continuous',
      ramp: 'viridis',
      description: `Annual-average heat a standard pile of the ${group} foundation yields at the fluid limit through the design life.`,
      source: SIZING_SRC,
    },
    pilesPerTon: {
      title: 'Piles per ton of peak heating',
      unit: 'piles/ton',
      kind: 'continuous',
      ramp: 'cividis',
      legendMin: 0,
      legendMax: 40,
      description: `Standard piles per ton (3.517 kW) of peak building heating at the fluid limit, each loaded as a pile of the ${group} foundation.`,
      source: SIZING_SRC,
    },
    windowLower: {
      title: 'Operating window, lower bound',
      unit: 'W/m',
      kind: 'continuous',
      ramp: 'viridis',
      description:
        'Least annual-average extraction holding the foundation ground frozen through the design life.',
      source: FLS_SRC,
    },
    windowUpper: {
      title: 'Operating window, upper bound',
      unit: 'W/m',
      kind: 'continuous',
      ramp: 'viridis',
      description: 'Most annual-average extraction allowed by the fluid limit and over-cooling.',
      source: `${SIZING_SRC}; ${FLS_SRC}`,
    },
    windowUpperFluid: {
      title: 'Fluid-limited extraction',
      unit: 'W/m',
      kind: 'continuous',
      ramp: 'viridis',
      description: 'Annual-average extraction at the heat pump minimum entering fluid temperature.',
      source: SIZING_SRC,
    },
    windowUpperOvercool: {
      title: 'Over-cooling-limited extraction',
      unit: 'W/m',
      kind: 'continuous',
      ramp: 'viridis',
      description: 'Annual-average extraction cooling the reference point by the allowed over-cooling.',
      source: FLS_SRC,
    },
    loadShare: {
      title: 'Share of heating load carried',
      unit: '',
      kind: 'continuous',
      ramp: 'viridis',
      legendMin: 0,
      legendMax: 1,
      description: `Share of the standard building's heat that its ${s.building.foundationPiles} foundation piles can carry.`,
      source: `${SIZING_SRC}; ${FLS_SRC}`,
    },
    extractionCarried: {
      title: 'Extraction carried',
      unit: 'W/m',
      kind: 'continuous',
      ramp: 'viridis',
      description:
        'Annual-average extraction per metre the foundation piles carry (the load within the window).',
      source: `${SIZING_SRC}; ${FLS_SRC}`,
    },
    bindingLimit: {
      title: 'Binding limit',
      unit: '',
      kind: 'class',
      classes: classes(BINDING_LABELS),
      description: 'Which bound of the operating window limits the piles.',
      source: 'operating window (operating-window.ts)',
    },
    seasonalCop: {
      title: 'Seasonal COP of the heat pump unit',
      unit: '',
      kind: 'continuous',
      ramp: 'viridis',
      legendMin: 1.5,
      legendMax: 4,
      description: 'Heat-pump seasonal COP at the seasonal mean entering fluid temperature.',
      source: 'scenario COP curve',
    },
    heatingDemand: {
      title: 'Heating demand of the standard building',
      unit: 'kWh/yr',
      kind: 'continuous',
      ramp: 'cividis',
      description: 'UA × heating degree-days below the balance temperature.',
      source: ECON_SRC,
    },
    fuelSaved: {
      title: 'Fuel saved',
      unit: 'L/yr',
      kind: 'continuous',
      ramp: 'blueOrange',
      description: 'Heating oil avoided minus generator diesel added (negative: more fuel burnt).',
      source: ECON_SRC,
    },
    co2Avoided: {
      title: 'CO2 avoided',
      unit: 't/yr',
      kind: 'continuous',
      ramp: 'blueOrange',
      description: 'Net CO2 avoided per standard building.',
      source: ECON_SRC,
    },
    costSaved: {
      title: 'Cost saved',
      unit: `${cur}/yr`,
      kind: 'continuous',
      ramp: 'blueOrange',
      description: "Owner's net heating cost saved per year.",
      source: ECON_SRC,
    },
    breakEvenCopFuel: {
      title: 'Break-even COP, fuel',
      unit: '',
      kind: 'continuous',
      ramp: 'cividis',
      description: 'COP above which the heat pump saves community fuel.',
      source: ECON_SRC,
    },
    breakEvenCopCo2: {
      title: 'Break-even COP, CO2',
      unit: '',
      kind: 'continuous',
      ramp: 'cividis',
      description: 'COP above which the heat pump avoids CO2.',
      source: ECON_SRC,
    },
    breakEvenCopCost: {
      title: 'Break-even COP, cost',
      unit: '',
      kind: 'continuous',
      ramp: 'cividis',
      description: "COP above which the owner's cost falls.",
      source: ECON_SRC,
    },
    fuelIncrease: {
      title: 'Heat pump increases fuel burn',
      unit: '',
      kind: 'class',
      classes: [
        { value: 0, label: 'no' },
        { value: 1, label: 'yes: system COP below the fuel break-even' },
      ],
      description:
        'Flag where the system seasonal COP (pump, backup and auxiliaries included) is below the fuel break-even COP.',
      source: ECON_SRC,
    },
    bedrockDepth: {
      title: 'Depth to bedrock',
      unit: 'm',
      kind: 'continuous',
      ramp: 'cividis',
      description: 'Input depth to bedrock (criterion raw value).',
      source: 'input grid',
    },
    thawStability: {
      title: 'Thaw stability',
      unit: '',
      kind: 'continuous',
      ramp: 'viridis',
      legendMin: 0,
      legendMax: 1,
      description: 'Texture and ice-content thaw stability score, 0 unstable to 1 stable.',
      source: 'suitability.ts (common practice)',
    },
    excessIce: {
      title: 'Excess ice',
      unit: 'm³/m³',
      kind: 'continuous',
      ramp: 'cividis',
      legendMin: 0,
      legendMax: 0.5,
      description:
        "Ice beyond the texture's pore space per volume of frozen ground, as water volume: e = (θ − n)/(1 − n) for water content θ above the porosity n, else 0. Its meltwater leaves a thaw strain of about e (settlement per metre of thawed ground).",
      source:
        'soil catalogue porosity at the texture default density (soil-catalogue.ts); input water + ice content',
    },
    zeroCurtain: {
      title: 'Zero curtain at the end of life',
      unit: '',
      kind: 'class',
      classes: [
        { value: 0, label: 'no' },
        {
          value: 1,
          label: 'yes: held at 0 °C while its ice melts',
          description: `Conduction alone would warm the ground at pile depth above 0 °C within ${life} years, but its latent heat is not spent yet: the ground stays at its freezing point.`,
        },
      ],
      description: `Where groundTempEnd is 0 °C because latent heat holds the ground at its freezing point (after ${life} years, without piles).`,
      source: RAMP_SRC,
    },
    thawBeyondHorizon: {
      title: 'Thaw beyond the climate horizon',
      unit: '',
      kind: 'class',
      classes: classes(THAW_HORIZON_LABELS),
      description: `Whether the thaw years fall after ${hy}, the scenario's climate horizon (thawYear, thawYearPiles, thawDelay and frozenMargin read "after ${hy}" or "≥" there).`,
      source: 'scenario climateHorizonYear (climate-horizon.ts)',
    },
    ...foundationBands(s),
  };
  return IDS.map((id) => ({ id, ...L[id] }));
}
