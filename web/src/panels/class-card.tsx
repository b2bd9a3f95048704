/**
 * Why a cell has its class: each criterion of the manifest, the hard foundation checks first (value,
 * limit, verdict), then the weighted soft criteria, then the class bands (robustness among them). Without criteria in the manifest
 * the card lists the class bands of the cell with their plain explanations.
 */
import type { Criterion, Manifest } from '../../../layers/screening/manifest';
import { horizonText } from '../../../layers/screening/climate-horizon';
import { displayConversion, displayTitle, formatNumber, type UnitSystem } from '../units/display-units';

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

export function ClassCard(props: {
  manifest: Manifest;
  values: Record<string, number | null>;
  units: UnitSystem;
}) {
  const { manifest, values, units } = props;
  const criteria = manifest.criteria ?? [];
  const classBands = manifest.bands.filter((b) => b.kind === 'class');
  const show = (v: number, unit: string) => {
    const c = displayConversion(unit, units);
    return `${formatNumber(v * c.factor + c.offset)}${c.unit ? ` ${c.unit}` : ''}`;
  };
  // Thaw-based criteria past the climate horizon read "≥ value" / "after <year>" (climate-horizon.ts).
  const valueText = (c: Criterion, v: number | null): string => {
    const band = manifest.bands.find((b) => b.id === c.bandId);
    const flag = band?.horizon ? values[band.horizon.flagBand] : undefined;
    const h = horizonText(band?.horizon, flag, v === null ? '' : show(v, c.unit));
    if (h !== null) return h;
    return v === null ? 'no data' : show(v, c.unit);
  };
  return (
    <details className="class-card" open data-testid="class-card">
      <summary>Why this class</summary>
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
            {criteria.map((c) => {
              const raw = values[c.bandId];
              const v = raw === undefined ? null : raw;
              // The thaw-unstable check has no value where the ground is not ice-rich: it passes.
              const notIceRich = c.id === 'thawUnstable' && (v === null || !Number.isFinite(v));
              const verdict = notIceRich ? true : criterionVerdict(c, v);
              const score = c.kind === 'soft' ? criterionScore(c, v) : null;
              return (
                <tr key={c.id} title={c.description}>
                  <th scope="row">
                    {displayTitle(c.title, c.unit, units)}
                    <div className="muted">
                      {c.kind === 'exclusion'
                        ? 'foundation check: must pass'
                        : `weight ${formatNumber(c.weight, 2)}`}
                    </div>
                  </th>
                  <td>{notIceRich ? 'not ice-rich' : valueText(c, v)}</td>
                  <td>
                    {c.comparison} {show(c.threshold, c.unit)}
                  </td>
                  <td className={verdict === null ? 'muted' : verdict ? 'pass' : 'fail'}>
                    {verdict === null
                      ? 'unknown'
                      : verdict
                        ? 'pass'
                        : c.kind === 'exclusion'
                          ? 'excludes'
                          : 'short'}
                    {score !== null ? <div className="muted">score {formatNumber(score, 2)}</div> : null}
                  </td>
                </tr>
              );
            })}
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
