/**
 * Issue 15, item 6: one export schema for the web's shortlist export and `pile-atlas shortlist`, every
 * match written (a limit only when asked), a GeoPackage beside the GeoJSON, `--out` written atomically.
 * The build is synthetic (a manifest and four GeoTIFFs written here, 120 x 100 cells of 1 km in
 * EPSG:3413 inside the invented demo region), so the values, and how they must round, are known.
 */
import { mkdir, readdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { writeArrayBuffer } from 'geotiff';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';
import { FAULT_ENV } from '../../data-pipeline/build/fault-points';
import { loadGdal } from '../../data-pipeline/gdal/gdal-wasm';
import { SCREENING_CAUTION } from '../../layers/cautions';
import {
  bandColumnName,
  exportColumns,
  exportStep,
  importBandValue,
} from '../../layers/screening/export-schema';
import type { Manifest } from '../../layers/screening/manifest';
import { exportProperties } from '../../web/src/shortlist/shortlist-export';
import type { ShortlistItem } from '../../web/src/shortlist/shortlist-item';
import { testManifest } from '../unit/web-test-manifest';
import { makeTempDir, removeTempDirs, runCli } from './pipeline-fixtures';

afterAll(removeTempDirs);

const W = 120;
const H = 100;
const CELL = 1000;
/** The cell whose values are set by hand (row, column) and what they must export as. */
const PICK = { row: 5, col: 7 };

interface Fixture {
  dir: string;
  manifest: Manifest;
  planes: Record<string, Float32Array>;
  /** Cells with data (the shortlist's "screened area": not nodata in both the first and last band). */
  screened: number;
}

async function syntheticBuild(): Promise<Fixture> {
  const dir = join(await makeTempDir('shortlist-schema'), 'tiles');
  await mkdir(join(dir, 'geotiff'), { recursive: true });
  const toGrid = createTransform('EPSG:4326', 'EPSG:3413');
  const [cx, cy] = toGrid(-3, 75);
  const x0 = Math.round(cx / CELL) * CELL - (W / 2) * CELL;
  const y0 = Math.round(cy / CELL) * CELL + (H / 2) * CELL;
  const base = testManifest();
  const distance = {
    ...base.bands[0],
    id: 'settlementDistance_km',
    title: 'Distance to the nearest settlement',
    unit: 'km',
    min: 0,
    max: 150,
  };
  const manifest = testManifest({
    analysisGrid: {
      ...base.analysisGrid,
      width: W,
      height: H,
      cellSize_m: CELL,
      geoTransform: [x0, CELL, 0, y0, 0, -CELL],
    },
    bands: [...base.bands, distance],
    parameters: {
      geotiffs: Object.fromEntries([...base.bands, distance].map((b) => [b.id, `geotiff/${b.id}.tif`])),
    },
  });
  const n = W * H;
  const planes: Record<string, Float32Array> = {
    groundTemp: new Float32Array(n),
    pilesPerTon: new Float32Array(n),
    suitability: new Float32Array(n),
    settlementDistance_km: new Float32Array(n),
  };
  for (let i = 0; i < n; i++) {
    planes.groundTemp[i] = -6 + (i % 997) * 0.0061237;
    planes.pilesPerTon[i] = 1 + (i % 389) * 0.0137;
    planes.suitability[i] = i % 4;
    planes.settlementDistance_km[i] = (i % 613) * 0.23456;
  }
  // Outside the screened area: nodata in every band (first row, first 20 cells).
  for (let i = 0; i < 20; i++) for (const p of Object.values(planes)) p[i] = NaN;
  // Ground temperature missing but the cell screened (nodata in one band only).
  planes.groundTemp[W * 3 + 3] = NaN;
  const pick = PICK.row * W + PICK.col;
  planes.groundTemp[pick] = -4.56789;
  planes.pilesPerTon[pick] = 2.349;
  planes.suitability[pick] = 3;
  planes.settlementDistance_km[pick] = 12.3456;
  for (const [id, values] of Object.entries(planes)) {
    const tif = writeArrayBuffer(values, {
      width: W,
      height: H,
      ModelPixelScale: [CELL, CELL, 0],
      ModelTiepoint: [0, 0, 0, x0, y0, 0],
      GTModelTypeGeoKey: 1,
      GTRasterTypeGeoKey: 1,
      ProjectedCSTypeGeoKey: 3413,
    });
    await writeFile(join(dir, `geotiff/${id}.tif`), new Uint8Array(tif));
  }
  await writeFile(join(dir, 'manifest.json'), JSON.stringify(manifest, null, 2));
  return { dir, manifest, planes, screened: n - 20 };
}

let fx: Fixture;
beforeAll(async () => {
  fx = await syntheticBuild();
}, 60_000);

type Props = Record<string, unknown>;
interface Fc {
  features: { geometry: { type: string }; properties: Props }[];
  matched: number;
  returned: number;
  truncated: boolean;
  units: Record<string, string>;
}

describe('shortlist export schema (web and CLI)', () => {
  it('web and CLI exports of the same cells have identical column names and rounded values', async () => {
    const out = join(await makeTempDir('shortlist-schema-out'), 'picks.geojson');
    const r = await runCli(['shortlist', '--tiles', fx.dir, '--where', 'suitability = good', '--out', out]);
    expect(r.stderr).toMatch(/shortlist: \d+ matched/);
    expect(r.code).toBe(0);
    const fc = JSON.parse(await readFile(out, 'utf8')) as Fc;
    expect(fc.features.length).toBeGreaterThan(2000);
    const shared = exportColumns(fx.manifest).map((c) => c.name);
    const toLonLat = createTransform('EPSG:3413', 'EPSG:4326');
    const gt = fx.manifest.analysisGrid.geoTransform;
    const webOf = (p: Props) => {
      const col = p.cellCol as number;
      const row = p.cellRow as number;
      const cell = row * W + col;
      // The web keeps the place's position and the band values of the cell as read (not rounded).
      const [lon, lat] = toLonLat(gt[0] + (col + 0.5) * gt[1], gt[3] + (row + 0.5) * gt[5]);
      const values: Record<string, number | null> = {};
      for (const [id, plane] of Object.entries(fx.planes))
        values[id] = Number.isNaN(plane[cell]) ? null : plane[cell];
      const item: ShortlistItem = {
        id: 'x',
        name: 'site',
        note: '',
        lon,
        lat,
        addedAt: '2026-12-01T00:00:00.000Z',
        origin: 'map',
        values,
        metrics: {},
      };
      return exportProperties(item, 1, fx.manifest);
    };
    let compared = 0;
    for (const f of fc.features.filter((_, i) => i % 97 === 0)) {
      const cli = f.properties;
      const web = webOf(cli);
      // Same column names, in the same order, for the shared record; same values.
      const cliKeys = Object.keys(cli).filter((k) => shared.includes(k));
      const webKeys = Object.keys(web).filter((k) => shared.includes(k));
      expect(cliKeys).toEqual(shared);
      expect(webKeys).toEqual(shared);
      for (const k of shared) expect([k, web[k]]).toEqual([k, cli[k]]);
      compared++;
    }
    expect(compared).toBeGreaterThan(20);

    // The hand-set cell, rounded by the schema's steps (common practice for screening figures, as
    // export-schema.ts states: 0.01 K, 0.1 pile per ton, 0.01 km, class codes whole, 1e-6 degree).
    const picked = fc.features.find(
      (f) => f.properties.cellCol === PICK.col && f.properties.cellRow === PICK.row,
    );
    expect(picked).toBeDefined();
    const p = picked!.properties;
    expect(p.groundTemp_degC).toBe(-4.57);
    expect(p.pilesPerTon_piles_per_ton).toBe(2.3);
    expect(p.settlementDistance_km).toBe(12.35); // the id already carries the unit: not doubled
    expect(p.settlementDistance_km_km).toBeUndefined();
    expect(p.suitability_class).toBe(3);
    expect(p.suitability_label).toBe('good');
    expect(String(p.cautions)).toContain(SCREENING_CAUTION);
    expect(String(p.fictionalData)).toContain('invented');
    const web = webOf(p);
    expect(web.groundTemp_degC).toBe(-4.57);
    expect(web.lon_deg).toBe(p.lon_deg);
    expect(Math.abs(String(p.lon_deg).split('.')[1].length)).toBeLessThanOrEqual(6);
    expect(fc.units.groundTemp_degC).toBe('°C');
    expect(fc.units.suitability_class).toBe('class code');
  });
});

interface OgrField {
  name: string;
  type: string;
}
interface OgrLayer {
  name: string;
  featureCount: number;
  metadata?: Record<string, Record<string, string>>;
  geometryFields: { type: string; coordinateSystem?: { projjson?: { id?: { code?: number } } } }[];
  fields: OgrField[];
  features?: { properties: Props }[];
}

describe('pile-atlas shortlist outputs', () => {
  it('writes a GeoPackage beside the GeoJSON with typed columns, a units table and the cautions', async () => {
    const dir = await makeTempDir('shortlist-gpkg');
    const out = join(dir, 'picks.geojson');
    const r = await runCli(['shortlist', '--tiles', fx.dir, '--where', 'suitability = good', '--out', out]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).gpkg).toBe(join(dir, 'picks.gpkg'));
    const fc = JSON.parse(await readFile(out, 'utf8')) as Fc;
    const gdal = await loadGdal();
    const info = gdal.vectorInfo(join(dir, 'picks.gpkg'), [
      '-features',
      '-where',
      `cellCol = ${PICK.col} AND cellRow = ${PICK.row}`,
    ]) as { metadata?: Record<string, Record<string, string>>; layers: OgrLayer[] };
    const layer = info.layers.find((l) => l.name === 'shortlist')!;
    expect(layer.features).toHaveLength(1);
    const all = gdal.vectorInfo(join(dir, 'picks.gpkg'), ['-so']) as { layers: OgrLayer[] };
    expect(all.layers.find((l) => l.name === 'shortlist')!.featureCount).toBe(fc.features.length);
    const types = Object.fromEntries(layer.fields.map((f) => [f.name, f.type]));
    expect(types.groundTemp_degC).toBe('Real');
    expect(types.suitability_class).toBe('Integer');
    expect(types.suitability_label).toBe('String');
    expect(types.cautions).toBe('String');
    expect(types.cellCol).toBe('Integer');
    const p = layer.features![0].properties;
    expect(p.groundTemp_degC).toBe(-4.57);
    expect(p.pilesPerTon_piles_per_ton).toBe(2.3);
    expect(String(p.cautions)).toContain(SCREENING_CAUTION);
    const meta = info.metadata?.[''] ?? {};
    expect(meta.CAUTIONS).toContain(SCREENING_CAUTION);
    expect(JSON.parse(meta.UNITS).groundTemp_degC).toBe('°C');
    expect(layer.fields.map((f) => f.name)).not.toContain('WKT');
    expect(layer.geometryFields[0].type).toBe('Polygon');
    expect(layer.geometryFields[0].coordinateSystem?.projjson?.id?.code).toBe(4326);
    expect(layer.metadata?.['']?.DESCRIPTION).toContain(SCREENING_CAUTION);
    const units = gdal.vectorInfo(join(dir, 'picks.gpkg'), ['-features', '-sql', 'SELECT * FROM units']) as {
      layers: OgrLayer[];
    };
    const rows = units.layers[0].features!.map((f) => f.properties);
    expect(rows).toHaveLength(layer.fields.length);
    expect(rows).toContainEqual({ column: 'groundTemp_degC', type: 'real', unit: '°C' });
    expect(rows).toContainEqual({ column: 'cautions', type: 'text', unit: null });
  });

  it('--units na writes North American names and values (GeoJSON, GeoPackage) that read back to the SI run', async () => {
    const dir = await makeTempDir('shortlist-na');
    const where = ['--where', 'suitability = good'];
    const si = await runCli([
      'shortlist',
      '--tiles',
      fx.dir,
      ...where,
      '--out',
      join(dir, 'si.geojson'),
      '--no-gpkg',
    ]);
    const na = await runCli([
      'shortlist',
      '--tiles',
      fx.dir,
      ...where,
      '--units',
      'na',
      '--out',
      join(dir, 'na.geojson'),
    ]);
    expect([si.code, na.code]).toEqual([0, 0]);
    const fcSi = JSON.parse(await readFile(join(dir, 'si.geojson'), 'utf8')) as Fc & { unitSystem: string };
    const fcNa = JSON.parse(await readFile(join(dir, 'na.geojson'), 'utf8')) as Fc & { unitSystem: string };
    expect([fcSi.unitSystem, fcNa.unitSystem]).toEqual(['SI', 'North American']);
    expect(fcNa.units.groundTemp_degF).toBe('°F');
    expect(fcNa.units.settlementDistance_mi).toBe('mi');
    expect(fcNa.units).not.toHaveProperty('groundTemp_degC');
    const pick = (fc: Fc) =>
      fc.features.find((f) => f.properties.cellCol === PICK.col && f.properties.cellRow === PICK.row)!
        .properties;
    const p = pick(fcNa);
    // -4.56789 °C × 1.8 + 32 = 23.7778 °F (step 0.01 °F); 12.3456 km / 1.609344 = 7.6712 mi (step 0.001 mi);
    // piles per ton the same in both systems (unit definitions; export-schema.ts steps).
    expect(p.groundTemp_degF).toBe(23.78);
    expect(p.settlementDistance_mi).toBe(7.671);
    expect(p.pilesPerTon_piles_per_ton).toBe(2.3);
    expect(p.unitSystem).toBe('North American');
    // Every value of every feature reads back to the SI run's value within one SI step.
    expect(fcNa.features.length).toBe(fcSi.features.length);
    fcNa.features.forEach((f, i) => {
      for (const band of fx.manifest.bands) {
        const want = fcSi.features[i].properties[bandColumnName(band)];
        const back = importBandValue(band, f.properties, 'NA');
        if (typeof want !== 'number') expect(back).toBeNull();
        else expect(Math.abs(back! - want)).toBeLessThanOrEqual(exportStep(band)! + 1e-9);
      }
    });
    const gdal = await loadGdal();
    const info = gdal.vectorInfo(join(dir, 'na.gpkg'), ['-so']) as {
      metadata?: Record<string, Record<string, string>>;
      layers: OgrLayer[];
    };
    expect(info.metadata?.['']?.UNIT_SYSTEM).toBe('North American');
    expect(JSON.parse(info.metadata?.['']?.UNITS ?? '{}').groundTemp_degF).toBe('°F');
    const fields = info.layers.find((l) => l.name === 'shortlist')!.fields.map((f) => f.name);
    expect(fields).toContain('groundTemp_degF');
    expect(fields).not.toContain('groundTemp_degC');
    const bad = await runCli(['shortlist', '--tiles', fx.dir, ...where, '--units', 'imperial']);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim()).toMatch(/--units imperial: expected si \(the stored units\) or na/);
  });

  it('writes every match, more than 10,000, unless --limit asks for fewer', async () => {
    // Independent count from the planes: every screened cell (suitability is a class 0..3 everywhere).
    let expected = 0;
    for (let i = 0; i < W * H; i++) if (fx.planes.suitability[i] >= 0) expected++;
    expect(expected).toBe(fx.screened);
    expect(expected).toBeGreaterThan(10_000);
    const all = await runCli(['shortlist', '--tiles', fx.dir, '--where', 'suitability >= 0']);
    expect(all.code).toBe(0);
    const fc = JSON.parse(all.stdout) as Fc;
    expect(fc.features).toHaveLength(expected);
    expect(fc.matched).toBe(expected);
    expect(fc.returned).toBe(expected);
    expect(fc.truncated).toBe(false);
    // Each cell once: the (column, row) pairs are all distinct.
    expect(new Set(fc.features.map((f) => `${f.properties.cellCol},${f.properties.cellRow}`)).size).toBe(
      expected,
    );
    expect(all.stderr).toContain(`${expected} matched, ${expected} written`);

    const cut = await runCli([
      'shortlist',
      '--tiles',
      fx.dir,
      '--where',
      'suitability >= 0',
      '--limit',
      '50',
    ]);
    expect(cut.code).toBe(0);
    const few = JSON.parse(cut.stdout) as Fc;
    expect(few.features).toHaveLength(50);
    expect(few.matched).toBe(expected);
    expect(few.truncated).toBe(true);
    expect(cut.stderr).toContain(`${expected} matched, 50 written (--limit 50)`);
  });

  it('--out is written atomically: a failure leaves the previous files and no temporary ones', async () => {
    const dir = await makeTempDir('shortlist-atomic');
    const out = join(dir, 'picks.geojson');
    await writeFile(out, 'previous\n');
    process.env[FAULT_ENV] = 'shortlist:enospc';
    let failed;
    try {
      failed = await runCli(['shortlist', '--tiles', fx.dir, '--where', 'suitability >= 0', '--out', out]);
    } finally {
      delete process.env[FAULT_ENV];
    }
    expect(failed.code).not.toBe(0);
    expect(failed.stderr).toMatch(/ENOSPC|no space/i);
    expect(await readFile(out, 'utf8')).toBe('previous\n');
    expect(await readdir(dir)).toEqual(['picks.geojson']);

    const ok = await runCli(['shortlist', '--tiles', fx.dir, '--where', 'suitability = good', '--out', out]);
    expect(ok.code).toBe(0);
    expect((JSON.parse(await readFile(out, 'utf8')) as Fc).matched).toBeGreaterThan(2000);
    expect((await readdir(dir)).sort()).toEqual(['picks.geojson', 'picks.gpkg']);
  });
});
