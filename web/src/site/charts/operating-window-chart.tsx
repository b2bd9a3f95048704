/**
 * The operating window on a line of annual-mean extraction per metre of pile: below the lower bound
 * too little heat is taken to keep the foundation ground frozen through the design life; above the
 * upper bound the fluid reaches the heat pump's limit or the soil is over-cooled (quick estimate,
 * layers/screening/operating-window.ts). The simulated run's mean extraction is marked on it.
 */
import { displayConversion, type UnitSystem } from '../../units/display-units';
import { CHART_COLOURS as C } from './chart-colours';
import { linearScale, niceTicks } from './chart-scale';

export interface WindowBounds {
  lower_W_m: number;
  upperFluid_W_m: number;
  upperOvercool_W_m: number;
}

export function OperatingWindowChart(props: {
  window: WindowBounds;
  simulated_W_m: number | null;
  full_W_m?: number | null;
  units: UnitSystem;
}) {
  const conv = displayConversion('W/m', props.units);
  const V = (v: number) => v * conv.factor;
  const w = props.window;
  const upper = Math.max(0, Math.min(w.upperFluid_W_m, w.upperOvercool_W_m));
  const lower = Math.max(0, w.lower_W_m);
  const sim = props.simulated_W_m;
  const hi = Math.max(upper, lower, sim ?? 0, props.full_W_m ?? 0) * 1.35 || 10;
  const width = 520;
  const height = 150;
  const x = linearScale([0, V(hi)], [20, width - 20]);
  const ticks = niceTicks(0, V(hi), 6);
  const fluidBinds = w.upperFluid_W_m <= w.upperOvercool_W_m;
  const bandY = 38;
  const bandH = 34;
  return (
    <figure className="site-chart" data-testid="chart-window">
      <figcaption id="window-title">Operating window: heat taken per metre of pile (annual mean)</figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby="window-title">
        <desc>
          Too little below {V(lower).toFixed(1)} {conv.unit} (the ground at the foundation thaws within the
          design life); too much above {V(upper).toFixed(1)} {conv.unit} (
          {fluidBinds ? 'fluid limit' : 'over-cooling of the soil'}).
        </desc>
        <rect
          x={x(0)}
          y={bandY}
          width={Math.max(0, x(V(lower)) - x(0))}
          height={bandH}
          fill={C.windowTooLittle}
        />
        {upper > lower ? (
          <rect
            x={x(V(lower))}
            y={bandY}
            width={x(V(upper)) - x(V(lower))}
            height={bandH}
            fill={C.windowOk}
          />
        ) : null}
        <rect
          x={x(V(Math.max(upper, lower)))}
          y={bandY}
          width={Math.max(0, x(V(hi)) - x(V(Math.max(upper, lower))))}
          height={bandH}
          fill={C.windowTooMuch}
        />
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
          too much: {fluidBinds ? 'fluid limit' : 'soil over-cooled'}
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
        {props.full_W_m ? (
          <g>
            <line
              x1={x(V(props.full_W_m))}
              x2={x(V(props.full_W_m))}
              y1={bandY - 2}
              y2={bandY + bandH + 2}
              stroke={C.quick}
              strokeWidth="1.5"
              strokeDasharray="3 2"
            />
            <text
              x={x(V(props.full_W_m))}
              y={bandY + bandH + 30}
              textAnchor="middle"
              className="marker-label"
            >
              full load {V(props.full_W_m).toFixed(1)}
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
