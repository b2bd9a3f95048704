/**
 * Long-term adfreeze (tangential freezing) strength between frozen ground and a pile shaft against
 * the ground temperature, and the shaft capacity it gives over a frozen embedment.
 *
 * Method. The design adfreeze strength R_af(T) of frozen clayey and silty soils on a foundation
 * surface, tabulated against ground temperature in the Russian permafrost foundation standard
 * SNiP 2.02.04-88 "Bases and foundations on permafrost soils", Table 3 (carried into SP 25.13330);
 * the same relation is the one the published regional (GIS) studies of pile capacity under climate
 * warming use (Streletskiy, Shiklomanov & Nelson 2012, Arctic, Antarctic, and Alpine Research
 * 44:368–380, whose 20–40 % capacity losses domain-notes.md quotes). Values recalled from memory,
 * medium-low confidence: check them against the standard before relying on them. The clayey-silty
 * row, the lower of the standard's rows, is used for every texture (cautious: sands bond more
 * strongly; peat is not covered by the row and is treated as silt). Between the tabulated
 * temperatures R_af is interpolated linearly; between −0.3 °C and 0 °C it falls linearly to 0 (the
 * bond is lost when the ice melts; the standard starts at −0.3 °C); colder than −10 °C it is held at
 * the −10 °C value. The tabulated values are long-term (design) values: the short-term strengths of
 * laboratory tests (e.g. Parameswaran 1978, Can. Geotech. J. 15:494–500, frozen sand on steel) are
 * several times higher, and Weaver & Morgenstern (1981, Can. Geotech. J. 18:357–370) derive the
 * long-term value as a roughness factor (about 0.6 for steel, recalled from memory) times the
 * long-term shear strength of the soil, an input no regional grid provides.
 *
 * Shaft capacity: Q = Σ R_af(T(z_i))·p·Δz over the frozen embedment (the standard's bearing formula
 * without its end-bearing term and with its condition factors at 1: screw-pile helices neglected).
 */
import { requireFinite, requireNonNegative, requirePositive } from './validate';

/**
 * Ground temperatures (°C) and the design adfreeze strength R_af (kPa) of clayey and silty soils,
 * SNiP 2.02.04-88 Table 3 (recalled from memory, medium-low confidence).
 */
export const ADFREEZE_TABLE = {
  temperature_C: [-0.3, -0.5, -1, -1.5, -2, -2.5, -3, -4, -6, -8, -10],
  strength_kPa: [40, 60, 100, 130, 150, 180, 200, 230, 290, 350, 400],
} as const;

/**
 * Table segment of each 0.1 K step of −T below the first tabulated temperature (the tabulated
 * temperatures are multiples of 0.1 K): SEGMENT[floor(−10·T)] = i, T between t[i] and t[i−1]; and the
 * slope of each segment, (r[i] − r[i−1])/(t[i] − t[i−1]), kPa/K.
 */
const SEGMENT = ((): Uint8Array => {
  const t = ADFREEZE_TABLE.temperature_C;
  const last = Math.round(-10 * t[t.length - 1]);
  const seg = new Uint8Array(last);
  for (let b = 0, i = 1; b < last; b++) {
    while (i < t.length - 1 && b >= Math.round(-10 * t[i])) i++;
    seg[b] = i;
  }
  return seg;
})();
const SLOPE = Float64Array.from(ADFREEZE_TABLE.temperature_C, (t, i) =>
  i === 0
    ? 0
    : (ADFREEZE_TABLE.strength_kPa[i] - ADFREEZE_TABLE.strength_kPa[i - 1]) /
      (t - ADFREEZE_TABLE.temperature_C[i - 1]),
);

/** R_af at `temp_C`, kPa (kernel: no checks; NaN → NaN). */
export function adfreezeStrengthKernel_kPa(temp_C: number): number {
  if (Number.isNaN(temp_C)) return NaN;
  const t = ADFREEZE_TABLE.temperature_C;
  const r = ADFREEZE_TABLE.strength_kPa;
  if (temp_C >= 0) return 0;
  if (temp_C >= t[0]) return (r[0] * temp_C) / t[0];
  if (!(temp_C > t[t.length - 1])) return r[r.length - 1];
  const i = SEGMENT[Math.min(SEGMENT.length - 1, Math.floor(-10 * temp_C))];
  return r[i - 1] + SLOPE[i] * (temp_C - t[i - 1]);
}

/** Long-term adfreeze strength of frozen ground on a pile shaft at `temp_C`, kPa (see module comment). */
export function adfreezeStrength_kPa(temp_C: number): number {
  return adfreezeStrengthKernel_kPa(requireFinite('temp_C', temp_C));
}

/**
 * Long-term adfreeze shaft capacity of a pile, kN: Σ R_af(T(z))·p·Δz by the midpoint rule over
 * `segments` equal slices from `top_m` to `bottom_m` (p = 2π·radius). `temperatureAt` gives the design
 * (warmest-season) ground temperature at depth z. Zero when bottom ≤ top.
 */
export function adfreezeCapacity_kN(p: {
  radius_m: number;
  top_m: number;
  bottom_m: number;
  temperatureAt: (depth_m: number) => number;
  segments?: number;
}): number {
  const r = requirePositive('radius_m', p.radius_m, 'm');
  const top = requireNonNegative('top_m', p.top_m, 'm');
  const bottom = requireFinite('bottom_m', p.bottom_m);
  const n = p.segments ?? 20;
  if (!(bottom > top)) return 0;
  const dz = (bottom - top) / n;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += adfreezeStrength_kPa(p.temperatureAt(top + (i + 0.5) * dz));
  return sum * 2 * Math.PI * r * dz;
}
