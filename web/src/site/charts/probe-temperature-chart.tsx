/** Temperature at one probe over the run, with and without the pile, the freezing point marked. */
import type { SiteResult } from '../../../../layers/site/site-input-schema';
import { displayConversion, type UnitSystem } from '../../units/display-units';
import { ChartFrame, ReferenceLine } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { linePath, niceDomain } from './chart-scale';

export function ProbeTemperatureChart(props: {
  result: SiteResult;
  probe: number;
  freezingPoint_C: number;
  units: UnitSystem;
}) {
  const { result, probe, units } = props;
  const conv = displayConversion('°C', units);
  const T = (v: number) => v * conv.factor + conv.offset;
  const no = result.noPile.probes[probe];
  const withP = result.withPile?.probes[probe];
  const noT = no.T_C.map(T);
  const wT = withP ? withP.T_C.map(T) : [];
  const fp = T(props.freezingPoint_C);
  const years = result.noPile.time_yr;
  const yDomain = niceDomain([...noT, ...wT], 5, [fp]);
  const xDomain: [number, number] = [0, years[years.length - 1] ?? 1];
  const depth = displayConversion('m', units);
  const where = `${(no.r_m * depth.factor).toFixed(1)} ${depth.unit} from the pile axis, ${(no.z_m * depth.factor).toFixed(1)} ${depth.unit} deep`;
  return (
    <ChartFrame
      testId="chart-probe"
      title={`Ground temperature at ${where}`}
      description={`Temperature over ${xDomain[1]} years without and with the pile; freezing point ${fp.toFixed(1)} ${conv.unit}.`}
      xDomain={xDomain}
      yDomain={yDomain}
      xLabel="years from start"
      yLabel={`temperature (${conv.unit})`}
      legend={[
        { label: 'without pile', colour: C.noPile },
        ...(withP ? [{ label: 'with pile', colour: C.withPile }] : []),
        { label: `freezing point ${fp.toFixed(1)} ${conv.unit}`, colour: C.freezing, dash: '5 3' },
      ]}
    >
      {(x, y) => (
        <>
          <ReferenceLine
            className="freezing"
            x={x}
            y={y}
            xDomain={xDomain}
            value={fp}
            colour={C.freezing}
            dash="5 3"
          />
          <path d={linePath(years, noT, x, y)} fill="none" stroke={C.noPile} strokeWidth="1.3" />
          {withP ? (
            <path
              d={linePath(result.withPile!.time_yr, wT, x, y)}
              fill="none"
              stroke={C.withPile}
              strokeWidth="1.3"
            />
          ) : null}
          {no.thawYear !== null ? <circle cx={x(no.thawYear)} cy={y(fp)} r="4" fill={C.noPile} /> : null}
          {withP && withP.thawYear !== null ? (
            <circle cx={x(withP.thawYear)} cy={y(fp)} r="4" fill={C.withPile} />
          ) : null}
        </>
      )}
    </ChartFrame>
  );
}
