export * from './types.js';
export { createRunState } from './create.js';
export { runReducer } from './reducer.js';
export { currentReading, endOptions, firstPowerBlock, isOverLimit, lockReason, openChecks, poweredBlock } from './gates.js';
export { suggestNext } from './suggest.js';
export { assessReading, judge, type Assessed, type Rejected } from './assess.js';
export { scopeSetup, upTo125, type ScopeSetup } from './scope-setup.js';
export { downstreamMap, stagesAffectedBy } from './graph.js';
