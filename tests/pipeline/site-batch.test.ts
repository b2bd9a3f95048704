/**
 * `pile-atlas site --batch`: every site of a CSV or GeoJSON file on a base input, one JSON line per
 * site, bad and repeated sites refused by name, the rest still run; each line's figures are the
 * single-site simulation's for the same merged input.
 */
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { readFileSync } from 'node:fs';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { simulateSite } from '../../layers/site/simulate-site';
import { siteInputSchema } from '../../layers/site/site-input-schema';
import { mergeInput, parseSites } from '../../data-pipeline/site/site-batch';
import { makeTempDir, removeTempDirs, runCli } from './pipeline-fixtures';
import { main } from '../../data-pipeline/cli';
import { planSiteEnsemble } from '../../layers/screening/site-ensemble';
import { siteEnsembleFigures } from '../../layers/screening/site-ensemble-figures';
import { scenarioUncertaintySchema } from '../../layers/screening/uncertainty-schema';

afterAll(removeTempDirs);

const example = JSON.parse(readFileSync(join(import.meta.dirname, '../../examples/site-demo.json'), 'utf8'));
// Short runs keep the test quick; the comparison is between two runs of the same input.
const base = { ...example, years: 3, timeStep_days: 14 };

describe('site --batch', () => {
  it('reads CSV dotted paths and GeoJSON properties.site into overrides', () => {
    const csv = parseSites(
      's.csv',
      'name,lon,lat,climate.meanAirTemp_C,ground.layers.1.soil.texture\n"A, north",-3,75,-4.5,sand\n',
    );
    expect(csv[0]).toEqual({
      name: 'A, north',
      lon: -3,
      lat: 75,
      overrides: {
        climate: { meanAirTemp_C: -4.5 },
        ground: { layers: { 1: { soil: { texture: 'sand' } } } },
      },
    });
    const merged = mergeInput(base, csv[0].overrides) as typeof base;
    expect(merged.ground.layers[1].soil.texture).toBe('sand');
    expect(merged.ground.layers[1].soil.waterContent_m3m3).toBe(base.ground.layers[1].soil.waterContent_m3m3);
    expect(merged.ground.layers).toHaveLength(base.ground.layers.length);
    const gj = parseSites(
      's.geojson',
      JSON.stringify({
        type: 'FeatureCollection',
        features: [
          {
            type: 'Feature',
            geometry: { type: 'Point', coordinates: [1, 70] },
            properties: { name: 'B', site: { years: 5 } },
          },
        ],
      }),
    );
    expect(gj[0]).toEqual({ name: 'B', lon: 1, lat: 70, overrides: { years: 5 } });
  });

  it('streams one line per site; refuses a repeated and a bad site by name; the others match the single run', async () => {
    const dir = await makeTempDir('site-batch');
    const baseFile = join(dir, 'base.json');
    await writeFile(baseFile, JSON.stringify(base));
    const sitesFile = join(dir, 'sites.csv');
    await writeFile(
      sitesFile,
      [
        'name,lon,lat,climate.meanAirTemp_C',
        'Cold bench,-3.1,75.2,-5',
        'Warm bench,-2.9,75.0,-1.5',
        'cold bench,-2.0,74.0,-5',
        'Too hot,-2.5,74.5,40',
      ].join('\n'),
    );
    const { code, stdout, stderr } = await runCli(['site', '--batch', sitesFile, '--base', baseFile]);
    expect(code).toBe(2);
    const lines = stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l));
    expect(lines).toHaveLength(4);
    expect(lines.map((l) => l.ok)).toEqual([true, true, false, false]);
    expect(lines[2].problems[0]).toMatch(/repeats site 1 \(Cold bench\)/);
    expect(lines[3].problems.join(' ')).toMatch(/^Too hot.*meanAirTemp_C/);
    expect(stderr).toMatch(/site 1\/4: Cold bench/);
    const single = simulateSite(
      siteInputSchema.parse(mergeInput(base, { climate: { meanAirTemp_C: -1.5 } })),
    );
    expect(lines[1].probes.map((p: { thawDelay_yr: number | null }) => p.thawDelay_yr)).toEqual(
      single.thawDelay_yr,
    );
    expect(lines[1].lowestFluid_C).toBe(single.fluid?.lowest_C ?? null);
    expect(lines[1].caution).toMatch(/not a design/i);
    // Each site ran on its own input: the cold site's line is its own single run, not the warm one's.
    const cold = simulateSite(siteInputSchema.parse(mergeInput(base, { climate: { meanAirTemp_C: -5 } })));
    expect(lines[0].lowestFluid_C).toBe(cold.fluid?.lowest_C ?? null);
    expect(lines[0].lowestFluid_C).not.toBe(lines[1].lowestFluid_C);
  }, 300_000);

  it('--ensemble: each site line streams as soon as its members are done, with the simulated ensemble figures', async () => {
    const dir = await makeTempDir('site-batch-ensemble');
    const baseFile = join(dir, 'base.json');
    await writeFile(baseFile, JSON.stringify(base));
    const sitesFile = join(dir, 'sites.csv');
    await writeFile(
      sitesFile,
      ['name,lon,lat,climate.meanAirTemp_C', 'Cold bench,-3.1,75.2,-5', 'Warm bench,-2.9,75.0,-1.5'].join(
        '\n',
      ),
    );
    // stdout and stderr in the order they were written: a line per site, progress per member.
    const events: { stream: 'out' | 'err'; text: string }[] = [];
    const spy = (stream: 'out' | 'err') => (chunk: string | Uint8Array) => {
      events.push({ stream, text: String(chunk) });
      return true;
    };
    const out = vi.spyOn(process.stdout, 'write').mockImplementation(spy('out'));
    const err = vi.spyOn(process.stderr, 'write').mockImplementation(spy('err'));
    let code: number;
    try {
      code = await main([
        'site',
        '--batch',
        sitesFile,
        '--base',
        baseFile,
        '--members',
        '3',
        '--workers',
        '2',
      ]);
    } finally {
      out.mockRestore();
      err.mockRestore();
    }
    expect(code).toBe(0);
    const lineAt = events.map((e, i) => (e.stream === 'out' ? i : -1)).filter((i) => i >= 0);
    expect(lineAt).toHaveLength(2);
    const progress = events.filter((e) => e.stream === 'err').map((e) => e.text);
    // Members are counted across both sites (3 each), up to 6 of 6.
    expect(progress.filter((t) => /ensemble members \d+\/6/.test(t))).toHaveLength(6);
    // Streaming: the first site's line is out before the second site's last member reports.
    const lastMember = events.findIndex((e) => /ensemble members 6\/6/.test(e.text));
    expect(lineAt[0]).toBeLessThan(lastMember);
    const lines = lineAt.map((i) => JSON.parse(events[i].text));
    expect(lines.map((l) => l.name)).toEqual(['Cold bench', 'Warm bench']);
    // The warm site's figures are the ensemble's own: the same members run here, one by one.
    const input = siteInputSchema.parse(mergeInput(base, { climate: { meanAirTemp_C: -1.5 } }));
    const u = scenarioUncertaintySchema.parse({});
    const plan = planSiteEnsemble(input, u, 3, u.seed);
    const expected = siteEnsembleFigures(plan.members.map((m) => simulateSite(m)));
    expect(lines[1].ensemble).toMatchObject({ kind: 'simulated ensemble', seed: u.seed, ...expected });
    expect(lines[1].ensemble.drivers).toBeNull(); // 3 members are too few for the regression fit
    expect(lines[1].lowestFluid_C).toBe(simulateSite(input).fluid?.lowest_C ?? null);
    // The members spread: their lowest fluid temperatures are not all the site's own.
    expect(expected.lowestFluidP10_C).not.toBe(expected.lowestFluidP90_C);
    const bad = await runCli(['site', '--batch', sitesFile, '--base', baseFile, '--members', '1']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--members must be an integer in \[2, 256\]/);
  }, 600_000);
});
