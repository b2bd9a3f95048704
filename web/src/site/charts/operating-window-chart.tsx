/**
 * The operating window on a line of annual-mean extraction per metre of pile: below the lower bound
 * too little heat is taken to keep the foundation ground frozen through the design life; above the
 * upper bound the fluid reaches the heat pump's limit or the soil is over-cooled (quick estimate,
 * layers/screening/operating-window.ts). The simulated run's mean extraction is marked on it.
 */
import { displayConversion, type UnitSystem } from '../../units/display-units';
import type { StudyWindow, WindowZone } from '../../../../layers/screening/study-window';
import { CHART_COLOURS as C } from './chart-colours';
import { linearScale, niceTicks } from './chart-scale';

const FILL: Record<WindowZone, string> = {
  'too little': C.windowTooLittle,
  window: C.windowOk,
  'too much': C.windowTooMuch,
};

/**
 * The chart's zones and marker, in W/m, straight from the study's window (study-window.ts): the zone the
 * marker is drawn in is `window.zone`, the same one the window note names.
 */
export function windowChartData(w: StudyWindow) {
  const hi = w.zones[w.zones.length - 1].to_W_m;
  const v = w.simulated_W_m;
  // The drawn bands as half-open intervals: [0, lower), [lower, upper], (upper, ∞).
  const inZone = (z: StudyWindow['zones'][number], x: number) =>
    z.zone === 'too little'
      ? x < z.to_W_m
      : z.zone === 'window'
        ? x >= z.from_W_m && x <= z.to_W_m
        : x > z.from_W_m;
  const markerZone = v === null ? null : (w.zones.find((z) => inZone(z, v))?.zone ?? null);
  return { zones: w.zones, hi, marker: w.simulated_W_m, markerZone, full: w.full_W_m };
}

export function OperatingWindowChart(props: { window: StudyWindow; units: UnitSystem }) {
  const conv = displayConversion('W/m', props.units);
  const V = (v: number) => v * conv.factor;
  const w = props.window;
  const data = windowChartData(w);
  const upper = w.upper_W_m;
  const lower = w.lower_W_m;
  const sim = data.marker;
  const hi = data.hi;
  const width = 520;
  const height = 150;
  const x = linearScale([0, V(hi)], [20, width - 20]);
  const ticks = niceTicks(0, V(hi), 6);
  const bandY = 38;
  const bandH = 34;
  return (
    <figure className="site-chart" data-testid="chart-window" data-marker-zone={data.markerZone ?? ''}>
      <figcaption id="window-title">Operating window: heat taken per metre of pile (annual mean)</figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby="window-title">
        <desc>
          Too little below {V(lower).toFixed(1)} {conv.unit} (the ground at the foundation thaws within the
          design life); too much above {V(upper).toFixed(1)} {conv.unit} ({w.upperLimit}).
        </desc>
        {data.zones.map((z) => (
          <rect
            key={z.zone}
            x={x(V(z.from_W_m))}
            y={bandY}
            width={Math.max(0, x(V(z.to_W_m)) - x(V(z.from_W_m)))}
            height={bandH}
            fill={FILL[z.zone]}
          />
        ))}
        <text x={x(V(lower / 2))} y={bandY - 6} textAnchor="middle" className="band-label">
          {lower > 0 ? 'too little: ground thaws' : ''}
        </text>
        {upper > lower ? (
          <text
            x={x(V((lower + upper) / 2))}
            y={bandY + bandH / 2 + 4}
            textAnchor="middle"
            className="band-label"
          >
            window
          </text>
        ) : (
          <text x={x(V(lower))} y={bandY + bandH / 2 + 4} textAnchor="middle" className="band-label">
            no window
          </text>
        )}
        <text
          x={x(V((Math.max(upper, lower) + hi) / 2))}
          y={bandY - 6}
          textAnchor="middle"
          className="band-label"
        >
          too much: {w.upperLimit}
        </text>
        {sim !== null && Number.isFinite(sim) ? (
          <g data-testid="window-simulated">
            <line
              x1={x(V(sim))}
              x2={x(V(sim))}
              y1={bandY - 2}
              y2={bandY + bandH + 2}
              stroke={C.withPile}
              strokeWidth="3"
            />
            <text x={x(V(sim))} y={bandY + bandH + 16} textAnchor="middle" className="marker-label">
              this run {V(sim).toFixed(1)}
            </text>
          </g>
        ) : null}
        {data.full ? (
          <g>
            <line
              x1={x(V(data.full))}
              x2={x(V(data.full))}
              y1={bandY - 2}
              y2={bandY + bandH + 2}
              stroke={C.quick}
              strokeWidth="1.5"
              strokeDasharray="3 2"
            />
            <text x={x(V(data.full))} y={bandY + bandH + 30} textAnchor="middle" className="marker-label">
              full load {V(data.full).toFixed(1)}
            </text>
          </g>
        ) : null}
        <g className="axis">
          <line x1={x(0)} x2={x(V(hi))} y1={height - 32} y2={height - 32} />
          {ticks.map((t) => (
            <text key={t} x={x(t)} y={height - 18} textAnchor="middle">
              {t}
            </text>
          ))}
          <text className="axis-label" x={width / 2} y={height - 3} textAnchor="middle">
            heat taken from the ground ({conv.unit} of active pile, annual mean)
          </text>
        </g>
      </svg>
    </figure>
  );
}
