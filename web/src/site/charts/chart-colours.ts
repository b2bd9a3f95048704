/** Colours of the site charts: distinguishable with the common colour-vision deficiencies (blue vs orange). */
export const CHART_COLOURS = {
  withPile: '#1d5f9e',
  noPile: '#d0792b',
  freezing: '#6b3fa0',
  inlet: '#1d5f9e',
  outlet: '#3aa0a0',
  limit: '#b3263a',
  bar: '#5b8fc4',
  windowTooLittle: '#f6d5bf',
  windowOk: '#cfe8cf',
  windowTooMuch: '#d9def4',
  quick: '#555555',
} as const;
