/**
 * The demo's scenario set (issue 17): the default scenario (each cell's linear trend, 30-year life)
 * and three more on two warming pathways. The pathways are ILLUSTRATIVE, invented for the fictional
 * demo region: a "low" and a "high" emission-like shape of air warming against year, not a published
 * dataset and not any real region's projection. Each is pattern-scaled by the cell's warming grid
 * (reference 0.05 K/yr, about the demo region's mean trend), so the map keeps the demo's north-south
 * pattern. `examples/scenario-set-demo.json` holds the same set for `pile-atlas build --scenario`.
 */
const REFERENCE_TREND_C_PER_YR = 0.05;

const LOW_PATHWAY = {
  label: 'low pathway (illustrative)',
  points: [
    { year: 2000, airWarming_K: 0 },
    { year: 2025, airWarming_K: 1.0 },
    { year: 2050, airWarming_K: 1.8 },
    { year: 2075, airWarming_K: 2.2 },
    { year: 2100, airWarming_K: 2.3 },
  ],
  patternReference_C_per_yr: REFERENCE_TREND_C_PER_YR,
};

const HIGH_PATHWAY = {
  label: 'high pathway (illustrative)',
  points: [
    { year: 2000, airWarming_K: 0 },
    { year: 2025, airWarming_K: 1.2 },
    { year: 2050, airWarming_K: 3.0 },
    { year: 2075, airWarming_K: 5.2 },
    { year: 2100, airWarming_K: 7.5 },
  ],
  patternReference_C_per_yr: REFERENCE_TREND_C_PER_YR,
};

export const DEMO_SCENARIO_SET = {
  scenarios: [
    { name: 'Present trend, 30-year life' },
    { name: 'Low pathway, 30-year life', warmingPathway: LOW_PATHWAY },
    { name: 'High pathway, 30-year life', warmingPathway: HIGH_PATHWAY },
    { name: 'High pathway, 50-year life', warmingPathway: HIGH_PATHWAY, designLife_yr: 50 },
  ],
};
