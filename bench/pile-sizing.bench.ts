/** Timing of the pile heat-exchanger hot paths (figures for the README; never asserted in tests). */
import { sizePileField, type PileFieldSizingInput } from '../layers/site/pile-sizing';
import { pileFieldGFunction } from '../layers/physics/finite-line-source';
import { superposeAggregated } from '../layers/physics/load-aggregation';
import { infiniteLineSourceG } from '../layers/physics/infinite-line-source';

function time(label: string, f: () => unknown, repeat = 1): void {
  const t0 = performance.now();
  for (let i = 0; i < repeat; i++) f();
  console.log(`${label}: ${((performance.now() - t0) / repeat).toFixed(1)} ms`);
}

export async function run(): Promise<void> {
  const base: PileFieldSizingInput = {
    peakHeatingLoad_W: 12_000,
    annualHeating_kWh: 30_000,
    pile: { length_m: 12, radius_m: 0.081, buriedDepth_m: 1, Rb_mK_W: 0.12 },
    layout: { spacing_m: 3 },
    ground: { conductivity_W_mK: 1.8, diffusivity_m2_s: 8e-7, undisturbedTemperature_C: -1 },
    minEnteringFluid_C: -8,
    fluid: { fluid: 'propyleneGlycol', massFraction: 0.4 },
  };
  const r = sizePileField(base);
  console.log(
    `12 kW house, 12 m piles at 3 m: ${r.pileCount} piles, controlling pulse ${r.controllingPulse}`,
  );
  time('sizePileField groupFls with 25-year series', () => sizePileField(base));
  time('sizePileField groupFls, count only', () => sizePileField({ ...base, includeLifeSeries: false }));
  time(
    'sizePileField singlePileCylinder (per-cell cheap path)',
    () => sizePileField({ ...base, method: 'singlePileCylinder', includeLifeSeries: false }),
    20,
  );
  const pos = Array.from({ length: 100 }, (_, i) => ({ x_m: (i % 10) * 3, y_m: Math.floor(i / 10) * 3 }));
  time('pileFieldGFunction, 100 piles, 1 time', () =>
    pileFieldGFunction({
      positions: pos,
      pileRadius_m: 0.1,
      length_m: 12,
      buriedDepth_m: 1,
      diffusivity_m2_s: 1e-6,
      times_s: [7.9e8],
    }),
  );
  const n = 25 * 8760;
  const loads = Array.from({ length: n }, (_, i) => 30 + 20 * Math.cos((2 * Math.PI * i) / 8760));
  time('superposeAggregated, 25 years hourly', () =>
    superposeAggregated({
      loads,
      timeStep_s: 3600,
      g: (t) => infiniteLineSourceG({ radius_m: 0.1, time_s: t, diffusivity_m2_s: 1e-6 }),
    }),
  );
}
