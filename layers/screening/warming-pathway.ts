/**
 * A warming pathway: air-temperature change against calendar year, a piecewise-linear series as
 * published climate projections are tabulated (a value per period or per decade), given in the
 * scenario as a regional table. The per-cell model warms the ground by the superposed Carslaw & Jaeger
 * ramps of this series (surface-warming-history.ts); the site simulator by the same series added to
 * its air temperature (layers/site/site-setup.ts). The pathway's last year is its climate horizon:
 * thaw later than that is reported as "after <year>" (climate-horizon.ts).
 *
 * The change is taken relative to the scenario's start year (the input climate grids describe the
 * start year): offset(t) = P(startYear + t) − P(startYear), P linearly interpolated between points.
 * After the last point the offset is held (no climate beyond the horizon; the horizon caps the thaw
 * years anyway).
 *
 * Pattern scaling (Santer et al. 1990, Tech. Note NCAR/TN-341; Mitchell 2003, Climatic Change 60):
 * with `patternReference_C_per_yr` set, each cell's pathway is the regional one scaled by
 * warming_C_per_yr / patternReference_C_per_yr, so the cell's warming grid keeps its spatial pattern;
 * without it every cell follows the regional table (uniform).
 */
import { z } from 'zod';

export const pathwayPointSchema = z.strictObject({
  /** Calendar year. */
  year: z.number().min(1850).max(2500),
  /** Air-temperature change from the pathway's own baseline, K. */
  airWarming_K: z.number().min(-15).max(25),
});

export const warmingPathwaySchema = z
  .strictObject({
    /** Name of the pathway in the trade's words (e.g. "low emissions (illustrative)"). */
    label: z.string().min(1).max(80),
    /** Points, years strictly increasing (2 to 60). */
    points: z.array(pathwayPointSchema).min(2).max(60),
    /** Pattern scaling: the cell trend (K/yr) at which a cell follows the regional table as it is. */
    patternReference_C_per_yr: z.number().positive().max(1).optional(),
  })
  .superRefine((p, ctx) => {
    for (let i = 1; i < p.points.length; i++) {
      if (!(p.points[i].year > p.points[i - 1].year)) {
        ctx.addIssue({
          code: 'custom',
          path: ['points', i, 'year'],
          message: `must be after points[${i - 1}].year (${p.points[i - 1].year}); received ${p.points[i].year}`,
        });
      }
    }
  });

export type WarmingPathway = z.infer<typeof warmingPathwaySchema>;

/** P(year): the pathway's value, linearly interpolated, held beyond its ends, K. */
export function pathwayValue_K(p: WarmingPathway, year: number): number {
  const pts = p.points;
  if (year <= pts[0].year) return pts[0].airWarming_K;
  for (let i = 1; i < pts.length; i++) {
    if (year <= pts[i].year) {
      const f = (year - pts[i - 1].year) / (pts[i].year - pts[i - 1].year);
      return pts[i - 1].airWarming_K + f * (pts[i].airWarming_K - pts[i - 1].airWarming_K);
    }
  }
  return pts[pts.length - 1].airWarming_K;
}

/**
 * The pathway as offsets since the start year: knots at t = 0 and at every point after the start
 * year (yr since start), with the air offset at each, K (offset at t = 0 is 0).
 */
export function pathwayKnots(
  p: WarmingPathway,
  startYear: number,
): { time_yr: number[]; airOffset_K: number[] } {
  const base = pathwayValue_K(p, startYear);
  const time_yr = [0];
  const airOffset_K = [0];
  for (const pt of p.points) {
    if (pt.year > startYear) {
      time_yr.push(pt.year - startYear);
      airOffset_K.push(pt.airWarming_K - base);
    }
  }
  return { time_yr, airOffset_K };
}

/** The pathway's last year: its climate horizon. */
export function pathwayHorizonYear(p: WarmingPathway): number {
  return p.points[p.points.length - 1].year;
}
