/**
 * The site study's thaw-timing chart (web/src/site/charts/thaw-share-chart.tsx), rendered to markup:
 * its two stairs sit at the summary's shares, and it says when no member thaws within the run.
 */
import { readFileSync } from 'node:fs';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { planSiteEnsemble, summariseSiteEnsemble } from '../../layers/screening/site-ensemble';
import { scenarioUncertaintySchema } from '../../layers/screening/uncertainty-schema';
import { siteInputSchema, type SiteResult } from '../../layers/site/site-input-schema';
import { CHART_MARGIN } from '../../web/src/site/charts/chart-frame';
import { ThawShareChart } from '../../web/src/site/charts/thaw-share-chart';

const input = siteInputSchema.parse(JSON.parse(readFileSync('examples/site-demo.json', 'utf8')));
const u = scenarioUncertaintySchema.parse({});
const time = [0, 10, 20, 30];

/** 12 members (the regression needs more than inputs + 1) with the given thaw years, cycled. */
function summaryOf(noPile: (number | null)[], withPile: (number | null)[] | null) {
  const caseOf = (thawYear: number | null) => ({
    time_yr: time,
    probes: [{ r_m: 1, z_m: 2, thawYear, T_C: time.map((t) => -2 + 0.05 * t) }],
  });
  const results = Array.from(
    { length: 12 },
    (_, j) =>
      ({
        noPile: caseOf(noPile[j % noPile.length]),
        withPile: withPile ? caseOf(withPile[j % withPile.length]) : null,
        thawDelay_yr: [null],
      }) as unknown as SiteResult,
  );
  return summariseSiteEnsemble(planSiteEnsemble(input, u, 12, 1), results);
}

const render = (s: ReturnType<typeof summaryOf>) =>
  renderToStaticMarkup(createElement(ThawShareChart, { summary: s, where: '1.0 m from the pile axis' }));

/** The y of each level of a stair path (its M point and every V). */
const levels = (d: string) => [...d.matchAll(/(?:M[\d.]+,|V)([\d.]+)/g)].map((m) => Number(m[1]));

describe('thaw-share chart', () => {
  it('draws both stairs at the shares, labelled, with the gap read as the thaw delay', () => {
    // Thaw years 10, 20, never (without) and 20, never, never (with): by t = 0, 10, 20, 30 yr
    // without the pile 0, 1/3, 2/3, 2/3 thawed; with it 0, 0, 1/3, 1/3 (hand count).
    const html = render(summaryOf([10, 20, null], [20, null, null]));
    const d = [...html.matchAll(/class="thaw-share [^"]*" d="([^"]+)"/g)].map((m) => m[1]);
    expect(d).toHaveLength(2);
    // y of a share s on the 0–100 % axis of the 520 × 260 frame: bottom − s·(bottom − top).
    const bottom = 260 - CHART_MARGIN.bottom;
    const y = (s: number) => Number((bottom - s * (bottom - CHART_MARGIN.top)).toFixed(1));
    expect(levels(d[0])).toEqual([0, 1 / 3, 2 / 3, 2 / 3].map(y));
    expect(levels(d[1])).toEqual([0, 0, 1 / 3, 1 / 3].map(y));
    expect(html).toContain('without piles');
    expect(html).toContain('with piles');
    expect(html).toContain('share of members thawed (%)');
    expect(html).toContain('years from start');
    expect(html).toMatch(/horizontal gap between the two curves is the thaw delay/);
    expect(html).not.toMatch(/does not thaw within the run/);
  });

  it('says so when no member thaws, and draws one curve for a site without piles', () => {
    const none = render(summaryOf([null], [null]));
    expect(none).toMatch(/does not thaw within the run in any of the 12 members/);
    const bare = render(summaryOf([10, null], null));
    expect([...bare.matchAll(/class="thaw-share /g)]).toHaveLength(1);
    expect(bare).not.toContain('with piles');
    expect(bare).toMatch(/no piles/);
  });
});
