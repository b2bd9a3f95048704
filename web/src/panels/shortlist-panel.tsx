/**
 * The shortlist: name and note each site, sort by any metric, remove, export (GeoJSON, CSV) and
 * re-import an earlier GeoJSON export. The list lives in the shortlist store (persisted).
 */
import { useMemo, useState, type ChangeEvent } from 'react';
import type { FeatureCollection } from 'geojson';
import { ShortlistReport } from '../report/shortlist-report';
import { StudyAll } from '../report/study-all';
import type { Band, Manifest } from '../../../layers/screening/manifest';
import type { ShortlistItem } from '../shortlist/shortlist-item';
import { shortlistStore } from '../shortlist/shortlist-store';
import { useShortlist, useShortlistSaveStatus } from '../shortlist/use-shortlist';
import {
  shortlistFromGeoJSON,
  shortlistToCsv,
  shortlistToGeoJSON,
  sortShortlist,
  type ShortlistSortKey,
} from '../shortlist/shortlist-export';
import { downloadFile } from '../download-file';
import { loadScenarioFigures, type ScenarioFigures } from '../shortlist/scenario-figures';
import { MAX_SHORTLIST_PINS } from '../map/point-markers';
import { bandValueText, horizonFlagOf } from './cell-panel';
import { displayTitle, formatLonLat, type UnitSystem } from '../units/display-units';
import { metricLines } from '../shortlist/metric-labels';
import { scenarioFromManifest } from '../../../layers/screening/site-prefill';

/** Sites listed before "show all" (a list of thousands of editable rows would take seconds to draw). */
const LISTED_AT_FIRST = 200;

/** Figures listed per site in the list (the report and the exports hold all of them). */
const METRICS_LISTED = 4;

type SortDirection = 'asc' | 'desc';
interface PanelSort {
  key: string;
  direction: SortDirection;
}

/** The sort the page keeps (in the URL) when it passes one, otherwise the panel's own. */
function usePanelSort(sort: PanelSort | undefined, onSort: ((s: PanelSort) => void) | undefined) {
  const [ownSort, setOwnSort] = useState<PanelSort>({ key: 'addedAt', direction: 'asc' });
  const current = sort ?? ownSort;
  const sortKey = current.key as ShortlistSortKey;
  const direction = current.direction;
  const putSort = onSort ?? setOwnSort;
  const setSortKey = (key: ShortlistSortKey) => putSort({ key, direction });
  const setDirection = (d: SortDirection) => putSort({ key: sortKey, direction: d });
  return { sortKey, direction, setSortKey, setDirection };
}

export function ShortlistPanel(props: {
  manifest: Manifest;
  units: UnitSystem;
  metricBandId: string;
  onLocate: (lon: number, lat: number) => void;
  /** The sort, when the page keeps it (in the URL); otherwise the panel keeps its own. */
  sort?: PanelSort;
  onSort?: (sort: PanelSort) => void;
  /** Land polygons for the report's map. */
  land?: FeatureCollection | null;
  /** Where the build's data lives: the other scenarios of a set are read from beside it. */
  dataBase?: URL;
}) {
  const { manifest, units } = props;
  const items = useShortlist();
  const [showAll, setShowAll] = useState(false);
  const sort = usePanelSort(props.sort, props.onSort);
  const { sortKey, direction } = sort;
  const sorted = useMemo(() => sortShortlist(items, sortKey, direction), [items, sortKey, direction]);
  const listed = showAll ? sorted : sorted.slice(0, LISTED_AT_FIRST);
  const shownBand =
    manifest.bands.find((b) => `band:${b.id}` === sortKey) ??
    manifest.bands.find((b) => b.id === props.metricBandId);
  // The scenario's currency, for the cost figures of a site study.
  const currency = useMemo(() => scenarioFromManifest(manifest.scenario).economics.currency, [manifest]);

  return (
    <section className="panel shortlist" aria-label="Shortlist" data-testid="shortlist-panel">
      <h2>Shortlist ({items.length.toLocaleString('en-US')})</h2>
      <ShortlistSaveState />
      <ShortlistSortControls bands={manifest.bands} {...sort} />
      {sorted.length === 0 ? (
        <p className="muted">No sites yet: click the map, then “Add to shortlist”.</p>
      ) : null}
      <ol className="shortlist-items" data-testid="shortlist-items">
        {listed.map((it) => (
          <ShortlistRow
            key={it.id}
            item={it}
            shownBand={shownBand}
            units={units}
            currency={currency}
            onLocate={props.onLocate}
          />
        ))}
      </ol>
      {items.length > MAX_SHORTLIST_PINS ? (
        <p className="muted small">
          The map pins the first {MAX_SHORTLIST_PINS} sites added; exports hold all of them.
        </p>
      ) : null}
      {listed.length < sorted.length ? (
        <button type="button" onClick={() => setShowAll(true)} data-testid="shortlist-show-all">
          Show all {sorted.length.toLocaleString('en-US')} sites
        </button>
      ) : null}
      <ShortlistActions
        manifest={manifest}
        dataBase={props.dataBase}
        sorted={sorted}
        land={props.land ?? null}
        units={units}
      />
    </section>
  );
}

/** Whether the list could be read and is saved in this browser. */
function ShortlistSaveState() {
  const save = useShortlistSaveStatus();
  return (
    <>
      {shortlistStore.loadProblem() ? (
        <p className="notice warn" data-testid="shortlist-load-problem">
          {shortlistStore.loadProblem()}
        </p>
      ) : null}
      {save.problem ? (
        <p className="notice warn" role="alert" data-testid="shortlist-save-problem">
          {save.problem}
        </p>
      ) : null}
      <p className="muted small" data-testid="shortlist-save-state" data-state={save.state}>
        {save.state === 'loading'
          ? 'Reading the saved shortlist…'
          : save.state === 'saving'
            ? 'Saving…'
            : save.state === 'saved'
              ? `Saved in this browser (${save.savedCount.toLocaleString('en-US')} site(s)).`
              : 'Not saved: see above.'}
      </p>
    </>
  );
}

function ShortlistSortControls(props: {
  bands: Band[];
  sortKey: ShortlistSortKey;
  direction: SortDirection;
  setSortKey: (key: ShortlistSortKey) => void;
  setDirection: (d: SortDirection) => void;
}) {
  const { sortKey, direction } = props;
  return (
    <div className="row wrap">
      <label className="sort">
        Sort by{' '}
        <select
          value={sortKey}
          onChange={(e) => props.setSortKey(e.target.value as ShortlistSortKey)}
          data-testid="shortlist-sort"
        >
          <option value="addedAt">date added</option>
          <option value="name">name</option>
          {props.bands
            .filter((b) => b.kind === 'continuous')
            .map((b) => (
              <option key={b.id} value={`band:${b.id}`}>
                {b.title}
              </option>
            ))}
        </select>
      </label>
      <button
        type="button"
        onClick={() => props.setDirection(direction === 'asc' ? 'desc' : 'asc')}
        aria-label="Reverse sort order"
      >
        {direction === 'asc' ? '↑ ascending' : '↓ descending'}
      </button>
    </div>
  );
}

/**
 * One site: editable name and note, where it is, the shown band and its first figures (in the
 * planner's words and the chosen units, shortlist/metric-labels.ts), show / remove.
 */
function ShortlistRow(props: {
  item: ShortlistItem;
  shownBand: Band | undefined;
  units: UnitSystem;
  currency: string;
  onLocate: (lon: number, lat: number) => void;
}) {
  const { item: it, shownBand, units } = props;
  return (
    <li data-testid="shortlist-item">
      <input
        className="site-name"
        aria-label="Site name"
        value={it.name}
        onChange={(e) => shortlistStore.update(it.id, { name: e.target.value })}
      />
      <textarea
        aria-label="Note"
        placeholder="note"
        rows={1}
        value={it.note}
        onChange={(e) => shortlistStore.update(it.id, { note: e.target.value })}
      />
      <div className="muted small" data-testid="shortlist-item-figures">
        {formatLonLat(it.lon, it.lat, 3)}
        {shownBand
          ? ` · ${displayTitle(shownBand.title, shownBand.unit, units)}: ${bandValueText(shownBand, it.values[shownBand.id] ?? null, units, horizonFlagOf(shownBand, it.values))}`
          : ''}
        {it.origin === 'site' ? ' · site study' : ''}
        {metricLines(it.metrics, units, props.currency)
          .slice(0, METRICS_LISTED)
          .map((m) => ` · ${m.label}: ${m.text}`)
          .join('')}
      </div>
      <div className="row item-actions">
        <button
          type="button"
          onClick={() => props.onLocate(it.lon, it.lat)}
          aria-label={`Show ${it.name} on the map`}
        >
          show
        </button>
        <button type="button" onClick={() => shortlistStore.remove(it.id)} aria-label={`Remove ${it.name}`}>
          remove
        </button>
      </div>
    </li>
  );
}

/** Re-import of an earlier GeoJSON export, and what it did (or why it could not). */
function useShortlistImport(bands: Band[]) {
  const [message, setMessage] = useState<string | null>(null);
  const onImport = async (ev: ChangeEvent<HTMLInputElement>) => {
    const file = ev.target.files?.[0];
    ev.target.value = '';
    if (!file) return;
    try {
      const { items: imported, issues } = shortlistFromGeoJSON(JSON.parse(await file.text()), bands);
      shortlistStore.importItems(imported);
      setMessage(
        `Imported ${imported.length} site(s)${issues.length ? `; skipped: ${issues.join('; ')}` : ''}.`,
      );
    } catch (e) {
      setMessage(`Could not read ${file.name}: ${(e as Error).message}`);
    }
  };
  return { message, onImport };
}

/** Study all, the report, the exports and the re-import of an earlier GeoJSON export. */
function ShortlistActions(props: {
  manifest: Manifest;
  dataBase: URL | undefined;
  sorted: ShortlistItem[];
  land: FeatureCollection | null;
  units: UnitSystem;
}) {
  const { manifest, sorted } = props;
  const { message, onImport } = useShortlistImport(manifest.bands);
  const exporting = useScenarioExport(manifest, props.dataBase, sorted);
  const [reportOpen, setReportOpen] = useState(false);
  const stamp = new Date().toISOString().slice(0, 10);
  const none = sorted.length === 0;
  return (
    <>
      <div className="row wrap">
        <StudyAll manifest={manifest} items={sorted} />
        <button type="button" onClick={() => setReportOpen(true)} disabled={none} data-testid="open-report">
          Shortlist report
        </button>
        {reportOpen ? (
          <ShortlistReport
            manifest={manifest}
            items={sorted}
            land={props.land}
            units={props.units}
            onClose={() => setReportOpen(false)}
          />
        ) : null}
        <ExportButtons
          manifest={manifest}
          sorted={sorted}
          exporting={exporting}
          stamp={stamp}
          units={props.units}
        />
        <label className="file-button">
          Import GeoJSON
          <input
            type="file"
            accept=".geojson,.json,application/geo+json,application/json"
            onChange={onImport}
            data-testid="import-geojson"
          />
        </label>
      </div>
      <p className="small" data-testid="export-units">
        Exports in{' '}
        {props.units === 'NA' ? 'North American units (°F, ft, mi, Btu/h)' : 'SI units (°C, m, km, W)'}, as
        the unit switch shows; the file says which, and Import reads either.
      </p>
      {message ? (
        <p className="small" role="status">
          {message}
        </p>
      ) : null}
      {exporting.note ? (
        <p className="small" role="status" data-testid="export-note">
          {exporting.note}
        </p>
      ) : null}
    </>
  );
}

/** Export GeoJSON and CSV (with every scenario's key figures of a scenario-set build). */
function ExportButtons(props: {
  manifest: Manifest;
  sorted: ShortlistItem[];
  exporting: ReturnType<typeof useScenarioExport>;
  units: UnitSystem;
  stamp: string;
}) {
  const { manifest, sorted, exporting, stamp, units } = props;
  const none = sorted.length === 0;
  return (
    <>
      <button
        type="button"
        disabled={none || exporting.busy}
        data-testid="export-geojson"
        onClick={() =>
          exporting.run((figures) =>
            downloadFile(
              `pile-atlas-shortlist-${stamp}.geojson`,
              JSON.stringify(shortlistToGeoJSON(sorted, manifest, units, figures), null, 2),
              'application/geo+json',
            ),
          )
        }
      >
        Export GeoJSON
      </button>
      <button
        type="button"
        disabled={none || exporting.busy}
        data-testid="export-csv"
        onClick={() =>
          exporting.run((figures) =>
            downloadFile(
              `pile-atlas-shortlist-${stamp}.csv`,
              shortlistToCsv(sorted, manifest, units, figures),
              'text/csv',
            ),
          )
        }
      >
        Export CSV
      </button>
    </>
  );
}

/**
 * An export with every scenario's key figures at the sites (a scenario-set build: the scenarios'
 * tiles under the sites are read first); without the set, or when they cannot be read, the export
 * goes ahead with the scenario shown and says so.
 */
function useScenarioExport(manifest: Manifest, dataBase: URL | undefined, items: ShortlistItem[]) {
  const [busy, setBusy] = useState(false);
  const [note, setNote] = useState<string | null>(null);
  const hasSet = (manifest.scenarioSet?.scenarios.length ?? 0) > 1 && dataBase !== undefined;
  const run = (write: (figures: ScenarioFigures | null) => void) => {
    if (!hasSet || !dataBase) return write(null);
    setBusy(true);
    setNote('Reading every scenario’s figures at the sites…');
    loadScenarioFigures(manifest, dataBase, items).then(
      (figures) => {
        setBusy(false);
        setNote(null);
        write(figures);
      },
      (e: unknown) => {
        setBusy(false);
        setNote(`Exported without the other scenarios’ figures: ${(e as Error).message}`);
        write(null);
      },
    );
  };
  return { busy, note, run };
}
