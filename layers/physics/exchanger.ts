/** The pile as a ground heat exchanger: public physics API of the exchanger modules (re-exports only). */
export * from './fluids';
export * from './convection';
export * from './pile-resistance';
export * from './infinite-line-source';
export * from './infinite-cylinder-source';
export * from './finite-line-source';
export * from './solid-cylinder-source';
export * from './load-aggregation';
export * from './heat-pump';
export * from './fluid-temperature-convention';
export * from './finite-line-source-point';
