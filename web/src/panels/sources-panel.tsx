/** Where the numbers come from: tool version, build time, scenario, input grids with licences. */
import type { Manifest } from '../../../layers/screening/manifest';

function flat(obj: Record<string, unknown>, prefix = ''): [string, string][] {
  const out: [string, string][] = [];
  for (const [k, v] of Object.entries(obj)) {
    const key = prefix ? `${prefix}.${k}` : k;
    if (v && typeof v === 'object' && !Array.isArray(v)) out.push(...flat(v as Record<string, unknown>, key));
    else out.push([key, Array.isArray(v) ? JSON.stringify(v) : String(v)]);
  }
  return out;
}

export function SourcesPanel(props: { manifest: Manifest }) {
  const m = props.manifest;
  return (
    <details className="panel sources" data-testid="sources-panel">
      <summary>
        <h2>Data sources and scenario</h2>
      </summary>
      <p className="small">
        Built with {m.tool.name} {m.tool.version} on {m.createdAt}. Region: {m.region.name}. Analysis grid{' '}
        {m.analysisGrid.width} × {m.analysisGrid.height} cells of {m.analysisGrid.cellSize_m} m in{' '}
        {m.analysisGrid.crs}.
      </p>
      <h3>Input grids</h3>
      {m.sources.length === 0 ? <p className="muted small">No input grids listed.</p> : null}
      <ul className="small">
        {m.sources.map((s) => (
          <li key={s.file}>
            <strong>{s.role}</strong>: {s.file} ({s.width} × {s.height}, {s.crs}, {s.unit || 'no unit'}) —{' '}
            {s.provenance}. Licence: {s.licence}.{' '}
            <span className="muted">sha256 {s.sha256.slice(0, 16)}…</span>
          </li>
        ))}
      </ul>
      {m.scenario ? (
        <>
          <h3>Scenario</h3>
          <table className="kv small">
            <tbody>
              {flat(m.scenario).map(([k, v]) => (
                <tr key={k}>
                  <th scope="row">{k}</th>
                  <td>{v}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      ) : null}
      <h3>Layers and methods</h3>
      <ul className="small">
        {m.bands.map((b) => (
          <li key={b.id}>
            <strong>{b.title}</strong> ({b.unit || 'no unit'}): {b.source}
          </li>
        ))}
      </ul>
    </details>
  );
}
