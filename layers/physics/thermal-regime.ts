// The ground's thermal regime under a warming climate (science core I): soil properties, surface
// forcing, ground temperature and phase change. Re-exports only; each module cites its sources.
export * from './validate';
export * from './special-functions';
export * from './soil-constituents';
export * from './johansen-conductivity';
export * from './cote-konrad-conductivity';
export * from './soil-heat-capacity';
export * from './unfrozen-water';
export * from './soil-catalogue';
export * from './surface-forcing';
export * from './ttop';
export * from './stefan';
export * from './kudryavtsev';
export * from './neumann';
export * from './neumann-active-layer';
export * from './ground-temperature-wave';
export * from './carslaw-jaeger-surface-response';
export * from './geothermal-gradient';
export * from './ground-temperature';
export * from './years-to-thaw';
