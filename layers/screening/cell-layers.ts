/**
 * The output layers (manifest bands) of the per-cell screening model, in output order. `METRIC` gives
 * each layer's index in the model's output array. Ids, titles, units, kinds, ramps and classes come from
 * the band registry (band-ids.ts, band-registry.ts); this file adds the scenario-dependent descriptions
 * and sources.
 */
import type { ScreeningLayer } from './screening-model';
import type { Scenario } from './scenario';
import { BAND, METRIC_BAND_IDS, type MetricBandId } from './band-ids';
import { BAND_REGISTRY } from './band-registry';
import { effectiveHorizonYear, THAW_HORIZON } from './climate-horizon';
import { foundationDescriptions } from './foundation-bands';

const IDS = METRIC_BAND_IDS;

export type MetricId = MetricBandId;
export const METRIC_IDS: readonly MetricId[] = IDS;
export const METRIC = Object.fromEntries(IDS.map((id, i) => [id, i])) as Record<MetricId, number>;
export const METRIC_COUNT = IDS.length;

const TTOP_SRC =
  'TTOP (Smith & Riseborough 1996, 2002) with geothermal gradient; or the ground-temperature grid';
const RAMP_SRC =
  'Carslaw & Jaeger (1959) §2.5 linear surface warming plus a Stefan latent-heat delay (years-to-thaw)';
const FLS_SRC =
  'finite line source of the foundation group at the reference point (Eskilson 1987; Zeng, Diao & Fang 2002) superposed on the warming';
const SIZING_SRC =
  'three-pulse method (Kavanaugh & Rafferty 1997), month by month against the lagged ground, with the foundation group field response';
const ECON_SRC = 'degree-day demand; diesel-grid vs oil-furnace balance (reference-values §12)';

type LayerTexts = Pick<ScreeningLayer, 'description' | 'source' | 'horizon'>;
type SomeLayerTexts = Partial<Record<MetricId, LayerTexts>>;

/** Texts of the class, the ground-temperature and active-layer layers and the soil inputs. */
function groundTexts(s: Scenario) {
  const life = s.designLife_yr;
  return {
    suitability: {
      description: 'Hard exclusions first, then the weighted soft criteria (see criteria).',
      source: 'Pile Atlas screening rules (scenario weights)',
    },
    suitabilityScore: {
      description: 'Weighted soft-criterion score, 0 to 1 (NaN where excluded).',
      source: 'Pile Atlas screening rules',
    },
    exclusion: {
      description: 'First hard criterion that fails (0 = none).',
      source: 'Pile Atlas screening rules',
    },
    groundTemp: {
      description: `Mean annual ground temperature at the pile's mid-depth (${s.pile.topDepth_m + s.pile.length_m / 2} m), today.`,
      source: TTOP_SRC,
    },
    groundTempEnd: {
      description: `As groundTemp after ${life} years of warming, without piles; latent-aware: where the conduction ramp reaches 0 °C but the ground's ice has not melted by then, 0 °C (zero curtain, see zeroCurtain); once thawed, the ramp delayed by the melting time.`,
      source: `${TTOP_SRC}; ${RAMP_SRC}`,
    },
    permafrostClassToday: {
      description: `warm > ${s.permafrostClasses.warmAbove_C} °C, cold < ${s.permafrostClasses.coldBelow_C} °C.`,
      source: 'thresholds after Ran et al. (2022), ESSD (scenario settings)',
    },
    permafrostClassEnd: {
      description: `Class of groundTempEnd (${life} years).`,
      source: 'thresholds after Ran et al. (2022), ESSD (scenario settings)',
    },
    activeLayer: {
      description:
        'Seasonal thaw depth with the sensible heat of the thawed and frozen ground (thaw-season step of the surface thawing index into ground at TTOP).',
      source:
        'two-phase Neumann solution over the thaw season (Carslaw & Jaeger 1959 §11.2), as in the modified Berggren method (Aldrich & Paynter 1953)',
    },
    bedrockDepth: {
      description: 'Input depth to bedrock (criterion raw value).',
      source: 'input grid',
    },
    thawStability: {
      description: 'Texture and ice-content thaw stability score, 0 unstable to 1 stable.',
      source: 'suitability.ts (common practice)',
    },
    excessIce: {
      description:
        "Ice beyond the texture's pore space per volume of frozen ground, as water volume: e = (θ − n)/(1 − n) for water content θ above the porosity n, else 0. Its meltwater leaves a thaw strain of about e (settlement per metre of thawed ground).",
      source:
        'soil catalogue porosity at the texture default density (soil-catalogue.ts); input water + ice content',
    },
  } satisfies SomeLayerTexts;
}

/** Texts of the thaw-year layers, with the climate horizon that caps them (climate-horizon.ts). */
function thawTexts(s: Scenario) {
  const life = s.designLife_yr;
  const z = s.referenceDepth_m;
  const r = s.referenceRadius_m;
  const hy = effectiveHorizonYear(s);
  const horizon = (
    after: number[],
    atLeast: number[],
    undetermined: number[],
  ): ScreeningLayer['horizon'] => ({
    year: hy,
    flagBand: BAND.thawBeyondHorizon,
    after,
    atLeast,
    undetermined,
  });
  const { pilesAfter, bothAfter } = THAW_HORIZON;
  return {
    thawYear: {
      description: `Year the ground at ${z} m thaws under the warming trend: conduction to 0 °C plus melting of its ice; ${hy} with thawBeyondHorizon = 2 means after ${hy} (the scenario's climate horizon).`,
      source: RAMP_SRC,
      horizon: horizon([bothAfter], [], []),
    },
    thawYearPiles: {
      description: `As thawYear at ${r} m from a foundation pile (between piles), every pile of the group operating at its carried extraction; ${hy} with thawBeyondHorizon ≥ 1 means after ${hy}.`,
      source: FLS_SRC,
      horizon: horizon([pilesAfter, bothAfter], [], []),
    },
    thawDelay: {
      description: `Years of frozen ground the piles buy at the reference depth and radius (a lower bound where the thaw with piles falls after ${hy}; not determined where neither thaws before ${hy}).`,
      source: FLS_SRC,
      horizon: horizon([], [pilesAfter], [bothAfter]),
    },
    frozenMargin: {
      description: `Thaw year with piles minus the end of the design life (${life} yr); a lower bound where the thaw falls after ${hy}.`,
      source: FLS_SRC,
      horizon: horizon([], [pilesAfter, bothAfter], []),
    },
    zeroCurtain: {
      description: `Where groundTempEnd is 0 °C because latent heat holds the ground at its freezing point (after ${life} years, without piles).`,
      source: RAMP_SRC,
    },
    thawBeyondHorizon: {
      description: `Whether the thaw years fall after ${hy}, the scenario's climate horizon (thawYear, thawYearPiles, thawDelay and frozenMargin read "after ${hy}" or "≥" there).`,
      source: 'scenario climateHorizonYear (climate-horizon.ts)',
    },
  } satisfies SomeLayerTexts;
}

/** Texts of the pile-yield and operating-window layers. */
function pileTexts(s: Scenario) {
  const group = `${s.building.foundationPiles}-pile, ${s.building.pileSpacing_m} m spacing`;
  return {
    extractionPerPile: {
      description: `Annual-average heat a standard pile of the ${group} foundation yields at the fluid limit through the design life.`,
      source: SIZING_SRC,
    },
    pilesPerTon: {
      description: `Standard piles per ton (3.517 kW) of peak building heating at the fluid limit, each loaded as a pile of the ${group} foundation.`,
      source: SIZING_SRC,
    },
    windowLower: {
      description:
        'Least annual-average extraction holding the foundation ground frozen through the design life.',
      source: FLS_SRC,
    },
    windowUpper: {
      description: 'Most annual-average extraction allowed by the fluid limit and over-cooling.',
      source: `${SIZING_SRC}; ${FLS_SRC}`,
    },
    windowUpperFluid: {
      description: 'Annual-average extraction at the heat pump minimum entering fluid temperature.',
      source: SIZING_SRC,
    },
    windowUpperOvercool: {
      description: 'Annual-average extraction cooling the reference point by the allowed over-cooling.',
      source: FLS_SRC,
    },
    loadShare: {
      description: `Share of the standard building's heat that its ${s.building.foundationPiles} foundation piles can carry.`,
      source: `${SIZING_SRC}; ${FLS_SRC}`,
    },
    extractionCarried: {
      description:
        'Annual-average extraction per metre the foundation piles carry (the load within the window).',
      source: `${SIZING_SRC}; ${FLS_SRC}`,
    },
    bindingLimit: {
      description: 'Which bound of the operating window limits the piles.',
      source: 'operating window (operating-window.ts)',
    },
  } satisfies SomeLayerTexts;
}

/** Texts of the heat-pump and economics layers. */
function economicsTexts() {
  return {
    seasonalCop: {
      description: 'Heat-pump seasonal COP at the seasonal mean entering fluid temperature.',
      source: 'scenario COP curve',
    },
    heatingDemand: {
      description: 'UA × heating degree-days below the balance temperature.',
      source: ECON_SRC,
    },
    fuelSaved: {
      description: 'Heating oil avoided minus generator diesel added (negative: more fuel burnt).',
      source: ECON_SRC,
    },
    co2Avoided: {
      description: 'Net CO2 avoided per standard building.',
      source: ECON_SRC,
    },
    costSaved: {
      description: "Owner's net heating cost saved per year.",
      source: ECON_SRC,
    },
    breakEvenCopFuel: {
      description: 'COP above which the heat pump saves community fuel.',
      source: ECON_SRC,
    },
    breakEvenCopCo2: {
      description: 'COP above which the heat pump avoids CO2.',
      source: ECON_SRC,
    },
    breakEvenCopCost: {
      description: "COP above which the owner's cost falls.",
      source: ECON_SRC,
    },
    fuelIncrease: {
      description: 'Flag where the seasonal COP is below the fuel break-even COP.',
      source: ECON_SRC,
    },
  } satisfies SomeLayerTexts;
}

/** The layer definitions for a scenario (units and texts; ranges come from the build). */
export function cellLayers(s: Scenario): ScreeningLayer[] {
  const cur = s.economics.currency;
  const life = s.designLife_yr;
  const L: Record<MetricId, LayerTexts> = {
    ...groundTexts(s),
    ...thawTexts(s),
    ...pileTexts(s),
    ...economicsTexts(),
    ...foundationDescriptions(s),
  };
  return IDS.map((id) => {
    const { unitNA: _na, description: _d, source: _s, ...entry } = BAND_REGISTRY[id];
    const layer: ScreeningLayer = { id, ...entry, ...L[id] };
    if (id === BAND.costSaved || id === BAND.capitalCost) layer.unit = entry.unit.replace('¤', cur);
    if (id === BAND.zeroCurtain && layer.classes) {
      layer.classes = layer.classes.map((c) =>
        c.value === 1
          ? {
              ...c,
              description: `Conduction alone would warm the ground at pile depth above 0 °C within ${life} years, but its latent heat is not spent yet: the ground stays at its freezing point.`,
            }
          : c,
      );
    }
    return layer;
  });
}
