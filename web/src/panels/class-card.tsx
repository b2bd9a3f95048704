/**
 * Why a cell has its class: each criterion of the manifest, the hard foundation checks first (value,
 * limit, verdict), then the weighted soft criteria, then the class bands (robustness among them). Without criteria in the manifest
 * the card lists the class bands of the cell with their plain explanations.
 */
import type { Criterion, Manifest } from '../../../layers/screening/manifest';
import { horizonText } from '../../../layers/screening/climate-horizon';
import { displayConversion, displayTitle, formatNumber, type UnitSystem } from '../units/display-units';
import { rangeText, SUCCESS_BAND, successText } from './ensemble-ranges';
import { RANGE_METRICS } from '../../../layers/screening/cell-ensemble-model';

/** Whether `value comparison threshold` holds (the criterion passes); null when the value is nodata. */
export function criterionVerdict(c: Criterion, value: number | null): boolean | null {
  if (value === null || !Number.isFinite(value)) return null;
  switch (c.comparison) {
    case '<':
      return value < c.threshold;
    case '<=':
      return value <= c.threshold;
    case '>':
      return value > c.threshold;
    case '>=':
      return value >= c.threshold;
    case '!=':
      return value !== c.threshold;
  }
}

/** Soft-criterion score, linear from 0 at `poor` to 1 at `good`, clamped; null when not defined. */
export function criterionScore(c: Criterion, value: number | null): number | null {
  if (value === null || c.good === undefined || c.poor === undefined || c.good === c.poor) return null;
  return Math.min(1, Math.max(0, (value - c.poor) / (c.good - c.poor)));
}

type CellValues = Record<string, number | null>;

/** A value in the display unit system, with its unit. */
function showValue(v: number, unit: string, units: UnitSystem): string {
  const c = displayConversion(unit, units);
  return `${formatNumber(v * c.factor + c.offset)}${c.unit ? ` ${c.unit}` : ''}`;
}

/** A criterion's value; thaw-based criteria past the climate horizon read "≥ value" / "after <year>" (climate-horizon.ts). */
function criterionValueText(
  manifest: Manifest,
  values: CellValues,
  c: Criterion,
  v: number | null,
  units: UnitSystem,
): string {
  const band = manifest.bands.find((b) => b.id === c.bandId);
  const flag = band?.horizon ? values[band.horizon.flagBand] : undefined;
  const h = horizonText(band?.horizon, flag, v === null ? '' : showValue(v, c.unit, units));
  if (h !== null) return h;
  return v === null ? 'no data' : showValue(v, c.unit, units);
}

export function ClassCard(props: { manifest: Manifest; values: CellValues; units: UnitSystem }) {
  const { manifest, values, units } = props;
  const criteria = manifest.criteria ?? [];
  const classBands = manifest.bands.filter((b) => b.kind === 'class');
  return (
    <details className="class-card" data-testid="class-card">
      <summary>Why this class</summary>
      {SUCCESS_BAND in values ? <EnsembleRanges manifest={manifest} values={values} units={units} /> : null}
      {criteria.length > 0 ? (
        <table className="criteria" data-testid="criteria">
          <thead>
            <tr>
              <th scope="col">Criterion</th>
              <th scope="col">Value</th>
              <th scope="col">Limit</th>
              <th scope="col">Verdict</th>
            </tr>
          </thead>
          <tbody>
            {criteria.map((c) => (
              <CriterionRow key={c.id} criterion={c} manifest={manifest} values={values} units={units} />
            ))}
          </tbody>
        </table>
      ) : null}
      {classBands.map((b) => {
        const v = values[b.id];
        const cls =
          v === null || v === undefined ? undefined : b.classes?.find((c) => c.value === Math.round(v));
        return (
          <p key={b.id} className="small">
            <strong>{b.title}:</strong> {cls ? cls.label : 'no data'}
            {cls?.description ? <span className="muted"> — {cls.description}</span> : null}
          </p>
        );
      })}
      {criteria.length > 0 ? (
        <p className="muted small">
          A failed “must pass” criterion excludes the place. The others add weight × score (0 at the poor end,
          1 at the good end) to the suitability score; “short” means the value misses the threshold.
        </p>
      ) : (
        <p className="muted small">
          This build lists no criteria; the class comes from the model named in the legend.
        </p>
      )}
    </details>
  );
}

/** Ensemble builds: the probability of success and the P10–P90 range of each ranged metric. */
function EnsembleRanges(props: { manifest: Manifest; values: CellValues; units: UnitSystem }) {
  const { manifest, values, units } = props;
  return (
    <div className="ensemble-ranges" data-testid="class-card-ranges">
      <p className="small">
        <strong>Probability of success:</strong> {successText(values[SUCCESS_BAND])}
      </p>
      <ul className="small">
        {RANGE_METRICS.map((id) => {
          const band = manifest.bands.find((b) => b.id === id);
          const r = band ? rangeText(manifest, (x) => values[x], id, units) : null;
          return band && r ? (
            <li key={id}>
              {displayTitle(band.title, band.unit, units)}: {r}
            </li>
          ) : null;
        })}
      </ul>
      <p className="muted small">
        P10–P90: in 8 of 10 ensemble members the value lies in this range (1 in 10 below, 1 in 10 above), over
        the declared uncertainty of the inputs.
      </p>
    </div>
  );
}

/** One criterion: its weight or "must pass", the cell's value, the limit and the verdict (with the score). */
function CriterionRow(props: {
  criterion: Criterion;
  manifest: Manifest;
  values: CellValues;
  units: UnitSystem;
}) {
  const { criterion: c, values, units } = props;
  const raw = values[c.bandId];
  const v = raw === undefined ? null : raw;
  // The thaw-unstable check has no value where the ground is not ice-rich: it passes.
  const notIceRich = c.id === 'thawUnstable' && (v === null || !Number.isFinite(v));
  const verdict = notIceRich ? true : criterionVerdict(c, v);
  const score = c.kind === 'soft' ? criterionScore(c, v) : null;
  return (
    <tr title={c.description}>
      <th scope="row">
        {displayTitle(c.title, c.unit, units)}
        <div className="muted">
          {c.kind === 'exclusion' ? 'foundation check: must pass' : `weight ${formatNumber(c.weight, 2)}`}
        </div>
      </th>
      <td>{notIceRich ? 'not ice-rich' : criterionValueText(props.manifest, values, c, v, units)}</td>
      <td>
        {c.comparison} {showValue(c.threshold, c.unit, units)}
      </td>
      <td className={verdict === null ? 'muted' : verdict ? 'pass' : 'fail'}>
        {verdict === null ? 'unknown' : verdict ? 'pass' : c.kind === 'exclusion' ? 'excludes' : 'short'}
        {score !== null ? <div className="muted">score {formatNumber(score, 2)}</div> : null}
      </td>
    </tr>
  );
}
