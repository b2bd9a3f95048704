/** Fan chart: P10–P90 band and P50 line of the probe temperature over the ensemble, freezing point marked. */
import type { SiteEnsembleSummary } from '../../../../layers/screening/site-ensemble';
import { displayConversion, type UnitSystem } from '../../units/display-units';
import { ChartFrame, ReferenceLine } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { linePath, niceDomain } from './chart-scale';

export function ProbeFanChart(props: {
  summary: SiteEnsembleSummary;
  where: string;
  freezingPoint_C: number;
  units: UnitSystem;
}) {
  const { summary, units } = props;
  const conv = displayConversion('°C', units);
  const T = (v: number) => v * conv.factor + conv.offset;
  const t = summary.time_yr;
  const lo = summary.probeP10_C.map(T);
  const mid = summary.probeP50_C.map(T);
  const hi = summary.probeP90_C.map(T);
  const fp = T(props.freezingPoint_C);
  const yDomain = niceDomain([...lo, ...hi], 5, [fp]);
  const xDomain: [number, number] = [0, t[t.length - 1] ?? 1];
  return (
    <ChartFrame
      testId="chart-probe-fan"
      title={`Ground temperature at ${props.where}: range over ${summary.members} ensemble members`}
      description={`P10 to P90 band and median of the temperature over ${xDomain[1]} years; freezing point ${fp.toFixed(1)} ${conv.unit}.`}
      xDomain={xDomain}
      yDomain={yDomain}
      xLabel="years from start"
      yLabel={`temperature (${conv.unit})`}
      legend={[
        { label: 'P10–P90 (8 of 10 members inside)', colour: '#9ec1e6' },
        { label: 'P50 (median)', colour: C.withPile },
        { label: `freezing point ${fp.toFixed(1)} ${conv.unit}`, colour: C.freezing, dash: '5 3' },
      ]}
    >
      {(x, y) => {
        const upper = t.map((ti, i) => `${i === 0 ? 'M' : 'L'}${x(ti).toFixed(1)},${y(hi[i]).toFixed(1)}`);
        const lower = t
          .map((ti, i) => `L${x(ti).toFixed(1)},${y(lo[i]).toFixed(1)}`)
          .reverse()
          .join('');
        return (
          <>
            <path d={`${upper.join('')}${lower}Z`} fill="#9ec1e6" fillOpacity="0.7" stroke="none" />
            <ReferenceLine
              className="freezing"
              x={x}
              y={y}
              xDomain={xDomain}
              value={fp}
              colour={C.freezing}
              dash="5 3"
            />
            <path d={linePath(t, mid, x, y)} fill="none" stroke={C.withPile} strokeWidth="1.4" />
          </>
        );
      }}
    </ChartFrame>
  );
}
