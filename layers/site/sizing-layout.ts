/**
 * Pile positions for sizing: a rectangular grid filled row by row at a given spacing, with a fixed
 * number of columns or (default) ceil(√N) columns, i.e. as square as the count allows.
 */
import type { PilePosition } from '../physics/finite-line-source';
import { requireRange } from '../physics/validate';

export interface PileLayout {
  /** Centre-to-centre spacing, m (at least one pile diameter). */
  spacing_m: number;
  /** Piles per row; omit for a near-square block. 1 gives a single line. */
  columns?: number;
}

/** Positions of `count` piles in the layout (origin at the first pile). */
export function layoutPositions(input: {
  count: number;
  layout: PileLayout;
  pileRadius_m: number;
}): PilePosition[] {
  const n = requireRange('count', input.count, 1, 1e5);
  if (!Number.isInteger(n)) throw new RangeError(`count must be an integer in [1, 100000]; received ${n}`);
  const rb = requireRange('pileRadius_m', input.pileRadius_m, 1e-3, 5, 'm');
  const s = requireRange(
    'layout.spacing_m',
    input.layout.spacing_m,
    2 * rb,
    1000,
    'm (at least the pile diameter)',
  );
  const cols =
    input.layout.columns === undefined
      ? Math.ceil(Math.sqrt(n))
      : requireRange('layout.columns', input.layout.columns, 1, 1e5);
  if (!Number.isInteger(cols))
    throw new RangeError(`layout.columns must be an integer >= 1; received ${cols}`);
  const out: PilePosition[] = [];
  for (let i = 0; i < n; i++) out.push({ x_m: (i % cols) * s, y_m: Math.floor(i / cols) * s });
  return out;
}
