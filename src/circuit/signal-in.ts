import type { StageKind } from './types.js';

// PLACEHOLDER until the stage kind is written: it refuses to evaluate.
export const signalInKind: StageKind<unknown> = {
  kind: 'signal-in',
  summary: 'not built yet',
  roles: [],
  outputs: ['out'],
  needsInput: false,
  parse() {
    throw new Error('stage kind signal-in is not built yet');
  },
  checks: () => [],
  evaluate() {
    throw new Error('stage kind signal-in is not built yet');
  },
  faultHints: {},
};
