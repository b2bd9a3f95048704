/**
 * The pile's loop and its operating controller for the three operation modes.
 *
 * Resistances: `pileResistance` (Hellström line source for a U-tube, series resistances for a coaxial
 * loop; layers/physics/pile-resistance.ts) at the fluid's properties at a reference temperature
 * (0 °C, or 1 K above the fluid's freezing point if that is higher), unless measured Rb and Ra are
 * given. Delta circuit: U-tube g_down = g_up = 1/(2 Rb), g_12 = 1/R12 with R12 = 4 Rb Ra / (4 Rb − Ra);
 * coaxial: 1/Rb on the channel in contact with the casing (the annulus), 0 on the centre pipe, g_12 = 1/Ra.
 * Modes:
 * - heatRate: extraction_W (times the month's factor); 0 W switches the pump off.
 * - inletTemperature: the given inlet temperature and flow (pump off in months marked false).
 * - building: load per pile = designLoad/pileCount × (T_balance − T_air)/(T_balance − T_air,coldest),
 *   ≥ 0 (degree-day load line, common practice); ground load = load (1 − 1/COP(EFT)) (heat-pump.ts),
 *   COP at the previous step's outlet (= entering fluid) temperature, held for the step; when the outlet
 *   would fall below the curve's lowest EFT the heat pump draws only what holds the outlet there, and when
 *   the ground cannot supply any heat above that EFT (ground at or below it) the heat pump is off for
 *   the step (limiting modes of the loop's heat-pump command, pile-loop.ts); what it does not deliver is
 *   left to a backup heater and reported as unmet.
 */
import { loadLineFraction } from './site-load-line';
import { fluidProperties, freezingPoint_C } from '../physics/fluids';
import { DEFAULT_HEAT_PUMP_CURVE, heatPumpCurveAt } from '../physics/heat-pump';
import { pileResistance } from '../physics/pile-resistance';
import { SECONDS_PER_DAY } from '../physics/surface-forcing';
import { createPileLoop, type LoopCommand, type PileLoop } from './pile-loop';
import type { SiteInput } from './site-input-schema';
import type { SiteMesh } from './site-mesh';

export interface SiteLoop {
  loop: PileLoop;
  Rb_mK_W: number;
  Ra_mK_W: number;
  flow_L_min: number;
  /** Building heat demanded per pile at the current step (building mode), W; otherwise NaN. */
  demand_W(): number;
  /** Building heat delivered per pile by the heat pump at the current state, W; otherwise NaN. */
  delivered_W(): number;
}

/** Month index 0–11 of a time in a 365-day year. */
export function monthOf(time_s: number): number {
  const day = (time_s / SECONDS_PER_DAY) % 365;
  return Math.min(11, Math.floor(day / (365 / 12)));
}

type SitePile = NonNullable<SiteInput['pile']>;

/** The loop's resistances and flow capacity (see the module comment); throws naming `pile.*`. */
export interface LoopResistances {
  Rb: number;
  Ra: number;
  R12: number;
  /** ṁ c of the loop, W/K. */
  flowCapacity_W_K: number;
}

/**
 * Resistances and flow capacity of the pile's loop at `flow_L_min` (measured Rb, Ra if given, else
 * `pileResistance`). Also the site schema's last check of a pile (site-input-rules.ts): it throws a
 * RangeError naming `pile.fluid` or `pile.loop` for what the physics refuses.
 */
export function loopResistances(pile: SitePile, flow_L_min: number): LoopResistances {
  const spec = {
    fluid: pile.fluid.name,
    massFraction: pile.fluid.name === 'water' ? 0 : pile.fluid.massFraction,
  };
  let tf: number;
  try {
    tf = freezingPoint_C(spec);
  } catch (e) {
    throw new RangeError(`pile.fluid: ${(e as Error).message}`);
  }
  const props = fluidProperties({ ...spec, temperature_C: Math.max(0, tf + 1) });
  const flow_m3_s = flow_L_min / 60000;
  const mcp = flow_m3_s * props.density_kg_m3 * props.specificHeat_J_kgK;
  if (pile.resistance) {
    const Rb = pile.resistance.Rb_mK_W;
    const Ra = pile.resistance.Ra_mK_W;
    const R12 =
      pile.loop.type === 'coaxial'
        ? Ra
        : 4 * Rb * Ra > 0 && 4 * Rb > Ra
          ? (4 * Rb * Ra) / (4 * Rb - Ra)
          : Infinity;
    return { Rb, Ra, R12, flowCapacity_W_K: mcp };
  }
  const casing = {
    outerRadius_m: pile.outerDiameter_m / 2,
    innerRadius_m: pile.outerDiameter_m / 2 - pile.wallThickness_m,
    conductivity_W_mK: pile.steelConductivity_W_mK,
  };
  const common = { casing, fluid: props, flowRate_m3_s: flow_m3_s, length_m: pile.length_m };
  const loopSpec = pile.loop;
  try {
    const r =
      loopSpec.type === 'uTube'
        ? pileResistance({
            ...common,
            loop: 'uTube',
            pipeOuterRadius_m: loopSpec.pipeOuterDiameter_m / 2,
            pipeInnerRadius_m: loopSpec.pipeInnerDiameter_m / 2,
            pipeConductivity_W_mK: loopSpec.pipeConductivity_W_mK,
            shankHalfSpacing_m: loopSpec.shankSpacing_m / 2,
            fillConductivity_W_mK: loopSpec.fillConductivity_W_mK,
          })
        : pileResistance({
            ...common,
            loop: 'coaxial',
            centreOuterRadius_m: loopSpec.centreOuterDiameter_m / 2,
            centreInnerRadius_m: loopSpec.centreInnerDiameter_m / 2,
            centreConductivity_W_mK: loopSpec.centreConductivity_W_mK,
            downFlow: loopSpec.downFlow,
          });
    return { Rb: r.Rb_mK_W, Ra: r.Ra_mK_W, R12: r.R12_mK_W, flowCapacity_W_K: mcp };
  } catch (e) {
    throw new RangeError(`pile.loop: ${(e as Error).message}`);
  }
}

/** Per-metre conductances channel to wall and channel to channel (delta circuit, pile-loop.ts). */
function channelConductances(
  pile: NonNullable<SiteInput['pile']>,
  Rb: number,
  R12: number,
): { gDown: number; gUp: number; gChannels: number } {
  let gDown: number;
  let gUp: number;
  if (pile.loop.type === 'uTube') {
    gDown = 1 / (2 * Rb);
    gUp = gDown;
  } else {
    const annulusDown = pile.loop.downFlow === 'annulus';
    gDown = annulusDown ? 1 / Rb : 0;
    gUp = annulusDown ? 0 : 1 / Rb;
  }
  const gChannels = Number.isFinite(R12) && R12 > 0 ? 1 / R12 : 0;
  return { gDown, gUp, gChannels };
}

/** Length of each pile row and whether it exchanges heat (below the top of the active length). */
function pileRowGeometry(mesh: SiteMesh, pileRows: number, topDepth_m: number) {
  const rowLength = new Float64Array(pileRows);
  const rowActive: boolean[] = [];
  for (let j = 0; j < pileRows; j++) {
    rowLength[j] = mesh.zFaces_m[j + 1] - mesh.zFaces_m[j];
    rowActive.push(mesh.zCentres_m[j] > topDepth_m);
  }
  return { rowLength, rowActive };
}

export function createSiteLoop(
  input: SiteInput,
  mesh: SiteMesh,
  pileRows: number,
  airTemperature_C: (time_s: number) => number,
): SiteLoop {
  const pile = input.pile!;
  const op = input.operation;
  const flow_L_min = op.mode === 'inletTemperature' ? op.flow_L_min : pile.flow_L_min;
  const { Rb, Ra, R12, flowCapacity_W_K: mcp } = loopResistances(pile, flow_L_min);
  const { gDown, gUp, gChannels } = channelConductances(pile, Rb, R12);
  const { rowLength, rowActive } = pileRowGeometry(mesh, pileRows, pile.topDepth_m);

  let demand = NaN;
  let cop = NaN;
  let stepTime = -1;
  const curve = op.mode === 'building' ? (op.heatPump ?? DEFAULT_HEAT_PUMP_CURVE) : DEFAULT_HEAT_PUMP_CURVE;
  // Validated once here, not in every step (the zod check had cost more than the run's interpolation).
  const heatPump = heatPumpCurveAt(curve);
  let lastOutlet = NaN;

  const command = (time_s: number, outlet_C: number): LoopCommand => {
    if (op.mode === 'heatRate') {
      const f = op.monthlyFactors ? op.monthlyFactors[monthOf(time_s)] : 1;
      const e = op.extraction_W * f;
      return e === 0 ? { kind: 'off' } : { kind: 'extraction', extraction_W: e };
    }
    if (op.mode === 'inletTemperature') {
      if (op.monthlyOn && !op.monthlyOn[monthOf(time_s)]) return { kind: 'off' };
      return { kind: 'inlet', inlet_C: op.inlet_C };
    }
    if (time_s !== stepTime) {
      // New step: the load from the air temperature, COP at the last step's entering fluid temperature
      // (held for the step, so the step's heat-pump command is a fixed function of the ground).
      stepTime = time_s;
      const load =
        (op.designLoad_W / op.pileCount) *
        loadLineFraction(input.climate, op.balancePoint_C, airTemperature_C(time_s));
      const eft = Number.isFinite(lastOutlet) ? lastOutlet : outlet_C;
      cop = heatPump(Math.max(-60, Math.min(60, eft))).cop;
      demand = load;
    }
    if (!(demand > 0)) return { kind: 'off' };
    // The loop limits the draw so that the entering fluid stays at or above the curve's lowest EFT, and
    // switches the heat pump off for the step when the ground cannot supply any heat above it.
    return { kind: 'heatPump', extraction_W: demand * (1 - 1 / cop), minOutlet_C: curve.minEnteringFluid_C };
  };

  const loop = createPileLoop({
    rowLength_m: rowLength,
    rowActive,
    gDown_W_mK: gDown,
    gUp_W_mK: gUp,
    gChannels_W_mK: gChannels,
    flowCapacity_W_K: mcp,
    command,
  });
  const baseEnd = loop.endStep;
  loop.endStep = (dt: number) => {
    // A heat pump that was off keeps the last entering temperature it saw for its COP.
    lastOutlet = loop.running ? loop.outlet_C : lastOutlet;
    baseEnd(dt);
  };
  return {
    loop,
    Rb_mK_W: Rb,
    Ra_mK_W: Ra,
    flow_L_min,
    demand_W: () => (op.mode === 'building' ? demand : NaN),
    delivered_W: () => {
      if (op.mode !== 'building') return NaN;
      if (!loop.running) return 0;
      return Math.max(0, loop.extraction_W) / (1 - 1 / cop);
    },
  };
}
