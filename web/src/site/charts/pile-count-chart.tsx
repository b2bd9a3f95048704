/**
 * Piles needed for the peak load by the three-pulse method (layers/site/pile-sizing.ts): how far each
 * design pulse (the design-life annual mean, the design month, the 6-hour peak) pulls the fluid below
 * the undisturbed ground at the chosen pile count; the largest one controls.
 */
import type { PileFieldSizingResult, Pulse } from '../../../../layers/site/pile-sizing';
import { displayConversion, type UnitSystem } from '../../units/display-units';
import { ChartFrame } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { niceDomain } from './chart-scale';

const PULSES: { id: Pulse; label: string }[] = [
  { id: 'annual', label: 'annual (design life)' },
  { id: 'monthly', label: 'design month' },
  { id: 'peak', label: 'peak hours' },
];

export function PileCountChart(props: { sizing: PileFieldSizingResult; units: UnitSystem }) {
  const s = props.sizing;
  const conv = displayConversion('K', props.units);
  const vals = PULSES.map((p) => s.pulseDrop_K[p.id] * conv.factor);
  const yDomain = niceDomain(vals, 4, [0]);
  return (
    <ChartFrame
      testId="chart-pulses"
      title={`Piles needed: ${s.pileCount} (controlled by the ${PULSES.find((p) => p.id === s.controllingPulse)?.label})`}
      description="Fluid temperature drop caused by each design pulse at the sized pile count; the largest controls the count."
      xDomain={[0, 3]}
      yDomain={yDomain}
      xTicks={[0.5, 1.5, 2.5]}
      xTickLabel={(v) => PULSES[Math.floor(v)]?.label ?? ''}
      xLabel="design pulse"
      yLabel={`fluid drop (${conv.unit.replace(' (difference)', '')})`}
      legend={[
        { label: 'controlling pulse', colour: C.withPile, kind: 'box' },
        { label: 'other pulses', colour: C.bar, kind: 'box' },
      ]}
      height={220}
    >
      {(x, y) =>
        PULSES.map((p, i) => {
          const w = (x(1) - x(0)) * 0.5;
          const v = vals[i];
          return (
            <g key={p.id}>
              <rect
                x={x(i + 0.5) - w / 2}
                y={y(Math.max(0, v))}
                width={w}
                height={Math.abs(y(0) - y(v))}
                fill={p.id === s.controllingPulse ? C.withPile : C.bar}
              />
              <text x={x(i + 0.5)} y={y(Math.max(0, v)) - 4} textAnchor="middle" className="marker-label">
                {v.toFixed(1)}
              </text>
            </g>
          );
        })
      }
    </ChartFrame>
  );
}
