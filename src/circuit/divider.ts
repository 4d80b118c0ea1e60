import type { StageKind } from './types.js';

// PLACEHOLDER until the stage kind is written: it refuses to evaluate.
export const dividerKind: StageKind<unknown> = {
  kind: 'divider',
  summary: 'not built yet',
  roles: [],
  outputs: ['out'],
  needsInput: false,
  parse() {
    throw new Error('stage kind divider is not built yet');
  },
  checks: () => [],
  evaluate() {
    throw new Error('stage kind divider is not built yet');
  },
  faultHints: {},
};
