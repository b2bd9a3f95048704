/**
 * Ground temperature against depth for chosen years (annual mean as a line, seasonal range as a band),
 * with and without the pile, the freezing point marked (site-profile.ts).
 */
import { displayConversion, type UnitSystem } from '../../units/display-units';
import type { ProfilePoint } from '../../../../layers/site/site-profile';
import { ChartFrame, type LegendEntry } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { niceDomain } from './chart-scale';

export interface ProfileSeries {
  year: number;
  noPile: ProfilePoint[];
  withPile: ProfilePoint[] | null;
}

const DASHES = ['', '6 3', '2 3'];

/** A profile point's temperature (°C, SI) at its depth, as chart coordinates. */
type ToChart = (temperature_C: number, z_m: number) => string;

/** The seasonal range as a closed band: down the minima, back up the maxima. */
function seasonalBandPath(pts: ProfilePoint[], at: ToChart): string {
  if (!pts.length) return '';
  const down = pts.map((p) => at(p.min_C, p.z_m)).join('L');
  const up = pts
    .slice()
    .reverse()
    .map((p) => at(p.max_C, p.z_m))
    .join('L');
  return `M${down}L${up}Z`;
}

function meanLinePath(pts: ProfilePoint[], at: ToChart): string {
  return pts.length ? `M${pts.map((p) => at(p.mean_C, p.z_m)).join('L')}` : '';
}

/** One entry per year and case (without / with the pile, dashed by year), then the freezing point. */
function profileLegend(series: ProfileSeries[]): LegendEntry[] {
  const legend: LegendEntry[] = [];
  series.forEach((s, i) => {
    legend.push({ label: `year ${s.year}, without pile`, colour: C.noPile, dash: DASHES[i % 3] });
    if (s.withPile)
      legend.push({ label: `year ${s.year}, with pile`, colour: C.withPile, dash: DASHES[i % 3] });
  });
  legend.push({ label: 'freezing point', colour: C.freezing, dash: '5 3' });
  return legend;
}

export function DepthProfileChart(props: {
  series: ProfileSeries[];
  r_m: number;
  freezingPoint_C: number;
  units: UnitSystem;
}) {
  const conv = displayConversion('°C', props.units);
  const len = displayConversion('m', props.units);
  const T = (v: number) => v * conv.factor + conv.offset;
  const Z = (v: number) => v * len.factor;
  const all = props.series.flatMap((s) => [...s.noPile, ...(s.withPile ?? [])]);
  // The seasonal band near the surface swings by tens of kelvin: scale to the means and to the band
  // below 1 m so the annual-mean curves stay readable (the band is clipped at the frame).
  const xDomain = niceDomain(
    all.flatMap((p) => (p.z_m >= 1 ? [T(p.min_C), T(p.max_C)] : [T(p.mean_C)])),
    6,
    [T(props.freezingPoint_C)],
  );
  const zMax = Math.max(...all.map((p) => Z(p.z_m)), 1);
  const yDomain: [number, number] = [0, zMax];
  const fp = T(props.freezingPoint_C);
  const last = props.series[props.series.length - 1];
  return (
    <ChartFrame
      testId="chart-profile"
      title={`Ground temperature against depth, ${(props.r_m * len.factor).toFixed(1)} ${len.unit} from the pile axis`}
      description="Annual mean temperature against depth for the chosen years; the shaded band is the last year's seasonal range."
      xDomain={xDomain}
      yDomain={yDomain}
      yDown
      xLabel={`temperature (${conv.unit}); line = annual mean, band = seasonal range of year ${last?.year ?? ''}`}
      yLabel={`depth (${len.unit})`}
      legend={profileLegend(props.series)}
      height={300}
    >
      {(x, y) => {
        const at: ToChart = (t, z) => `${x(T(t)).toFixed(1)},${y(Z(z)).toFixed(1)}`;
        return (
          <>
            {last ? <path d={seasonalBandPath(last.noPile, at)} fill={C.noPile} opacity="0.15" /> : null}
            {last?.withPile ? (
              <path d={seasonalBandPath(last.withPile, at)} fill={C.withPile} opacity="0.15" />
            ) : null}
            <line
              x1={x(fp)}
              x2={x(fp)}
              y1={y(0)}
              y2={y(zMax)}
              stroke={C.freezing}
              strokeDasharray="5 3"
              strokeWidth="1.5"
            />
            {props.series.map((s, i) => (
              <g key={s.year}>
                <path
                  d={meanLinePath(s.noPile, at)}
                  fill="none"
                  stroke={C.noPile}
                  strokeWidth="1.8"
                  strokeDasharray={DASHES[i % 3]}
                />
                {s.withPile ? (
                  <path
                    d={meanLinePath(s.withPile, at)}
                    fill="none"
                    stroke={C.withPile}
                    strokeWidth="1.8"
                    strokeDasharray={DASHES[i % 3]}
                  />
                ) : null}
              </g>
            ))}
          </>
        );
      }}
    </ChartFrame>
  );
}
