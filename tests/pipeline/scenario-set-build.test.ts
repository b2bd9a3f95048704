/**
 * Scenario sets in one build (issue 17 item 2): the small demo region built with three scenarios of
 * the demo set (present trend; high pathway with 30- and 50-year lives) writes one band set per
 * scenario (the first at the root, the others under scenarios/<slug>/), every manifest lists all three
 * with their differences from the first, and the bands behave as the model says they must: the design
 * life does not enter the thaw year without piles, so the two high-pathway scenarios agree on it
 * pixel for pixel while their frozen margins differ; the pathway changes the thaw years.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTiles } from '../../data-pipeline/build/build-tiles';
import { DEMO_SCENARIO_SET } from '../../data-pipeline/demo/demo-scenarios';
import { BAND } from '../../layers/screening/band-ids';
import { manifestSchema, type Manifest } from '../../layers/screening/manifest';
import { unpackTile } from '../../layers/screening/tile-format';
import { ValidationError } from '../../layers/validation-error';
import { makeTempDir, removeTempDirs, SMALL_DEMO, smallDemo } from './pipeline-fixtures';

afterAll(removeTempDirs);

const set = {
  scenarios: [
    DEMO_SCENARIO_SET.scenarios[0],
    DEMO_SCENARIO_SET.scenarios[2],
    DEMO_SCENARIO_SET.scenarios[3],
    // the first scenario again under another name: its comparison with the first must be null change
    { ...DEMO_SCENARIO_SET.scenarios[0], name: 'Present trend, again' },
  ],
};
let outDir = '';
let inDir = '';
let manifests: Manifest[] = [];
beforeAll(async () => {
  inDir = await smallDemo();
  outDir = join(await makeTempDir('set'), 'out');
  await buildTiles({ inDir, outDir, cellSize_m: SMALL_DEMO.cellSize_m, scenario: set, geotiff: false });
  const root = manifestSchema.parse(JSON.parse(await readFile(join(outDir, 'manifest.json'), 'utf8')));
  manifests = [];
  for (const s of root.scenarioSet?.scenarios ?? []) {
    manifests.push(manifestSchema.parse(JSON.parse(await readFile(join(outDir, s.manifest), 'utf8'))));
  }
}, 400_000);

/** Values of one band over the first tile at the finest zoom of a scenario's output. */
async function bandPlane(m: Manifest, sub: string, id: string): Promise<Float32Array> {
  const z = m.tiles.maxZoom;
  const xs = await import('node:fs/promises').then((fs) => fs.readdir(join(outDir, sub, 'tiles', String(z))));
  const x = xs.sort()[0];
  const ys = await import('node:fs/promises').then((fs) =>
    fs.readdir(join(outDir, sub, 'tiles', String(z), x)),
  );
  const bytes = await readFile(join(outDir, sub, 'tiles', String(z), x, ys.sort()[0]));
  const planes = unpackTile(bytes, m.bands);
  return planes[m.bands.findIndex((b) => b.id === id)];
}

describe('scenario set build', () => {
  it('writes one manifest per scenario, each listing all of them with their differences from the first', () => {
    expect(manifests.map((m) => m.scenarioSet?.current)).toEqual(set.scenarios.map((s) => s.name));
    const list = manifests[0].scenarioSet?.scenarios ?? [];
    expect(list.map((s) => s.manifest)).toEqual([
      'manifest.json',
      'scenarios/high-pathway-30-year-life/manifest.json',
      'scenarios/high-pathway-50-year-life/manifest.json',
      'scenarios/present-trend-again/manifest.json',
    ]);
    expect(list[0].differences).toEqual([]);
    expect(list[1].differences.map((d) => d.path)).toEqual(['warmingPathway']);
    expect(list[2].differences.map((d) => d.path).sort()).toEqual(['designLife_yr', 'warmingPathway']);
    expect(list[2].differences.find((d) => d.path === 'designLife_yr')?.text).toBe(
      'designLife_yr: 50 (first scenario: 30)',
    );
    expect(list.map((s) => s.horizonYear)).toEqual([2100, 2100, 2100, 2100]);
    expect(list[3].differences).toEqual([]);
    expect(list[1].warming).toBe('high pathway (illustrative)');
    for (const s of list) expect(s.keyFigures.cellsScreened).toBeGreaterThan(100);
    expect(manifests[1].scenarioSet?.root).toBe('../../');
    // inputs read once: every scenario records the same sources and analysis grid
    for (const m of manifests) {
      expect(m.sources).toEqual(manifests[0].sources);
      expect(m.analysisGrid).toEqual(manifests[0].analysisGrid);
      expect((m.scenario as { name: string }).name).toBe(m.scenarioSet?.current);
    }
  });
  it('design life leaves the thaw year without piles unchanged and moves the frozen margin; the pathway moves thaw years', async () => {
    const subs = ['', 'scenarios/high-pathway-30-year-life', 'scenarios/high-pathway-50-year-life'];
    const thaw = await Promise.all(manifests.slice(0, 3).map((m, i) => bandPlane(m, subs[i], BAND.thawYear)));
    const margin = await Promise.all(
      manifests.slice(0, 3).map((m, i) => bandPlane(m, subs[i], BAND.frozenMargin)),
    );
    let finite = 0;
    let pathwayMoved = 0;
    let marginMoved = 0;
    for (let p = 0; p < thaw[1].length; p++) {
      if (!Number.isFinite(thaw[1][p])) continue;
      finite++;
      expect(thaw[2][p]).toBe(thaw[1][p]);
      if (Math.abs(thaw[1][p] - thaw[0][p]) > 0.5) pathwayMoved++;
      if (Number.isFinite(margin[1][p]) && margin[2][p] < margin[1][p] - 1) marginMoved++;
    }
    expect(finite).toBeGreaterThan(50);
    expect(pathwayMoved).toBeGreaterThan(finite / 10);
    expect(marginMoved).toBeGreaterThan(finite / 10);
  });
  it('compares each scenario with the first over the whole region (good under both, class changed, margin lost)', () => {
    const list = manifests[0].scenarioSet?.scenarios ?? [];
    const goodFirst = (list[0].keyFigures['share good'] ?? 0) * list[0].keyFigures.cellsScreened;
    // identical scenario: no change, every good cell good under both, no margin lost
    expect(list[3].keyFigures.classChanged_cells).toBe(0);
    expect(list[3].keyFigures.frozenMarginLost_mean_yr).toBe(0);
    expect(list[3].keyFigures.pilesPerTonAdded_mean).toBe(0);
    expect(Math.abs(list[3].keyFigures.goodUnderBoth_cells - goodFirst)).toBeLessThan(
      1e-3 * list[0].keyFigures.cellsScreened, // the shares are rounded
    );
    // a different scenario: good under both is at most either's good count; the 50-year life loses margin
    for (const i of [1, 2]) {
      const goodOther = (list[i].keyFigures['share good'] ?? 0) * list[i].keyFigures.cellsScreened;
      expect(list[i].keyFigures.goodUnderBoth_cells).toBeLessThanOrEqual(
        Math.min(goodFirst, goodOther) + 1e-3 * list[i].keyFigures.cellsScreened,
      );
    }
    expect(list[2].keyFigures.classChanged_cells).toBeGreaterThan(0);
    expect(list[2].keyFigures.frozenMarginLost_mean_yr).toBeGreaterThan(
      list[1].keyFigures.frozenMarginLost_mean_yr,
    );
    expect(list[0].keyFigures.goodUnderBoth_cells).toBeUndefined();
  });
  it('rejects two scenarios with the same name, naming the field, before reading any input', async () => {
    const bad = { scenarios: [{ name: 'A' }, { name: 'a', designLife_yr: 50 }] };
    const err = await buildTiles({
      inDir,
      outDir: join(await makeTempDir('bad'), 'out'),
      scenario: bad,
    }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ValidationError);
    expect(String((err as Error).message)).toMatch(/scenarios\.1\.name/);
  });
});

describe('scenario difference bands', () => {
  it('writes difference bands on every scenario after the first: each cell is its two scenarios’ values subtracted', async () => {
    // Definition of the bands (issue 17 item 3): margin lost = first − this, piles added = this − first,
    // class change compares the ordinal classes. Tolerance: the tiles' quantisation, at most scale / 2
    // per band (layers/screening/tile-format.ts), summed over the three bands involved.
    const subs = ['', 'scenarios/high-pathway-30-year-life', 'scenarios/high-pathway-50-year-life'];
    const q = (m: Manifest, id: string) => (m.bands.find((b) => b.id === id)?.scale ?? NaN) / 2;
    expect(manifests[0].bands.some((b) => b.id === BAND.classChange)).toBe(false);
    const plane = (i: number, id: string) => bandPlane(manifests[i], subs[i], id);
    const [m0, p0, c0] = await Promise.all(
      [BAND.frozenMargin, BAND.pilesPerTon, BAND.suitability].map((id) => plane(0, id)),
    );
    for (const i of [1, 2]) {
      const m = manifests[i];
      const classBand = m.bands.find((b) => b.id === BAND.classChange);
      expect(classBand?.classes?.map((c) => c.label)).toEqual([
        'excluded under only one of the two',
        'worse class',
        'same class',
        'better class',
      ]);
      expect(m.bands.find((b) => b.id === BAND.frozenMarginLost)?.unit).toBe('yr');
      const [mi, pi, ci, lost, added, change] = await Promise.all(
        [
          BAND.frozenMargin,
          BAND.pilesPerTon,
          BAND.suitability,
          BAND.frozenMarginLost,
          BAND.pilesPerTonAdded,
          BAND.classChange,
        ].map((id) => plane(i, id)),
      );
      const tolLost =
        q(manifests[0], BAND.frozenMargin) + q(m, BAND.frozenMargin) + q(m, BAND.frozenMarginLost);
      const tolAdded =
        q(manifests[0], BAND.pilesPerTon) + q(m, BAND.pilesPerTon) + q(m, BAND.pilesPerTonAdded);
      let checked = 0;
      let changed = 0;
      for (let p = 0; p < lost.length; p++) {
        if (Number.isFinite(m0[p]) && Number.isFinite(mi[p])) {
          expect(Math.abs(lost[p] - (m0[p] - mi[p]))).toBeLessThanOrEqual(tolLost);
          checked++;
        } else expect(lost[p]).toBeNaN();
        if (Number.isFinite(p0[p]) && Number.isFinite(pi[p]))
          expect(Math.abs(added[p] - (pi[p] - p0[p]))).toBeLessThanOrEqual(tolAdded);
        if (!Number.isFinite(c0[p]) || !Number.isFinite(ci[p])) continue;
        const [a, b] = [Math.round(c0[p]), Math.round(ci[p])];
        const want = a === b ? 2 : a === 0 || b === 0 ? 0 : b > a ? 3 : 1;
        expect(Math.round(change[p])).toBe(want);
        if (want !== 2) changed++;
      }
      expect(checked).toBeGreaterThan(50);
      if (i === 2) expect(changed).toBeGreaterThan(0);
    }
    // the same scenario under another name: nothing changes
    const again = await Promise.all(
      [BAND.classChange, BAND.frozenMarginLost].map((id) =>
        bandPlane(manifests[3], 'scenarios/present-trend-again', id),
      ),
    );
    const finiteLost = again[1].filter((v) => Number.isFinite(v));
    expect(finiteLost.length).toBeGreaterThan(50);
    for (const v of finiteLost)
      expect(Math.abs(v)).toBeLessThanOrEqual(q(manifests[3], BAND.frozenMarginLost));
    for (const v of again[0]) if (Number.isFinite(v)) expect(Math.round(v)).toBe(2);
  });
});
