/**
 * The shortlist report, to print or save as PDF: a cover page with the scenario, the cautions and a
 * map of the sites (an SVG of the land and numbered pins: no WebGL, so it prints anywhere), a
 * comparison table of the sites' headline figures, one sheet per site with every screening value and
 * any study results, and the data sources. Rendered into document.body over the dashboard; the print
 * style (report.css) prints it alone, one section per page.
 */
import { createPortal } from 'react-dom';
import type { FeatureCollection } from 'geojson';
import { GROUND_CAUTIONS, SCREENING_CAUTION } from '../../../layers/cautions';
import { HEADLINE_BAND_IDS } from '../../../layers/screening/band-registry';
import { BAND } from '../../../layers/screening/band-ids';
import type { Manifest } from '../../../layers/screening/manifest';
import type { ShortlistItem } from '../shortlist/shortlist-item';
import { bandValueText, horizonFlagOf } from '../panels/cell-panel';
import { displayTitle, formatLonLat, formatQuantity, type UnitSystem } from '../units/display-units';
import { SiteMap } from './site-map';
import './report.css';

type Band = Manifest['bands'][number];

/** A band's value at a site as the report prints it (units, horizon flag). */
function siteValue(item: ShortlistItem, b: Band, units: UnitSystem): string {
  return bandValueText(b, item.values[b.id] ?? null, units, horizonFlagOf(b, item.values));
}

export function ShortlistReport(props: {
  manifest: Manifest;
  items: readonly ShortlistItem[];
  land: FeatureCollection | null;
  units: UnitSystem;
  onClose: () => void;
}) {
  const { manifest, items, units } = props;
  const overlay = (
    <div
      className="report-overlay"
      role="dialog"
      aria-label="Shortlist report"
      data-testid="shortlist-report"
    >
      <div className="report-actions">
        <button type="button" className="primary" onClick={() => window.print()} data-testid="report-print">
          Print or save as PDF
        </button>
        <button type="button" onClick={props.onClose} data-testid="report-close">
          Close report
        </button>
      </div>
      <CoverPage manifest={manifest} items={items} land={props.land} units={units} />
      {items.map((item, i) => (
        <SiteSheet key={item.id} item={item} number={i + 1} bands={manifest.bands} units={units} />
      ))}
      <SourcesPage manifest={manifest} />
    </div>
  );
  return createPortal(overlay, document.body);
}

/** The cover: scenario, units, cautions, the map of the sites and the comparison table. */
function CoverPage(props: {
  manifest: Manifest;
  items: readonly ShortlistItem[];
  land: FeatureCollection | null;
  units: UnitSystem;
}) {
  const { manifest, items, units } = props;
  const scenario = (manifest.scenario as { name?: string; description?: string } | undefined) ?? {};
  const printed = new Date().toISOString().slice(0, 10);
  return (
    <section className="report-page" data-testid="report-page">
      <h1>Shortlist report · {manifest.region.name}</h1>
      <p className="small">
        {items.length} site(s) · scenario: {scenario.name ?? 'the build’s default scenario'} · units:{' '}
        {units === 'SI' ? 'SI' : 'North American'} · printed {printed}
      </p>
      <div className="report-caution" data-testid="report-cautions">
        <strong>{SCREENING_CAUTION}</strong>
        <ul>
          {GROUND_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
        {manifest.fictional ? <p>{manifest.notice}</p> : null}
      </div>
      <SiteMap bounds={manifest.region.bounds} land={props.land} sites={items} />
      <h2>Comparison</h2>
      <ComparisonTable bands={manifest.bands} items={items} units={units} />
    </section>
  );
}

/** The sites side by side: headline figures, and the study's where any site was studied. */
function ComparisonTable(props: { bands: Band[]; items: readonly ShortlistItem[]; units: UnitSystem }) {
  const { bands, items, units } = props;
  const headline = HEADLINE_BAND_IDS.flatMap((id) => bands.filter((b) => b.id === id));
  const studied = items.some((i) => i.metrics.studyThawDelay_yr !== undefined);
  const simulated = items.some((i) => i.metrics.studyEnsembleMembers !== undefined);
  const mapRange = bands.some((b) => b.id === BAND.thawDelayP10);
  return (
    <table className="report-table" data-testid="report-comparison">
      <thead>
        <tr>
          <th>#</th>
          <th>Site</th>
          <th>Position</th>
          {headline.map((b) => (
            <th key={b.id}>{displayTitle(b.title, b.unit, units)}</th>
          ))}
          {studied ? <th>Site study: thaw delay at the first probe</th> : null}
          {studied ? <th>Site study: lowest fluid temperature</th> : null}
          {mapRange ? <th>Map ensemble: thaw delay P10 / P50 / P90</th> : null}
          {simulated ? <th>Simulated ensemble: thaw delay at the first probe, P10 / P50 / P90</th> : null}
          {simulated ? <th>Simulated ensemble: lowest fluid temperature, P10 / P50 / P90</th> : null}
        </tr>
      </thead>
      <tbody>
        {items.map((item, i) => (
          <tr key={item.id}>
            <td>{i + 1}</td>
            <td>{item.name}</td>
            <td>{formatLonLat(item.lon, item.lat, 3)}</td>
            {headline.map((b) => (
              <td key={b.id}>{siteValue(item, b, units)}</td>
            ))}
            {studied ? <td>{studyDelay(item, units)}</td> : null}
            {studied ? <td>{studyNumber(item.metrics.studyLowestFluid_C, '°C', units)}</td> : null}
            {mapRange ? <td>{mapThawRange(item, units)}</td> : null}
            {simulated ? <td>{simulatedRange(item, 'studyThawDelay', 'yr', units)}</td> : null}
            {simulated ? <td>{simulatedRange(item, 'studyLowestFluid', '°C', units)}</td> : null}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** One page per site: every screening value. */
function SiteSheet(props: { item: ShortlistItem; number: number; bands: Band[]; units: UnitSystem }) {
  const { item, units } = props;
  return (
    <section className="report-page" data-testid="report-page">
      <h2>
        Site {props.number}: {item.name}
      </h2>
      <p className="small">
        {formatLonLat(item.lon, item.lat, 4)}
        {item.note ? ` · ${item.note}` : ''}
      </p>
      <table className="report-table two-col" data-testid="report-site-sheet">
        <tbody>
          {props.bands.map((b) => (
            <tr key={b.id}>
              <th scope="row">{displayTitle(b.title, b.unit, units)}</th>
              <td>{siteValue(item, b, units)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="small report-caution">{SCREENING_CAUTION}</p>
    </section>
  );
}

function SourcesPage({ manifest }: { manifest: Manifest }) {
  return (
    <section className="report-page" data-testid="report-page">
      <h2>Sources</h2>
      <table className="report-table" data-testid="report-sources">
        <thead>
          <tr>
            <th>Input</th>
            <th>Provenance</th>
            <th>Licence</th>
          </tr>
        </thead>
        <tbody>
          {manifest.sources.map((s) => (
            <tr key={s.file}>
              <td>{s.file}</td>
              <td>{s.provenance}</td>
              <td>{s.licence}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="small">
        Built by {manifest.tool.name} {manifest.tool.version} on {manifest.createdAt.slice(0, 10)}.
      </p>
      <p className="report-caution small">
        {SCREENING_CAUTION} {GROUND_CAUTIONS.join(' ')}
      </p>
    </section>
  );
}

function studyNumber(v: number | string | null | undefined, unit: string, units: UnitSystem): string {
  return typeof v === 'number' ? formatQuantity(v, unit, units) : 'not studied';
}

function studyDelay(item: ShortlistItem, units: UnitSystem): string {
  const v = item.metrics.studyThawDelay_yr;
  if (v === undefined) return 'not studied';
  if (v === null) return 'no thaw in the simulated years';
  const text = studyNumber(v, 'yr', units);
  return item.metrics.studyThawDelayAtLeast === 'yes' ? `at least ${text}` : text;
}

/** P10 / P50 / P90 of the map ensemble's thaw delay at the site's cell (the build's ensemble bands). */
function mapThawRange(item: ShortlistItem, units: UnitSystem): string {
  const ids = [BAND.thawDelayP10, BAND.thawDelayP50, BAND.thawDelayP90];
  const v = ids.map((id) => item.values[id]);
  if (v.every((x) => typeof x !== 'number')) return 'no data';
  return v.map((x) => (typeof x === 'number' ? formatQuantity(x, 'yr', units) : 'no data')).join(' / ');
}

/**
 * P10 / P50 / P90 of a figure of the site's simulated ensemble ("Study all" with the ensemble), with the
 * member count; "not run" before, "not defined" where fewer than half the members define it.
 */
function simulatedRange(
  item: ShortlistItem,
  figure: 'studyThawDelay' | 'studyLowestFluid',
  unit: 'yr' | '°C',
  units: UnitSystem,
): string {
  const m = item.metrics;
  if (m.studyEnsembleMembers === undefined) return 'not run';
  const suffix = unit === 'yr' ? 'yr' : 'C';
  const v = ['P10', 'P50', 'P90'].map((p) => m[`${figure}${p}_${suffix}`]);
  const n = `(${m.studyEnsembleMembers} members)`;
  if (v.every((x) => typeof x !== 'number')) return `not defined in half the members ${n}`;
  return `${v.map((x) => (typeof x === 'number' ? formatQuantity(x, unit, units) : 'no data')).join(' / ')} ${n}`;
}
