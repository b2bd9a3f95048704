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

  // Rules the simulator's physics enforces, now in the schema with the user's field names
  // (site-input-rules.ts). Porosity n = 1 − ρd/ρs (soil-catalogue.ts: silt 1400 kg/m³ over 2650 kg/m³
  // solids gives n = 0.472, hand computation).
  it('accepts water content above the soil porosity as excess ice (issue 11 item 7)', () => {
    expect(issuesOf((d) => (d.ground.layers[1].soil.waterContent_m3m3 = 0.6))).toEqual([]);
  });

  it('reports a dry density that leaves no pores, and a soil too dry for the unfrozen-water curve', () => {
    expect(issuesOf((d) => (d.ground.layers[1].soil.dryDensity_kg_m3 = 2640)).join()).toMatch(
      /ground\.layers\.1\.soil\.dryDensity_kg_m3: dry density 2640 kg\/m³ gives a porosity of 0\.004/,
    );
    expect(
      issuesOf((d) => (d.ground.layers[1].soil = { texture: 'clay', waterContent_m3m3: 0.001 })).join(),
    ).toMatch(/ground\.layers\.1\.soil: .*freezingPoint_C .*too dry/);
  });

  it('reports U-tube pipes that do not fit the casing in diameters, not radii', () => {
    // Casing inner diameter 0.1683 − 2·0.0071 = 0.1541 m: legs of 0.09 m do not fit twice.
    const msg = issuesOf((d) => (d.pile.loop.pipeOuterDiameter_m = 0.09)).join();
    expect(msg).toMatch(
      /pile\.loop\.pipeOuterDiameter_m: U-tube pipe outer diameter 0\.09 m .*inner diameter .*0\.154 m/,
    );
    expect(msg).not.toMatch(/Radius/);
    expect(issuesOf((d) => (d.pile.loop.shankSpacing_m = 0.15)).join()).toMatch(
      /pile\.loop\.shankSpacing_m: leg spacing/,
    );
  });

  it('refuses unknown keys in operation.heatPump', () => {
    const msg = issuesOf(
      (d) =>
        (d.operation.heatPump = {
          enteringFluid_C: [-10, 10],
          cop: [3, 4],
          capacityRatio: [1, 1],
          minEnteringFluid_C: -8,
          colour: 'red',
        }),
    ).join();
    expect(msg).toMatch(/operation\.heatPump/);
  });

  it('refuses a fluid that the operation freezes before running', () => {
    // Water freezes at 0 °C; the default heat pump holds its entering fluid at −8 °C (heat-pump.ts).
    expect(issuesOf((d) => (d.pile.fluid = { name: 'water', massFraction: 0 })).join()).toMatch(
      /pile\.fluid: the heat pump's lowest entering fluid temperature -8 °C \(default curve\) is not above the freezing point 0 °C/,
    );
    expect(
      issuesOf((d) => (d.operation = { mode: 'inletTemperature', inlet_C: -20, flow_L_min: 12 })).join(),
    ).toMatch(/operation\.inlet_C: inlet temperature -20 °C is not above the freezing point/);
  });

  it('refuses surface temperatures colder than any on Earth', () => {
    // nFreeze 3 × (−40 − 40) = −240 °C.
    const msg = issuesOf((d) => {
      d.climate.meanAirTemp_C = -40;
      d.climate.amplitude_C = 40;
      d.climate.nFreeze = 3;
    }).join();
    expect(msg).toMatch(/climate\.nFreeze: the coldest surface temperature .* = -240 °C is below -90 °C/);
  });
});
