/**
 * Scales and tick marks for the site charts (pure). `niceTicks` picks steps of 1, 2, 2.5 or 5 × 10^k so
 * that about `count` ticks span the domain (the usual "nice numbers" rule, Heckbert 1990, Graphics
 * Gems I, "Nice numbers for graph labels").
 */
export interface LinearScale {
  (value: number): number;
  domain: [number, number];
  range: [number, number];
}

export function linearScale(domain: [number, number], range: [number, number]): LinearScale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0 || 1;
  const f = ((v: number) => r0 + ((v - d0) / span) * (r1 - r0)) as LinearScale;
  f.domain = domain;
  f.range = range;
  return f;
}

/** Nice tick values covering [lo, hi] (inclusive where they fall on a tick). */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [];
  if (hi < lo) [lo, hi] = [hi, lo];
  if (hi === lo) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  const start = Math.ceil(lo / step - 1e-9) * step;
  for (let v = start; v <= hi + step * 1e-9; v += step) out.push(Number(v.toPrecision(12)));
  return out;
}

/** Domain rounded out to nice ticks, with the given values included; [0, 1] when none are finite. */
export function niceDomain(values: Iterable<number>, count = 5, include: number[] = []): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of [...values, ...include]) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === Infinity) return [0, 1];
  if (lo === hi) {
    lo -= 1;
    hi += 1;
  }
  const t = niceTicks(lo, hi, count);
  const step = t.length > 1 ? t[1] - t[0] : 1;
  return [
    Math.min(lo, t[0] > lo ? t[0] - step : t[0]),
    Math.max(hi, t[t.length - 1] < hi ? t[t.length - 1] + step : t[t.length - 1]),
  ];
}

/** SVG path through the points, breaking the line at non-finite values. */
export function linePath(
  xs: readonly number[],
  ys: readonly number[],
  x: LinearScale,
  y: LinearScale,
): string {
  let d = '';
  let pen = false;
  for (let i = 0; i < xs.length; i++) {
    const a = xs[i];
    const b = ys[i];
    if (!Number.isFinite(a) || !Number.isFinite(b)) {
      pen = false;
      continue;
    }
    d += `${pen ? 'L' : 'M'}${x(a).toFixed(1)},${y(b).toFixed(1)}`;
    pen = true;
  }
  return d;
}
