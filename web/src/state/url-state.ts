/**
 * The view, the selected layer, the unit system, the opacity and the filters in the page URL (query
 * string), so a view can be bookmarked and shared. Parsing is strict (zod): a URL with any invalid
 * part falls back to the defaults as a whole and reports what was wrong, for a visible notice.
 *
 * Format: ?c=<lon>,<lat>&z=<zoom>&layer=<bandId>&units=SI|NA&opacity=<0..1>
 *         &f=<bandId>:<min>:<max>;...   (SI values, either bound may be empty)
 *         &x=<bandId>:<class>,<class>;... (excluded classes)
 */
import { z } from 'zod';
import type { FilterSpec } from '../filters/cell-filter';
import type { UnitSystem } from '../units/display-units';
import { formatZodIssues } from '../../../layers/validation-error';

export interface ViewState {
  center: [number, number];
  zoom: number;
  layer: string;
  units: UnitSystem;
  opacity: number;
  filter: FilterSpec;
}

const id = z.string().regex(/^[a-zA-Z][a-zA-Z0-9_]*$/, 'band id expected');
const num = z
  .string()
  .regex(/^-?\d+(\.\d+)?(e-?\d+)?$/i, 'number expected')
  .transform(Number);
const optNum = z.union([z.literal('').transform(() => undefined), num]);

const urlSchema = z.object({
  c: z
    .string()
    .transform((s) => s.split(','))
    .pipe(z.tuple([num.pipe(z.number().min(-180).max(180)), num.pipe(z.number().min(-85).max(85))]))
    .optional(),
  z: num.pipe(z.number().min(0).max(22)).optional(),
  layer: id.optional(),
  units: z.enum(['SI', 'NA']).optional(),
  opacity: num.pipe(z.number().min(0).max(1)).optional(),
  f: z
    .string()
    .transform((s) => (s ? s.split(';') : []))
    .pipe(
      z.array(
        z
          .string()
          .transform((s) => s.split(':'))
          .pipe(z.tuple([id, optNum, optNum])),
      ),
    )
    .optional(),
  x: z
    .string()
    .transform((s) => (s ? s.split(';') : []))
    .pipe(
      z.array(
        z
          .string()
          .transform((s) => s.split(':'))
          .pipe(
            z.tuple([
              id,
              z
                .string()
                .transform((s) => s.split(','))
                .pipe(z.array(num.pipe(z.number().int()))),
            ]),
          ),
      ),
    )
    .optional(),
});

const KNOWN = new Set(['c', 'z', 'layer', 'units', 'opacity', 'f', 'x']);

/**
 * Parse a query string against the defaults and the known band ids. Returns the state and the list of
 * problems (empty when the URL was valid; otherwise the state is exactly the defaults).
 */
export function parseUrlState(
  search: string,
  defaults: ViewState,
  bandIds: readonly string[],
): { state: ViewState; problems: string[] } {
  const params = new URLSearchParams(search);
  const raw: Record<string, string> = {};
  const problems: string[] = [];
  params.forEach((v, k) => {
    if (KNOWN.has(k)) raw[k] = v;
  });
  const parsed = urlSchema.safeParse(raw);
  if (!parsed.success) {
    problems.push(...formatZodIssues(parsed.error, { root: '(url)' }));
    return { state: defaults, problems };
  }
  const p = parsed.data;
  const known = new Set(bandIds);
  if (p.layer !== undefined && !known.has(p.layer))
    problems.push(`layer: no band "${p.layer}" in this build`);
  for (const [b] of p.f ?? []) if (!known.has(b)) problems.push(`f: no band "${b}" in this build`);
  for (const [b] of p.x ?? []) if (!known.has(b)) problems.push(`x: no band "${b}" in this build`);
  for (const [b, lo, hi] of p.f ?? [])
    if (lo !== undefined && hi !== undefined && lo > hi)
      problems.push(`f: ${b} minimum ${lo} > maximum ${hi}`);
  if (problems.length > 0) return { state: defaults, problems };
  return {
    state: {
      center: p.c ?? defaults.center,
      zoom: p.z ?? defaults.zoom,
      layer: p.layer ?? defaults.layer,
      units: p.units ?? defaults.units,
      opacity: p.opacity ?? defaults.opacity,
      filter: {
        ranges: (p.f ?? []).map(([bandId, min, max]) => ({ bandId, min, max })),
        excluded: (p.x ?? []).map(([bandId, values]) => ({ bandId, values })),
      },
    },
    problems,
  };
}

/** Query string for a state (without the leading '?'); compact numbers. */
export function formatUrlState(s: ViewState): string {
  const params = new URLSearchParams();
  params.set('c', `${s.center[0].toFixed(4)},${s.center[1].toFixed(4)}`);
  params.set('z', s.zoom.toFixed(2));
  params.set('layer', s.layer);
  params.set('units', s.units);
  params.set('opacity', String(Math.round(s.opacity * 100) / 100));
  const ranges = s.filter.ranges.filter((r) => r.min !== undefined || r.max !== undefined);
  if (ranges.length > 0)
    params.set('f', ranges.map((r) => `${r.bandId}:${fmt(r.min)}:${fmt(r.max)}`).join(';'));
  const excluded = s.filter.excluded.filter((e) => e.values.length > 0);
  if (excluded.length > 0)
    params.set('x', excluded.map((e) => `${e.bandId}:${e.values.join(',')}`).join(';'));
  return params.toString();
}

function fmt(v: number | undefined): string {
  return v === undefined ? '' : String(Number(v.toPrecision(8)));
}
