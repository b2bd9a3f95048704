/**
 * Issue 17 item 4: exports of a scenario-set build carry, per place, every scenario's key figures
 * (one column group per scenario, export-schema.ts). The small demo region is built with three
 * scenarios of the demo set (present trend, low pathway, high pathway with a 50-year life); the CLI's
 * shortlist must carry, in each scenario's group, that scenario's own band values at the feature's
 * cell, read here independently from that scenario's GeoTIFFs and rounded by the export schema. The
 * web's export of the same values must read back (re-import) to the shown scenario's band values.
 */
import { readFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import type { Feature } from 'geojson';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { DEMO_SCENARIO_SET } from '../../data-pipeline/demo/demo-scenarios';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { shortlist } from '../../data-pipeline/shortlist/shortlist-cells';
import { BAND } from '../../layers/screening/band-ids';
import {
  bandColumnName,
  exportValue,
  scenarioColumnPrefix,
  scenarioKeyBands,
  SCENARIO_KEY_BAND_IDS,
} from '../../layers/screening/export-schema';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import { shortlistFromGeoJSON, shortlistToGeoJSON } from '../../web/src/shortlist/shortlist-export';
import type { ShortlistItem } from '../../web/src/shortlist/shortlist-item';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';
import { makeTempDir, removeTempDirs, runCli, SMALL_DEMO, smallDemo } from './pipeline-fixtures';

afterAll(removeTempDirs);

const set = {
  scenarios: [DEMO_SCENARIO_SET.scenarios[0], DEMO_SCENARIO_SET.scenarios[1], DEMO_SCENARIO_SET.scenarios[3]],
};
let outDir = '';
let manifests: Manifest[] = [];
/** Per scenario, the key bands' planes (band id -> values) read from its GeoTIFFs. */
let planes: Map<string, Float32Array>[] = [];
let features: Feature[] = [];

async function readPlanes(dir: string, m: Manifest): Promise<Map<string, Float32Array>> {
  const files = m.parameters.geotiffs as Record<string, string>;
  const out = new Map<string, Float32Array>();
  for (const id of SCENARIO_KEY_BAND_IDS) {
    const src = await readGeoTiffGrid(join(dir, files[id]), { label: id });
    out.set(id, src.grid.values);
  }
  return out;
}

beforeAll(async () => {
  const inDir = await smallDemo();
  outDir = join(await makeTempDir('set-export'), 'out');
  await buildTiles({ inDir, outDir, cellSize_m: SMALL_DEMO.cellSize_m, scenario: set });
  const root = manifestSchema.parse(JSON.parse(await readFile(join(outDir, 'manifest.json'), 'utf8')));
  manifests = [];
  planes = [];
  for (const s of root.scenarioSet?.scenarios ?? []) {
    const file = join(outDir, s.manifest);
    const m = manifestSchema.parse(JSON.parse(await readFile(file, 'utf8')));
    manifests.push(m);
    planes.push(await readPlanes(dirname(file), m));
  }
  const fc = await shortlist({ tilesDir: outDir, where: 'not excluded' });
  features = fc.features;
}, 600_000);

describe('scenario-set export', () => {
  it('names one column group per scenario after the scenario, SI units in the column names', () => {
    expect(manifests).toHaveLength(3);
    const p = features[0].properties ?? {};
    expect(scenarioColumnPrefix(set.scenarios[2].name)).toBe('high_pathway_50_year_life__');
    for (const s of set.scenarios) {
      const prefix = scenarioColumnPrefix(s.name);
      expect(p[`${prefix}scenario`]).toBe(s.name);
      for (const col of ['suitability_class', 'suitability_label', 'thawDelay_yr', 'groundTempEnd_degC'])
        expect(p).toHaveProperty(`${prefix}${col}`);
      expect(p).toHaveProperty(`${prefix}pilesPerTon_piles_per_ton`);
      expect(p).toHaveProperty(`${prefix}loadShare`);
    }
  });

  it('carries in each group that scenario’s band values at the cell (its own GeoTIFFs)', () => {
    expect(features.length).toBeGreaterThan(50);
    const width = manifests[0].analysisGrid.width;
    let differ = 0;
    for (const f of features) {
      const p = f.properties ?? {};
      const cell = (p.cellRow as number) * width + (p.cellCol as number);
      manifests.forEach((m, k) => {
        const prefix = scenarioColumnPrefix(set.scenarios[k].name);
        for (const id of SCENARIO_KEY_BAND_IDS) {
          const band = m.bands.find((b) => b.id === id)!;
          const want = exportValue(band, planes[k].get(id)![cell]);
          expect(p[`${prefix}${bandColumnName(band)}`], `${prefix}${id} at cell ${cell}`).toBe(want);
        }
      });
      // The shown (first) scenario's group repeats the record's own columns.
      expect(p[`${scenarioColumnPrefix(set.scenarios[0].name)}thawDelay_yr`]).toBe(p.thawDelay_yr);
      const first = p[`${scenarioColumnPrefix(set.scenarios[0].name)}groundTempEnd_degC`];
      const high = p[`${scenarioColumnPrefix(set.scenarios[2].name)}groundTempEnd_degC`];
      if (first !== high) differ++;
    }
    // The groups are three scenarios, not one read three times: the high pathway warms the ground more.
    expect(differ).toBeGreaterThan(features.length / 2);
  });

  it('lists every group column with its unit on the collection', async () => {
    const fc = (await shortlist({ tilesDir: outDir, where: 'not excluded', limit: 1 })) as unknown as {
      units: Record<string, string>;
    };
    const prefix = scenarioColumnPrefix(set.scenarios[1].name);
    expect(fc.units[`${prefix}thawDelay_yr`]).toBe('yr');
    expect(fc.units[`${prefix}groundTempEnd_degC`]).toBe('°C');
    expect(fc.units[`${prefix}suitability_class`]).toBe('class code');
  });

  it('writes the groups into the CLI’s GeoPackage as typed columns, the values of the GeoJSON', async () => {
    const dir = await makeTempDir('set-export-gpkg');
    const out = join(dir, 'picks.geojson');
    const r = await runCli(['shortlist', '--tiles', outDir, '--where', 'not excluded', '--out', out]);
    expect(r.code).toBe(0);
    const fc = JSON.parse(await readFile(out, 'utf8')) as { features: Feature[] };
    const want = fc.features[0].properties ?? {};
    const gdal = await loadGdal();
    const info = gdal.vectorInfo(join(dir, 'picks.gpkg'), [
      '-features',
      '-where',
      `cellCol = ${want.cellCol} AND cellRow = ${want.cellRow}`,
    ]) as {
      layers: {
        name: string;
        fields: { name: string; type: string }[];
        features?: { properties: Record<string, unknown> }[];
      }[];
    };
    const layer = info.layers.find((l) => l.name === 'shortlist')!;
    const types = Object.fromEntries(layer.fields.map((f) => [f.name, f.type]));
    const high = scenarioColumnPrefix(set.scenarios[2].name);
    expect(types[`${high}thawDelay_yr`]).toBe('Real');
    expect(types[`${high}suitability_class`]).toBe('Integer');
    expect(types[`${high}scenario`]).toBe('String');
    const got = layer.features![0].properties;
    for (const s of set.scenarios) {
      const prefix = scenarioColumnPrefix(s.name);
      for (const col of ['scenario', 'suitability_class', 'thawDelay_yr', 'groundTempEnd_degC'])
        expect(got[`${prefix}${col}`], `${prefix}${col}`).toEqual(want[`${prefix}${col}`]);
    }
  });

  it('a web export with the groups still re-imports to the shown scenario’s values', () => {
    const m = manifests[0];
    const f = features[0];
    const p = f.properties ?? {};
    const width = m.analysisGrid.width;
    const cell = (p.cellRow as number) * width + (p.cellCol as number);
    const values: Record<string, number | null> = {};
    for (const b of m.bands)
      values[b.id] = typeof p[bandColumnName(b)] === 'number' ? (p[bandColumnName(b)] as number) : null;
    const item: ShortlistItem = {
      id: 'site-1',
      name: 'Site 1',
      note: '',
      lon: p.lon_deg as number,
      lat: p.lat_deg as number,
      addedAt: '2026-01-01T00:00:00Z',
      origin: 'map',
      values,
      metrics: { scenario: set.scenarios[0].name },
    };
    const figures = {
      sets: manifests.map((mk, k) => scenarioKeyBands(set.scenarios[k].name, mk.bands)),
      values: new Map([
        ['site-1', planes.map((pl) => Object.fromEntries([...pl].map(([id, v]) => [id, v[cell]])))],
      ]),
    };
    const geo = shortlistToGeoJSON([item], m, 'SI', figures);
    const props = geo.features[0].properties;
    const high = scenarioColumnPrefix(set.scenarios[2].name);
    expect(props[`${high}thawDelay_yr`]).toBe(
      exportValue(
        m.bands.find((b) => b.id === BAND.thawDelay)!,
        planes[2].get(BAND.thawDelay)![cell],
      ),
    );
    const back = shortlistFromGeoJSON(JSON.parse(JSON.stringify(geo)), m.bands);
    expect(back.issues).toEqual([]);
    expect(back.items[0].values).toEqual(values);
    // The groups follow the unit switch: North American converts and renames them like the other
    // columns (°F = °C × 9/5 + 32, the definition of the Fahrenheit scale; years stay years).
    const naGeo = shortlistToGeoJSON([item], m, 'NA', figures);
    const na = naGeo.features[0].properties;
    const end_C = planes[2].get(BAND.groundTempEnd)![cell];
    expect(na[`${high}groundTempEnd_degC`]).toBeUndefined();
    const end_F = na[`${high}groundTempEnd_degF`] as number;
    expect(Math.abs(end_F - ((end_C * 9) / 5 + 32))).toBeLessThan(0.01);
    expect(na[`${high}thawDelay_yr`]).toBe(props[`${high}thawDelay_yr`]);
    expect(na[`${high}scenario`]).toBe(set.scenarios[2].name);
    // And the North American file still re-imports to the shown scenario's stored (SI) values.
    const naBack = shortlistFromGeoJSON(JSON.parse(JSON.stringify(naGeo)), m.bands);
    expect(naBack.issues).toEqual([]);
    expect(naBack.items[0].values[BAND.groundTempEnd]).toBeCloseTo(values[BAND.groundTempEnd]!, 1);
  });
});
