/**
 * Time-step and mesh convergence of `simulateSite` (issue 20 item 3), on (i) the demo site
 * (examples/site-demo.json, with and without its pile) and (ii) a thin-active-layer site (wet peat over
 * ice-rich silt, cold, warming; the ground of the seasonal benchmark's thin case).
 *
 *   npx tsx bench/site-convergence.ts [--years N] [--quick]
 *
 * For each case: a time-step series at the standard mesh (14, 7, 3.5, 1.75, 0.875, 0.4375 days; --quick
 * stops at 1.75), and a mesh series (coarse, standard, fine and "fine+", the fine preset with the
 * vertical cell along the pile and the first radial cell halved through `numerics`, the only mesh
 * overrides the schema allows) at the default step
 * and (not with --quick) at 1.75 days. Printed as Markdown tables: thaw year (no pile; with the pile
 * at the first two probes), the first probe's temperature at fixed times (no pile and with pile), the
 * active layer (deepest thaw of the far-field column in year 1 and in the last year), CPU time.
 * Observed order of accuracy in the time step from the three finest steps (ratio r = 2, Richardson):
 *   p = log((f1 − f2)/(f2 − f3)) / log r,   f* = f3 + (f3 − f2)/(r^p − 1),
 * with f1 the coarsest of the three; when the differences change sign or p falls outside (0.3, 4) the
 * series is not in its asymptotic range and f3 ± |f3 − f2| is given instead. Then the error of the
 * default setting (standard mesh, default step) against f*. The mesh presets do not refine by one
 * ratio, so the mesh series prints its successive changes only. The thaw year is a continuous
 * functional: the time the annual maximum thaw depth at the probe's column (read from the cells'
 * liquid fractions) crosses the probe depth, interpolated between consecutive years' maxima.
 * Public API only (simulateSite and the input schema), so it runs against any simulator on the branch.
 */
import { readFileSync } from 'node:fs';
import { SITE_DEFAULTS, siteInputSchema, type SiteInput } from '../layers/site/site-input-schema';
import { simulateSite } from '../layers/site/simulate-site';
import type { SiteResult } from '../layers/site/site-result';

const args = process.argv.slice(2);
const quick = args.includes('--quick');
const yearsArg = args.indexOf('--years');
const years = yearsArg >= 0 ? Number(args[yearsArg + 1]) : 40;
if (!Number.isInteger(years) || years < 2 || years > 200) {
  throw new RangeError(`--years must be an integer in [2, 200]; received ${args[yearsArg + 1]}`);
}

const STEPS_DAYS = quick ? [14, 7, 3.5, 1.75] : [14, 7, 3.5, 1.75, 0.875, 0.4375];
/** Output times for the probe temperatures, yr (monthly output hits them exactly). */
const PROBE_TIMES_YR = [1.5, Math.min(10.5, years - 0.5)];
const DEFAULT_STEP = SITE_DEFAULTS.timeStep_days.value;
/** Mesh series at the default step and (full run) at 1.75 d: the fine meshes at the finest step cost too much. */
const meshSteps = quick ? [DEFAULT_STEP] : [DEFAULT_STEP, 1.75];

type Mesh = 'coarse' | 'standard' | 'fine' | 'fine+';

const demo = siteInputSchema.parse({
  ...JSON.parse(readFileSync(new URL('../examples/site-demo.json', import.meta.url), 'utf8')),
  years,
});

/**
 * Thin active layer (about 0.5 m at the start, 0.8 m after 40 years): the ground of the seasonal
 * benchmark's thin case (peat 0.3 m over ice-rich silt), mean air −7.5 °C warming 0.12 K/yr, so that
 * the 0.75 m probes thaw within the run.
 */
const thin = siteInputSchema.parse({
  ...demo,
  years,
  ground: {
    layers: [
      { top_m: 0, bottom_m: 0.3, soil: { texture: 'peat', waterContent_m3m3: 0.8 } },
      { top_m: 0.3, bottom_m: 50, soil: { texture: 'silt', waterContent_m3m3: 0.45 } },
    ],
    geothermalFlux_W_m2: 0.06,
    initial: 'equilibrium',
  },
  climate: { meanAirTemp_C: -7.5, amplitude_C: 18, warming_C_per_yr: 0.12, nThaw: 0.8, nFreeze: 0.5 },
  probes: [
    { r_m: 1.5, z_m: 0.75 },
    { r_m: 0.5, z_m: 0.75 },
    { r_m: 1.5, z_m: 2 },
  ],
});

function withNumerics(base: SiteInput, step_days: number, mesh: Mesh): SiteInput {
  const fidelity = mesh === 'fine+' ? 'fine' : mesh;
  const numerics: SiteInput['numerics'] = { ...base.numerics, fidelity };
  if (mesh === 'fine+') {
    numerics.pileStep_m = 0.125;
    numerics.firstRadialStep_m = 0.005;
  } else {
    delete numerics.pileStep_m;
    delete numerics.firstRadialStep_m;
  }
  return { ...base, timeStep_days: step_days, numerics };
}

interface Row {
  step_days: number;
  mesh: Mesh;
  thawNoPile: number | null;
  /** Thaw year with the pile at the first and second probe. */
  thawPile: (number | null)[];
  /** Thaw delay at the first probe, yr, and whether it is a lower bound (pile case not thawed). */
  delay: number | null;
  delayLowerBound: boolean;
  probeNoPile: number[];
  probePile: number[];
  activeLayerFirst: number;
  activeLayerLast: number;
  cpu_s: number;
  cells: string;
}

/** First probe's temperature at t_yr, linear between the bracketing outputs (output times sit on steps). */
function atTime(r: SiteResult['noPile'] | null, t_yr: number): number {
  if (!r) return NaN;
  const t = r.time_yr;
  const i = t.findIndex((x) => x >= t_yr);
  if (i <= 0) return i === 0 ? r.probes[0].T_C[0] : NaN;
  const f = (t_yr - t[i - 1]) / (t[i] - t[i - 1]);
  return r.probes[0].T_C[i - 1] + f * (r.probes[0].T_C[i] - r.probes[0].T_C[i - 1]);
}

function runOne(base: SiteInput, step_days: number, mesh: Mesh): Row {
  const input = withNumerics(base, step_days, mesh);
  const c0 = process.cpuUsage();
  const r = simulateSite(input);
  const c = process.cpuUsage(c0);
  const a = r.noPile.annualThawDepth_m;
  return {
    step_days,
    mesh,
    thawNoPile: r.noPile.probes[0].thawYear,
    thawPile: [0, 1].map((i) => (r.withPile ? r.withPile.probes[i].thawYear : null)),
    delay: r.thawDelay_yr[0],
    delayLowerBound: r.thawDelayIsLowerBound[0],
    probeNoPile: PROBE_TIMES_YR.map((t) => atTime(r.noPile, t)),
    probePile: PROBE_TIMES_YR.map((t) => atTime(r.withPile, t)),
    activeLayerFirst: a[0],
    activeLayerLast: a[a.length - 1],
    cpu_s: (c.user + c.system) / 1e6,
    cells: `${r.mesh.nr}×${r.mesh.nz}`,
  };
}

const fmt = (x: number | null, d = 3): string => (x === null || !Number.isFinite(x) ? '—' : x.toFixed(d));

function table(rows: Row[]): string {
  const head =
    '| step (d) | mesh | cells | thaw yr, no pile | thaw yr, pile (probe 1) | thaw yr, pile (probe 2) | delay, probe 1 (yr) | ' +
    PROBE_TIMES_YR.map((t) => `T(${t} yr) no pile °C | T(${t} yr) pile °C`).join(' | ') +
    ' | active layer yr 1 (m) | active layer last yr (m) | CPU (s) |';
  const sep = '|' + ' --- |'.repeat(head.split('|').length - 2);
  const body = rows.map(
    (r) =>
      `| ${r.step_days} | ${r.mesh} | ${r.cells} | ${fmt(r.thawNoPile)} | ${fmt(r.thawPile[0])} | ${fmt(r.thawPile[1])} | ${r.delayLowerBound ? '≥ ' : ''}${fmt(r.delay, 2)} | ` +
      PROBE_TIMES_YR.map((_, i) => `${fmt(r.probeNoPile[i])} | ${fmt(r.probePile[i])}`).join(' | ') +
      ` | ${fmt(r.activeLayerFirst)} | ${fmt(r.activeLayerLast)} | ${r.cpu_s.toFixed(1)} |`,
  );
  return [head, sep, ...body].join('\n');
}

/** Richardson from the three finest of a halving series (coarse to fine). */
function richardson(values: (number | null)[]): string {
  const v = values.slice(-3);
  if (v.some((x) => x === null || !Number.isFinite(x))) return 'n/a (missing values)';
  const [f1, f2, f3] = v as number[];
  const d12 = f1 - f2;
  const d23 = f2 - f3;
  if (d23 === 0) return `converged to the printed digits: ${f3.toFixed(3)}`;
  const ratio = d12 / d23;
  const p = ratio > 0 ? Math.log(ratio) / Math.LN2 : NaN;
  if (!(p > 0.3 && p < 4)) {
    return `not asymptotic (differences ${d12.toFixed(3)}, ${d23.toFixed(3)}): best ${f3.toFixed(3)} ± ${Math.abs(d23).toFixed(3)}`;
  }
  const extrap = f3 + (f3 - f2) / (2 ** p - 1);
  return `p = ${p.toFixed(2)}, extrapolated ${extrap.toFixed(3)}`;
}

function extrapolated(values: (number | null)[]): number | null {
  const v = values.slice(-3);
  if (v.some((x) => x === null || !Number.isFinite(x))) return null;
  const [f1, f2, f3] = v as number[];
  const ratio = (f1 - f2) / (f2 - f3);
  const p = ratio > 0 ? Math.log(ratio) / Math.LN2 : NaN;
  if (!(p > 0.3 && p < 4)) return f3;
  return f3 + (f3 - f2) / (2 ** p - 1);
}

function study(name: string, base: SiteInput): void {
  console.log(`\n## ${name}: ${base.years} years\n`);
  const stepRows = STEPS_DAYS.map((s) => runOne(base, s, 'standard'));
  console.log('Time step series, standard mesh:\n');
  console.log(table(stepRows));
  const meshes: Mesh[] = ['coarse', 'standard', 'fine', 'fine+'];
  const meshRows: Row[] = [];
  for (const step of meshSteps) {
    for (const m of meshes) {
      const done = stepRows.find((r) => r.step_days === step && r.mesh === m);
      meshRows.push(done ?? runOne(base, step, m));
    }
  }
  console.log('\nMesh series:\n');
  console.log(table(meshRows));
  console.log('\nObserved order in the time step (three finest steps, r = 2):\n');
  const quantities: [string, (r: Row) => number | null][] = [
    ['thaw year, no pile', (r) => r.thawNoPile],
    ['thaw year, pile (probe 1)', (r) => r.thawPile[0]],
    ['thaw year, pile (probe 2)', (r) => r.thawPile[1]],
    ['active layer, last year', (r) => r.activeLayerLast],
    [`T(${PROBE_TIMES_YR[0]} yr), no pile`, (r) => r.probeNoPile[0]],
    [`T(${PROBE_TIMES_YR[0]} yr), pile`, (r) => r.probePile[0]],
  ];
  const def = stepRows.find((r) => r.step_days === DEFAULT_STEP);
  for (const [q, get] of quantities) {
    const series = stepRows.map(get);
    const best = extrapolated(series);
    const d = def ? get(def) : null;
    const err = best !== null && d !== null ? (d - best).toFixed(3) : 'n/a';
    console.log(
      `- ${q}: ${richardson(series)}; default (${DEFAULT_STEP} d, standard) ${fmt(d)}, error ${err}`,
    );
  }
  // The presets do not refine every cell by one ratio (first vertical cell 0.2, 0.1, 0.05 m; growth
  // 1.4, 1.3, 1.12), so no order is fitted in the mesh: successive changes only.
  console.log('\nMesh: change from each mesh to the next (coarse → standard → fine → fine+):\n');
  for (const step of meshSteps) {
    const rows = meshRows.filter((r) => r.step_days === step);
    for (const [q, get] of quantities) {
      const v = rows.map(get);
      const steps = v
        .slice(1)
        .map((x, i) => (x !== null && v[i] !== null ? (x - (v[i] as number)).toFixed(3) : 'n/a'));
      console.log(`- ${step} d, ${q}: ${v.map((x) => fmt(x)).join(' → ')} (changes ${steps.join(', ')})`);
    }
  }
}

console.log(`# simulateSite convergence study${quick ? ' (quick)' : ''}`);
study(
  'Demo site (examples/site-demo.json); probe 1 at r = 0.5 m, z = 2 m; probe 2 at r = 1.5 m, z = 2 m',
  demo,
);
study(
  'Thin active layer (peat 0.3 m over ice-rich silt, −7.5 °C, +0.12 K/yr); probe 1 at r = 1.5 m, z = 0.75 m; probe 2 at r = 0.5 m, z = 0.75 m',
  thin,
);
