/**
 * Whole-region comparison of a scenario with the first scenario of a set (issue 17): from the two
 * scenarios' band files, cell by cell, the cells good under both, the cells whose suitability class
 * changed, and the mean frozen margin lost and piles per ton added over the cells where both have a
 * value. Reads both band files in row chunks (never a band whole); the same scan feeds the
 * difference bands (scenario-difference-bands.ts).
 */
import { BAND } from '../../layers/screening/band-ids';
import { SUITABILITY_LABELS } from '../../layers/screening/suitability';
import type { ScreeningLayer } from '../../layers/screening/screening-model';
import { closeBandFds, openBandFds, readBandRows, type BandFiles } from './band-files';

const CHUNK_ROWS = 64;
const GOOD = Number(Object.keys(SUITABILITY_LABELS).find((k) => SUITABILITY_LABELS[Number(k)] === 'good'));

export interface ScenarioComparison {
  goodUnderBoth_cells: number;
  classChanged_cells: number;
  frozenMarginLost_mean_yr: number;
  pilesPerTonAdded_mean: number;
}

export interface ScenarioBands {
  files: BandFiles;
  layers: ScreeningLayer[];
}

/** One row chunk of both scenarios: suitability class, frozen margin and piles per ton of each. */
export interface PairChunk {
  row0: number;
  row1: number;
  /** Cells in the chunk ((row1 - row0) x width). */
  n: number;
  first: { cls: Float32Array; margin: Float32Array; piles: Float32Array };
  other: { cls: Float32Array; margin: Float32Array; piles: Float32Array };
}

const PAIR_BANDS = [BAND.suitability, BAND.frozenMargin, BAND.pilesPerTon];

/**
 * Call `fn` on consecutive row chunks of the two scenarios' class, margin and piles bands. Returns
 * false (and calls nothing) when either scenario lacks one of them (the basic model).
 */
export function scanScenarioPair(
  first: ScenarioBands,
  other: ScenarioBands,
  fn: (chunk: PairChunk) => void,
): boolean {
  const pick = (layers: ScreeningLayer[], id: string) => layers.findIndex((l) => l.id === id);
  const a = PAIR_BANDS.map((id) => pick(first.layers, id));
  const b = PAIR_BANDS.map((id) => pick(other.layers, id));
  if (a.some((i) => i < 0) || b.some((i) => i < 0)) return false;
  const { width, height } = first.files;
  const fa = openBandFds({ ...first.files, paths: a.map((i) => first.files.paths[i]) }, 'r');
  const fb = openBandFds({ ...other.files, paths: b.map((i) => other.files.paths[i]) }, 'r');
  const bufs = Array.from({ length: 6 }, () => new Float32Array(CHUNK_ROWS * width));
  try {
    for (let r0 = 0; r0 < height; r0 += CHUNK_ROWS) {
      const r1 = Math.min(height, r0 + CHUNK_ROWS);
      const [cls, margin, piles] = fa.map((fd, k) => readBandRows(fd, width, r0, r1, bufs[k]));
      const [clsB, marginB, pilesB] = fb.map((fd, k) => readBandRows(fd, width, r0, r1, bufs[3 + k]));
      fn({
        row0: r0,
        row1: r1,
        n: (r1 - r0) * width,
        first: { cls, margin, piles },
        other: { cls: clsB, margin: marginB, piles: pilesB },
      });
    }
  } finally {
    closeBandFds(fa);
    closeBandFds(fb);
  }
  return true;
}

export function compareWithFirst(first: ScenarioBands, other: ScenarioBands): ScenarioComparison | null {
  let good = 0;
  let changed = 0;
  let marginSum = 0;
  let marginN = 0;
  let pilesSum = 0;
  let pilesN = 0;
  const ok = scanScenarioPair(first, other, ({ n, first: a, other: b }) => {
    for (let i = 0; i < n; i++) {
      if (a.cls[i] === a.cls[i] && b.cls[i] === b.cls[i]) {
        if (a.cls[i] !== b.cls[i]) changed++;
        if (a.cls[i] === GOOD && b.cls[i] === GOOD) good++;
      }
      if (Number.isFinite(a.margin[i]) && Number.isFinite(b.margin[i])) {
        marginSum += a.margin[i] - b.margin[i];
        marginN++;
      }
      if (Number.isFinite(a.piles[i]) && Number.isFinite(b.piles[i])) {
        pilesSum += b.piles[i] - a.piles[i];
        pilesN++;
      }
    }
  });
  if (!ok) return null;
  return {
    goodUnderBoth_cells: good,
    classChanged_cells: changed,
    frozenMarginLost_mean_yr: marginN > 0 ? marginSum / marginN : NaN,
    pilesPerTonAdded_mean: pilesN > 0 ? pilesSum / pilesN : NaN,
  };
}
