/**
 * Scenario-dependent descriptions and sources of the foundation-check, structural, system-economics
 * and class-robustness bands (issue 13); their ids, titles, units and classes are in the band registry
 * (band-ids.ts, band-registry.ts), as for every band.
 */
import type { ScreeningLayer } from './screening-model';
import type { Scenario } from './scenario';

/** The bands of issue 13 (ids in band-ids.ts METRIC_BAND_IDS, entries in band-registry.ts). */
export type FoundationBandId =
  | 'adfreezeTempEndPiles'
  | 'activeLayerEnd'
  | 'capacityStart'
  | 'capacityEnd'
  | 'capacityEndPiles'
  | 'capacityKept'
  | 'frostJackingUplift'
  | 'frostJackingRatio'
  | 'thawSettlement'
  | 'iceRichThawYear'
  | 'systemCop'
  | 'pumpPower'
  | 'capitalCost'
  | 'simplePayback'
  | 'classRobust'
  | 'robustnessFlags';

const ADF_SRC =
  'long-term adfreeze strength against ground temperature, SNiP 2.02.04-88 Table 3 (recalled from memory; adfreeze-strength.ts), as in Streletskiy et al. (2012)';
const RAMP_SRC = 'Carslaw & Jaeger (1959) §2.5 linear surface warming (response-tables.ts)';
const FLS_SRC = 'finite line source of the foundation group at the reference point (Eskilson 1987)';

/** Descriptions and sources of the bands for a scenario. */
export function foundationDescriptions(
  s: Scenario,
): Record<FoundationBandId, Pick<ScreeningLayer, 'description' | 'source'>> {
  const life = s.designLife_yr;
  const f = s.suitability.foundation;
  const tip = s.pile.topDepth_m + s.pile.length_m;
  const pile = `the standard pile (${(2 * s.pile.radius_m * 1000).toFixed(0)} mm shaft, tip at ${tip} m)`;
  return {
    adfreezeTempEndPiles: {
      description: `Mean annual ground temperature at ${s.referenceDepth_m} m, ${s.referenceRadius_m} m from a pile (between piles), after ${life} years of warming with every pile of the group extracting its carried load. Hard check: at most ${f.maxAdfreezeTempEnd_C} °C.`,
      source: `${RAMP_SRC}; ${FLS_SRC}`,
    },
    activeLayerEnd: {
      description: `Seasonal thaw depth in the climate ${life} years on (air warmed by the trend), without piles.`,
      source: 'two-phase Neumann solution over the thaw season (neumann-active-layer.ts)',
    },
    capacityStart: {
      description: `Long-term adfreeze capacity of ${pile} below today's active layer, at the warmest design temperature of the year.`,
      source: ADF_SRC,
    },
    capacityEnd: {
      description: `As capacityStart after ${life} years of warming, below the end-of-life active layer, the piles not used as heat exchangers.`,
      source: `${ADF_SRC}; ${RAMP_SRC}`,
    },
    capacityEndPiles: {
      description: `As capacityEnd with the ground cooled by the group's heat extraction (cooling at the reference radius, held along the shaft: cautious).`,
      source: `${ADF_SRC}; ${RAMP_SRC}; ${FLS_SRC}`,
    },
    capacityKept: {
      description: `End-of-life adfreeze capacity with the piles operating minus without: the structural benefit of extracting heat through the foundation.`,
      source: `${ADF_SRC}; ${FLS_SRC}`,
    },
    frostJackingUplift: {
      description: `Tangential frost-heave force on the shaft over the end-of-life active layer: ${f.heaveStressFrostSusceptible_kPa} kPa in silt, clay and peat, ${f.heaveStressCoarse_kPa} kPa in gravel and sand.`,
      source:
        'tangential heave stresses of published laboratory and field studies (domain-notes; Penner & Gold 1971)',
    },
    frostJackingRatio: {
      description: `Uplift × ${f.jackingSafetyFactor} (factor of safety) over the anchorage (the smaller of the start and end-of-life capacities with the piles operating) plus ${f.deadLoadPerPile_kN} kN of dead load. Hard check: at most 1.`,
      source: 'frost-jacking.ts',
    },
    thawSettlement: {
      description: `Excess ice times the ground thawed within ${life} years (active-layer deepening, or down to ${s.referenceDepth_m} m where that thaws with the piles operating); a lower bound under load.`,
      source: 'thaw strain = excess ice (Nelson et al. 2001; Andersland & Ladanyi 2004) (thaw-settlement.ts)',
    },
    iceRichThawYear: {
      description: `Thaw year at ${s.referenceDepth_m} m with the piles operating, where the ground holds more than ${f.thawUnstableExcessIce_m3m3} m³/m³ of excess ice (no value: not thaw-unstable). Hard check: after the design life plus ${f.thawMargin_yr} yr (${s.startYear + life + f.thawMargin_yr}); ${s.climateHorizonYear} means after the climate horizon.`,
      source: FLS_SRC,
    },
    systemCop: {
      description:
        'Heat delivered over all the electricity the system draws: compressor (unit seasonal COP), loop circulation pump (Darcy–Weisbach pressure drop), electric backup and controls.',
      source: 'system-cop.ts (Haaland 1983 friction factor; scenario system settings)',
    },
    pumpPower: {
      description:
        'Electric power of the loop pump at the design flow: pressure drop of the pile loops and header (Darcy–Weisbach, Haaland friction factor, fittings allowance) × flow / pump efficiency.',
      source: 'system-cop.ts',
    },
    capitalCost: {
      description: `Loops in the foundation piles, heat pump sized to the piles' peak, installation (scenario prices; the piles themselves are needed for the foundation anyway).`,
      source: 'scenario economics prices (recalled from memory, editable)',
    },
    simplePayback: {
      description:
        'Capital cost over the yearly cost saved at the system COP; no value where the heat pump costs more to run than the furnace (never pays back).',
      source: 'system-cop.ts; economics.ts',
    },
    classRobust: {
      description: `Whether the class stays the same with the fluid limit ±${s.suitability.robustness.fluidLimitStep_K} K, the COP curve ±${Math.round(s.suitability.robustness.copScale * 100)} % and each soft weight doubled or halved.`,
      source: 'class-robustness.ts',
    },
    robustnessFlags: {
      description:
        'Sum of the codes of the changes that move the class: 1 fluid limit warmer, 2 fluid limit colder, 4 COP lower, 8 COP higher, 16 a weight doubled or halved.',
      source: 'class-robustness.ts',
    },
  };
}
