/**
 * The swipe view's divider (issue 17 item 3): one map, the scenario shown left of a vertical divider
 * and the second scenario right of it. The divider is dragged with the pointer or moved with the
 * keyboard (arrow keys 5 % of the width, with Shift 1 %; Home and End the edges), is a focusable
 * `separator` with its position as its value, and names the scenario on each side. The position moves
 * live while dragging and is handed on (`onCommit`, for the link) when the drag ends or a key moves it.
 */
import { useEffect, useRef, useState, type KeyboardEvent, type PointerEvent } from 'react';

const STEP_PCT = 5;
const FINE_STEP_PCT = 1;

/** The divider's place after a key press, or null for a key it does not use. */
export function dividerAfterKey(pct: number, key: string, shift: boolean): number | null {
  const step = shift ? FINE_STEP_PCT : STEP_PCT;
  if (key === 'ArrowLeft' || key === 'ArrowDown') return Math.max(0, pct - step);
  if (key === 'ArrowRight' || key === 'ArrowUp') return Math.min(100, pct + step);
  if (key === 'Home') return 0;
  if (key === 'End') return 100;
  return null;
}

export function SwipeDivider(props: {
  pct: number;
  leftName: string;
  rightName: string;
  onMove: (pct: number) => void;
  onCommit: (pct: number) => void;
}) {
  const { pct, onMove, onCommit } = props;
  const dragging = useRef(false);
  const [active, setActive] = useState(false);
  const latest = useRef(pct);
  useEffect(() => {
    latest.current = pct;
  }, [pct]);
  const at = (ev: PointerEvent<HTMLDivElement>) => {
    const wrap = ev.currentTarget.parentElement?.getBoundingClientRect();
    if (!wrap || wrap.width <= 0) return latest.current;
    return Math.max(0, Math.min(100, ((ev.clientX - wrap.left) / wrap.width) * 100));
  };
  const onKeyDown = (ev: KeyboardEvent<HTMLDivElement>) => {
    const next = dividerAfterKey(pct, ev.key, ev.shiftKey);
    if (next === null) return;
    ev.preventDefault();
    onMove(next);
    onCommit(next);
  };
  const end = (ev: PointerEvent<HTMLDivElement>) => {
    if (!dragging.current) return;
    dragging.current = false;
    setActive(false);
    ev.currentTarget.releasePointerCapture(ev.pointerId);
    onCommit(latest.current);
  };
  return (
    <div
      className={active ? 'swipe-divider dragging' : 'swipe-divider'}
      style={{ left: `${pct}%` }}
      role="separator"
      aria-orientation="vertical"
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={Math.round(pct)}
      aria-valuetext={`${props.leftName} left of the divider, ${props.rightName} right of it (divider at ${Math.round(pct)} % of the width)`}
      aria-label="Swipe divider between the two scenarios"
      title="Drag, or use the arrow keys, to move the divider"
      tabIndex={0}
      data-testid="swipe-divider"
      onKeyDown={onKeyDown}
      onPointerDown={(ev) => {
        dragging.current = true;
        setActive(true);
        ev.currentTarget.setPointerCapture(ev.pointerId);
        ev.preventDefault();
      }}
      onPointerMove={(ev) => {
        if (!dragging.current) return;
        const next = at(ev);
        latest.current = next;
        onMove(next);
      }}
      onPointerUp={end}
      onPointerCancel={end}
    >
      <span className="swipe-handle" aria-hidden="true">
        ◀▶
      </span>
    </div>
  );
}
