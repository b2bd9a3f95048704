/** Monthly mean fluid temperatures over the run, with the heat pump's lowest entering temperature and
 * the fluid's freezing point marked. */
import type { SiteFluidResult } from '../../../../layers/site/site-input-schema';
import { displayConversion, type UnitSystem } from '../../units/display-units';
import { ChartFrame, ReferenceLine } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { linePath, niceDomain } from './chart-scale';

export function FluidTemperatureChart(props: {
  fluid: SiteFluidResult;
  minEnteringFluid_C: number | null;
  fluidFreezing_C: number | null;
  units: UnitSystem;
}) {
  const conv = displayConversion('°C', props.units);
  const T = (v: number | null) => (v === null ? NaN : v * conv.factor + conv.offset);
  const f = props.fluid;
  const t = f.month_yr.map((m) => m + 1 / 24);
  const inlet = f.inlet_C.map(T);
  const outlet = f.outlet_C.map(T);
  const limits = [props.minEnteringFluid_C, props.fluidFreezing_C]
    .filter((v): v is number => v !== null)
    .map(T);
  const yDomain = niceDomain([...inlet, ...outlet], 5, limits);
  const xDomain: [number, number] = [0, Math.ceil(f.month_yr[f.month_yr.length - 1] ?? 1)];
  const minE = T(props.minEnteringFluid_C);
  const frz = T(props.fluidFreezing_C);
  return (
    <ChartFrame
      testId="chart-fluid"
      title="Fluid temperatures by month"
      description="Monthly mean inlet and outlet fluid temperatures over the run, with the heat pump's lowest entering temperature and the fluid's freezing point."
      xDomain={xDomain}
      yDomain={yDomain}
      xLabel="years from start (monthly means while the loop runs)"
      yLabel={`fluid temperature (${conv.unit})`}
      legend={[
        { label: 'to the pile (inlet)', colour: C.inlet },
        { label: 'from the pile (outlet = entering the heat pump)', colour: C.outlet },
        ...(Number.isFinite(minE)
          ? [
              {
                label: `lowest entering temperature ${minE.toFixed(1)} ${conv.unit}`,
                colour: C.limit,
                dash: '6 3',
              },
            ]
          : []),
        ...(Number.isFinite(frz)
          ? [{ label: `fluid freezes ${frz.toFixed(1)} ${conv.unit}`, colour: C.freezing, dash: '2 3' }]
          : []),
      ]}
    >
      {(x, y) => (
        <>
          <ReferenceLine x={x} y={y} xDomain={xDomain} value={minE} colour={C.limit} dash="6 3" />
          <ReferenceLine x={x} y={y} xDomain={xDomain} value={frz} colour={C.freezing} dash="2 3" />
          <path d={linePath(t, inlet, x, y)} fill="none" stroke={C.inlet} strokeWidth="1.2" />
          <path d={linePath(t, outlet, x, y)} fill="none" stroke={C.outlet} strokeWidth="1.2" />
        </>
      )}
    </ChartFrame>
  );
}
