/**
 * A small printable map of the shortlisted sites: the land polygons and numbered pins in an SVG,
 * projected equirectangularly with x scaled by cos(mid-latitude) (fine at a region's scale).
 */
import type { FeatureCollection, Position } from 'geojson';

export function SiteMap(props: {
  bounds: readonly number[];
  land: FeatureCollection | null;
  sites: readonly { lon: number; lat: number; name: string }[];
}) {
  const [w, s, e, n] = props.bounds;
  const k = Math.cos((((s + n) / 2) * Math.PI) / 180);
  const width = 640;
  const height = Math.max(120, Math.round((width * (n - s)) / ((e - w) * k)));
  const x = (lon: number) => ((lon - w) / (e - w)) * width;
  const y = (lat: number) => ((n - lat) / (n - s)) * height;
  const ring = (r: Position[]) =>
    r.map(([lon, lat], i) => `${i ? 'L' : 'M'}${x(lon).toFixed(1)},${y(lat).toFixed(1)}`).join('') + 'Z';
  const paths: string[] = [];
  for (const f of props.land?.features ?? []) {
    const g = f.geometry;
    if (g?.type === 'Polygon') paths.push(g.coordinates.map(ring).join(''));
    else if (g?.type === 'MultiPolygon') for (const p of g.coordinates) paths.push(p.map(ring).join(''));
  }
  return (
    <svg
      className="report-map"
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label={`Map of the ${props.sites.length} shortlisted sites`}
      data-testid="report-map"
    >
      <rect width={width} height={height} fill="#dfe9f0" />
      {paths.map((d, i) => (
        <path key={i} d={d} fill="#f3f0e6" stroke="#8a8a80" strokeWidth={0.6} />
      ))}
      {props.sites.map((site, i) => (
        <g key={i} transform={`translate(${x(site.lon).toFixed(1)},${y(site.lat).toFixed(1)})`}>
          <circle r={9} fill="#b3261e" stroke="#fff" strokeWidth={1.5} />
          <text textAnchor="middle" dy="3.5" fontSize="10" fill="#fff" fontWeight="bold">
            {i + 1}
          </text>
        </g>
      ))}
    </svg>
  );
}
