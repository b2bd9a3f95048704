/**
 * A scenario set: several named scenarios screened in one build (issue 17 item 2), e.g. warming
 * pathway × design life. The file is `{ "scenarios": [ {scenario}, ... ] }`, each entry a scenario
 * (scenario.ts) with a unique `name`; a plain scenario file is a set of one. The first scenario is the
 * reference: the manifest lists every other one with its differences from it (scenarioDifferences).
 */
import { z } from 'zod';
import { scenarioSchema, type Scenario } from './scenario';

export const scenarioSetSchema = z
  .strictObject({
    scenarios: z.array(scenarioSchema).min(1).max(12),
  })
  .superRefine((set, ctx) => {
    const seen = new Map<string, number>();
    set.scenarios.forEach((s, i) => {
      const slug = scenarioSlug(s.name);
      const j = seen.get(slug);
      if (j !== undefined) {
        ctx.addIssue({
          code: 'custom',
          path: ['scenarios', i, 'name'],
          message: `must differ from scenarios[${j}].name ("${set.scenarios[j].name}") after lower-casing and punctuation; received "${s.name}"`,
        });
      }
      seen.set(slug, i);
    });
  });

export type ScenarioSet = z.infer<typeof scenarioSetSchema>;

/** True when a scenario file's JSON is a set (`{ scenarios: [...] }`) rather than one scenario. */
export function isScenarioSetJson(json: unknown): boolean {
  return typeof json === 'object' && json !== null && 'scenarios' in json;
}

/** A scenario name as a directory name: lower case, [a-z0-9-] only. */
export function scenarioSlug(name: string): string {
  const s = name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  return s.length > 0 ? s.slice(0, 60) : 'scenario';
}

export interface ScenarioDifference {
  /** Dotted path of the field, e.g. "designLife_yr" or "warmingPathway". */
  path: string;
  /** The reference (first) scenario's value (undefined: not set). */
  reference: unknown;
  value: unknown;
}

/**
 * The fields in which `s` differs from the reference scenario, as dotted paths (objects compared field
 * by field; arrays and the warming pathway compared whole). `name` is not a difference.
 */
export function scenarioDifferences(reference: Scenario, s: Scenario): ScenarioDifference[] {
  const out: ScenarioDifference[] = [];
  const walk = (a: unknown, b: unknown, path: string) => {
    const isObj = (v: unknown): v is Record<string, unknown> =>
      typeof v === 'object' && v !== null && !Array.isArray(v);
    if (isObj(a) && isObj(b) && path !== 'warmingPathway') {
      const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
      for (const k of keys) {
        if (path === '' && k === 'name') continue;
        walk(a[k], b[k], path ? `${path}.${k}` : k);
      }
      return;
    }
    if (JSON.stringify(a) !== JSON.stringify(b)) out.push({ path, reference: a, value: b });
  };
  walk(reference, s, '');
  return out;
}

/** One line per difference, for the manifest and the web ("design life 50 yr (first: 30)"). */
export function differenceText(d: ScenarioDifference): string {
  const show = (v: unknown): string => {
    if (v === undefined) return 'none';
    if (typeof v === 'object' && v !== null && 'label' in v) return String((v as { label: unknown }).label);
    return typeof v === 'string' ? v : JSON.stringify(v);
  };
  return `${d.path}: ${show(d.value)} (first scenario: ${show(d.reference)})`;
}
