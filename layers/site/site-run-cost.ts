/**
 * What a site run will cost, stated before it starts: the mesh the simulator will build for the input
 * (site-setup.ts buildMeshes), the number of time steps, and a time estimate from the cost per cell and
 * step of the pair of runs (with and without the pile).
 *
 * Cost coefficient: 3.0 µs per mesh cell per time step for the pair, measured with `simulateSite` on a
 * demo sand site over 20 years (coarse mesh 14 × 52 cells: 2.0 s; standard 17 × 96: 5.0 s; 1043 steps of
 * 7 days) on a machine of two cores shared with other work, so an idle machine is faster. The sizing
 * after the run adds a few seconds. An estimate, shown as "about".
 */
import type { SiteInput } from './site-input-schema';
import { buildMeshes, resolveGround } from './site-setup';

export const SECONDS_PER_CELL_STEP = 3.0e-6;

export interface SiteRunCost {
  cells: number;
  timeSteps: number;
  /** Estimated wall time of the pair of runs, s. */
  estimate_s: number;
}

export function siteRunCost(input: SiteInput): SiteRunCost {
  const { pile } = buildMeshes(input, resolveGround(input));
  const cells = pile.nr * pile.nz;
  const timeSteps = Math.ceil((input.years * 365.25) / input.timeStep_days);
  return { cells, timeSteps, estimate_s: cells * timeSteps * SECONDS_PER_CELL_STEP };
}
