/**
 * Number of foundation piles of fixed length needed to carry a building's heating load, by a
 * three-pulse design method adapted to piles.
 *
 * Method: the three-pulse design-length method of Kavanaugh & Rafferty (1997, Ground-Source Heat Pumps:
 * Design of Geothermal Systems for Commercial and Institutional Buildings, ASHRAE; ASHRAE Handbook—HVAC
 * Applications, geothermal chapter), with two changes after Bernier et al. (2008, ASHRAE Trans.
 * 114(2):342–350) and Philippe, Bernier & Marchio (2010, ASHRAE Trans. 116(2)): the long pulses use the
 * finite-line-source g-function of the actual pile group (spatial superposition, so pile interaction,
 * finite length and the ground surface replace the temperature penalty t_p), and the unknown is the
 * count N of piles of given length H rather than a length. With q' = Q/(N H) per metre of pile
 * (heat extracted > 0) and the pulses superposed in time,
 *   T_f = T_g − [q'_a g_N(t_life) + (q'_m − q'_a) g_N(t_m + t_p) + (q'_p − q'_m) g_cyl(t_p)]/(2πk) − q'_p R_b,
 *   EFT = T_f + Q_p/(2 ṁc_p), lowest fluid temperature = EFT − Q_p/(ṁc_p) (heating: the fluid entering
 *   the heat pump is the warmest point of the loop; layers/physics/fluid-temperature-convention.ts),
 * q_a the annual mean ground load, q_m the design month's, q_p the peak (t_p, default 6 h), g_cyl the
 * cylinder source at the pile wall (2πG, Carslaw & Jaeger). N is the least count with EFT >= the
 * minimum EFT (exponential search, then bisection; EFT rises with N). The controlling pulse is the one
 * whose term takes the largest share of T_g − T_f (the peak term includes q'_p R_b).
 * Ground loads: Q(1 − 1/COP); the peak uses the COP at the minimum EFT, the annual and monthly loads
 * the COP at the undisturbed ground temperature (more heat from the ground: conservative).
 * Fluid temperature over the design life: monthly loads superposed on g_N (interpolated in ln t over 32
 * precomputed times), the design-month peak added each year.
 * Cheap path (`method: 'singlePileCylinder'`): every pulse from the Bernier (2001) cylinder-source fit
 * for one pile, no interaction, closed-form N = ceil(drop of one pile / allowed drop) — for per-cell
 * screening only (it under-sizes groups).
 * Limits: homogeneous ground without phase change (freezing of pore water near the pile adds latent heat
 * and changes k: not modelled here; the site simulator does that), no surface heat exchange beyond the
 * isothermal surface of the FLS, uniform heat rate along piles, identical piles in parallel.
 */
import { cylinderSourceG, cylinderSourceGBernier } from '../physics/infinite-cylinder-source';
import { pileFieldGFunction } from '../physics/finite-line-source';
import { fluidProperties, requireFluidAbove, type FluidName } from '../physics/fluids';
import {
  enteringFromMeanFluid_C,
  leavingFromEnteringFluid_C,
  meanFluidFromEntering_C,
} from '../physics/fluid-temperature-convention';
import { heatPumpAt, WATTS_PER_TON, type HeatPumpCurve, DEFAULT_HEAT_PUMP_CURVE } from '../physics/heat-pump';
import { requireNonNegative, requirePositive, requireRange } from '../physics/validate';
import { layoutPositions, type PileLayout } from './sizing-layout';

const YEAR_S = 365.25 * 86400;
const MONTH_S = YEAR_S / 12;

/** Subarctic monthly share of annual heating (Jan…Dec), common practice shape from degree-days. */
export const DEFAULT_MONTHLY_HEATING_FRACTIONS = [
  0.15, 0.13, 0.12, 0.09, 0.06, 0.03, 0.02, 0.03, 0.05, 0.08, 0.11, 0.13,
] as const;

export interface PileFieldSizingInput {
  /** Peak building heating load, W (give this or peakHeatingLoad_tons). */
  peakHeatingLoad_W?: number;
  /** Peak building heating load in tons of refrigeration (1 ton = 3516.853 W). */
  peakHeatingLoad_tons?: number;
  /** Annual building heating energy, kWh. */
  annualHeating_kWh: number;
  /** Share of annual heating per month, 12 values summing to 1. */
  monthlyFractions?: readonly number[];
  pile: { length_m: number; radius_m: number; buriedDepth_m: number; Rb_mK_W: number };
  layout: PileLayout;
  ground: {
    conductivity_W_mK: number;
    diffusivity_m2_s: number;
    undisturbedTemperature_C: number;
    /**
     * Undisturbed ground averaged along the pile, month by month (12 values, the months of
     * monthlyFractions), °C. When given, the design is checked in every month against that month's
     * ground, with its own monthly load and the design-day peak above it (the short piles of a
     * foundation sit in the seasonal wave, whose pile-averaged minimum lags the air by one to three
     * months: the coldest-load month need not be the limiting one). Absent: every month at
     * undisturbedTemperature_C and only the design month is checked (the classical three pulses).
     */
    monthlyTemperature_C?: readonly number[];
  };
  minEnteringFluid_C?: number;
  heatPumpCurve?: HeatPumpCurve;
  fluid?: { fluid: FluidName; massFraction: number };
  /** Total loop flow per kW of peak heating load, m³/s per kW (common practice 3 US gpm/ton = 5.4e-5). */
  flowPerKilowatt_m3_s?: number;
  /** Freeze margin below the lowest fluid temperature, K (common practice 3). */
  freezeMargin_K?: number;
  designLife_yr?: number;
  peakDuration_h?: number;
  maxPiles?: number;
  method?: 'groupFls' | 'singlePileCylinder';
  /** Compute the year-by-year fluid temperature (default true; false for a fast count only). */
  includeLifeSeries?: boolean;
}

export type Pulse = 'annual' | 'monthly' | 'peak';

export interface PileFieldSizingResult {
  pileCount: number;
  totalLength_m: number;
  controllingPulse: Pulse;
  /** Temperature drop of the mean fluid below the ground attributed to each pulse, K. */
  pulseDrop_K: Record<Pulse, number>;
  enteringFluidAtDesign_C: number;
  lowestFluid_C: number;
  groundLoad_W: Record<Pulse, number>;
  copPeak: number;
  fluidTemperature_C: { year: number[]; minEnteringFluid_C: number[]; designMonthMeanFluid_C: number[] };
  positions: { x_m: number; y_m: number }[];
  method: 'groupFls' | 'singlePileCylinder';
}

interface Prepared {
  H: number;
  rb: number;
  D: number;
  k: number;
  a: number;
  Tg: number;
  /** Month-by-month pile-averaged ground (12), or null for the annual mean in the design month only. */
  TgMonths: number[] | null;
  Rb: number;
  layout: PileLayout;
  q: Record<Pulse, number>;
  qMonths: number[];
  designMonth: number;
  halfLoopDrop_K: number;
  minEft: number;
  life_s: number;
  peak_s: number;
  method: 'groupFls' | 'singlePileCylinder';
  copPeak: number;
}

/** The building's loads, checked: peak (W), annual heating (J) and the monthly fractions. */
function checkedLoads(input: PileFieldSizingInput): {
  peak: number;
  annual_J: number;
  fr: readonly number[];
} {
  const hasW = input.peakHeatingLoad_W !== undefined;
  const hasT = input.peakHeatingLoad_tons !== undefined;
  if (hasW === hasT) throw new TypeError('give exactly one of peakHeatingLoad_W and peakHeatingLoad_tons');
  const peak = hasW
    ? requirePositive('peakHeatingLoad_W', input.peakHeatingLoad_W, 'W')
    : requirePositive('peakHeatingLoad_tons', input.peakHeatingLoad_tons, 'tons') * WATTS_PER_TON;
  const annual_J = requirePositive('annualHeating_kWh', input.annualHeating_kWh, 'kWh') * 3.6e6;
  const fr = input.monthlyFractions ?? DEFAULT_MONTHLY_HEATING_FRACTIONS;
  if (fr.length !== 12) throw new RangeError(`monthlyFractions must hold 12 values; received ${fr.length}`);
  fr.forEach((f, i) => requireRange(`monthlyFractions[${i}]`, f, 0, 1));
  const sum = fr.reduce((s, f) => s + f, 0);
  if (Math.abs(sum - 1) > 1e-3)
    throw new RangeError(`monthlyFractions must sum to 1 (±0.001); received ${sum}`);
  return { peak, annual_J, fr };
}

/** The pile and ground, checked (the monthly ground, when given, 12 values). */
function checkedPileAndGround(input: PileFieldSizingInput) {
  const H = requireRange('pile.length_m', input.pile.length_m, 1, 200, 'm');
  const rb = requireRange('pile.radius_m', input.pile.radius_m, 0.01, 2, 'm');
  const D = requireRange('pile.buriedDepth_m', input.pile.buriedDepth_m, 0, 50, 'm');
  const Rb = requireNonNegative('pile.Rb_mK_W', input.pile.Rb_mK_W, 'm·K/W');
  const k = requireRange('ground.conductivity_W_mK', input.ground.conductivity_W_mK, 0.05, 10, 'W/(m·K)');
  const a = requireRange('ground.diffusivity_m2_s', input.ground.diffusivity_m2_s, 1e-8, 1e-4, 'm2/s');
  const Tg = requireRange(
    'ground.undisturbedTemperature_C',
    input.ground.undisturbedTemperature_C,
    -30,
    30,
    '°C',
  );
  const tm = input.ground.monthlyTemperature_C;
  if (tm !== undefined && tm.length !== 12)
    throw new RangeError(`ground.monthlyTemperature_C must hold 12 values; received ${tm.length}`);
  const TgMonths = tm
    ? tm.map((t, i) => requireRange(`ground.monthlyTemperature_C[${i}]`, t, -30, 30, '°C'))
    : null;
  return { H, rb, D, Rb, k, a, Tg, TgMonths };
}

function prepare(input: PileFieldSizingInput): Prepared {
  const { peak, annual_J, fr } = checkedLoads(input);
  const { H, rb, D, Rb, k, a, Tg, TgMonths } = checkedPileAndGround(input);
  const curve = input.heatPumpCurve ?? DEFAULT_HEAT_PUMP_CURVE;
  const minEft = requireRange(
    'minEnteringFluid_C',
    input.minEnteringFluid_C ?? curve.minEnteringFluid_C,
    -30,
    20,
    '°C',
  );
  if (minEft >= Tg) {
    throw new RangeError(
      `minEnteringFluid_C must be below ground.undisturbedTemperature_C ${Tg} °C; received ${minEft}`,
    );
  }
  // Up to 200 yr: the longest run the site input allows (site-input-schema.ts years); the field response
  // is near its steady state long before that, so a longer life only lengthens the annual pulse.
  const life = requireRange('designLife_yr', input.designLife_yr ?? 25, 1, 200, 'yr');
  const peakH = requireRange('peakDuration_h', input.peakDuration_h ?? 6, 0.5, 72, 'h');
  const flowPerKw = requireRange(
    'flowPerKilowatt_m3_s',
    input.flowPerKilowatt_m3_s ?? 5.4e-5,
    1e-6,
    1e-3,
    'm3/s per kW',
  );
  const fluidSpec = input.fluid ?? { fluid: 'propyleneGlycol' as const, massFraction: 0.3 };
  const copPeak = heatPumpAt({ enteringFluid_C: minEft, curve }).cop;
  const copSeason = heatPumpAt({ enteringFluid_C: Tg, curve }).cop;
  const fracGround = 1 - 1 / copSeason;
  const hoursMonth = MONTH_S;
  const qMonths = fr.map((f) => ((annual_J * f) / hoursMonth) * fracGround);
  let designMonth = 0;
  for (let i = 1; i < 12; i++) if (fr[i] > fr[designMonth]) designMonth = i;
  const margin = input.freezeMargin_K ?? 3;
  requireFluidAbove({ ...fluidSpec, lowestTemperature_C: minEft, margin_K: margin });
  const fluid = fluidProperties({ ...fluidSpec, temperature_C: minEft });
  const mcp = flowPerKw * (peak / 1000) * fluid.density_kg_m3 * fluid.specificHeat_J_kgK;
  const qPeak = peak * (1 - 1 / copPeak);
  const loopDrop = qPeak / mcp;
  requireFluidAbove({
    ...fluidSpec,
    lowestTemperature_C: minEft - loopDrop,
    margin_K: input.freezeMargin_K ?? 3,
  });
  return {
    H,
    rb,
    D,
    k,
    a,
    Tg,
    TgMonths,
    Rb,
    layout: input.layout,
    q: { annual: (annual_J / YEAR_S) * fracGround, monthly: qMonths[designMonth], peak: qPeak },
    qMonths,
    designMonth,
    halfLoopDrop_K: loopDrop / 2,
    minEft,
    life_s: life * YEAR_S,
    peak_s: peakH * 3600,
    method: input.method ?? 'groupFls',
    copPeak,
  };
}

function fieldG(p: Prepared, n: number, times_s: number[]): number[] {
  if (p.method === 'singlePileCylinder')
    return times_s.map((t) => 2 * Math.PI * cylinderSourceGBernier((p.a * t) / (p.rb * p.rb)));
  const positions = layoutPositions({ count: n, layout: p.layout, pileRadius_m: p.rb });
  return pileFieldGFunction({
    positions,
    pileRadius_m: p.rb,
    length_m: p.H,
    buriedDepth_m: p.D,
    diffusivity_m2_s: p.a,
    times_s,
  });
}

const peakCache = new WeakMap<Prepared, number>();

function peakG(p: Prepared): number {
  const cached = peakCache.get(p);
  if (cached !== undefined) return cached;
  const fo = (p.a * p.peak_s) / (p.rb * p.rb);
  const g =
    2 * Math.PI * (p.method === 'singlePileCylinder' ? cylinderSourceGBernier(fo) : cylinderSourceG(fo));
  peakCache.set(p, g);
  return g;
}

/**
 * Drops of the mean fluid below the ground by pulse in month `m` (default the design month): the annual
 * pulse over the life, the month's load above the annual mean, the design-day peak above the design
 * month's mean (the same UA·margin above every month's mean) with the resistance at the month's peak.
 */
function drops(p: Prepared, n: number, m = p.designMonth): Record<Pulse, number> {
  const L = n * p.H;
  const [gLife, gMonth] = fieldG(p, n, [p.life_s, MONTH_S + p.peak_s]);
  const c = 1 / (2 * Math.PI * p.k * L);
  const above = p.q.peak - p.q.monthly;
  const month = p.qMonths[m];
  return {
    annual: p.q.annual * gLife * c,
    monthly: (month - p.q.annual) * gMonth * c,
    peak: above * peakG(p) * c + ((month + above) / L) * p.Rb,
  };
}

/** Ground in month m: the month's pile-averaged ground when given, else the annual mean. */
function groundIn(p: Prepared, m: number): number {
  return p.TgMonths ? p.TgMonths[m] : p.Tg;
}

function eftIn(p: Prepared, n: number, m: number): number {
  const d = drops(p, n, m);
  return enteringFromMeanFluid_C(
    groundIn(p, m) - d.annual - d.monthly - d.peak,
    2 * p.halfLoopDrop_K,
    'heating',
  );
}

/** The limiting month: the design month, or with monthly ground the month of the lowest entering fluid. */
function limitingMonth(p: Prepared, n: number): number {
  if (!p.TgMonths) return p.designMonth;
  let best = p.designMonth;
  let low = eftIn(p, n, best);
  for (let m = 0; m < 12; m++) {
    const e = eftIn(p, n, m);
    if (e < low - 1e-12) {
      low = e;
      best = m;
    }
  }
  return best;
}

function eft(p: Prepared, n: number): number {
  return eftIn(p, n, limitingMonth(p, n));
}

/** Entering fluid temperature at the design condition for a given pile count (same method). */
export function designEnteringFluid_C(input: PileFieldSizingInput & { pileCount: number }): number {
  const n = requireRange('pileCount', input.pileCount, 1, 1e5);
  return eft(prepare(input), Math.round(n));
}

function lifeSeries(p: Prepared, n: number): PileFieldSizingResult['fluidTemperature_C'] {
  const years = Math.round(p.life_s / YEAR_S);
  const steps = years * 12;
  const tk = Array.from({ length: 32 }, (_, i) => MONTH_S * Math.pow(steps, i / 31));
  const gk = fieldG(p, n, tk);
  const lnt = tk.map(Math.log);
  const g = (t: number): number => {
    const x = Math.log(t);
    let i = 0;
    while (i < 30 && x > lnt[i + 1]) i++;
    const w = Math.min(Math.max((x - lnt[i]) / (lnt[i + 1] - lnt[i]), 0), 1);
    return (1 - w) * gk[i] + w * gk[i + 1];
  };
  const L = n * p.H;
  const c = 1 / (2 * Math.PI * p.k * L);
  const gP = peakG(p);
  const out = {
    year: [] as number[],
    minEnteringFluid_C: [] as number[],
    designMonthMeanFluid_C: [] as number[],
  };
  const theta: number[] = [];
  for (let m = 0; m < steps; m++) {
    let s = 0;
    for (let i = 0; i <= m; i++) {
      const dq = p.qMonths[i % 12] - (i > 0 ? p.qMonths[(i - 1) % 12] : 0);
      s += dq * g((m - i + 1) * MONTH_S);
    }
    theta.push(s);
  }
  for (let y = 0; y < years; y++) {
    const m = y * 12 + p.designMonth;
    const meanF = p.Tg - theta[m] * c;
    out.year.push(y + 1);
    out.designMonthMeanFluid_C.push(meanF);
    const peakDrop = (p.q.peak - p.qMonths[p.designMonth]) * gP * c + (p.q.peak / L) * p.Rb;
    out.minEnteringFluid_C.push(enteringFromMeanFluid_C(meanF - peakDrop, 2 * p.halfLoopDrop_K, 'heating'));
  }
  return out;
}

/** Sizes the pile field (see the module comment). Throws RangeError when maxPiles do not suffice. */
export function sizePileField(input: PileFieldSizingInput): PileFieldSizingResult {
  const p = prepare(input);
  const maxN = requireRange('maxPiles', input.maxPiles ?? 2000, 1, 1e5);
  if (p.method === 'singlePileCylinder') {
    // every term scales as 1/N: closed form N = ceil(total drop of one pile / allowed drop)
    const d1 = drops(p, 1);
    const n = Math.max(
      1,
      Math.ceil(
        (d1.annual + d1.monthly + d1.peak) /
          (p.Tg - meanFluidFromEntering_C(p.minEft, 2 * p.halfLoopDrop_K, 'heating')) -
          1e-9,
      ),
    );
    if (n > maxN) {
      throw new RangeError(
        `maxPiles ${maxN} piles are not enough to keep the entering fluid above ${p.minEft} °C`,
      );
    }
    return result(p, n, input.includeLifeSeries !== false);
  }
  let hi = 1;
  while (eft(p, hi) < p.minEft) {
    if (hi >= maxN) {
      throw new RangeError(
        `maxPiles ${maxN} piles are not enough to keep the entering fluid above ${p.minEft} °C`,
      );
    }
    hi = Math.min(hi * 2, maxN);
  }
  let lo = Math.floor(hi / 2);
  if (hi === 1) lo = 0;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (eft(p, mid) >= p.minEft) hi = mid;
    else lo = mid;
  }
  return result(p, hi, input.includeLifeSeries !== false);
}

function result(p: Prepared, n: number, withSeries: boolean): PileFieldSizingResult {
  const month = limitingMonth(p, n);
  const d = drops(p, n, month);
  const controlling = (Object.keys(d) as Pulse[]).reduce(
    (best, k) => (d[k] > d[best] ? k : best),
    'annual' as Pulse,
  );
  const design = enteringFromMeanFluid_C(
    groundIn(p, month) - d.annual - d.monthly - d.peak,
    2 * p.halfLoopDrop_K,
    'heating',
  );
  return {
    pileCount: n,
    totalLength_m: n * p.H,
    controllingPulse: controlling,
    pulseDrop_K: d,
    enteringFluidAtDesign_C: design,
    lowestFluid_C: leavingFromEnteringFluid_C(design, 2 * p.halfLoopDrop_K, 'heating'),
    groundLoad_W: p.q,
    copPeak: p.copPeak,
    fluidTemperature_C: withSeries
      ? lifeSeries(p, n)
      : { year: [], minEnteringFluid_C: [], designMonthMeanFluid_C: [] },
    positions: layoutPositions({ count: n, layout: p.layout, pileRadius_m: p.rb }),
    method: p.method,
  };
}
