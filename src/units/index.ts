export * from './unit.js';
export * from './parse.js';
export * from './format.js';
export * from './e-series.js';
export * from './uncertainty.js';
