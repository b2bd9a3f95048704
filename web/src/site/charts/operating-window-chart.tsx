/**
 * The operating window on a line of annual-mean extraction per metre of pile: below the lower bound
 * too little heat is taken to keep the foundation ground frozen through the design life; above the
 * upper bound the fluid reaches the heat pump's limit or the soil is over-cooled (quick estimate,
 * layers/screening/operating-window.ts). The simulated run's mean extraction is marked on it.
 */
import type { ReactNode } from 'react';
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

const WIDTH = 520;
const HEIGHT = 150;
/** Top and height of the band of zones. */
const BAND_Y = 38;
const BAND_H = 34;

export function OperatingWindowChart(props: { window: StudyWindow; units: UnitSystem }) {
  const conv = displayConversion('W/m', props.units);
  const V = (v: number) => v * conv.factor;
  const w = props.window;
  const data = windowChartData(w);
  const upper = w.upper_W_m;
  const lower = w.lower_W_m;
  const sim = data.marker;
  const hi = data.hi;
  const x = linearScale([0, V(hi)], [20, WIDTH - 20]);
  const ticks = niceTicks(0, V(hi), 6);
  return (
    <figure className="site-chart" data-testid="chart-window" data-marker-zone={data.markerZone ?? ''}>
      <figcaption id="window-title">Operating window: heat taken per metre of pile (annual mean)</figcaption>
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-labelledby="window-title">
        <desc>
          Too little below {V(lower).toFixed(1)} {conv.unit} (the ground at the foundation thaws within the
          design life); too much above {V(upper).toFixed(1)} {conv.unit} ({w.upperLimit}).
        </desc>
        {data.zones.map((z) => (
          <rect
            key={z.zone}
            x={x(V(z.from_W_m))}
            y={BAND_Y}
            width={Math.max(0, x(V(z.to_W_m)) - x(V(z.from_W_m)))}
            height={BAND_H}
            fill={FILL[z.zone]}
          />
        ))}
        <ZoneLabels at={(v) => x(V(v))} lower={lower} upper={upper} hi={hi} upperLimit={w.upperLimit} />
        {sim !== null && Number.isFinite(sim) ? (
          <g data-testid="window-simulated">
            <ExtractionMarker
              at={x(V(sim))}
              colour={C.withPile}
              strokeWidth="3"
              labelY={BAND_Y + BAND_H + 16}
            >
              this run {V(sim).toFixed(1)}
            </ExtractionMarker>
          </g>
        ) : null}
        {data.full ? (
          <g>
            <ExtractionMarker
              at={x(V(data.full))}
              colour={C.quick}
              strokeWidth="1.5"
              dash="3 2"
              labelY={BAND_Y + BAND_H + 30}
            >
              full load {V(data.full).toFixed(1)}
            </ExtractionMarker>
          </g>
        ) : null}
        <g className="axis">
          <line x1={x(0)} x2={x(V(hi))} y1={HEIGHT - 32} y2={HEIGHT - 32} />
          {ticks.map((t) => (
            <text key={t} x={x(t)} y={HEIGHT - 18} textAnchor="middle">
              {t}
            </text>
          ))}
          <text className="axis-label" x={WIDTH / 2} y={HEIGHT - 3} textAnchor="middle">
            heat taken from the ground ({conv.unit} of active pile, annual mean)
          </text>
        </g>
      </svg>
    </figure>
  );
}

/** The zones' names over (or in) the band; `at` maps W/m (SI) to the chart's x. */
function ZoneLabels(props: {
  at: (v_W_m: number) => number;
  lower: number;
  upper: number;
  hi: number;
  upperLimit: string;
}) {
  const { at, lower, upper, hi } = props;
  return (
    <>
      <text x={at(lower / 2)} y={BAND_Y - 6} textAnchor="middle" className="band-label">
        {lower > 0 ? 'too little: ground thaws' : ''}
      </text>
      {upper > lower ? (
        <text
          x={at((lower + upper) / 2)}
          y={BAND_Y + BAND_H / 2 + 4}
          textAnchor="middle"
          className="band-label"
        >
          window
        </text>
      ) : (
        <text x={at(lower)} y={BAND_Y + BAND_H / 2 + 4} textAnchor="middle" className="band-label">
          no window
        </text>
      )}
      <text
        x={at((Math.max(upper, lower) + hi) / 2)}
        y={BAND_Y - 6}
        textAnchor="middle"
        className="band-label"
      >
        too much: {props.upperLimit}
      </text>
    </>
  );
}

/** A vertical mark across the band at one extraction, labelled below it. */
function ExtractionMarker(props: {
  at: number;
  colour: string;
  strokeWidth: string;
  dash?: string;
  labelY: number;
  children: ReactNode;
}) {
  return (
    <>
      <line
        x1={props.at}
        x2={props.at}
        y1={BAND_Y - 2}
        y2={BAND_Y + BAND_H + 2}
        stroke={props.colour}
        strokeWidth={props.strokeWidth}
        strokeDasharray={props.dash}
      />
      <text x={props.at} y={props.labelY} textAnchor="middle" className="marker-label">
        {props.children}
      </text>
    </>
  );
}
