import type { StageKind } from './types.js';

// PLACEHOLDER until the stage kind is written: it refuses to evaluate.
export const schmittIntegratorKind: StageKind<unknown> = {
  kind: 'schmitt-integrator',
  summary: 'not built yet',
  roles: [],
  outputs: ['out'],
  needsInput: false,
  parse() {
    throw new Error('stage kind schmitt-integrator is not built yet');
  },
  checks: () => [],
  evaluate() {
    throw new Error('stage kind schmitt-integrator is not built yet');
  },
  faultHints: {},
};
