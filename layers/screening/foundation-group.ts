/**
 * The standard building's foundation as a pile group: positions of its piles and of the reference
 * point where thaw and over-cooling are tracked.
 *
 * Piles: `building.foundationPiles` piles at `building.pileSpacing_m`, filled row by row with
 * `building.pileColumns` per row (default ceil(√N): 16 → 4 × 4), the layout of the sizing module
 * (layers/site/sizing-layout.ts). Reference point: at `referenceRadius_m` from the axis of the pile
 * nearest the group's centroid (the first such pile on a tie), along its row towards the centroid
 * (+x when the centroid is level with it). With the defaults (4 × 4 at 3 m, 1.5 m) the point lies
 * midway between two of the four central piles; for a single pile it is at the reference radius from it.
 */
import type { PilePosition } from '../physics/finite-line-source';
import { layoutPositions } from '../site/sizing-layout';
import type { Scenario } from './scenario';

export interface FoundationGroup {
  positions: PilePosition[];
  /** The reference point in plan, m (same origin as the positions). */
  reference: PilePosition;
  /** Horizontal distance from the reference point to each pile's axis, m (≥ the pile radius). */
  referenceDistances_m: number[];
}

export function foundationGroup(s: Scenario): FoundationGroup {
  const positions = layoutPositions({
    count: s.building.foundationPiles,
    layout: { spacing_m: s.building.pileSpacing_m, columns: s.building.pileColumns },
    pileRadius_m: s.pile.radius_m,
  });
  const n = positions.length;
  const cx = positions.reduce((a, p) => a + p.x_m, 0) / n;
  const cy = positions.reduce((a, p) => a + p.y_m, 0) / n;
  let best = 0;
  let bestD = Infinity;
  positions.forEach((p, i) => {
    const d = Math.hypot(p.x_m - cx, p.y_m - cy);
    if (d < bestD - 1e-9) {
      best = i;
      bestD = d;
    }
  });
  const pile = positions[best];
  const dir = cx >= pile.x_m ? 1 : -1;
  const reference = { x_m: pile.x_m + dir * s.referenceRadius_m, y_m: pile.y_m };
  // A point inside another pile's casing is taken at its wall (the FLS diverges on the axis).
  const referenceDistances_m = positions.map((p) =>
    Math.max(s.pile.radius_m, Math.hypot(p.x_m - reference.x_m, p.y_m - reference.y_m)),
  );
  return { positions, reference, referenceDistances_m };
}
