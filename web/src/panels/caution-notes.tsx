/** The cautions shown wherever results are (layers/cautions.ts; design.md section 6). */
import { FICTIONAL_DATA_NOTICE, GROUND_CAUTIONS, SCREENING_CAUTION } from '../../../layers/cautions';

/** The build's notice without the standard sentences the app already shows on its own. */
export function extraNotice(notice: string): string {
  let rest = notice;
  for (const sentence of [SCREENING_CAUTION, ...GROUND_CAUTIONS, FICTIONAL_DATA_NOTICE])
    rest = rest.split(sentence).join(' ');
  return rest.replace(/\s+/g, ' ').trim();
}

export function FictionalNotice(props: { fictional: boolean; notice: string }) {
  const extra = extraNotice(props.notice);
  if (!props.fictional && !extra) return null;
  return (
    <div className="notice fictional" role="note" data-testid="fictional-notice">
      {props.fictional ? <strong>{FICTIONAL_DATA_NOTICE} </strong> : null}
      {extra}
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
