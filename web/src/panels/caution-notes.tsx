/** The cautions shown wherever results are (layers/cautions.ts; design.md section 6). */
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../../layers/cautions';

export function FictionalNotice(props: { fictional: boolean; notice: string }) {
  if (!props.fictional && !props.notice) return null;
  return (
    <div className="notice fictional" role="note" data-testid="fictional-notice">
      {props.fictional ? <strong>{FICTIONAL_DATA_NOTICE} </strong> : null}
      {props.notice}
    </div>
  );
}

export function ScreeningCaution(props: { full?: boolean }) {
  return (
    <div className="notice caution" role="note" data-testid="screening-caution">
      <strong>{SCREENING_CAUTION}</strong>
      {props.full ? (
        <ul>
          {GROUND_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
