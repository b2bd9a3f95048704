/**
 * Whole-region comparison of a scenario with the first scenario of a set (issue 17): from the two
 * scenarios' band files, cell by cell, the cells good under both, the cells whose suitability class
 * changed, and the mean frozen margin lost and piles per ton added over the cells where both have a
 * value. Reads both band files in row chunks (never a band whole).
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

export function compareWithFirst(
  first: { files: BandFiles; layers: ScreeningLayer[] },
  other: { files: BandFiles; layers: ScreeningLayer[] },
): ScenarioComparison | null {
  const pick = (layers: ScreeningLayer[], id: string) => layers.findIndex((l) => l.id === id);
  const ids = [BAND.suitability, BAND.frozenMargin, BAND.pilesPerTon];
  const a = ids.map((id) => pick(first.layers, id));
  const b = ids.map((id) => pick(other.layers, id));
  if (a.some((i) => i < 0) || b.some((i) => i < 0)) return null;
  const { width, height } = first.files;
  const fa = openBandFds({ ...first.files, paths: a.map((i) => first.files.paths[i]) }, 'r');
  const fb = openBandFds({ ...other.files, paths: b.map((i) => other.files.paths[i]) }, 'r');
  const bufs = Array.from({ length: 6 }, () => new Float32Array(CHUNK_ROWS * width));
  let good = 0;
  let changed = 0;
  let marginSum = 0;
  let marginN = 0;
  let pilesSum = 0;
  let pilesN = 0;
  try {
    for (let r0 = 0; r0 < height; r0 += CHUNK_ROWS) {
      const r1 = Math.min(height, r0 + CHUNK_ROWS);
      const [ca, ma, pa] = fa.map((fd, k) => readBandRows(fd, width, r0, r1, bufs[k]));
      const [cb, mb, pb] = fb.map((fd, k) => readBandRows(fd, width, r0, r1, bufs[3 + k]));
      const n = (r1 - r0) * width;
      for (let i = 0; i < n; i++) {
        if (ca[i] === ca[i] && cb[i] === cb[i]) {
          if (ca[i] !== cb[i]) changed++;
          if (ca[i] === GOOD && cb[i] === GOOD) good++;
        }
        if (Number.isFinite(ma[i]) && Number.isFinite(mb[i])) {
          marginSum += ma[i] - mb[i];
          marginN++;
        }
        if (Number.isFinite(pa[i]) && Number.isFinite(pb[i])) {
          pilesSum += pb[i] - pa[i];
          pilesN++;
        }
      }
    }
  } finally {
    closeBandFds(fa);
    closeBandFds(fb);
  }
  return {
    goodUnderBoth_cells: good,
    classChanged_cells: changed,
    frozenMarginLost_mean_yr: marginN > 0 ? marginSum / marginN : NaN,
    pilesPerTonAdded_mean: pilesN > 0 ? pilesSum / pilesN : NaN,
  };
}
