/** Heat extracted from the ground per pile by month of one chosen year (bars), with the building heat
 * delivered and the part left to a backup heater in building mode. */
import type { SiteFluidResult } from '../../../../layers/site/site-input-schema';
import { ChartFrame } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { niceDomain } from './chart-scale';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

export function MonthlyHeatChart(props: { fluid: SiteFluidResult; year: number }) {
  const f = props.fluid;
  const m0 = (props.year - 1) * 12;
  const ground = f.extracted_kWh.slice(m0, m0 + 12);
  const delivered = f.delivered_kWh?.slice(m0, m0 + 12) ?? null;
  const unmet = f.unmet_kWh?.slice(m0, m0 + 12) ?? null;
  const tops = ground.map((g, i) => Math.max(g, (delivered?.[i] ?? 0) + (unmet?.[i] ?? 0)));
  const yDomain = niceDomain(tops, 5, [0]);
  return (
    <ChartFrame
      testId="chart-monthly-heat"
      title={`Heat by month, year ${props.year}, per pile`}
      description="Heat taken from the ground per pile by month; in building mode also the heat delivered and the part left to a backup heater."
      xDomain={[0, 12]}
      yDomain={yDomain}
      xTicks={[0.5, 1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5, 8.5, 9.5, 10.5, 11.5]}
      xTickLabel={(v) => MONTHS[Math.floor(v)] ?? ''}
      xLabel="month"
      yLabel="energy (kWh per pile)"
      legend={[
        { label: 'taken from the ground', colour: C.bar, kind: 'box' },
        ...(delivered
          ? [{ label: 'delivered by the heat pump', colour: C.withPile, kind: 'box' as const }]
          : []),
        ...(unmet ? [{ label: 'left to a backup heater', colour: C.limit, kind: 'box' as const }] : []),
      ]}
    >
      {(x, y) =>
        ground.map((g, i) => {
          const w = (x(1) - x(0)) * 0.32;
          const cx = x(i + 0.5);
          const d = delivered?.[i] ?? 0;
          const u = unmet?.[i] ?? 0;
          return (
            <g key={i}>
              <rect
                x={cx - w - 1}
                y={y(Math.max(g, 0))}
                width={w}
                height={Math.abs(y(0) - y(g))}
                fill={C.bar}
              />
              {delivered ? (
                <rect x={cx + 1} y={y(d)} width={w} height={y(0) - y(d)} fill={C.withPile} />
              ) : null}
              {unmet && u > 0 ? (
                <rect x={cx + 1} y={y(d + u)} width={w} height={y(d) - y(d + u)} fill={C.limit} />
              ) : null}
            </g>
          );
        })
      }
    </ChartFrame>
  );
}
