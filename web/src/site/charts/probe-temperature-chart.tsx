/**
 * Temperature at one probe over the run, with and without the pile, the freezing point marked; with
 * the study run under every scenario (scenario-sweep.tsx), each scenario's two curves drawn over it in
 * its own colour (solid with the pile, dashed without), its thaw marked, its name in the legend.
 */
import type { SiteResult } from '../../../../layers/site/site-input-schema';
import { displayConversion, type UnitSystem } from '../../units/display-units';
import { ChartFrame, ReferenceLine } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { linePath, niceDomain, type LinearScale } from './chart-scale';

type ProbeSeries = SiteResult['noPile']['probes'][number];

/** One scenario's curves at the probe shown. */
export interface ProbeOverlay {
  label: string;
  colour: string;
  time_yr: number[];
  noPile: ProbeSeries;
  withPile: ProbeSeries | null;
  withPileTime_yr: number[];
}

/** A scenario's two curves and thaw marks (overlay colour; dashed without the pile). */
function OverlayCurves(props: {
  o: ProbeOverlay;
  T: (v: number) => number;
  fp: number;
  x: LinearScale;
  y: LinearScale;
}) {
  const { o, T, fp, x, y } = props;
  return (
    <g className="scenario-overlay" data-scenario={o.label}>
      <path
        d={linePath(o.time_yr, o.noPile.T_C.map(T), x, y)}
        fill="none"
        stroke={o.colour}
        strokeWidth="1"
        strokeDasharray="4 3"
      />
      {o.withPile ? (
        <path
          d={linePath(o.withPileTime_yr, o.withPile.T_C.map(T), x, y)}
          fill="none"
          stroke={o.colour}
          strokeWidth="1"
        />
      ) : null}
      {o.noPile.thawYear !== null ? (
        <circle cx={x(o.noPile.thawYear)} cy={y(fp)} r="3" fill="none" stroke={o.colour} />
      ) : null}
      {o.withPile && o.withPile.thawYear !== null ? (
        <circle cx={x(o.withPile.thawYear)} cy={y(fp)} r="3" fill={o.colour} />
      ) : null}
    </g>
  );
}

export function ProbeTemperatureChart(props: {
  result: SiteResult;
  probe: number;
  freezingPoint_C: number;
  units: UnitSystem;
  overlay?: ProbeOverlay[];
}) {
  const { result, probe, units } = props;
  const overlay = props.overlay ?? [];
  const conv = displayConversion('°C', units);
  const T = (v: number) => v * conv.factor + conv.offset;
  const no = result.noPile.probes[probe];
  const withP = result.withPile?.probes[probe];
  const noT = no.T_C.map(T);
  const wT = withP ? withP.T_C.map(T) : [];
  const fp = T(props.freezingPoint_C);
  const years = result.noPile.time_yr;
  const overlayT = overlay.flatMap((o) => [...o.noPile.T_C, ...(o.withPile?.T_C ?? [])].map(T));
  const yDomain = niceDomain([...noT, ...wT, ...overlayT], 5, [fp]);
  const lastYear = Math.max(years[years.length - 1] ?? 1, ...overlay.map((o) => o.time_yr.at(-1) ?? 0));
  const xDomain: [number, number] = [0, lastYear];
  const depth = displayConversion('m', units);
  const where = `${(no.r_m * depth.factor).toFixed(1)} ${depth.unit} from the pile axis, ${(no.z_m * depth.factor).toFixed(1)} ${depth.unit} deep`;
  return (
    <ChartFrame
      testId="chart-probe"
      title={`Ground temperature at ${where}`}
      description={`Temperature over ${xDomain[1]} years without and with the pile; freezing point ${fp.toFixed(1)} ${conv.unit}.${overlay.length ? ` With the curves of ${overlay.length} scenarios.` : ''}`}
      xDomain={xDomain}
      yDomain={yDomain}
      xLabel="years from start"
      yLabel={`temperature (${conv.unit})`}
      legend={[
        { label: 'without pile', colour: C.noPile },
        ...(withP ? [{ label: 'with pile', colour: C.withPile }] : []),
        { label: `freezing point ${fp.toFixed(1)} ${conv.unit}`, colour: C.freezing, dash: '5 3' },
        ...overlay.map((o) => ({ label: `${o.label} (solid with pile, dashed without)`, colour: o.colour })),
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
          {overlay.map((o) => (
            <OverlayCurves key={o.label} o={o} T={T} fp={fp} x={x} y={y} />
          ))}
        </>
      )}
    </ChartFrame>
  );
}
