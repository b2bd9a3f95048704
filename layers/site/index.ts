// The single-site simulator, its input schema and pile-field sizing (re-exports only).
export * from './site-input-schema';
export * from './site-result';
export * from './simulate-site';
export * from './pile-sizing';
export * from './sizing-layout';
export * from './site-bounds';
