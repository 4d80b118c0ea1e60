import type { StageKind } from './types.js';

// PLACEHOLDER until the stage kind is written: it refuses to evaluate.
export const rcLowpassKind: StageKind<unknown> = {
  kind: 'rc-lowpass',
  summary: 'not built yet',
  roles: [],
  outputs: ['out'],
  needsInput: false,
  parse() {
    throw new Error('stage kind rc-lowpass is not built yet');
  },
  checks: () => [],
  evaluate() {
    throw new Error('stage kind rc-lowpass is not built yet');
  },
  faultHints: {},
};
