// The science core (pure TypeScript, SI units): physics models, site simulator and sizing, screening.
export * from './physics/index';
export * from './site/index';
export * from './screening/index';
export * from './grid';
export * from './cautions';
