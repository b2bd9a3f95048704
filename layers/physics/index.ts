// The science core's physics: every published model, re-exported (one module per model).
export * from './thermal-regime';
export * from './exchanger';
// Both the soil and the fluid modules name a freezing point; the soil's keeps the plain name.
export { freezingPoint_C } from './unfrozen-water';
export { freezingPoint_C as fluidFreezingPoint_C } from './fluids';
