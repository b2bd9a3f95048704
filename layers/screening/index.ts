// Regional screening: per-cell model, scenario, economics, suitability, layer registry and the tile,
// manifest and colour contracts (re-exports only).
export * from './screening-model';
export * from './cell-screening-model';
export * from './scenario';
export * from './economics';
export * from './suitability';
export * from './operating-window';
export * from './cell-layers';
export * from './basic-screening-model';
export * from './manifest';
export * from './tile-format';
export * from './colour-ramps';
export * from './uncertainty-schema';
export * from './latin-hypercube';
export * from './ensemble-statistics';
export * from './cell-ensemble-model';
