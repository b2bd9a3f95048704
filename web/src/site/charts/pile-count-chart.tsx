/**
 * Piles needed for the peak load by design pulse (site-sizing.ts, three-pulse method of
 * layers/site/pile-sizing.ts): the count for the annual load alone, with the design month added, and
 * with the peak hours added (the full design). The step that adds the most piles drives the design; a
 * step can also remove piles when its pulse is weaker than the previous one.
 */
import type { PileFieldSizingResult } from '../../../../layers/site/pile-sizing';
import type { PulseCounts } from '../../../../layers/site/site-sizing';
import { ChartFrame } from './chart-frame';
import { CHART_COLOURS as C } from './chart-colours';
import { niceDomain } from './chart-scale';
import { displayConversion, proseUnit, type UnitSystem } from '../../units/display-units';

const BARS: { id: keyof PulseCounts; label: string }[] = [
  { id: 'annual', label: 'annual load alone' },
  { id: 'monthly', label: '+ design month' },
  { id: 'peak', label: '+ peak hours (full)' },
];

export function PileCountChart(props: {
  sizing: PileFieldSizingResult;
  byPulse: PulseCounts;
  units: UnitSystem;
}) {
  const { sizing: s, byPulse } = props;
  // A fluid drop is a temperature difference: K in SI, °F in North American units (display-units.ts).
  const k = displayConversion('K', props.units);
  const drop = (v: number) => `${(v * k.factor).toFixed(1)} ${proseUnit(k.unit)}`;
  const vals = BARS.map((b) => byPulse[b.id]);
  const yDomain = niceDomain(
    vals.filter((v): v is number => v !== null),
    4,
    [0],
  );
  const drops = `fluid drop by pulse at ${s.pileCount} piles: annual ${drop(s.pulseDrop_K.annual)}, month ${drop(s.pulseDrop_K.monthly)}, peak ${drop(s.pulseDrop_K.peak)}`;
  return (
    <>
      <ChartFrame
        testId="chart-pulses"
        title={`Piles needed by design pulse: ${s.pileCount} in all (${s.controllingPulse} pulse controls)`}
        description={`Pile count for the annual load alone, with the design month, and with the peak hours; ${drops}.`}
        xDomain={[0, 3]}
        yDomain={yDomain}
        xTicks={[0.5, 1.5, 2.5]}
        xTickLabel={(v) => BARS[Math.floor(v)]?.label ?? ''}
        xLabel="design pulses included"
        yLabel="piles needed"
        legend={[
          { label: 'full design', colour: C.withPile, kind: 'box' },
          { label: 'with fewer pulses', colour: C.bar, kind: 'box' },
        ]}
        height={220}
      >
        {(x, y) =>
          BARS.map((b, i) => {
            const v = vals[i];
            if (v === null) return null;
            const w = (x(1) - x(0)) * 0.5;
            return (
              <g key={b.id}>
                <rect
                  x={x(i + 0.5) - w / 2}
                  y={y(v)}
                  width={w}
                  height={y(0) - y(v)}
                  fill={b.id === 'peak' ? C.withPile : C.bar}
                />
                <text x={x(i + 0.5)} y={y(v) - 4} textAnchor="middle" className="marker-label">
                  {v}
                </text>
              </g>
            );
          })
        }
      </ChartFrame>
      <p className="hint">
        Each count is its own sizing. A count can fall when a pulse is weaker than the one before it (the peak
        hours&apos; ground load, taken at the heat pump&apos;s lowest COP, can lie below the design
        month&apos;s mean), and the near-square layout shifts counts by a few piles.{' '}
        {drops[0].toUpperCase() + drops.slice(1)}.
      </p>
    </>
  );
}
