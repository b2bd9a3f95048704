/**
 * Thaw timing over the ensemble: the share of members in which the first probe has thawed by each
 * output time, without and with the pile (a stair per case: the empirical distribution of the thaw
 * year, members that never thaw within the run staying unthawed). The horizontal gap between the
 * two stairs at a given share is the thaw delay the pile buys at that share (negative where the
 * curve with the pile lies to the left: the pile brings the thaw forward).
 */
import type { SiteEnsembleSummary } from '../../../../layers/screening/site-ensemble';
import { ChartFrame } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import type { LinearScale } from './chart-scale';

/** SVG stair through the shares: level until each output time, then the step up to its share. */
function stairPath(t: readonly number[], share: readonly number[], x: LinearScale, y: LinearScale): string {
  if (t.length === 0) return '';
  let d = `M${x(t[0]).toFixed(1)},${y(100 * share[0]).toFixed(1)}`;
  for (let i = 1; i < t.length; i++) d += `H${x(t[i]).toFixed(1)}V${y(100 * share[i]).toFixed(1)}`;
  return d;
}

/** The sentence under the chart when one or both cases never thaw within the run. */
function thawNote(summary: SiteEnsembleSummary): string | null {
  const s = summary.thawShare;
  const n = summary.members;
  if (s.thawedNoPile === 0 && (s.thawedWithPile ?? 0) === 0)
    return `The probe does not thaw within the run in any of the ${n} members, without or with the piles: both curves stay at 0 % and the run is too short to read a thaw delay.`;
  if (s.thawedWithPile === 0)
    return `With the piles the probe does not thaw within the run in any of the ${n} members: the delay is longer than the run can show.`;
  return null;
}

export function ThawShareChart(props: { summary: SiteEnsembleSummary; where: string }) {
  const { summary } = props;
  const s = summary.thawShare;
  const t = summary.time_yr;
  const xDomain: [number, number] = [0, t[t.length - 1] ?? 1];
  const note = thawNote(summary);
  return (
    <div data-testid="ensemble-thaw-chart">
      <ChartFrame
        testId="chart-thaw-share"
        title={`Thaw at ${props.where}: share of the ${summary.members} ensemble members thawed`}
        description={`Share of members in which the probe has thawed by each time over ${xDomain[1]} years, without and with the piles; without the piles ${s.thawedNoPile} of ${summary.members} thaw within the run${s.thawedWithPile === null ? '' : `, with the piles ${s.thawedWithPile}`}.`}
        xDomain={xDomain}
        yDomain={[0, 100]}
        xLabel="years from start"
        yLabel="share of members thawed (%)"
        legend={[
          { label: 'without piles', colour: C.noPile },
          ...(s.withPile ? [{ label: 'with piles', colour: C.withPile }] : []),
        ]}
      >
        {(x, y) => (
          <>
            <path
              className="thaw-share no-pile"
              d={stairPath(t, s.noPile, x, y)}
              fill="none"
              stroke={C.noPile}
              strokeWidth="1.6"
            />
            {s.withPile ? (
              <path
                className="thaw-share with-pile"
                d={stairPath(t, s.withPile, x, y)}
                fill="none"
                stroke={C.withPile}
                strokeWidth="1.6"
              />
            ) : null}
          </>
        )}
      </ChartFrame>
      <p className="small muted">
        {s.withPile
          ? 'The horizontal gap between the two curves is the thaw delay: how many years later the same share of members thaws with the piles (where the curve with piles lies to the left, the piles bring the thaw forward). '
          : 'The site has no piles: only the curve without piles is drawn. '}
        Members that do not thaw within the run stay unthawed to its end.
        {note ? ` ${note}` : ''}
      </p>
    </div>
  );
}
