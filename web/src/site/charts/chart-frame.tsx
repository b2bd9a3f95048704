/**
 * The frame every site chart draws in: an SVG with a title, axes with ticks and unit labels, grid lines
 * and a legend. Children receive the scales. Sized by a viewBox so it scales with its container and
 * prints crisply.
 */
import { useId, type ReactNode } from 'react';
import { linearScale, niceTicks, type LinearScale } from './chart-scale';

export interface LegendEntry {
  label: string;
  colour: string;
  dash?: string;
  kind?: 'line' | 'box';
}

export interface ChartFrameProps {
  title: string;
  /** Short plain description for screen readers. */
  description: string;
  xDomain: [number, number];
  yDomain: [number, number];
  xLabel: string;
  yLabel: string;
  /** y grows downward (depth axes). */
  yDown?: boolean;
  xTicks?: number[];
  xTickLabel?: (v: number) => string;
  yTickLabel?: (v: number) => string;
  legend: LegendEntry[];
  width?: number;
  height?: number;
  testId?: string;
  children: (x: LinearScale, y: LinearScale) => ReactNode;
}

export const CHART_MARGIN = { left: 56, right: 14, top: 12, bottom: 40 };

const fmt = (v: number) =>
  Math.abs(v) >= 1000 ? v.toLocaleString('en-US') : String(Number(v.toPrecision(4)));

export function ChartFrame(props: ChartFrameProps) {
  const width = props.width ?? 520;
  const height = props.height ?? 260;
  const m = CHART_MARGIN;
  const x = linearScale(props.xDomain, [m.left, width - m.right]);
  const y = linearScale(props.yDomain, props.yDown ? [m.top, height - m.bottom] : [height - m.bottom, m.top]);
  const xt = props.xTicks ?? niceTicks(props.xDomain[0], props.xDomain[1], 6);
  const yt = niceTicks(props.yDomain[0], props.yDomain[1], 5);
  const titleId = `${props.testId ?? props.title}-title`.replace(/\W+/g, '-');
  const clipId = `clip${useId().replace(/\W+/g, '')}`;
  const plot: PlotArea = { width, height, x, y, xt, yt };
  return (
    <figure className="site-chart" data-testid={props.testId}>
      <figcaption id={titleId}>{props.title}</figcaption>
      <svg
        viewBox={`0 0 ${width} ${height}`}
        role="img"
        aria-labelledby={titleId}
        aria-describedby={`${titleId}-d`}
      >
        <desc id={`${titleId}-d`}>{props.description}</desc>
        <g className="grid">
          {yt.map((v) => (
            <line key={`gy${v}`} x1={m.left} x2={width - m.right} y1={y(v)} y2={y(v)} />
          ))}
          {xt.map((v) => (
            <line key={`gx${v}`} x1={x(v)} x2={x(v)} y1={m.top} y2={height - m.bottom} />
          ))}
        </g>
        <clipPath id={clipId}>
          <rect
            x={m.left}
            y={m.top - 2}
            width={width - m.left - m.right}
            height={height - m.top - m.bottom + 4}
          />
        </clipPath>
        <g className="plot" clipPath={`url(#${clipId})`}>
          {props.children(x, y)}
        </g>
        <ChartAxes
          plot={plot}
          xLabel={props.xLabel}
          yLabel={props.yLabel}
          xTickLabel={props.xTickLabel ?? fmt}
          yTickLabel={props.yTickLabel ?? fmt}
        />
      </svg>
      <ChartLegend entries={props.legend} />
    </figure>
  );
}

/** The frame's size, scales and ticks, as the axes draw them. */
interface PlotArea {
  width: number;
  height: number;
  x: LinearScale;
  y: LinearScale;
  xt: number[];
  yt: number[];
}

function ChartAxes(props: {
  plot: PlotArea;
  xLabel: string;
  yLabel: string;
  xTickLabel: (v: number) => string;
  yTickLabel: (v: number) => string;
}) {
  const { width, height, x, y, xt, yt } = props.plot;
  const m = CHART_MARGIN;
  return (
    <g className="axis">
      <line x1={m.left} x2={m.left} y1={m.top} y2={height - m.bottom} />
      <line x1={m.left} x2={width - m.right} y1={height - m.bottom} y2={height - m.bottom} />
      {yt.map((v) => (
        <text key={`ty${v}`} x={m.left - 5} y={y(v) + 4} textAnchor="end">
          {props.yTickLabel(v)}
        </text>
      ))}
      {xt.map((v) => (
        <text key={`tx${v}`} x={x(v)} y={height - m.bottom + 15} textAnchor="middle">
          {props.xTickLabel(v)}
        </text>
      ))}
      <text className="axis-label" x={(m.left + width - m.right) / 2} y={height - 6} textAnchor="middle">
        {props.xLabel}
      </text>
      <text
        className="axis-label"
        transform={`translate(13 ${(m.top + height - m.bottom) / 2}) rotate(-90)`}
        textAnchor="middle"
      >
        {props.yLabel}
      </text>
    </g>
  );
}

function ChartLegend({ entries }: { entries: LegendEntry[] }) {
  return (
    <ul className="chart-legend">
      {entries.map((e) => (
        <li key={e.label}>
          <svg width="22" height="10" aria-hidden="true">
            {e.kind === 'box' ? (
              <rect x="2" y="1" width="18" height="8" fill={e.colour} />
            ) : (
              <line
                x1="1"
                x2="21"
                y1="5"
                y2="5"
                stroke={e.colour}
                strokeWidth="2.5"
                strokeDasharray={e.dash}
              />
            )}
          </svg>
          {e.label}
        </li>
      ))}
    </ul>
  );
}

/** A dashed horizontal reference line across the plot (a freezing point, a fluid limit); none when y is not finite. */
export function ReferenceLine(props: {
  x: LinearScale;
  y: LinearScale;
  xDomain: [number, number];
  value: number;
  colour: string;
  dash: string;
  className?: string;
}) {
  if (!Number.isFinite(props.value)) return null;
  return (
    <line
      className={props.className}
      x1={props.x(props.xDomain[0])}
      x2={props.x(props.xDomain[1])}
      y1={props.y(props.value)}
      y2={props.y(props.value)}
      stroke={props.colour}
      strokeDasharray={props.dash}
      strokeWidth="1.5"
    />
  );
}
