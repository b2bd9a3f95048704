/**
 * Volumetric enthalpy of freezing ground with a linear freezing interval.
 *
 * Method: the ground is frozen below Ts = Tf - w/2, thawed above Tl = Tf + w/2 (Tf the freezing point,
 * w the freezing interval) and releases its volumetric latent heat L linearly in between (liquid
 * fraction f = (T - Ts)/w). With the mean capacity c̄ = (cF + cT)/2 in the interval, the enthalpy
 * (J/m³, zero at Ts) is
 *   H = cF (T - Ts)                          for T < Ts,
 *   H = (c̄ + L/w)(T - Ts)                    for Ts ≤ T ≤ Tl,
 *   H = c̄ w + L + cT (T - Tl)                for T > Tl,
 * which is continuous and strictly increasing, so T(H) is its exact inverse. This is the enthalpy form
 * of the phase-change problem (e.g. Voller & Cross 1981; Pham 1985, Int. J. Heat Mass Transfer 28:2079);
 * as w -> 0 it tends to the isothermal (Stefan) change that the Neumann solutions describe.
 * Conductivity follows the liquid fraction linearly between the frozen and thawed values.
 *
 * The hot-path helpers take a `MaterialTable` (one entry per material, flat typed arrays) and an index,
 * and perform no allocation.
 */
export interface GroundMaterial {
  kFrozen_W_mK: number;
  kThawed_W_mK: number;
  cFrozen_J_m3K: number;
  cThawed_J_m3K: number;
  latent_J_m3: number;
  freezingPoint_C: number;
  /** Width of the freezing interval, K (> 0). */
  freezingInterval_K: number;
}

export interface MaterialTable {
  count: number;
  kF: Float64Array;
  kT: Float64Array;
  cF: Float64Array;
  cT: Float64Array;
  /** Solidus Ts and liquidus Tl, °C. */
  Ts: Float64Array;
  Tl: Float64Array;
  /** Capacity inside the interval, c̄ + L/w, J/m³K. */
  cMushy: Float64Array;
  /** Enthalpy at the liquidus, c̄ w + L, J/m³. */
  Hl: Float64Array;
  Tf: Float64Array;
}

export function materialTable(materials: GroundMaterial[]): MaterialTable {
  const n = materials.length;
  const t: MaterialTable = {
    count: n,
    kF: new Float64Array(n),
    kT: new Float64Array(n),
    cF: new Float64Array(n),
    cT: new Float64Array(n),
    Ts: new Float64Array(n),
    Tl: new Float64Array(n),
    cMushy: new Float64Array(n),
    Hl: new Float64Array(n),
    Tf: new Float64Array(n),
  };
  materials.forEach((m, i) => {
    const w = m.freezingInterval_K;
    if (!(w > 0)) throw new RangeError(`freezingInterval_K must be > 0 K; received ${w}`);
    const cBar = 0.5 * (m.cFrozen_J_m3K + m.cThawed_J_m3K);
    t.kF[i] = m.kFrozen_W_mK;
    t.kT[i] = m.kThawed_W_mK;
    t.cF[i] = m.cFrozen_J_m3K;
    t.cT[i] = m.cThawed_J_m3K;
    t.Ts[i] = m.freezingPoint_C - w / 2;
    t.Tl[i] = m.freezingPoint_C + w / 2;
    t.cMushy[i] = cBar + m.latent_J_m3 / w;
    t.Hl[i] = cBar * w + m.latent_J_m3;
    t.Tf[i] = m.freezingPoint_C;
  });
  return t;
}

/** Enthalpy H(T) of material `m`, J/m³ (zero at the solidus). */
export function enthalpyAt(t: MaterialTable, m: number, T: number): number {
  const Ts = t.Ts[m];
  if (T < Ts) return t.cF[m] * (T - Ts);
  const Tl = t.Tl[m];
  if (T <= Tl) return t.cMushy[m] * (T - Ts);
  return t.Hl[m] + t.cT[m] * (T - Tl);
}

/** Temperature T(H), the exact inverse of `enthalpyAt`, °C. */
export function temperatureAt(t: MaterialTable, m: number, H: number): number {
  if (H < 0) return t.Ts[m] + H / t.cF[m];
  const Hl = t.Hl[m];
  if (H <= Hl) return t.Ts[m] + H / t.cMushy[m];
  return t.Tl[m] + (H - Hl) / t.cT[m];
}

/** Liquid (thawed) fraction at temperature T, 0..1. */
export function liquidFractionAt(t: MaterialTable, m: number, T: number): number {
  const f = (T - t.Ts[m]) / (t.Tl[m] - t.Ts[m]);
  return f <= 0 ? 0 : f >= 1 ? 1 : f;
}

/** Conductivity at temperature T, W/m·K (linear in the liquid fraction). */
export function conductivityAt(t: MaterialTable, m: number, T: number): number {
  const f = liquidFractionAt(t, m, T);
  return t.kF[m] + f * (t.kT[m] - t.kF[m]);
}

/**
 * Apparent capacity for a step from T0 towards a predicted T1: the secant (H(T1) - H(T0))/(T1 - T0),
 * or the tangent dH/dT at T0 when the two are within 1e-9 K (Pham 1985's enthalpy-based estimate);
 * exactly the branch capacity when both lie on the same side of the freezing interval.
 */
export function apparentCapacity(t: MaterialTable, m: number, T0: number, T1: number): number {
  // Both ends in the same branch: the branch's capacity exactly (keeps the matrix bit-identical).
  const Ts = t.Ts[m];
  const Tl = t.Tl[m];
  if (T0 < Ts && T1 < Ts) return t.cF[m];
  if (T0 > Tl && T1 > Tl) return t.cT[m];
  const d = T1 - T0;
  if (Math.abs(d) > 1e-9) return (enthalpyAt(t, m, T1) - enthalpyAt(t, m, T0)) / d;
  if (T0 < t.Ts[m]) return t.cF[m];
  if (T0 <= t.Tl[m]) return t.cMushy[m];
  return t.cT[m];
}
