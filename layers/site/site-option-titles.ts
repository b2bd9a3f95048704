/**
 * Trade words for the choices of the site input (the schema's enum and literal values), so that no
 * internal id reaches a form, a sheet or a message. `optionTitle` falls back to the value split into
 * words for a value this table does not know (tests/unit/site-option-titles.test.ts keeps the table
 * complete for the schema).
 */
export const SITE_OPTION_TITLES: Readonly<Record<string, string>> = {
  // pile.loop.type
  uTube: 'U-tube loop in the pile',
  coaxial: 'Coaxial (pipe-in-pipe) loop',
  // pile.loop.downFlow
  annulus: 'Down the outer channel (annulus)',
  centre: 'Down the centre pipe',
  // pile.fluid.name
  water: 'Water',
  propyleneGlycol: 'Propylene glycol and water',
  ethanol: 'Ethanol and water',
  // operation.mode
  heatRate: 'Fixed heat extraction',
  inletTemperature: 'Fixed fluid inlet temperature',
  building: 'Heat pump serving a building',
  // ground.initial
  equilibrium: 'In balance with the present climate',
  // numerics.fidelity
  coarse: 'Coarse mesh (fast, for batches)',
  standard: 'Standard mesh',
  fine: 'Fine mesh (slow, for checks)',
  // ground.layers[].soil.texture
  gravel: 'Gravel',
  sand: 'Sand',
  silt: 'Silt',
  clay: 'Clay',
  peat: 'Peat',
  bedrock: 'Bedrock',
};

/** The trade's words for a choice of the site input. */
export function optionTitle(value: string): string {
  const known = SITE_OPTION_TITLES[value];
  if (known) return known;
  const words = value
    .replace(/_.*$/, '')
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}
