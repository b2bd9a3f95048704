/**
 * `npm run bench -- cell-fuzz`: the nightly size of the per-cell fuzz (bench/cell-fuzz.ts), 10,000 seeded
 * cells over everything the pipeline accepts (`CELL_FUZZ_CELLS`, `CELL_FUZZ_SEED` override). Prints the
 * counts of crashes and bound violations (both must be 0) and the first examples of each.
 */
import { checkCell, fuzzCells } from './cell-fuzz';

export async function run(): Promise<void> {
  const n = Number(process.env.CELL_FUZZ_CELLS ?? 10_000);
  const seed = Number(process.env.CELL_FUZZ_SEED ?? 7);
  const t0 = performance.now();
  const r = fuzzCells(n, seed, checkCell);
  console.log(
    `cells ${r.cells} (excluded by a foundation or input rule ${r.excluded}), crashes ${r.crashes.length}, ` +
      `bound violations ${r.violations.length}, ${((performance.now() - t0) / 1000).toFixed(1)} s`,
  );
  for (const line of [...r.crashes.slice(0, 3), ...r.violations.slice(0, 3)]) console.log(`  ${line}`);
}
