/**
 * Regenerates docs/site-demo-chart.svg and prints the README table from a run of the site simulator on
 * examples/site-demo.json (the tool's own output; nothing edited by hand):
 *   npx tsx bench/site-chart.ts
 * Chart: temperature of one probe over the run, without and with the pile, and the freezing point.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { SCREENING_CAUTION } from '../layers/cautions';
import { simulateSite } from '../layers/site/simulate-site';

const PROBE = 1; // r = 1.5 m, z = 2 m in the example

const input = JSON.parse(readFileSync(new URL('../examples/site-demo.json', import.meta.url), 'utf8'));
const result = simulateSite(input);
const withPile = result.withPile!;
const t = result.noPile.time_yr;
const a = result.noPile.probes[PROBE].T_C;
const b = withPile.probes[PROBE].T_C;
const { r_m, z_m } = result.noPile.probes[PROBE];

const W = 760;
const H = 380;
const left = 60;
const right = 20;
const top = 40;
const bottom = 70;
const tMax = t[t.length - 1];
const all = [...a, ...b, 0];
const yMin = Math.floor(Math.min(...all));
const yMax = Math.ceil(Math.max(...all));
const X = (x: number) => left + ((W - left - right) * x) / tMax;
const Y = (y: number) => top + ((H - top - bottom) * (yMax - y)) / (yMax - yMin);
const path = (ys: number[]) =>
  ys.map((y, i) => `${i ? 'L' : 'M'}${X(t[i]).toFixed(1)},${Y(y).toFixed(1)}`).join('');
const ticksX = Array.from({ length: Math.floor(tMax / 5) + 1 }, (_, i) => i * 5);
const ticksY = Array.from({ length: yMax - yMin + 1 }, (_, i) => yMin + i);
const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;');
const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" font-family="sans-serif" font-size="12">
<rect width="${W}" height="${H}" fill="white"/>
<text x="${left}" y="22" font-size="14">Ground temperature at r = ${r_m} m, z = ${z_m} m (examples/site-demo.json, monthly)</text>
${ticksY.map((y) => `<line x1="${left}" x2="${W - right}" y1="${Y(y)}" y2="${Y(y)}" stroke="#ddd"/><text x="${left - 8}" y="${Y(y) + 4}" text-anchor="end">${y}</text>`).join('\n')}
${ticksX.map((x) => `<line x1="${X(x)}" x2="${X(x)}" y1="${top}" y2="${H - bottom}" stroke="#eee"/><text x="${X(x)}" y="${H - bottom + 16}" text-anchor="middle">${x}</text>`).join('\n')}
<line x1="${left}" x2="${W - right}" y1="${Y(0)}" y2="${Y(0)}" stroke="#555" stroke-dasharray="4 3"/>
<path d="${path(a)}" fill="none" stroke="#c0392b" stroke-width="1.2"/>
<path d="${path(b)}" fill="none" stroke="#2166ac" stroke-width="1.2"/>
<text x="${(left + W - right) / 2}" y="${H - bottom + 34}" text-anchor="middle">years since start</text>
<text transform="translate(16 ${(top + H - bottom) / 2}) rotate(-90)" text-anchor="middle">°C</text>
<rect x="${left + 10}" y="${top + 6}" width="12" height="3" fill="#c0392b"/><text x="${left + 28}" y="${top + 11}">without pile</text>
<rect x="${left + 120}" y="${top + 6}" width="12" height="3" fill="#2166ac"/><text x="${left + 138}" y="${top + 11}">with pile (building mode)</text>
<text x="${left + 320}" y="${top + 11}" fill="#555">dashed: 0 °C</text>
<text x="${left}" y="${H - 10}" font-size="11" fill="#555">${esc(SCREENING_CAUTION)}</text>
</svg>
`;
writeFileSync(new URL('../docs/site-demo-chart.svg', import.meta.url), svg);

const rows = [
  '| year | thaw depth, no pile (m) | thaw depth, with pile (m) | probe, no pile (°C) | probe, with pile (°C) | heat extracted (kWh) | unmet heat (kWh) |',
];
rows.push('|---|---|---|---|---|---|---|');
const fluid = result.fluid!;
for (let y = 5; y <= input.years; y += 5) {
  const i = t.findIndex((x) => x >= y - 1e-6);
  const yr = (arr: (number | null)[] | null) =>
    (arr ?? []).slice((y - 1) * 12, y * 12).reduce<number>((s, v) => s + (v ?? 0), 0);
  rows.push(
    `| ${y} | ${result.noPile.annualThawDepth_m[y - 1].toFixed(2)} | ${withPile.annualThawDepth_m[y - 1].toFixed(2)} | ` +
      `${a[i].toFixed(2)} | ${b[i].toFixed(2)} | ${yr(fluid.extracted_kWh).toFixed(0)} | ${yr(fluid.unmet_kWh).toFixed(0)} |`,
  );
}
console.log(rows.join('\n'));
console.log(
  `\nthawYear (no pile / with pile) per probe: ${result.noPile.probes.map((p, k) => `${p.thawYear ?? '-'} / ${withPile.probes[k].thawYear ?? '-'}`).join('; ')}`,
);
console.log(
  `thawDelay_yr: ${JSON.stringify(result.thawDelay_yr)} (lower bound: ${JSON.stringify(result.thawDelayIsLowerBound)})`,
);
console.log(
  `lowest fluid ${fluid.lowest_C} °C at ${fluid.lowestAt_yr} yr; Rb ${fluid.Rb_mK_W}, Ra ${fluid.Ra_mK_W} m·K/W`,
);
console.log(
  `energy balance relative error ${result.energyBalance.relativeError.toExponential(2)}; warnings: ${JSON.stringify(result.warnings)}`,
);
console.log(
  `frozen by pile (m³, end of winter, years 1..): ${result.overCooling!.frozenByPile_m3.join(' ')}`,
);
