/**
 * One site study run, as the dashboard's study does it and `pile-atlas site --report` repeats it: the
 * planner's input plus a column of profile probes at the scenario's reference radius, the simulation
 * (with and without the pile), the pile sizing by design pulse for the map's foundation (the scenario's
 * pile spacing, design life and design-day margin) and the report (site-study-report.ts). The dashboard runs the two
 * heavy steps in its Web Worker with the same functions (web/src/site/site-worker.ts).
 */
import type { SiteInput } from '../site/site-input-schema';
import { simulateSite } from '../site/simulate-site';
import { withProfileProbes, type ProfileColumn } from '../site/site-profile';
import { sizeSiteByPulse, type SiteSizing } from '../site/site-sizing';
import type { SiteResult } from '../site/site-input-schema';
import { siteInputSchema } from '../site/site-input-schema';
import type { Scenario } from './scenario';
import { siteStudyReport, type SiteStudyReport } from './site-study-report';

/** The foundation the study sizes: the map's (scenario) pile spacing and design life. */
export function studyFoundation(s: Scenario): {
  spacing_m: number;
  designLife_yr: number;
  designMargin_K: number;
} {
  return {
    spacing_m: s.building.pileSpacing_m,
    designLife_yr: s.designLife_yr,
    designMargin_K: s.building.designMargin_K,
  };
}

/** The run input: the planner's probes, then the profile column at the reference radius. */
export function studyRunInput(input: SiteInput, s: Scenario): { input: SiteInput; column: ProfileColumn } {
  const pileR = input.pile ? input.pile.outerDiameter_m / 2 : 0;
  const r = Math.min(Math.max(s.referenceRadius_m, pileR + 0.05), input.domain.radius_m);
  const { input: withColumn, column } = withProfileProbes(input, r);
  return { input: siteInputSchema.parse(withColumn), column };
}

/** Sizing after a run; a failed sizing is a reason in words, never an exception. */
export function sizeStudy(
  input: SiteInput,
  result: SiteResult,
  column: ProfileColumn,
  s: Scenario,
): SiteSizing | null {
  try {
    return sizeSiteByPulse(input, result, column, studyFoundation(s));
  } catch {
    return { ok: false, reason: 'the three-pulse sizing could not be completed for these inputs' };
  }
}

/** The whole study for one validated input (module comment). */
export function runSiteStudy(
  input: SiteInput,
  s: Scenario,
  onProgress?: (fraction: number) => void,
): { report: SiteStudyReport; result: SiteResult; input: SiteInput; column: ProfileColumn } {
  const run = studyRunInput(input, s);
  const result = simulateSite(run.input, { onProgress });
  const sizing = sizeStudy(run.input, result, run.column, s);
  return {
    report: siteStudyReport({ input: run.input, result, column: run.column, sizing }, s),
    result,
    input: run.input,
    column: run.column,
  };
}
