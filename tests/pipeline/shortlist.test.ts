import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { readGeoTiffGrid } from '../../data-pipeline/read/read-geotiff-grid';
import { compileWhere, type ExpressionBand } from '../../data-pipeline/shortlist/where-expression';
import { SCREENING_CAUTION } from '../../layers/cautions';
import { haversine_km } from '../../layers/screening/proximity';
import { createTransform } from '../../data-pipeline/crs/crs-definitions';
import { bandColumnName, exportColumns, exportValue } from '../../layers/screening/export-schema';
import { RANGE_METRICS } from '../../layers/screening/cell-ensemble-model';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import { exportProperties } from '../../web/src/shortlist/shortlist-export';
import { makeTempDir, runCli, SMALL_DEMO, smallDemo, removeTempDirs } from './pipeline-fixtures';

afterAll(removeTempDirs);

const BANDS: ExpressionBand[] = [
  { id: 'thawDelay', unit: 'yr', kind: 'continuous' },
  { id: 'pilesPerTon', unit: 'piles/ton', kind: 'continuous' },
  { id: 'groundTemp', unit: '°C', kind: 'continuous' },
  {
    id: 'exclusion',
    unit: '',
    kind: 'class',
    classes: [
      { value: 0, label: 'not excluded' },
      { value: 1, label: 'bedrock too shallow' },
    ],
  },
  {
    id: 'suitability',
    unit: '',
    kind: 'class',
    classes: [
      { value: 1, label: 'poor' },
      { value: 2, label: 'fair' },
      { value: 3, label: 'good' },
    ],
  },
];

describe('shortlist --where expressions', () => {
  const test = (expr: string, values: number[]) => compileWhere(expr, BANDS).test(values);

  it('evaluates comparisons, unit suffixes, not/and/or precedence and parentheses', () => {
    const cell = [12, 2.5, -3.2, 0, 2];
    expect(test('thawDelay_yr >= 10 and pilesPerTon <= 3 and not excluded', cell)).toBe(true);
    expect(test('thawDelay_yr >= 10 and pilesPerTon <= 3 and not excluded', [12, 2.5, -3.2, 1, 2])).toBe(
      false,
    );
    expect(test('groundTemp_C < -3', cell)).toBe(true);
    // The export's column names work too (export-schema.ts): what a user copies from the GeoJSON.
    expect(test('groundTemp_degC < -3 and pilesPerTon_piles_per_ton <= 3', cell)).toBe(true);
    expect(test('suitability_class = fair', cell)).toBe(true);
    expect(test('groundTemp<-3.5', cell)).toBe(false);
    // and binds tighter than or: false or (true and true)
    expect(test('thawDelay > 20 or pilesPerTon < 3 and suitability = fair', cell)).toBe(true);
    expect(test('(thawDelay > 20 or pilesPerTon < 3) and suitability = good', cell)).toBe(false);
    expect(test('not not suitability == "fair"', cell)).toBe(true);
    expect(test('exclusion = not_excluded and suitability != poor', cell)).toBe(true);
  });

  it('treats nodata as failing every comparison', () => {
    expect(test('thawDelay >= 0', [NaN, 1, 1, 0, 1])).toBe(false);
    expect(test('not thawDelay >= 0', [NaN, 1, 1, 0, 1])).toBe(true);
  });

  it('reports the offending token and position', () => {
    const message = (expr: string) => {
      try {
        compileWhere(expr, BANDS);
      } catch (err) {
        return (err as Error).message;
      }
      return 'no error';
    };
    expect(message('thawDelay_days > 3')).toMatch(
      /"thawDelay_days" at position 1: band thawDelay is in "yr"/,
    );
    expect(message('suitability = great')).toMatch(/"great" at position 15 is not a class of suitability/);
    expect(message('foo > 3')).toMatch(/unknown band "foo" at position 1/);
    expect(message('thawDelay > 3 and')).toMatch(/unexpected end of expression/);
    expect(message('thawDelay > 3 pilesPerTon < 2')).toMatch(/unexpected token "pilesPerTon" at position 15/);
    expect(message('(thawDelay > 3')).toMatch(/expected "\)"/);
    expect(message('thawDelay > 3 ; drop')).toMatch(/unexpected character ";" at position 15/);
    expect(message('')).toMatch(/empty expression/);
  });
});

describe('pile-atlas shortlist on a built demo', () => {
  let tilesDir: string;

  beforeAll(async () => {
    const inDir = await smallDemo();
    tilesDir = join(await makeTempDir('shortlist'), 'tiles');
    await buildTiles({ inDir, outDir: tilesDir, cellSize_m: SMALL_DEMO.cellSize_m });
  }, 180_000);

  it('writes RFC 7946 GeoJSON of exactly the matching cells, with units in property names', async () => {
    const where = 'groundTemp_C < -2 and not excluded';
    const { code, stdout } = await runCli(['shortlist', '--tiles', tilesDir, '--where', where]);
    expect(code).toBe(0);
    const fc = JSON.parse(stdout);
    expect(fc.type).toBe('FeatureCollection');
    expect(fc.crs).toBeUndefined();
    expect(fc.notice).toContain(SCREENING_CAUTION);
    expect(fc.fictional).toBe(true);
    expect(fc.where).toBe(where);
    expect(fc.sources.length).toBeGreaterThanOrEqual(6);

    const temp = await readGeoTiffGrid(join(tilesDir, 'geotiff/groundTemp.tif'), { label: 'groundTemp' });
    const excl = await readGeoTiffGrid(join(tilesDir, 'geotiff/exclusion.tif'), { label: 'exclusion' });
    let expected = 0;
    for (let i = 0; i < temp.grid.values.length; i++) {
      if (temp.grid.values[i] < -2 && excl.grid.values[i] === 0) expected++;
    }
    expect(expected).toBeGreaterThan(0);
    expect(fc.matched).toBe(expected);
    expect(fc.features).toHaveLength(expected);
    for (const f of fc.features) {
      // Rounded to 0.01 K (export-schema.ts, common practice): a value just below -2 may print as -2.
      expect(f.properties.groundTemp_degC).toBeLessThanOrEqual(-2);
      expect(f.properties.exclusion_class).toBe(0);
      expect(f.properties.exclusion_label).toBeTypeOf('string');
      const ring = f.geometry.coordinates[0];
      expect(f.geometry.type).toBe('Polygon');
      expect(ring).toHaveLength(5);
      expect(ring[4]).toEqual(ring[0]);
      for (const [lon, lat] of ring) {
        expect(lon).toBeGreaterThan(-11);
        expect(lon).toBeLessThan(5);
        expect(lat).toBeGreaterThan(73.4);
        expect(lat).toBeLessThan(76.6);
      }
    }
  });

  it('filters settlements, writes to --out, and rejects a bad expression with a one-line error', async () => {
    const out = join(await makeTempDir('shortlist-out'), 'towns.geojson');
    const ok = await runCli([
      'shortlist',
      '--tiles',
      tilesDir,
      '--where',
      'groundTemp < 0',
      '--settlements',
      '--out',
      out,
    ]);
    expect(ok.code).toBe(0);
    const fc = JSON.parse(await readFile(out, 'utf8'));
    expect(fc.subject).toBe('settlements');
    expect(fc.features.length).toBeGreaterThan(0);
    for (const f of fc.features) {
      expect(f.geometry.type).toBe('Point');
      expect(f.properties.name).toBeTypeOf('string');
      expect(f.properties.groundTemp_degC).toBeLessThanOrEqual(0);
    }
    const bad = await runCli(['shortlist', '--tiles', tilesDir, '--where', 'groundTemp < cold']);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
    expect(bad.stderr).toMatch(/"cold" at position 14 is not a number/);
  });
  it('adds no ensemble columns to a build without an ensemble', async () => {
    const { code, stdout } = await runCli(['shortlist', '--tiles', tilesDir, '--where', 'not excluded']);
    expect(code).toBe(0);
    const fc = JSON.parse(stdout);
    expect(fc.features.length).toBeGreaterThan(0);
    const names = [...Object.keys(fc.features[0].properties), ...Object.keys(fc.units)];
    expect(names.filter((n) => /P(10|50|90)|successProbability|robustClass|classAgreement/.test(n))).toEqual(
      [],
    );
  });
});

describe('pile-atlas shortlist on an ensemble build (issue 14)', () => {
  let tilesDir: string;
  let manifest: Manifest;

  beforeAll(async () => {
    const inDir = await smallDemo();
    tilesDir = join(await makeTempDir('shortlist-ensemble'), 'tiles');
    await buildTiles({
      inDir,
      outDir: tilesDir,
      cellSize_m: SMALL_DEMO.cellSize_m,
      workers: 1,
      ensemble: { members: 8, seed: 11 },
    });
    manifest = manifestSchema.parse(JSON.parse(await readFile(join(tilesDir, 'manifest.json'), 'utf8')));
  }, 300_000);

  it('carries P10/P50/P90 of the key figures, probability of success and robust class, as the web does', async () => {
    const where = 'successProbability >= 0.5 and not excluded';
    const { code, stdout, stderr } = await runCli(['shortlist', '--tiles', tilesDir, '--where', where]);
    expect(code, stderr).toBe(0);
    const fc = JSON.parse(stdout);
    expect(fc.features.length).toBeGreaterThan(10);
    // Units in the column names and in the collection's units table, like every other band.
    expect(fc.units.pilesPerTonP10_piles_per_ton).toBe('piles/ton');
    expect(fc.units.thawDelayP50_yr).toBe('yr');
    expect(fc.units.groundTempEndP90_degC).toBe('°C');
    expect(fc.units.successProbability).toBe('1');
    expect(fc.units.robustClass_class).toBe('class code');
    const planes = new Map<string, Float32Array>();
    for (const id of [
      'pilesPerTonP10',
      'pilesPerTonP50',
      'pilesPerTonP90',
      'successProbability',
      'robustClass',
    ])
      planes.set(id, (await readGeoTiffGrid(join(tilesDir, `geotiff/${id}.tif`), { label: id })).grid.values);
    const robustLabels = manifest.bands.find((b) => b.id === 'robustClass')!.classes!.map((c) => c.label);
    expect(robustLabels).toContain('uncertain');
    const shared = exportColumns(manifest).map((c) => c.name);
    let ordered = 0;
    for (const f of fc.features) {
      const p = f.properties;
      for (const m of RANGE_METRICS) {
        const band = manifest.bands.find((b) => b.id === `${m}P10`)!;
        const [lo, mid, hi] = ['P10', 'P50', 'P90'].map(
          (q) => p[bandColumnName({ ...band, id: `${m}${q}` })],
        );
        expect(lo === undefined || mid === undefined || hi === undefined).toBe(false);
        if (lo !== null && mid !== null && hi !== null) {
          // Percentiles are ordered (Hyndman & Fan 1996, definition 7, monotone in p).
          expect(lo).toBeLessThanOrEqual(mid);
          expect(mid).toBeLessThanOrEqual(hi);
          ordered++;
        }
      }
      expect(p.successProbability).toBeGreaterThanOrEqual(0.5);
      expect(p.successProbability).toBeLessThanOrEqual(1);
      expect(robustLabels).toContain(p.robustClass_label);
      // The values are the build's, rounded by the schema (piles per ton 0.1: export-schema.ts).
      const cell = p.cellRow * manifest.analysisGrid.width + p.cellCol;
      const p50 = { id: 'pilesPerTonP50', unit: 'piles/ton', kind: 'continuous' as const };
      expect(p.pilesPerTonP50_piles_per_ton).toBe(exportValue(p50, planes.get('pilesPerTonP50')![cell]));
      expect(p.robustClass_class).toBe(planes.get('robustClass')![cell]);
      // The web's export of the same place has the same columns and values for the shared record.
      const values: Record<string, number | null> = {};
      for (const [id, plane] of planes) values[id] = Number.isNaN(plane[cell]) ? null : plane[cell];
      const item = { id: 'x', name: 's', note: '', lon: p.lon_deg, lat: p.lat_deg, addedAt: '' };
      const web = exportProperties({ ...item, origin: 'map', values, metrics: {} }, 1, manifest);
      for (const k of [
        'pilesPerTonP10_piles_per_ton',
        'pilesPerTonP90_piles_per_ton',
        'successProbability',
        'robustClass_label',
      ])
        expect(web[k], k).toBe(p[k]);
      expect(Object.keys(web).filter((k) => shared.includes(k))).toEqual(
        Object.keys(p).filter((k) => shared.includes(k)),
      );
    }
    expect(ordered).toBeGreaterThan(fc.features.length);
    // And --where takes the robust class by its label.
    const robust = await runCli(['shortlist', '--tiles', tilesDir, '--where', 'robustClass = uncertain']);
    expect(robust.code, robust.stderr).toBe(0);
    const uncertain = JSON.parse(robust.stdout);
    expect(uncertain.features.length).toBeGreaterThan(0);
    for (const f of uncertain.features) expect(f.properties.robustClass_label).toBe('uncertain');
  });

  it('flags thaw-delay percentiles past the climate horizon as lower bounds in the export', async () => {
    const { code, stdout, stderr } = await runCli([
      'shortlist',
      '--tiles',
      tilesDir,
      '--where',
      'not excluded',
    ]);
    expect(code, stderr).toBe(0);
    const fc = JSON.parse(stdout);
    const year = manifest.bands.find((b) => b.id === 'thawDelayP90')?.horizon?.year;
    expect(year).toBe(2100);
    let bounded = 0;
    for (const { properties: p } of fc.features) {
      const flag = p.thawDelayRangeBound_class as number | null;
      // Counted from P90 down (climate-horizon.ts): P90 bounded from 1 on, P50 from 2, P10 at 3.
      for (const [q, from] of [
        ['P90', 1],
        ['P50', 2],
        ['P10', 3],
      ] as const) {
        const qualifier = p[`thawDelay${q}_qualifier`];
        const value = p[`thawDelay${q}_yr`];
        if (flag !== null && flag >= from && value !== null) {
          expect(qualifier).toBe(`≥ ${value} yr`);
          bounded++;
        } else expect(qualifier).toBeNull();
        // A delay is never longer than the years left to the horizon (start year 2025).
        if (value !== null) expect(value).toBeLessThanOrEqual(year! - 2025);
      }
    }
    // The demo's cold north thaws with piles only after 2100 in some members (judgement of the demo).
    expect(bounded).toBeGreaterThan(0);
  });
});

describe('proximity bands and shortlist --near', () => {
  let tilesDir: string;
  let settlements: { name: string; lonLat: [number, number] }[];

  beforeAll(async () => {
    const inDir = await smallDemo();
    tilesDir = join(await makeTempDir('proximity'), 'tiles');
    await buildTiles({ inDir, outDir: tilesDir, cellSize_m: SMALL_DEMO.cellSize_m });
    const fc = JSON.parse(await readFile(join(tilesDir, 'settlements.geojson'), 'utf8'));
    settlements = fc.features.map(
      (f: { properties: { name: string }; geometry: { coordinates: [number, number] } }) => ({
        name: f.properties.name,
        lonLat: f.geometry.coordinates,
      }),
    );
  }, 180_000);

  it('writes the distance to the nearest settlement and road as bands, checked against brute force', async () => {
    const manifest = JSON.parse(await readFile(join(tilesDir, 'manifest.json'), 'utf8'));
    const ids = manifest.bands.map((b: { id: string }) => b.id);
    expect(ids).toContain('settlementDistance_km');
    expect(ids).toContain('roadDistance_km');
    const dist = await readGeoTiffGrid(join(tilesDir, 'geotiff/settlementDistance_km.tif'), { label: 'd' });
    const road = await readGeoTiffGrid(join(tilesDir, 'geotiff/roadDistance_km.tif'), { label: 'r' });
    const grid = manifest.analysisGrid;
    const toLonLat = createTransform(grid.crs, 'EPSG:4326');
    const gt = grid.geoTransform;
    let checked = 0;
    for (let i = 0; i < dist.grid.values.length; i += 37) {
      const v = dist.grid.values[i];
      if (v !== v) continue;
      const col = i % grid.width;
      const row = Math.floor(i / grid.width);
      const p = toLonLat(gt[0] + (col + 0.5) * gt[1], gt[3] + (row + 0.5) * gt[5]);
      // Independent: the spherical law of cosines (a textbook alternative to haversine, same sphere).
      const cosines = (q: [number, number]) => {
        const r = Math.PI / 180;
        const c =
          Math.sin(p[1] * r) * Math.sin(q[1] * r) +
          Math.cos(p[1] * r) * Math.cos(q[1] * r) * Math.cos((q[0] - p[0]) * r);
        return 6371.0088 * Math.acos(Math.min(1, c));
      };
      const nearest = Math.min(...settlements.map((s) => cosines(s.lonLat)));
      expect(v).toBeCloseTo(nearest, 1);
      // Every settlement is on the road network, so a road is never farther than the nearest settlement
      // (within the planar foot-of-perpendicular error, metres at 100 km: proximity.ts).
      expect(road.grid.values[i]).toBeLessThanOrEqual(v + 0.05);
      checked++;
    }
    expect(checked).toBeGreaterThan(20);
  });

  it('shortlist --near <settlement> --within <km> keeps exactly the cells within the radius', async () => {
    const s = settlements[0];
    const { code, stdout } = await runCli([
      'shortlist',
      '--tiles',
      tilesDir,
      '--near',
      s.name.toUpperCase(),
      '--within',
      '30',
      '--where',
      'not excluded',
    ]);
    expect(code).toBe(0);
    const fc = JSON.parse(stdout);
    expect(fc.near.settlement).toBe(s.name);
    expect(fc.features.length).toBeGreaterThan(0);
    for (const f of fc.features) {
      expect(haversine_km([f.properties.lon_deg, f.properties.lat_deg], s.lonLat)).toBeLessThanOrEqual(30.01);
      expect(f.properties.exclusion_class).toBe(0);
    }
    // Every cell whose centre is within 30 km and not excluded: counted from the GeoTIFFs.
    const excl = await readGeoTiffGrid(join(tilesDir, 'geotiff/exclusion.tif'), { label: 'exclusion' });
    const manifest = JSON.parse(await readFile(join(tilesDir, 'manifest.json'), 'utf8'));
    const grid = manifest.analysisGrid;
    const toLonLat = createTransform(grid.crs, 'EPSG:4326');
    const gt = grid.geoTransform;
    let expected = 0;
    for (let i = 0; i < excl.grid.values.length; i++) {
      if (excl.grid.values[i] !== 0) continue;
      const col = i % grid.width;
      const row = Math.floor(i / grid.width);
      const p = toLonLat(gt[0] + (col + 0.5) * gt[1], gt[3] + (row + 0.5) * gt[5]);
      if (haversine_km([p[0], p[1]], s.lonLat) <= 30) expected++;
    }
    expect(fc.matched).toBe(expected);

    const unknown = await runCli(['shortlist', '--tiles', tilesDir, '--near', 'Nowhere', '--within', '5']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/--near Nowhere: no settlement of that name/);
    const noRadius = await runCli(['shortlist', '--tiles', tilesDir, '--near', s.name]);
    expect(noRadius.code).toBe(2);
    expect(noRadius.stderr).toMatch(/--within <km>/);
  });
});
