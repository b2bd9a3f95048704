/**
 * Prefill of the site study from a clicked map cell, and the reverse step that turns the form back into
 * the per-cell inputs of the quick estimate.
 *
 * Mapping from tile bands (manifest band ids, SI) to the site input (layers/site/site-input-schema.ts):
 *   meanAirTemp_C           -> climate.meanAirTemp_C
 *   airAmplitude_C          -> climate.amplitude_C        (regional default 18 K when the tiles lack it)
 *   warming_C_per_yr        -> climate.warming_C_per_yr   (default 0.04 K/yr when the tiles lack it); with a
 *                              scenario pathway also climate.warmingPathway, scaled by it (scenario-study.ts)
 *   nFreeze                 -> climate.nFreeze            (else scenario.ground.nFreeze); nThaw from the scenario
 *   geothermalFlux_W_m2     -> ground.geothermalFlux_W_m2 (else scenario.ground.geothermalFlux_W_m2)
 *   textureClass, waterContent_m3m3 -> ground.layers[0] = { texture, water + ice content } from the surface
 *                              down to the bedrock (water above the texture's porosity is excess ice, as
 *                              on the map; capped only at the site input's 0.95 m³/m³, with a note)
 *   bedrockDepth            -> ground.layers[1] = bedrock (water 0.02) from that depth to the domain bottom;
 *                              a cell of bedrock texture, or bedrock within 0.2 m, is bedrock throughout
 * From the scenario (manifest.scenario, defaults of layers/screening/scenario.ts): the standard pile
 * (length, top depth, diameter), the building (design load UA·(balance − (MAAT − amplitude − margin)),
 * foundation piles, balance point), the run length from the map's thaw years (studyRunYears), and the reference probe
 * (referenceRadius_m, referenceDepth_m) as probe 0 so the simulated thaw delay matches the map's.
 * The pile is the map's standard pile, the one the calibration compares with the simulator
 * (bench/cell-calibration.ts), so the published agreement bounds apply to the study as prefilled:
 *   - a coaxial loop in the steel casing (centre pipe 50 × 3 mm PE, down the annulus) with the scenario's
 *     pile resistance as the given resistance (pile.resistance: Rb = scenario.pile.resistance_mK_W,
 *     Ra 1 m·K/W, as the calibration), with a note saying so: the user replaces it with the loop's own;
 *   - 40 % propylene glycol (PREFILL_GLYCOL);
 *   - the flow per pile that gives the map's loop temperature difference (2 × heatPump.fluidHalfDelta_K)
 *     at the design-day peak, shared by the foundation's piles (prefillFlowPerPile_L_min).
 */
import { notePartsText, type NotePart } from '../note-parts';
import type { SiteInputDraft } from '../site/site-input-schema';
import { designHeatingLoad_W } from '../site/site-load-line';
import { heatPumpAt } from '../physics/heat-pump';
import { fluidProperties } from '../physics/fluids';
import { BAND, type BandId } from './band-ids';
import { TEXTURE_CODES, type CellInputs, type TextureName } from './screening-model';
import { DEFAULT_SCENARIO, parseScenario, type Scenario } from './scenario';
import { screenCell, type CellScreening } from './cell-screening-model';
import { sitePathway } from './scenario-study';

/** The bands the prefill reads (each one a band every build writes: tests/pipeline/site-prefill-demo-build.test.ts). */
export const PREFILL_BANDS: readonly BandId[] = [
  BAND.meanAirTemp_C,
  BAND.airAmplitude_C,
  BAND.warming_C_per_yr,
  BAND.textureClass,
  BAND.waterContent_m3m3,
  BAND.bedrockDepth,
];

/** Band values of the clicked cell (manifest band id -> SI value, null = nodata). */
export type CellBandValues = Record<string, number | null | undefined>;

export interface PrefillNote {
  /** Site-input path the note is about, e.g. 'climate.amplitude_C'. */
  path: string;
  /** The note in SI words. */
  text: string;
  /** The same note, words and quantities apart, where it holds a quantity with a unit. */
  parts?: NotePart[];
}

export interface SitePrefill {
  draft: SiteInputDraft;
  notes: PrefillNote[];
  /** Why the run is as long as it is (studyRunYears). */
  runLength: { years: number; reason: string };
}

/**
 * Run length of the study for a cell: long enough to see the thaw the map predicts at the reference
 * point with the piles (its thaw year + 5 years), else to the scenario's climate horizon; never shorter
 * than the design life, never longer than the site input's 200 years.
 */
export function studyRunYears(quick: CellScreening | null, s: Scenario): { years: number; reason: string } {
  const horizon = s.climateHorizonYear - s.startYear;
  const life = Math.round(s.designLife_yr);
  const clamp = (y: number) => Math.min(200, Math.max(life, Math.ceil(y)));
  const m = quick?.metrics;
  const piles = m?.thawYearPiles;
  const noPiles = m?.thawYear;
  if (piles && piles.value !== null && piles.qualifier === undefined) {
    const years = clamp(piles.value - s.startYear + 5);
    return {
      years,
      reason: `${years} years: the map has the ground at the reference point thaw with the piles in ${Math.round(piles.value)}${
        noPiles?.value !== null && noPiles?.value !== undefined
          ? ` (without piles in ${Math.round(noPiles.value)})`
          : ''
      }; the run goes 5 years past it so both thaws can be read.`,
    };
  }
  const years = clamp(horizon);
  return {
    years,
    reason:
      noPiles && noPiles.value !== null && noPiles.qualifier === undefined
        ? `${years} years, to the climate horizon ${s.climateHorizonYear}: the map has the ground thaw without piles in ${Math.round(noPiles.value)} and with them after ${s.climateHorizonYear}.`
        : `${years} years, to the climate horizon ${s.climateHorizonYear}: the map has no thaw at the reference point before then.`,
  };
}

/** Regional fallbacks where the tiles carry no band (common practice for the subarctic; editable). */
export const PREFILL_FALLBACKS = {
  meanAirTemp_C: -5,
  amplitude_C: 18,
  warming_C_per_yr: 0.04,
  textureClass: 3,
  waterContent_m3m3: 0.35,
  bedrockDepth_m: 100,
  bedrockWater_m3m3: 0.02,
} as const;

const DOMAIN_DEPTH_M = 50;
/** Propylene glycol mass fraction of the prefilled loop, as the calibration (freezes near −21 °C, so the map's lowest leaving fluid keeps the 3 K freeze margin of the sizing; common practice). */
const PREFILL_GLYCOL = 0.4;

/**
 * Loop flow per pile, L/min, that gives the map's loop temperature difference 2·fluidHalfDelta_K at the
 * design-day peak: the peak ground load Q·(1 − 1/COP at the lowest entering fluid) shared by the
 * foundation's piles, over ρc_p of the glycol at that fluid temperature. Rounded to 0.1 L/min, at least
 * the form's 0.5 L/min.
 */
export function prefillFlowPerPile_L_min(s: Scenario, meanAirTemp_C: number, amplitude_C: number): number {
  const hp = s.heatPump;
  const peak_W = standardDesignLoad_W(s, meanAirTemp_C, amplitude_C);
  const cop = heatPumpAt({ enteringFluid_C: hp.minEnteringFluid_C }).cop;
  const ground_W = (peak_W * (1 - 1 / cop)) / s.building.foundationPiles;
  const fl = fluidProperties({
    fluid: 'propyleneGlycol',
    massFraction: PREFILL_GLYCOL,
    temperature_C: hp.minEnteringFluid_C,
  });
  const dT = Math.max(2 * hp.fluidHalfDelta_K, 0.5);
  const flow = (ground_W / (fl.density_kg_m3 * fl.specificHeat_J_kgK * dT)) * 60000;
  return Math.max(0.5, Math.round(flow * 10) / 10);
}

/** Scenario recorded in the manifest, or the defaults when absent or unreadable. */
export function scenarioFromManifest(raw: unknown): Scenario {
  if (raw === undefined || raw === null) return DEFAULT_SCENARIO;
  try {
    return parseScenario(raw);
  } catch {
    return DEFAULT_SCENARIO;
  }
}

function finite(v: number | null | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

const round = (x: number, digits: number): number => Number(x.toFixed(digits));

/**
 * Largest water + ice content the site input accepts (site-input-schema.ts, 0.95 m³/m³). Above the
 * texture's porosity the soil catalogue carries the excess as excess ice, as the map does (issue 11).
 */
export const MAX_SITE_WATER_CONTENT_M3M3 = 0.95;

/** Design-day heating load of the scenario's standard building at a site's climate, W (site-load-line.ts). */
export function standardDesignLoad_W(s: Scenario, meanAirTemp_C: number, amplitude_C: number): number {
  return designHeatingLoad_W({ ...s.building, meanAirTemp_C, amplitude_C });
}

/**
 * Load of the standard building at the coldest air of the annual wave, W: the site input's
 * designLoad_W (the top of the load line; the design-day margin is added for the peak pulse of the
 * sizing only, site-load-line.ts).
 */
export function standardLoadAtColdestAir_W(s: Scenario, meanAirTemp_C: number, amplitude_C: number): number {
  return designHeatingLoad_W({ ...s.building, designMargin_K: 0, meanAirTemp_C, amplitude_C });
}

/** A band's value, or the regional fallback with a note naming the site-input path. */
type BandPick = (band: BandId, path: string, fallback: number, what: string) => number;

function bandPicker(values: CellBandValues, notes: PrefillNote[]): BandPick {
  return (band, path, fallback, what) => {
    const v = values[band];
    if (finite(v)) return v;
    notes.push({
      path,
      text: `${what} is not in the map data here; ${fallback} is a regional default: check it.`,
    });
    return fallback;
  };
}

/** The site's climate from the cell's air bands, n-factors and heat flux from the scenario where absent. */
function climateFromCell(values: CellBandValues, s: Scenario, pick: BandPick) {
  const maat = round(
    pick(
      BAND.meanAirTemp_C,
      'climate.meanAirTemp_C',
      PREFILL_FALLBACKS.meanAirTemp_C,
      'Mean air temperature',
    ),
    2,
  );
  const amp = round(
    pick(
      BAND.airAmplitude_C,
      'climate.amplitude_C',
      PREFILL_FALLBACKS.amplitude_C,
      'Air temperature amplitude',
    ),
    2,
  );
  const warming = round(
    pick(
      BAND.warming_C_per_yr,
      'climate.warming_C_per_yr',
      PREFILL_FALLBACKS.warming_C_per_yr,
      'Warming trend',
    ),
    4,
  );
  const nFreeze = finite(values.nFreeze) ? round(values.nFreeze, 3) : s.ground.nFreeze;
  const flux = finite(values.geothermalFlux_W_m2)
    ? round(values.geothermalFlux_W_m2, 4)
    : s.ground.geothermalFlux_W_m2;
  return { maat, amp, warming, nFreeze, flux };
}

/** The ground layers from the cell's texture, water + ice content and bedrock depth (module comment). */
function layersFromCell(
  pick: BandPick,
  notes: PrefillNote[],
): NonNullable<SiteInputDraft['ground']['layers']> {
  const code = pick(
    BAND.textureClass,
    'ground.layers.0.soil.texture',
    PREFILL_FALLBACKS.textureClass,
    'Soil texture',
  );
  const texture: TextureName = TEXTURE_CODES[Math.round(code) as keyof typeof TEXTURE_CODES] ?? 'silt';
  const rawWater = pick(
    BAND.waterContent_m3m3,
    'ground.layers.0.soil.waterContent_m3m3',
    PREFILL_FALLBACKS.waterContent_m3m3,
    'Water + ice content',
  );
  const bedrock = pick(
    BAND.bedrockDepth,
    'ground.layers.1.top_m',
    PREFILL_FALLBACKS.bedrockDepth_m,
    'Depth to bedrock',
  );
  const bedrockLayer = (top_m: number) => ({
    top_m,
    bottom_m: DOMAIN_DEPTH_M,
    soil: { texture: 'bedrock' as const, waterContent_m3m3: PREFILL_FALLBACKS.bedrockWater_m3m3 },
  });
  if (texture === 'bedrock' || bedrock < 0.2) {
    return [bedrockLayer(0)];
  }
  const cap = MAX_SITE_WATER_CONTENT_M3M3;
  const water = round(Math.min(Math.max(rawWater, 0), cap), 3);
  // Compare before rounding: rounding to 3 digits is not a cap (a build's 0.1435 is not "capped").
  if (rawWater > cap) {
    notes.push({
      path: 'ground.layers.0.soil.waterContent_m3m3',
      text: `Map water content ${rawWater.toFixed(2)} m³/m³ exceeds the site input's largest water + ice content; capped at ${water}.`,
    });
  }
  const soilBottom = Math.min(round(bedrock, 1), DOMAIN_DEPTH_M);
  const layers: NonNullable<SiteInputDraft['ground']['layers']> = [
    { top_m: 0, bottom_m: soilBottom, soil: { texture, waterContent_m3m3: water } },
  ];
  if (soilBottom < DOMAIN_DEPTH_M) layers.push(bedrockLayer(soilBottom));
  return layers;
}

/** The map's standard pile as the calibration models it (module comment), with the map's resistance. */
export function standardPileDraft(s: Scenario, maat: number, amp: number): SiteInputDraft['pile'] {
  const p = s.pile;
  return {
    length_m: p.length_m,
    topDepth_m: p.topDepth_m,
    outerDiameter_m: round(2 * p.radius_m, 4),
    wallThickness_m: 0.0071,
    loop: {
      type: 'coaxial',
      centreOuterDiameter_m: 0.05,
      centreInnerDiameter_m: 0.044,
      centreConductivity_W_mK: 0.4,
      downFlow: 'annulus',
    },
    fluid: { name: 'propyleneGlycol', massFraction: PREFILL_GLYCOL },
    flow_L_min: prefillFlowPerPile_L_min(s, maat, amp),
    resistance: { Rb_mK_W: s.pile.resistance_mK_W, Ra_mK_W: 1 },
  };
}

/** Build the site form's starting input from a cell (see the module comment for the mapping). */
export function sitePrefill(values: CellBandValues, scenarioRaw?: unknown): SitePrefill {
  const s = scenarioFromManifest(scenarioRaw);
  const notes: PrefillNote[] = [];
  const pick = bandPicker(values, notes);
  const { maat, amp, warming, nFreeze, flux } = climateFromCell(values, s, pick);
  const layers = layersFromCell(pick, notes);
  const p = s.pile;
  const resistanceParts: NotePart[] = [
    "Pile resistance set to the map's standard pile, ",
    { value: s.pile.resistance_mK_W, unit: 'm·K/W' },
    ", so the study and the map compare like with like; enter your loop's measured resistances, or remove them to compute them from the loop and the flow.",
  ];
  notes.push({ path: 'pile.resistance', text: notePartsText(resistanceParts), parts: resistanceParts });
  const load = Math.round(standardLoadAtColdestAir_W(s, maat, amp) / 100) * 100;
  const draft: SiteInputDraft = {
    years: Math.round(s.designLife_yr),
    ground: { layers, geothermalFlux_W_m2: flux, initial: 'equilibrium' },
    climate: {
      meanAirTemp_C: maat,
      amplitude_C: amp,
      warming_C_per_yr: warming,
      // The scenario's warming pathway, pattern-scaled by the cell's trend (scenario-study.ts).
      ...(s.warmingPathway ? { warmingPathway: sitePathway(s, warming) } : {}),
      nThaw: s.ground.nThaw,
      nFreeze,
    },
    pile: standardPileDraft(s, maat, amp),
    operation: {
      mode: 'building',
      designLoad_W: Math.max(load, 100),
      pileCount: s.building.foundationPiles,
      balancePoint_C: s.building.balanceTemp_C,
    },
    probes: [
      { r_m: s.referenceRadius_m, z_m: s.referenceDepth_m },
      { r_m: 0.5, z_m: 3 },
      { r_m: s.referenceRadius_m, z_m: p.topDepth_m + p.length_m + 1 },
      { r_m: 5, z_m: s.referenceDepth_m },
    ],
    domain: { radius_m: 20, depth_m: DOMAIN_DEPTH_M },
    numerics: { fidelity: 'standard' },
  };
  const quick = (() => {
    try {
      const ci = cellInputsFromSite(draft, s);
      return ci ? screenCell(ci, s) : null;
    } catch {
      return null;
    }
  })();
  const runLength = studyRunYears(quick, s);
  draft.years = runLength.years;
  return { draft, notes, runLength };
}

/**
 * The per-cell inputs of the quick estimate for the current form (screenCell), or null when the ground
 * is given by explicit properties rather than soil descriptions. The soil of the layer holding the
 * scenario's reference depth gives texture and water; bedrock depth = top of the first bedrock layer
 * (1000 m when none).
 */
export function cellInputsFromSite(draft: SiteInputDraft, s: Scenario): CellInputs | null {
  const layers = draft.ground?.layers ?? [];
  const c = draft.climate;
  if (!c || layers.length === 0) return null;
  const z = s.referenceDepth_m;
  const soilLayers = layers.filter((l) => l.soil && l.soil.texture !== 'bedrock');
  const here = soilLayers.find((l) => l.top_m <= z && z < l.bottom_m) ?? soilLayers[0] ?? layers[0];
  if (!here.soil) return null;
  const rock = layers.find((l) => l.soil?.texture === 'bedrock');
  const code = Number(Object.entries(TEXTURE_CODES).find(([, n]) => n === here.soil?.texture)?.[0]);
  return {
    meanAirTemp_C: c.meanAirTemp_C,
    airAmplitude_C: c.amplitude_C,
    warming_C_per_yr: c.warming_C_per_yr,
    textureClass: code,
    waterContent_m3m3: here.soil.waterContent_m3m3,
    bedrockDepth_m: rock ? rock.top_m : 1000,
    groundTemp_C: NaN,
    geothermalFlux_W_m2: draft.ground?.geothermalFlux_W_m2 ?? NaN,
    nFreeze: c.nFreeze,
    latitude_deg: NaN,
  };
}
