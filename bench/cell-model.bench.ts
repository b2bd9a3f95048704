/**
 * Per-cell screening model throughput: cells screened per second on one core (target ≥ 200 000).
 * A seeded sample over the demo region's input ranges (all textures, a share of cells with a
 * ground-temperature grid value), warmed up, then timed over several passes; prints the model build
 * time and cells per CPU-second (median of the passes; CPU time, not wall time, so a busy machine does
 * not distort the per-core figure). Figures go to the README, never into a unit test.
 */
import { createScreeningModel } from '../layers/screening/cell-screening-model';
import { buildCellConstants } from '../layers/screening/cell-constants';
import { createKernelScratch, evaluateCellMetrics } from '../layers/screening/cell-kernel';
import { METRIC_COUNT } from '../layers/screening/cell-layers';
import { DEFAULT_SCENARIO } from '../layers/screening/scenario';
import type { CellInputs } from '../layers/screening/screening-model';

/** The seeded sample of cells (also read by cell-model-before-after.ts). */
export function sampleCells(n: number, seed: number): CellInputs[] {
  let a = seed >>> 0;
  const r = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const water = [0, 0.15, 0.24, 0.45, 0.45, 0.8, 0.03];
  return Array.from({ length: n }, () => {
    const tex = 1 + Math.floor(r() * 6);
    return {
      meanAirTemp_C: -12.5 + 9.3 * r(),
      airAmplitude_C: 12.5 + 9.3 * r(),
      warming_C_per_yr: 0.03 + 0.05 * r(),
      textureClass: tex,
      waterContent_m3m3: water[tex] * (0.85 + 0.3 * r()),
      bedrockDepth_m: tex === 6 ? 1 : 1 + 60 * r(),
      groundTemp_C: r() < 0.2 ? -8 + 8 * r() : NaN,
      geothermalFlux_W_m2: NaN,
      nFreeze: r() < 0.5 ? 0.3 + 0.4 * r() : NaN,
      latitude_deg: 75,
    };
  });
}

export async function run(): Promise<void> {
  const t0 = performance.now();
  const model = createScreeningModel();
  const buildMs = performance.now() - t0;
  const cells = sampleCells(50_000, 12345);
  const out = new Float32Array(model.layers.length);
  let sink = 0;
  // CPU time of this thread (user + system), so other load on the machine does not count.
  const pass = (): number => {
    const start = process.cpuUsage();
    for (let i = 0; i < cells.length; i++) {
      model.evaluate(cells[i], out);
      sink += out[0];
    }
    const used = process.cpuUsage(start);
    return cells.length / ((used.user + used.system) / 1e6);
  };
  // One evaluation of the kernel (every layer but the class robustness, which re-runs the kernel for
  // each perturbed scenario; class-robustness.ts).
  const k = buildCellConstants(DEFAULT_SCENARIO);
  const x = createKernelScratch();
  const m = new Float64Array(METRIC_COUNT);
  const kernelPass = (): number => {
    const start = process.cpuUsage();
    for (let i = 0; i < cells.length; i++) {
      evaluateCellMetrics(cells[i], k, x, m);
      sink += m[0];
    }
    const used = process.cpuUsage(start);
    return cells.length / ((used.user + used.system) / 1e6);
  };
  for (let w = 0; w < 3; w++) kernelPass();
  const kernelRates = Array.from({ length: 7 }, kernelPass).sort((p, q) => p - q);
  console.log(
    `kernel alone (one evaluation, no robustness): median ${Math.round(kernelRates[3]).toLocaleString('en')} cells/s/core (min ${Math.round(kernelRates[0]).toLocaleString('en')}); target 200,000`,
  );
  for (let w = 0; w < 3; w++) pass();
  const rates = Array.from({ length: 7 }, pass).sort((x, y) => x - y);
  const median = rates[3];
  console.log(`model build (tables, first call): ${buildMs.toFixed(0)} ms`);
  console.log(`layers per cell: ${model.layers.length}`);
  console.log(
    `cells/s/core: median ${Math.round(median).toLocaleString('en')} (min ${Math.round(rates[0]).toLocaleString('en')}, max ${Math.round(rates[6]).toLocaleString('en')}) over 7 passes of ${cells.length} cells, full model with class robustness`,
  );
  if (!Number.isFinite(sink)) console.log('(checksum)');
}
