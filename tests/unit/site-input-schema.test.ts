/** The site input schema: the example validates; bad input is reported with the field path. */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { formatSiteInputIssues, siteFieldMeta, siteInputSchema } from '../../layers/site/site-input-schema';
import { simulateSite } from '../../layers/site/simulate-site';

const example = JSON.parse(readFileSync(new URL('../../examples/site-demo.json', import.meta.url), 'utf8'));

function issuesOf(mutate: (d: typeof example) => void): string[] {
  const d = structuredClone(example);
  mutate(d);
  const r = siteInputSchema.safeParse(d);
  return r.success ? [] : formatSiteInputIssues(r.error);
}

describe('siteInputSchema', () => {
  it('accepts the example and fills the documented defaults', () => {
    const r = siteInputSchema.parse(example);
    expect(r.domain.depth_m).toBe(50);
    expect(r.outputStep_days).toBeCloseTo(365 / 12, 10);
    expect(r.pile?.loop.type).toBe('uTube');
  });

  it('reports a layer gap and a layer overlap at the layer top', () => {
    expect(issuesOf((d) => (d.ground.layers[1].top_m = 0.5)).join()).toMatch(
      /ground\.layers\.1\.top_m: layer gap/,
    );
    expect(issuesOf((d) => (d.ground.layers[2].top_m = 8)).join()).toMatch(
      /ground\.layers\.2\.top_m: layer overlap/,
    );
  });

  it('reports a layer with neither a soil description nor all explicit properties', () => {
    const msg = issuesOf((d) => delete d.ground.layers[2].latent_J_m3).join();
    expect(msg).toMatch(/ground\.layers\.2\.latent_J_m3: .*missing latent_J_m3/);
  });

  it('reports probes outside the domain', () => {
    expect(issuesOf((d) => (d.probes[0].r_m = 25)).join()).toMatch(
      /probes\.0\.r_m: probe radius 25 m is outside/,
    );
    expect(issuesOf((d) => (d.probes[1].z_m = 60)).join()).toMatch(
      /probes\.1\.z_m: probe depth 60 m is below/,
    );
    expect(issuesOf((d) => (d.probes[1].r_m = 0.01)).join()).toMatch(/probes\.1\.r_m/);
  });

  it('reports a pile longer than the domain', () => {
    expect(issuesOf((d) => (d.pile.length_m = 48)).join()).toMatch(/pile\.length_m: pile bottom/);
  });

  it('reports a mesh or time step that cannot resolve the pile', () => {
    expect(issuesOf((d) => (d.numerics = { pileStep_m: 5 })).join()).toMatch(
      /numerics\.pileStep_m: vertical cell 5 m/,
    );
    expect(issuesOf((d) => (d.numerics = { firstRadialStep_m: 0.5 })).join()).toMatch(
      /numerics\.firstRadialStep_m/,
    );
    expect(issuesOf((d) => (d.timeStep_days = 60)).join()).toMatch(/timeStep_days/);
  });

  it('reports non-finite numbers with their path', () => {
    expect(issuesOf((d) => (d.climate.meanAirTemp_C = Number.NaN)).join()).toMatch(/climate\.meanAirTemp_C/);
    expect(issuesOf((d) => (d.ground.geothermalFlux_W_m2 = Infinity)).join()).toMatch(
      /ground\.geothermalFlux_W_m2/,
    );
    expect(issuesOf((d) => (d.pile.outerDiameter_m = '0.17')).join()).toMatch(/pile\.outerDiameter_m/);
  });

  it('lists every issue at once and simulateSite refuses bad input with the paths', () => {
    const issues = issuesOf((d) => {
      d.probes[0].z_m = 99;
      d.ground.layers[1].top_m = 0.3;
    });
    expect(issues.length).toBe(2);
    const bad = structuredClone(example);
    bad.climate.nFreeze = -1;
    expect(() => simulateSite(bad)).toThrow(/climate\.nFreeze/);
  });

  it('carries titles, units and limits for the form', () => {
    const meta = siteFieldMeta();
    expect(meta['climate.meanAirTemp_C']).toMatchObject({ unit: '°C', min: -40, max: 20 });
    expect(meta['ground.layers[].kFrozen_W_mK']).toMatchObject({ unit: 'W/m·K' });
    expect(meta['operation.extraction_W'].unit).toBe('W');
    expect(meta['probes[].r_m'].title).toMatch(/radius/i);
  });
});
