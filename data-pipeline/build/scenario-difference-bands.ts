/**
 * The difference bands of a scenario after the first of a set (issue 17): class change, frozen-ground
 * margin lost and piles per ton added against the first scenario, cell by cell
 * (layers/screening/scenario-difference.ts), written as new band files beside the scenario's own and
 * appended to its bands, so they are tiled, exported and described like any band. Reads and writes
 * row chunk by row chunk (compare-scenarios.ts scanScenarioPair).
 */
import { join } from 'node:path';
import { SCENARIO_DIFFERENCE_BAND_IDS, type BandId } from '../../layers/screening/band-ids';
import { BAND_REGISTRY } from '../../layers/screening/band-registry';
import { classChange, frozenMarginLost, pilesPerTonAdded } from '../../layers/screening/scenario-difference';
import type { ScreeningLayer } from '../../layers/screening/screening-model';
import { closeBandFds, createBandFiles, openBandFds, writeBandRows } from './band-files';
import { scanScenarioPair, type ScenarioBands } from './compare-scenarios';

function layerOf(id: BandId): ScreeningLayer {
  const { unitNA: _na, description = '', source = '', ...entry } = BAND_REGISTRY[id];
  return { id, ...entry, description, source };
}

/**
 * Append the difference bands to `other` (its files and layers, in place), computed against `first`.
 * Returns the ids added (none when either scenario lacks the class, margin or piles band).
 */
export async function addScenarioDifferenceBands(
  first: ScenarioBands,
  other: ScenarioBands,
  bandsDir: string,
): Promise<BandId[]> {
  const { width, height } = other.files;
  const ids = [...SCENARIO_DIFFERENCE_BAND_IDS];
  const extra = await createBandFiles(join(bandsDir, 'difference'), ids.length, width, height);
  const fds = openBandFds(extra, 'r+');
  let out: Float32Array[] = [];
  let ok = false;
  try {
    ok = scanScenarioPair(first, other, ({ row0, n, first: a, other: b }) => {
      if (out.length === 0 || out[0].length < n) out = ids.map(() => new Float32Array(n));
      const [cls, margin, piles] = out;
      for (let i = 0; i < n; i++) {
        cls[i] = classChange(a.cls[i], b.cls[i]);
        margin[i] = frozenMarginLost(a.margin[i], b.margin[i]);
        piles[i] = pilesPerTonAdded(a.piles[i], b.piles[i]);
      }
      out.forEach((o, k) => writeBandRows(fds[k], width, row0, o.subarray(0, n)));
    });
  } finally {
    closeBandFds(fds);
  }
  if (!ok) return [];
  other.files.paths.push(...extra.paths);
  other.layers.push(...ids.map(layerOf));
  return ids;
}
