/**
 * Thermal resistance of a hollow steel pile used as a ground heat exchanger, per metre of pile.
 *
 * Definitions (Hellström 1991, Ground Heat Storage, Lund University, ch. 8; as restated in Javed &
 * Spitler 2017, in Advances in Ground-Source Heat Pump Systems, ch. 3):
 * - Rb: from the mean fluid temperature to the outer steel surface of the pile (the "pile wall").
 * - Ra: the internal resistance between the downward and upward flow channels (the short-circuit).
 *   For a U-tube it is Hellström's leg-to-leg resistance; `R12` is the direct coupling of the
 *   delta circuit, R12 = 4 Rb_inner Ra / (4 Rb_inner − Ra). For a coaxial loop the centre pipe does not
 *   touch the casing, so Ra = R12 = centre convection + centre pipe wall + annulus inner-wall convection.
 * - RbEffective: uniform-heat-flux effective resistance seen by (T_in + T_out)/2,
 *   Rb* = Rb + H² / (3 R12' (ṁ c_p)²) (Hellström 1991, eq. for Rb* with R_a; for the coaxial loop the
 *   same form was re-derived to first order in 1/R12 with R12' = R12).
 *
 * U-tube in a water- or grout-filled casing: pipe Rp = ln(ro/ri)/(2π kp) + 1/(2π ri h) (two legs in
 * parallel: Rp/2); fill by Hellström's line-source (zeroth-order multipole) formula with the casing
 * inner radius as "borehole" radius and the steel as the surrounding medium,
 *   R_fill = [ln(rc/rp) + ln(rc/(2xc)) + σ ln(rc⁴/(rc⁴ − xc⁴))]/(4π k_fill), σ = (k_fill − k_s)/(k_fill + k_s),
 *   Ra = [ln(2xc/rp) + σ ln((rc² + xc²)/(rc² − xc²))]/(π k_fill) + 2 Rp;
 * since steel conducts ~100 times better than the fill, σ ≈ −1 and the casing acts as an isothermal
 * circle. Steel casing R_s = ln(r_o/r_i)/(2π k_s). Line-source accuracy degrades when the legs nearly touch
 * the casing (rp/rc > 0.3): use a multipole code for a design.
 * Coaxial: annulus against the steel, Gnielinski/Kays–Perkins convection at the outer wall
 * (convection.ts), R_s as above; insulated or plastic centre pipe.
 *
 * Neglected (stated in `neglected`): helical plates (treated as no fin), natural convection in a
 * water-filled casing (conduction only, conservative), contact resistances, axial conduction,
 * entrance effects, the fluid's property change along the pile, and freezing of a water fill.
 */
import { annulusConvection, tubeConvection, type ConvectionResult, type FluidTransport } from './convection';
import { requireOneOf, requirePositive, requireRange } from './validate';

export interface CasingGeometry {
  outerRadius_m: number;
  innerRadius_m: number;
  /** Steel: about 45–50 W/(m·K) (common practice). */
  conductivity_W_mK: number;
}

interface CommonInput {
  casing: CasingGeometry;
  fluid: FluidTransport;
  /** Volumetric flow through this pile's loop, m³/s. */
  flowRate_m3_s: number;
  /** Active length of the pile, m (for the effective resistance). */
  length_m: number;
}

export interface UTubeInput extends CommonInput {
  loop: 'uTube';
  pipeOuterRadius_m: number;
  pipeInnerRadius_m: number;
  pipeConductivity_W_mK: number;
  /** Half the centre-to-centre distance between the legs, m. */
  shankHalfSpacing_m: number;
  /** Conductivity of the casing fill (water ~0.57, antifreeze ~0.45, grout 0.8–2.0), W/(m·K). */
  fillConductivity_W_mK: number;
}

export interface CoaxialInput extends CommonInput {
  loop: 'coaxial';
  centreOuterRadius_m: number;
  centreInnerRadius_m: number;
  /** Centre pipe (plastic ~0.4, insulated pipe lower), W/(m·K). */
  centreConductivity_W_mK: number;
  /** Which channel carries the fluid down (the resistances do not depend on it). */
  downFlow: 'annulus' | 'centre';
}

export type PileResistanceInput = UTubeInput | CoaxialInput;

export interface PileResistanceResult {
  Rb_mK_W: number;
  Ra_mK_W: number;
  R12_mK_W: number;
  RbEffective_mK_W: number;
  parts: Record<string, number>;
  flow: ConvectionResult;
  neglected: string[];
}

const NEGLECTED = [
  'helical plates (no fin effect)',
  'natural convection in a water-filled casing (conduction only)',
  'contact resistances',
  'axial conduction and entrance effects',
  'variation of fluid properties along the pile',
];

/** Hellström (1991) zeroth-order line-source fill resistance and leg-to-leg resistance (no pipe). */
export function hellstromLineSource(input: {
  boreRadius_m: number;
  pipeOuterRadius_m: number;
  shankHalfSpacing_m: number;
  fillConductivity_W_mK: number;
  surroundingConductivity_W_mK: number;
}): { Rg_mK_W: number; RaFill_mK_W: number } {
  const rb = requirePositive('boreRadius_m', input.boreRadius_m, 'm');
  const rp = requireRange('pipeOuterRadius_m', input.pipeOuterRadius_m, 1e-6, rb / 2, 'm');
  const xc = requireRange('shankHalfSpacing_m', input.shankHalfSpacing_m, rp, rb - rp, 'm');
  const kg = requirePositive('fillConductivity_W_mK', input.fillConductivity_W_mK);
  const k = requirePositive('surroundingConductivity_W_mK', input.surroundingConductivity_W_mK);
  const sigma = (kg - k) / (kg + k);
  const rb4 = rb ** 4;
  const Rg =
    (Math.log(rb / rp) + Math.log(rb / (2 * xc)) + sigma * Math.log(rb4 / (rb4 - xc ** 4))) /
    (4 * Math.PI * kg);
  const RaFill =
    (Math.log((2 * xc) / rp) + sigma * Math.log((rb * rb + xc * xc) / (rb * rb - xc * xc))) / (Math.PI * kg);
  return { Rg_mK_W: Rg, RaFill_mK_W: RaFill };
}

/** Conduction resistance of a cylindrical wall per metre, ln(ro/ri)/(2πk). */
export function cylinderWallResistance(input: {
  innerRadius_m: number;
  outerRadius_m: number;
  conductivity_W_mK: number;
}): number {
  const ri = requirePositive('innerRadius_m', input.innerRadius_m, 'm');
  const ro = requireRange('outerRadius_m', input.outerRadius_m, ri, Infinity, 'm');
  const k = requirePositive('conductivity_W_mK', input.conductivity_W_mK);
  return Math.log(ro / ri) / (2 * Math.PI * k);
}

function checkCasing(c: CasingGeometry): CasingGeometry {
  const ro = requirePositive('casing.outerRadius_m', c.outerRadius_m, 'm');
  const ri = requireRange('casing.innerRadius_m', c.innerRadius_m, 1e-6, ro * (1 - 1e-9), 'm');
  const k = requirePositive('casing.conductivity_W_mK', c.conductivity_W_mK);
  return { outerRadius_m: ro, innerRadius_m: ri, conductivity_W_mK: k };
}

function effective(Rb: number, R12: number, length_m: number, mcp: number): number {
  return Rb + (length_m * length_m) / (3 * R12 * mcp * mcp);
}

/** What every loop shares: checked flow and length, the casing's inner radius and wall resistance. */
interface PileCommon {
  flow: number;
  length: number;
  rc: number;
  Rs: number;
}

/** U-tube in the casing: Hellström's line-source fill resistances plus the pipes' wall and convection. */
function uTubeResistance(input: UTubeInput, p: PileCommon, casing: CasingGeometry): PileResistanceResult {
  const { flow, length, rc, Rs } = p;
  const u = input;
  const rpo = requireRange(
    'pipeOuterRadius_m',
    u.pipeOuterRadius_m,
    1e-4,
    rc / 2,
    'm (half the casing inner radius)',
  );
  const rpi = requireRange('pipeInnerRadius_m', u.pipeInnerRadius_m, 1e-4, rpo * (1 - 1e-9), 'm');
  const xc = requireRange('shankHalfSpacing_m', u.shankHalfSpacing_m, rpo, rc - rpo, 'm');
  const kp = requirePositive('pipeConductivity_W_mK', u.pipeConductivity_W_mK);
  const kf = requirePositive('fillConductivity_W_mK', u.fillConductivity_W_mK);
  const conv = tubeConvection({ fluid: input.fluid, flowRate_m3_s: flow, innerRadius_m: rpi });
  const RpWall = cylinderWallResistance({ innerRadius_m: rpi, outerRadius_m: rpo, conductivity_W_mK: kp });
  const RpConv = 1 / (2 * Math.PI * rpi * conv.h_W_m2K);
  const Rp = RpWall + RpConv;
  const hs = hellstromLineSource({
    boreRadius_m: rc,
    pipeOuterRadius_m: rpo,
    shankHalfSpacing_m: xc,
    fillConductivity_W_mK: kf,
    surroundingConductivity_W_mK: casing.conductivity_W_mK,
  });
  const RbInner = hs.Rg_mK_W + Rp / 2;
  const Ra = hs.RaFill_mK_W + 2 * Rp;
  const Rb = RbInner + Rs;
  const R12 = (4 * RbInner * Ra) / (4 * RbInner - Ra);
  const mcp = flow * input.fluid.density_kg_m3 * input.fluid.specificHeat_J_kgK;
  return {
    Rb_mK_W: Rb,
    Ra_mK_W: Ra,
    R12_mK_W: R12 > 0 ? R12 : Infinity,
    RbEffective_mK_W: effective(Rb, Ra, length, mcp),
    parts: {
      pipeConvection: RpConv,
      pipeWall: RpWall,
      fill: hs.Rg_mK_W,
      steelCasing: Rs,
      raFill: hs.RaFill_mK_W,
    },
    flow: conv,
    neglected: NEGLECTED,
  };
}

/** Coaxial loop: the annulus' convection to the casing, and the centre pipe between the channels. */
function coaxialResistance(input: CoaxialInput, p: PileCommon): PileResistanceResult {
  const { flow, length, rc, Rs } = p;
  const c = input;
  const rco = requireRange(
    'centreOuterRadius_m',
    c.centreOuterRadius_m,
    1e-4,
    rc * 0.98,
    'm (below the casing inner radius)',
  );
  const rci = requireRange('centreInnerRadius_m', c.centreInnerRadius_m, 1e-4, rco * (1 - 1e-9), 'm');
  const kc = requirePositive('centreConductivity_W_mK', c.centreConductivity_W_mK);
  requireOneOf('downFlow', c.downFlow, ['annulus', 'centre'] as const);
  const outer = annulusConvection({
    fluid: input.fluid,
    flowRate_m3_s: flow,
    innerRadius_m: rco,
    outerRadius_m: rc,
    wall: 'outer',
  });
  const inner = annulusConvection({
    fluid: input.fluid,
    flowRate_m3_s: flow,
    innerRadius_m: rco,
    outerRadius_m: rc,
    wall: 'inner',
  });
  const centre = tubeConvection({ fluid: input.fluid, flowRate_m3_s: flow, innerRadius_m: rci });
  const RconvOuter = 1 / (2 * Math.PI * rc * outer.h_W_m2K);
  const RconvInner = 1 / (2 * Math.PI * rco * inner.h_W_m2K);
  const RconvCentre = 1 / (2 * Math.PI * rci * centre.h_W_m2K);
  const RcentreWall = cylinderWallResistance({
    innerRadius_m: rci,
    outerRadius_m: rco,
    conductivity_W_mK: kc,
  });
  const Rb = RconvOuter + Rs;
  const R12 = RconvCentre + RcentreWall + RconvInner;
  const mcp = flow * input.fluid.density_kg_m3 * input.fluid.specificHeat_J_kgK;
  return {
    Rb_mK_W: Rb,
    Ra_mK_W: R12,
    R12_mK_W: R12,
    RbEffective_mK_W: effective(Rb, R12, length, mcp),
    parts: {
      annulusConvection: RconvOuter,
      steelCasing: Rs,
      centreConvection: RconvCentre,
      centreWall: RcentreWall,
      annulusInnerConvection: RconvInner,
    },
    flow: outer,
    neglected: NEGLECTED,
  };
}

/** Pile resistances for a U-tube or coaxial loop (see the module comment for the method). */
export function pileResistance(input: PileResistanceInput): PileResistanceResult {
  const loop = requireOneOf('loop', input.loop, ['uTube', 'coaxial'] as const);
  const casing = checkCasing(input.casing);
  const flow = requirePositive('flowRate_m3_s', input.flowRate_m3_s, 'm3/s');
  const length = requirePositive('length_m', input.length_m, 'm');
  const Rs = cylinderWallResistance({
    innerRadius_m: casing.innerRadius_m,
    outerRadius_m: casing.outerRadius_m,
    conductivity_W_mK: casing.conductivity_W_mK,
  });
  const common: PileCommon = { flow, length, rc: casing.innerRadius_m, Rs };
  return loop === 'uTube'
    ? uTubeResistance(input as UTubeInput, common, casing)
    : coaxialResistance(input as CoaxialInput, common);
}
