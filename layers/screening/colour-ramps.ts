/**
 * Colour ramps for the map, chosen to stay readable with colour-vision deficiency: sequential ramps
 * are perceptually uniform and monotonic in lightness (viridis, cividis; Nuñez et al. 2018, PLoS ONE
 * 13(7): e0199239 for cividis), the diverging ramp runs blue to orange through a light neutral, which
 * deuteranopes and protanopes still tell apart. Stops are sampled from the published ramps.
 */
export type Rgb = [number, number, number];

export const COLOUR_RAMPS: Record<string, Rgb[]> = {
  viridis: [
    [68, 1, 84],
    [72, 40, 120],
    [62, 74, 137],
    [49, 104, 142],
    [38, 130, 142],
    [31, 158, 137],
    [53, 183, 121],
    [109, 205, 89],
    [180, 222, 44],
    [253, 231, 37],
  ],
  cividis: [
    [0, 32, 77],
    [0, 52, 110],
    [57, 72, 108],
    [87, 92, 109],
    [112, 113, 115],
    [138, 134, 120],
    [166, 157, 117],
    [195, 181, 108],
    [226, 206, 92],
    [255, 234, 70],
  ],
  /** Diverging, cold (blue) to warm (orange), neutral at the middle. */
  blueOrange: [
    [33, 102, 172],
    [67, 147, 195],
    [146, 197, 222],
    [209, 229, 240],
    [247, 247, 247],
    [253, 219, 199],
    [244, 165, 130],
    [214, 96, 77],
    [178, 24, 43],
  ],
};

/** Colour of value v on a ramp spanning [min, max] (clamped), linear between stops. */
export function rampColour(rampId: string, v: number, min: number, max: number): Rgb {
  const ramp = COLOUR_RAMPS[rampId] ?? COLOUR_RAMPS.viridis;
  const t = max > min ? Math.min(1, Math.max(0, (v - min) / (max - min))) : 0.5;
  const x = t * (ramp.length - 1);
  const i = Math.min(ramp.length - 2, Math.floor(x));
  const f = x - i;
  const a = ramp[i];
  const b = ramp[i + 1];
  return [
    Math.round(a[0] + (b[0] - a[0]) * f),
    Math.round(a[1] + (b[1] - a[1]) * f),
    Math.round(a[2] + (b[2] - a[2]) * f),
  ];
}
